//! The ground floor: small numerical tools every layer above may use, and that
//! use nothing of kgain's — the optimal assignment ([`assignment`]),
//! one-dimensional minimisation and a compass search ([`minimise`]), bracketing of a change of state by bisection ([`bracket`]),
//! and the sets of wave directions on the circle and the sphere ([`directions`]).
//!
//! They are written here once rather than taken from an optimisation crate
//! because kgain needs what such crates do not return: the two ends of a
//! bracket (a certified stable and unstable Δt), a predicate rather than a
//! smooth objective, and allocation-free calls inside parallel sweeps.

pub mod assignment;
pub mod bracket;
pub mod directions;
pub mod minimise;
