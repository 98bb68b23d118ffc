//! Physical constants, energy units and temperatures.
//!
//! Every number that turns an energy into a rate passes through here, so the
//! sources live in one place. Constants are the exact CODATA 2018 / 2019 SI
//! values (Tiesinga, Mohr, Newell & Taylor, Rev. Mod. Phys. 2021, 93, 025010).

use std::fmt;

/// Boltzmann constant kB in J/K (CODATA 2018, exact).
pub const BOLTZMANN: f64 = 1.380649e-23;
/// Planck constant h in J·s (CODATA 2018, exact).
pub const PLANCK: f64 = 6.62607015e-34;
/// Avogadro constant NA in 1/mol (CODATA 2018, exact).
pub const AVOGADRO: f64 = 6.02214076e23;
/// Molar gas constant R = NA·kB in J/(mol·K) (exact product of two exact constants).
pub const GAS_CONSTANT: f64 = AVOGADRO * BOLTZMANN;
/// Elementary charge in C (CODATA 2018, exact); 1 eV per particle is e·NA J/mol.
pub const ELEMENTARY_CHARGE: f64 = 1.602176634e-19;
/// Speed of light in vacuum in m/s (CODATA 2018, exact): turns wavenumbers into energies.
pub const SPEED_OF_LIGHT: f64 = 299_792_458.0;
/// Standard atmosphere in Pa (10th CGPM, 1954): the pressure standard state of most
/// gas-phase quantum-chemistry outputs.
pub const ATMOSPHERE: f64 = 101_325.0;
/// 1 bar in Pa (IUPAC standard pressure).
pub const BAR: f64 = 100_000.0;
/// Thermochemical calorie in J (NIST SP 811).
pub const CALORIE: f64 = 4.184;
/// 1 hartree per particle, in kJ/mol: CODATA 2018 Eh·NA to 10 digits (the value the
/// product brief fixes).
pub const HARTREE_KJ_PER_MOL: f64 = 2625.499639;
/// Offset between the Celsius and kelvin scales.
pub const CELSIUS_OFFSET: f64 = 273.15;

/// An energy unit a profile can be written in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
pub enum EnergyUnit {
    /// kcal/mol, thermochemical calorie.
    #[serde(rename = "kcal/mol")]
    KcalPerMol,
    /// kJ/mol.
    #[serde(rename = "kJ/mol")]
    KjPerMol,
    /// eV per particle, expressed per mole (× e·NA).
    #[serde(rename = "eV")]
    Ev,
    /// hartree per particle, expressed per mole.
    #[serde(rename = "hartree")]
    Hartree,
}

impl EnergyUnit {
    /// All units, in the order they are listed in help texts.
    pub const ALL: [EnergyUnit; 4] = [
        EnergyUnit::KcalPerMol,
        EnergyUnit::KjPerMol,
        EnergyUnit::Ev,
        EnergyUnit::Hartree,
    ];

    /// kJ/mol in one of this unit.
    pub fn kj_per_mol(self) -> f64 {
        match self {
            EnergyUnit::KcalPerMol => CALORIE,
            EnergyUnit::KjPerMol => 1.0,
            EnergyUnit::Ev => ELEMENTARY_CHARGE * AVOGADRO / 1000.0,
            EnergyUnit::Hartree => HARTREE_KJ_PER_MOL,
        }
    }

    /// Converts a value in this unit to J/mol.
    pub fn to_j_per_mol(self, value: f64) -> f64 {
        value * self.kj_per_mol() * 1000.0
    }

    /// Converts a value in J/mol to this unit.
    pub fn from_j_per_mol(self, value: f64) -> f64 {
        value / (self.kj_per_mol() * 1000.0)
    }

    /// Converts a value in this unit to `other`.
    pub fn convert(self, value: f64, other: EnergyUnit) -> f64 {
        if self == other {
            value
        } else {
            value * self.kj_per_mol() / other.kj_per_mol()
        }
    }

    /// The spelling used in profile files and JSON ("kcal/mol", "kJ/mol", "eV", "hartree").
    pub fn name(self) -> &'static str {
        match self {
            EnergyUnit::KcalPerMol => "kcal/mol",
            EnergyUnit::KjPerMol => "kJ/mol",
            EnergyUnit::Ev => "eV",
            EnergyUnit::Hartree => "hartree",
        }
    }

    /// The typographic form for axis labels ("kcal mol⁻¹").
    pub fn axis_name(self) -> &'static str {
        match self {
            EnergyUnit::KcalPerMol => "kcal mol⁻¹",
            EnergyUnit::KjPerMol => "kJ mol⁻¹",
            EnergyUnit::Ev => "eV",
            EnergyUnit::Hartree => "E\u{2095}",
        }
    }

    /// Parses a unit name; case and the spellings "kcal mol-1", "kj", "ha", "au" are forgiven.
    pub fn parse(text: &str) -> Option<EnergyUnit> {
        let t: String = text
            .trim()
            .to_ascii_lowercase()
            .chars()
            .filter(|c| !c.is_whitespace())
            .collect();
        match t.as_str() {
            "kcal/mol" | "kcalmol-1" | "kcal" | "kcalmol⁻¹" => Some(EnergyUnit::KcalPerMol),
            "kj/mol" | "kjmol-1" | "kj" | "kjmol⁻¹" => Some(EnergyUnit::KjPerMol),
            "ev" => Some(EnergyUnit::Ev),
            "hartree" | "ha" | "eh" | "au" | "a.u." => Some(EnergyUnit::Hartree),
            _ => None,
        }
    }

    /// The energy of one wavenumber (cm⁻¹) per mole, h·c·NA·100 m⁻¹, in this unit.
    pub fn per_wavenumber(self) -> f64 {
        self.from_j_per_mol(PLANCK * SPEED_OF_LIGHT * AVOGADRO * 100.0)
    }

    /// The unit entropies are written in alongside this energy unit:
    /// cal/(mol·K) with kcal/mol, J/(mol·K) with kJ/mol (the usual tabulation),
    /// eV/K and hartree/K otherwise.
    pub fn entropy_name(self) -> &'static str {
        match self {
            EnergyUnit::KcalPerMol => "cal/(mol·K)",
            EnergyUnit::KjPerMol => "J/(mol·K)",
            EnergyUnit::Ev => "eV/K",
            EnergyUnit::Hartree => "hartree/K",
        }
    }

    /// Converts an entropy written in [`Self::entropy_name`] to this unit per kelvin.
    pub fn entropy_per_kelvin(self, s: f64) -> f64 {
        match self {
            EnergyUnit::KcalPerMol | EnergyUnit::KjPerMol => s / 1000.0,
            EnergyUnit::Ev | EnergyUnit::Hartree => s,
        }
    }

    /// Decimal places that show energies in this unit at the usual precision.
    pub fn display_decimals(self) -> usize {
        match self {
            EnergyUnit::KcalPerMol | EnergyUnit::KjPerMol => 1,
            EnergyUnit::Ev => 2,
            EnergyUnit::Hartree => 4,
        }
    }
}

impl fmt::Display for EnergyUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// A thermodynamic temperature, finite and above absolute zero by construction.
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd, serde::Serialize)]
#[serde(transparent)]
pub struct Temperature(f64);

/// Why a temperature text was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TemperatureError {
    /// The text is not a number followed by an optional unit.
    #[error(
        "cannot read '{0}' as a temperature (write e.g. \"25 C\", \"-78 C\", \"298.15 K\" or a number in kelvin)"
    )]
    Unreadable(String),
    /// The value is at or below absolute zero, or not finite.
    #[error("temperature {0} K is not above absolute zero")]
    NotPositive(f64),
}

impl Temperature {
    /// A temperature in kelvin; `None` unless finite and > 0.
    pub fn kelvin(k: f64) -> Option<Temperature> {
        (k.is_finite() && k > 0.0).then_some(Temperature(k))
    }

    /// Checked constructor with a reason.
    pub fn try_kelvin(k: f64) -> Result<Temperature, TemperatureError> {
        Temperature::kelvin(k).ok_or(TemperatureError::NotPositive(k))
    }

    /// Parses "25 C", "25 °C", "-78 C", "298.15 K", "298.15" (kelvin).
    pub fn parse(text: &str) -> Result<Temperature, TemperatureError> {
        let t = text.trim();
        let unreadable = || TemperatureError::Unreadable(text.to_string());
        let (number, celsius) = if let Some(n) = t
            .strip_suffix("°C")
            .or_else(|| t.strip_suffix("C"))
            .or_else(|| t.strip_suffix("c"))
        {
            (n, true)
        } else if let Some(n) = t.strip_suffix("K").or_else(|| t.strip_suffix("k")) {
            (n, false)
        } else {
            (t, false)
        };
        let value: f64 = number.trim().parse().map_err(|_| unreadable())?;
        if !value.is_finite() {
            return Err(unreadable());
        }
        let k = if celsius {
            value + CELSIUS_OFFSET
        } else {
            value
        };
        Temperature::try_kelvin(k)
    }

    /// Value in kelvin.
    pub fn k(self) -> f64 {
        self.0
    }

    /// Value in degrees Celsius.
    pub fn celsius(self) -> f64 {
        self.0 - CELSIUS_OFFSET
    }

    /// RT in J/mol.
    pub fn rt_j_per_mol(self) -> f64 {
        GAS_CONSTANT * self.0
    }

    /// RT in the given energy unit.
    pub fn rt(self, unit: EnergyUnit) -> f64 {
        unit.from_j_per_mol(self.rt_j_per_mol())
    }

    /// kB·T/h in 1/s: the Eyring prefactor.
    pub fn frequency_factor(self) -> f64 {
        BOLTZMANN * self.0 / PLANCK
    }
}

impl fmt::Display for Temperature {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{:.2} K ({:.1} °C)", self.0, self.celsius())
    }
}

/// Reads a duration as chemists write it: "2 h", "30 min", "45 s", "3 d",
/// "1.5 days", "250 ms", or a bare number of seconds. `None` unless finite and > 0.
pub fn parse_duration_s(text: &str) -> Option<f64> {
    let t = text.trim();
    let split = t
        .find(|c: char| c.is_alphabetic() || c == 'µ')
        .unwrap_or(t.len());
    let value: f64 = t[..split].trim().parse().ok()?;
    let factor = match t[split..].trim().to_ascii_lowercase().as_str() {
        "" | "s" | "sec" | "second" | "seconds" => 1.0,
        "ms" => 1e-3,
        "µs" | "us" => 1e-6,
        "ns" => 1e-9,
        "min" | "mins" | "minute" | "minutes" => 60.0,
        "h" | "hr" | "hrs" | "hour" | "hours" => 3600.0,
        "d" | "day" | "days" => 86_400.0,
        "week" | "weeks" => 7.0 * 86_400.0,
        "y" | "yr" | "year" | "years" => 365.25 * 86_400.0,
        _ => return None,
    };
    let seconds = value * factor;
    (seconds.is_finite() && seconds > 0.0).then_some(seconds)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn durations_in_the_forms_chemists_write() {
        // definitions: 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s.
        assert_eq!(parse_duration_s("2 h"), Some(7200.0));
        assert_eq!(parse_duration_s("30 min"), Some(1800.0));
        assert_eq!(parse_duration_s("45"), Some(45.0));
        assert_eq!(parse_duration_s("1.5 days"), Some(129_600.0));
        assert_eq!(parse_duration_s("250 ms"), Some(0.25));
        for bad in ["", "soon", "-2 h", "0 s", "2 fortnights", "inf"] {
            assert_eq!(parse_duration_s(bad), None, "{bad}");
        }
    }
}
