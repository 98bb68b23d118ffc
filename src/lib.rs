//! eyrie turns a declarative reaction profile (TOML) into the kinetics that
//! follow from its energies and into a reaction-coordinate diagram annotated
//! with exactly those numbers.
//!
//! The crate is a pipeline of stages, each taking plain data and returning
//! plain data; no stage reads an earlier stage's input:
//!
//! 1. [`profile`] — parse the TOML text, keep byte spans, collect every
//!    problem as a [`diag::Diagnostic`], and build a validated [`model::Model`].
//! 2. [`kinetics`] — pure functions over the model: Eyring rate constants,
//!    half-lives, apparent barriers. Never prints, never writes.
//! 3. [`layout`] — turns the numbers to show into a [`layout::Scene`]
//!    (positioned lines and text in millimetres). It does not compute kinetics.
//! 4. [`render`] — draws a scene as SVG, PNG or PDF. It never sees a profile.
//! 5. [`simulate`] — integrates the mass-action kinetics of the model in time
//!    (stiff BDF), for the regimes between the closed-form limits.
//!
//! [`units`] holds the physical constants and units every stage shares,
//! [`font`] the bundled typeface that layout measures with and render draws
//! with, and
//! `cli` (in the binary) is a thin shell over these functions.

#![forbid(unsafe_code)]
#![warn(missing_docs)]

pub mod charts;
pub mod convert;
pub mod diag;
pub mod export;
pub mod figure;
pub mod font;
pub mod format;
pub mod kinetics;
pub mod layout;
pub mod model;
pub mod profile;
pub mod render;
pub mod report;
pub mod simulate;
pub mod units;
