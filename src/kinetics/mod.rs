//! Pure kinetics over a validated model.
