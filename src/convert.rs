//! `eyrie convert`: the conversions chemists do by hand all day — a product
//! ratio, an ee/de or a ΔΔG‡ into the other two at a given temperature.

use crate::kinetics::selectivity;
use crate::units::{EnergyUnit, Temperature};
use serde::Serialize;

/// A selectivity as the user wrote it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Given {
    /// A ratio major:minor, normalised so that it is ≥ 1.
    Ratio(f64),
    /// An ee or de in percent, 0 ≤ ee < 100.
    Excess(f64),
    /// A free-energy difference, ≥ 0, in the given unit.
    Energy(f64, EnergyUnit),
}

/// Why a VALUE could not be read.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum GivenError {
    /// Not one of the accepted forms.
    #[error(
        "cannot read '{0}' (write a ratio such as 95:5 or 4, an excess such as 90%ee or 80%de, or an energy such as 1.8 kcal/mol or 7 kJ/mol)"
    )]
    Unreadable(String),
    /// A form that is read but has no finite answer.
    #[error("'{text}': {why}")]
    OutOfRange {
        /// The value as written.
        text: String,
        /// What is wrong with it.
        why: &'static str,
    },
}

impl Given {
    /// Reads "95:5", "4", "90%ee", "90 % de", "1.8 kcal/mol", "7 kJ/mol", "0.05 eV".
    pub fn parse(text: &str) -> Result<Given, GivenError> {
        let t = text.trim();
        let unreadable = || GivenError::Unreadable(text.to_string());
        let out_of_range = |why| GivenError::OutOfRange {
            text: text.to_string(),
            why,
        };
        let number = |s: &str| -> Result<f64, GivenError> {
            s.trim()
                .parse::<f64>()
                .ok()
                .filter(|v| v.is_finite())
                .ok_or_else(unreadable)
        };
        let lower = t.to_ascii_lowercase();
        if let Some(rest) = lower
            .strip_suffix("ee")
            .or_else(|| lower.strip_suffix("de"))
            .or_else(|| lower.strip_suffix("dr"))
            .filter(|r| r.trim_end().ends_with('%'))
        {
            let ee = number(rest.trim_end().trim_end_matches('%'))?.abs();
            if ee >= 100.0 {
                return Err(out_of_range(
                    "an excess of 100 % or more has no finite ratio",
                ));
            }
            return Ok(Given::Excess(ee));
        }
        if let Some((a, b)) = t.split_once(':') {
            let (a, b) = (number(a)?, number(b)?);
            if a <= 0.0 || b <= 0.0 {
                return Err(out_of_range("both parts of a ratio must be positive"));
            }
            return Ok(Given::Ratio(a.max(b) / a.min(b)));
        }
        if let Ok(r) = number(t) {
            if r <= 0.0 {
                return Err(out_of_range("a ratio must be positive"));
            }
            return Ok(Given::Ratio(if r >= 1.0 { r } else { 1.0 / r }));
        }
        let split = t.find(|c: char| c.is_alphabetic()).ok_or_else(unreadable)?;
        let unit = EnergyUnit::parse(&t[split..]).ok_or_else(unreadable)?;
        Ok(Given::Energy(number(&t[..split])?.abs(), unit))
    }
}

/// The three equivalent forms of one selectivity at one temperature; the
/// `--json` object of `eyrie convert`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Conversion {
    /// Major over minor, e.g. 19 for 95:5.
    pub ratio: f64,
    /// ee (or de) in percent.
    pub ee_percent: f64,
    /// ΔΔG‡ in kcal/mol.
    pub ddg_kcal_mol: f64,
    /// ΔΔG‡ in kJ/mol.
    pub ddg_kj_mol: f64,
    /// Temperature of the conversion, K.
    pub temperature_k: f64,
}

impl Conversion {
    /// Converts `given` at `t`.
    pub fn new(given: Given, t: Temperature) -> Conversion {
        let kcal = EnergyUnit::KcalPerMol;
        let ddg_kcal = match given {
            Given::Ratio(r) => selectivity::ddg_from_ratio(r, kcal, t),
            Given::Excess(ee) => {
                selectivity::ddg_from_ratio(selectivity::ratio_from_ee(ee), kcal, t)
            }
            Given::Energy(v, unit) => unit.convert(v, kcal),
        };
        let (ratio, ee_percent) = match given {
            Given::Ratio(r) => (r, selectivity::ee_from_ratio(r)),
            Given::Excess(ee) => (selectivity::ratio_from_ee(ee), ee),
            Given::Energy(..) => (
                selectivity::ratio_from_ddg(ddg_kcal, kcal, t),
                selectivity::ee_from_ddg(ddg_kcal, kcal, t),
            ),
        };
        Conversion {
            ratio,
            ee_percent,
            ddg_kcal_mol: ddg_kcal,
            ddg_kj_mol: kcal.convert(ddg_kcal, EnergyUnit::KjPerMol),
            temperature_k: t.k(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_the_forms_chemists_write() {
        assert_eq!(Given::parse("95:5"), Ok(Given::Ratio(19.0)));
        assert_eq!(Given::parse("5:95"), Ok(Given::Ratio(19.0)));
        assert_eq!(Given::parse("4"), Ok(Given::Ratio(4.0)));
        assert_eq!(Given::parse("90%ee"), Ok(Given::Excess(90.0)));
        assert_eq!(Given::parse("80 % de"), Ok(Given::Excess(80.0)));
        assert_eq!(
            Given::parse("1.8 kcal/mol"),
            Ok(Given::Energy(1.8, EnergyUnit::KcalPerMol))
        );
        assert_eq!(
            Given::parse("7 kJ/mol"),
            Ok(Given::Energy(7.0, EnergyUnit::KjPerMol))
        );
        for bad in [
            "",
            "abc",
            "100%ee",
            "0:5",
            "-3",
            "1.8 furlongs",
            "nan",
            "1:inf",
        ] {
            assert!(Given::parse(bad).is_err(), "{bad}");
        }
    }
}
