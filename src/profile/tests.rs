//! Unit tests of the profile stage.
