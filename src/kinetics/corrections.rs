//! Corrections to a rate constant or barrier that a chemist applies by hand:
//! tunnelling through the barrier top (Wigner; Bell's truncated parabolic
//! form), the 1 atm → 1 mol/L standard-state change, and the pseudo-first-order
//! shift of a step that consumes a co-reactant at a given concentration.

use crate::units::{
    ATMOSPHERE, BAR, BOLTZMANN, EnergyUnit, GAS_CONSTANT, PLANCK, SPEED_OF_LIGHT, Temperature,
};
use std::f64::consts::PI;

/// u = h·c·ν̃/(kB·T) for an imaginary frequency ν̃ (the magnitude, in cm⁻¹).
pub fn tunnelling_u(wavenumber_cm: f64, t: Temperature) -> f64 {
    PLANCK * SPEED_OF_LIGHT * wavenumber_cm.abs() * 100.0 / (BOLTZMANN * t.k())
}

/// Wigner's transmission coefficient κ = 1 + u²/24 (Wigner, Z. Phys. Chem. B
/// 1932, 19, 203): the leading quantum correction at the barrier top.
pub fn wigner(wavenumber_cm: f64, t: Temperature) -> f64 {
    let u = tunnelling_u(wavenumber_cm, t);
    1.0 + u * u / 24.0
}

/// Bell's correction is refused beyond its limit of validity.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[error(
    "Bell's tunnelling correction holds only below {limit_cm:.0} cm⁻¹ at {temperature_k} K \
     (u = {u:.2} ≥ 2π); use the Wigner correction or a full tunnelling model"
)]
pub struct BellOutOfRange {
    /// u = hcν̃/kBT of the request.
    pub u: f64,
    /// The largest valid wavenumber at this temperature, cm⁻¹.
    pub limit_cm: f64,
    /// The temperature, K.
    pub temperature_k: f64,
}

/// Bell's truncated parabolic-barrier correction κ = (u/2)/sin(u/2) (Bell, Trans.
/// Faraday Soc. 1959, 55, 1; The Tunnel Effect in Chemistry, 1980), valid for
/// u < 2π only: it has a pole there and rises steeply well before it.
pub fn bell(wavenumber_cm: f64, t: Temperature) -> Result<f64, BellOutOfRange> {
    let u = tunnelling_u(wavenumber_cm, t);
    if u >= 2.0 * PI {
        return Err(BellOutOfRange {
            u,
            limit_cm: bell_limit_cm(t),
            temperature_k: t.k(),
        });
    }
    let half = u / 2.0;
    Ok(if half == 0.0 { 1.0 } else { half / half.sin() })
}

/// The largest imaginary wavenumber (cm⁻¹) for which Bell's form is valid at `t`:
/// 2π·kB·T/(h·c).
pub fn bell_limit_cm(t: Temperature) -> f64 {
    2.0 * PI * BOLTZMANN * t.k() / (PLANCK * SPEED_OF_LIGHT * 100.0)
}

/// The standard state that computed free energies refer to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PressureStandard {
    /// 1 atm = 101 325 Pa, the default of most quantum-chemistry programs.
    Atmosphere,
    /// 1 bar = 10⁵ Pa.
    Bar,
}

/// G(1 mol/L) − G(p°) per species, in `unit`: RT·ln(c°·RT/p°) with c° = 1 mol/L.
/// A step changes by Δn times this, Δn being the change in the number of species
/// (−1 for a bimolecular association, 0 for a unimolecular step).
pub fn standard_state_shift(p: PressureStandard, t: Temperature, unit: EnergyUnit) -> f64 {
    let pressure = match p {
        PressureStandard::Atmosphere => ATMOSPHERE,
        PressureStandard::Bar => BAR,
    };
    // RT/p° in m³/mol; × 1000 L/m³ × c° (1 mol/L) is dimensionless.
    let ratio = GAS_CONSTANT * t.k() / pressure * 1000.0;
    t.rt(unit) * ratio.ln()
}

/// Change of the effective barrier of a step that consumes a co-reactant at
/// `concentration` mol/L, treated as pseudo-first-order: −RT·ln(c/c°), c° = 1 mol/L.
pub fn pseudo_first_order_shift(concentration: f64, t: Temperature, unit: EnergyUnit) -> f64 {
    -t.rt(unit) * concentration.ln()
}
