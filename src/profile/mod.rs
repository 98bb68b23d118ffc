//! Reads profile text (TOML) into a validated [`crate::model::Model`].
