//! Draws a [`crate::layout::Scene`]; never sees a profile.
