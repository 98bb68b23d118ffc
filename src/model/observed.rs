//! What was measured, as stated in the profile's `[[observed]]` tables,
//! resolved to the model's points, paths and cycles.

use super::PointId;
use crate::units::Temperature;
use std::ops::Range;

/// The kind of a measurement; the names are the profile's `kind` values.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ObservedKind {
    /// A product ratio (or dr), first over second.
    Ratio,
    /// An ee or de in percent, first product major when positive.
    Ee,
    /// A first-order rate constant, s⁻¹.
    Rate,
    /// A first-order half-life, s.
    HalfLife,
    /// A turnover frequency, s⁻¹.
    Tof,
    /// A kinetic isotope effect k(profile)/k(variant) of a path or step.
    Kie,
}

impl ObservedKind {
    /// The profile's spelling.
    pub fn name(self) -> &'static str {
        match self {
            ObservedKind::Ratio => "ratio",
            ObservedKind::Ee => "ee",
            ObservedKind::Rate => "rate",
            ObservedKind::HalfLife => "half-life",
            ObservedKind::Tof => "tof",
            ObservedKind::Kie => "kie",
        }
    }
}

/// What a measurement is about.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Target {
    /// Two products, first over second (ratio, ee).
    Products(PointId, PointId),
    /// The apparent rate of a path (index into the model's paths).
    Path(usize),
    /// The forward rate of the step through a TS, in the direction first written.
    Ts(PointId),
    /// The turnover of a `cycle = true` path.
    Cycle(usize),
}

/// One measurement to compare with the prediction.
#[derive(Debug, Clone, PartialEq)]
pub struct Observation {
    /// An optional name for reports (`name = …`).
    pub name: Option<String>,
    /// What was measured.
    pub kind: ObservedKind,
    /// What it is about.
    pub target: Target,
    /// The value: ratio (first:second), ee %, k in s⁻¹, t½ in s, or TOF in s⁻¹.
    pub value: f64,
    /// Experimental uncertainty of `value`, in the same unit, if stated.
    pub uncertainty: Option<f64>,
    /// Allowed error of the deciding energy, in the model's unit.
    pub tolerance: f64,
    /// For a KIE: the variant (index into the model's variants) whose rate divides.
    pub variant: Option<usize>,
    /// Temperature of the measurement (the profile's when `None`).
    pub temperature: Option<Temperature>,
    /// Where the `[[observed]]` table is written, for messages.
    pub span: Range<usize>,
}
