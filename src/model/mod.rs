//! The validated reaction network: stationary points, the steps between
//! them and the named paths.
//!
//! A [`Model`] is only built by [`crate::profile`] after every check has
//! passed, so later stages (kinetics, layout) never re-check it: ids are
//! unique, every path alternates minima and transition states correctly,
//! energies are finite and already shifted so the `zero` state is 0.

mod hints;
mod observed;

pub use hints::{Dash, FigureHints, PathStyle};
pub use observed::{Observation, ObservedKind, Target};

use crate::units::{EnergyUnit, Temperature};

/// Index of a stationary point in [`Model::points`].
pub type PointId = usize;

/// Minimum or first-order saddle point.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Kind {
    /// A reactant, intermediate or product (from `[states]`).
    Minimum,
    /// A transition state (from `[ts]`).
    TransitionState,
}

/// One stationary point.
#[derive(Debug, Clone, PartialEq)]
pub struct Point {
    /// The id used in the file, e.g. `ts-ion`.
    pub id: String,
    /// Text drawn under the bar; the id when the file gives none.
    pub label: String,
    /// Minimum or TS.
    pub kind: Kind,
    /// Free energy in the model's unit, relative to the `zero` state (as written when
    /// there is no `zero`).
    pub g: f64,
    /// Whether this minimum is a product (always false for a TS).
    pub product: bool,
}

/// An elementary step between two minima, through a TS or barrierless.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Step {
    /// The minimum the step starts from, in the direction it was first written.
    pub from: PointId,
    /// The transition state, or `None` for a barrierless step between adjacent minima.
    pub ts: Option<PointId>,
    /// The minimum the step leads to.
    pub to: PointId,
}

/// A named chain of points, as written in one `[[path]]` table.
#[derive(Debug, Clone, PartialEq)]
pub struct Path {
    /// The path's name (`name = …`), or `path N` (1-based) when the file gives none.
    pub name: String,
    /// The points in order: minimum, (TS,) minimum, …
    pub via: Vec<PointId>,
    /// One turnover of a catalytic cycle (`cycle = true`): the last state is the
    /// regenerated catalyst with the product released.
    pub cycle: bool,
}

/// How a point's free energy follows from the file, before the `zero` shift.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Thermo {
    /// A free energy given directly (`g`), the same at every temperature.
    Fixed(f64),
    /// Enthalpy and entropy (`h`, `s`): G(T) = H − T·S. `s` is in the model's
    /// energy unit per kelvin.
    Enthalpy {
        /// H in the model's unit.
        h: f64,
        /// S in the model's unit per K.
        s: f64,
    },
}

impl Thermo {
    /// G at temperature `t` (K), unshifted.
    pub fn g(self, t: f64) -> f64 {
        match self {
            Thermo::Fixed(g) => g,
            Thermo::Enthalpy { h, s } => h - t * s,
        }
    }
}

/// Which tunnelling correction multiplies the rate through each TS that gives
/// its imaginary frequency (`tunnelling = …`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Tunnelling {
    /// κ = 1 (apart from an explicit `kappa`).
    #[default]
    None,
    /// Wigner, κ = 1 + u²/24.
    Wigner,
    /// Bell's truncated parabolic form, valid for u < 2π (Wigner beyond, with a note).
    Bell,
}

/// What a point's energy needs besides its own value: transition-state
/// parameters and the conditions that shift its free energy.
#[derive(Debug, Clone, PartialEq)]
pub struct PointExtras {
    /// Magnitude of the imaginary frequency, cm⁻¹ (transition states only).
    pub imaginary_frequency: Option<f64>,
    /// Explicit transmission coefficient (default 1).
    pub kappa: f64,
    /// Number of separate molecules the state stands for, for the
    /// standard-state correction (default 1).
    pub species: u32,
    /// Concentrations (mol/L) of the free co-reactants present in this state.
    pub with: Vec<(String, f64)>,
}

impl Default for PointExtras {
    fn default() -> Self {
        PointExtras {
            imaginary_frequency: None,
            kappa: 1.0,
            species: 1,
            with: Vec::new(),
        }
    }
}

/// A validated profile.
#[derive(Debug, Clone, PartialEq)]
pub struct Model {
    pub(crate) title: Option<String>,
    pub(crate) temperature: Temperature,
    pub(crate) unit: EnergyUnit,
    pub(crate) zero: Option<PointId>,
    pub(crate) points: Vec<Point>,
    pub(crate) steps: Vec<Step>,
    pub(crate) paths: Vec<Path>,
    pub(crate) start: Vec<PointId>,
    /// Raw energies per point, so G can follow the temperature; empty means the
    /// points' `g` are fixed as given.
    pub(crate) thermo: Vec<Thermo>,
    /// Per-point extras (same order as `points`; empty means all defaults).
    pub(crate) extras: Vec<PointExtras>,
    /// The tunnelling correction in use.
    pub(crate) tunnelling: Tunnelling,
    /// The pressure standard state the energies were computed at, when they are
    /// to be converted to 1 mol/L.
    pub(crate) standard_state: Option<crate::kinetics::corrections::PressureStandard>,
    /// Measurements stated in the file (`[[observed]]`).
    pub(crate) observations: Vec<Observation>,
    /// Per-point energy uncertainty σ (model unit) and the shared systematic σ of
    /// the transition states, from `[uncertainty]` and `sigma` keys.
    pub(crate) uncertainty: Option<Uncertainty>,
    /// Energy offsets added to every point (model unit): a variant's shifts or a
    /// Monte Carlo sample.
    pub(crate) offsets: Vec<f64>,
    /// Variants of the mechanism (`[[variant]]`).
    pub(crate) variants: Vec<Variant>,
    /// How the file asks its figure to look (path styles, pinned columns).
    pub(crate) figure: FigureHints,
}

/// The same mechanism with some energies changed (`[[variant]]`): an
/// isotopologue, another catalyst, another solvent.
#[derive(Debug, Clone, PartialEq)]
pub struct Variant {
    /// Name used in reports and for `kind = "kie"` observations.
    pub name: String,
    /// Text for figure legends, when it differs from the name.
    pub label: Option<String>,
    /// Energy shift of each changed point, in the model's unit.
    pub shifts: Vec<(PointId, f64)>,
}

/// The stated uncertainty of the energies (`[uncertainty]`).
#[derive(Debug, Clone, PartialEq)]
pub struct Uncertainty {
    /// σ of each point's energy, in the model's unit (same order as the points).
    pub sigma: Vec<f64>,
    /// σ of a shift shared by every transition state (a method's systematic
    /// error on barriers), in the model's unit.
    pub systematic: f64,
    /// Number of Monte Carlo samples.
    pub samples: usize,
    /// Seed of the random stream (same seed, same intervals).
    pub seed: u64,
    /// Central probability of the reported intervals, e.g. 0.95.
    pub level: f64,
}

impl Model {
    /// The title, if the file gives one.
    pub fn title(&self) -> Option<&str> {
        self.title.as_deref()
    }
    /// The temperature of the analysis.
    pub fn temperature(&self) -> Temperature {
        self.temperature
    }
    /// The same model at another temperature (the `--temperature` option).
    pub fn with_temperature(mut self, t: Temperature) -> Model {
        self.temperature = t;
        self.refresh();
        self
    }
    /// The same model with every energy converted to `unit` (the `--unit`
    /// option: e.g. absolute hartree inputs reported in kcal/mol).
    pub fn with_unit(mut self, unit: EnergyUnit) -> Model {
        let from = self.unit;
        for p in &mut self.points {
            p.g = from.convert(p.g, unit);
        }
        for o in &mut self.observations {
            o.tolerance = from.convert(o.tolerance, unit);
        }
        if let Some(u) = &mut self.uncertainty {
            u.sigma.iter_mut().for_each(|x| *x = from.convert(*x, unit));
            u.systematic = from.convert(u.systematic, unit);
        }
        self.offsets
            .iter_mut()
            .for_each(|x| *x = from.convert(*x, unit));
        for t in &mut self.thermo {
            *t = match *t {
                Thermo::Fixed(g) => Thermo::Fixed(from.convert(g, unit)),
                Thermo::Enthalpy { h, s } => Thermo::Enthalpy {
                    h: from.convert(h, unit),
                    s: from.convert(s, unit),
                },
            };
        }
        self.unit = unit;
        self
    }

    /// Whether any energy depends on temperature (given as h and s).
    pub fn temperature_dependent(&self) -> bool {
        self.thermo
            .iter()
            .any(|t| matches!(t, Thermo::Enthalpy { .. }))
    }

    /// The raw energy description of each point (empty when built without one).
    pub fn thermo(&self) -> &[Thermo] {
        &self.thermo
    }

    /// The extras of one point (defaults when the model has none).
    pub fn extras(&self, id: PointId) -> PointExtras {
        self.extras.get(id).cloned().unwrap_or_default()
    }

    /// The same model with the Monte Carlo sample count and seed replaced
    /// (command-line overrides); no effect without a stated uncertainty.
    pub fn with_monte_carlo(mut self, samples: Option<usize>, seed: Option<u64>) -> Model {
        if let Some(u) = &mut self.uncertainty {
            if let Some(n) = samples {
                u.samples = n.max(1);
            }
            if let Some(s) = seed {
                u.seed = s;
            }
        }
        self
    }

    /// The stated uncertainty of the energies, if the file gives one.
    pub fn uncertainty(&self) -> Option<&Uncertainty> {
        self.uncertainty.as_ref()
    }

    /// The same model with `offsets` (model unit, one per point) added to every
    /// energy at every temperature: one Monte Carlo sample.
    pub fn perturbed(&self, offsets: &[f64]) -> Model {
        let mut m = self.clone();
        // Offsets add up: a Monte Carlo sample of a variant keeps the variant's shifts.
        m.offsets.resize(m.points.len(), 0.0);
        for (o, d) in m.offsets.iter_mut().zip(offsets) {
            *o += d;
        }
        if m.thermo.len() == m.points.len() {
            m.refresh();
        } else {
            for (p, d) in m.points.iter_mut().zip(offsets) {
                p.g += d;
            }
        }
        m
    }

    /// The variants stated in the file.
    pub fn variants(&self) -> &[Variant] {
        &self.variants
    }

    /// The model of variant `i`: the same mechanism with its energies shifted.
    /// Variants of a variant are not kept.
    pub fn variant(&self, i: usize) -> Model {
        let mut offsets = vec![0.0; self.points.len()];
        for &(p, d) in &self.variants[i].shifts {
            offsets[p] += d;
        }
        let mut m = self.perturbed(&offsets);
        m.variants.clear();
        m
    }

    /// The figure settings stated in the file.
    pub fn figure_hints(&self) -> &FigureHints {
        &self.figure
    }

    /// The measurements stated in the file.
    pub fn observations(&self) -> &[Observation] {
        &self.observations
    }

    /// The tunnelling correction in use.
    pub fn tunnelling(&self) -> Tunnelling {
        self.tunnelling
    }

    /// The pressure standard state energies are converted from, if any.
    pub fn standard_state(&self) -> Option<crate::kinetics::corrections::PressureStandard> {
        self.standard_state
    }

    /// The free energy of point `i` at the model's temperature, before the `zero`
    /// shift: its own G plus the standard-state and co-reactant terms.
    fn effective(&self, i: PointId) -> f64 {
        use crate::kinetics::corrections::{pseudo_first_order_shift, standard_state_shift};
        let t = self.temperature;
        let mut g = self.thermo[i].g(t.k());
        if let Some(extras) = self.extras.get(i) {
            if let Some(p) = self.standard_state {
                g += f64::from(extras.species) * standard_state_shift(p, t, self.unit);
            }
            // A free co-reactant at c mol/L lowers the state by RT·ln(c/c°) relative
            // to 1 mol/L, i.e. raises every barrier that consumes it by −RT·ln(c/c°).
            for (_, c) in &extras.with {
                g -= pseudo_first_order_shift(*c, t, self.unit);
            }
        }
        g
    }

    /// Recomputes every G at the model's temperature, shifted to `zero`.
    pub(crate) fn refresh(&mut self) {
        if self.thermo.len() != self.points.len() {
            return;
        }
        let shift = |i: usize| self.offsets.get(i).copied().unwrap_or(0.0);
        let offset = self.zero.map_or(0.0, |z| self.effective(z) + shift(z));
        let values: Vec<f64> = (0..self.points.len())
            .map(|i| self.effective(i) + shift(i) - offset)
            .collect();
        for (p, g) in self.points.iter_mut().zip(values) {
            p.g = g;
        }
    }
    /// The unit energies are written and reported in.
    pub fn unit(&self) -> EnergyUnit {
        self.unit
    }
    /// The state drawn and reported at 0, if the file names one.
    pub fn zero(&self) -> Option<PointId> {
        self.zero
    }
    /// All stationary points: states first in file order, then transition states.
    pub fn points(&self) -> &[Point] {
        &self.points
    }
    /// One point.
    pub fn point(&self, id: PointId) -> &Point {
        &self.points[id]
    }
    /// Looks a point up by its file id.
    pub fn find(&self, id: &str) -> Option<PointId> {
        self.points.iter().position(|p| p.id == id)
    }
    /// Elementary steps, deduplicated, in order of first appearance.
    pub fn steps(&self) -> &[Step] {
        &self.steps
    }
    /// The state(s) the material starts in, when the file names them (`start`).
    pub fn start(&self) -> &[PointId] {
        &self.start
    }
    /// Paths in file order.
    pub fn paths(&self) -> &[Path] {
        &self.paths
    }
    /// The products (minima marked or inferred as products), in point order.
    pub fn products(&self) -> impl Iterator<Item = PointId> + '_ {
        self.points
            .iter()
            .enumerate()
            .filter(|(_, p)| p.product)
            .map(|(i, _)| i)
    }
}
