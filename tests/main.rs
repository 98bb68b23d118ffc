//! The integration tests, built as one binary: each file below is a module.
//!
//! One binary instead of one per file links the library and its dependencies
//! once, which keeps a clean `cargo test` within a small CI machine's disk and
//! time (22 separate debug binaries once crashed the linker for lack of space).

mod common;

mod analyze_simulated;
mod bad_inputs;
mod chart;
mod check_cli;
mod cli;
mod corrections_in_profiles;
mod cycle_steady_state;
mod doc_examples;
mod export;
mod layout_lines;
mod layout_profiles;
mod no_panic;
mod plot_cli;
mod rate_control;
mod reference_checks;
mod render_direct;
mod render_outputs;
mod render_overlay;
mod render_svg;
mod simulate_cli;
mod simulate_extremes;
mod simulate_reference;
mod simulate_second_order;
mod uncertainty;
