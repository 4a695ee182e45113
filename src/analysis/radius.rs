//! The spectral-radius map at the problem's Δt: its parameters, its result (the
//! map, its maximum and where, and the verdict against the tolerance). The map
//! itself comes from the main sweep (`super::sweep`).

use crate::sample::Grid;

/// The radius map at the problem's Δt (its verdict uses [`Plan::tolerance`](super::Plan::tolerance)).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct RadiusParams;

/// The spectral-radius map and its maximum.
#[derive(Debug, Clone)]
pub struct RadiusResult {
    /// ρ(G) per grid node, C order.
    pub map: Vec<f64>,
    /// Largest value (NaN nodes ignored).
    pub max: f64,
    /// Where it is attained.
    pub wavevector: Vec<f64>,
    /// max ≤ 1 + tolerance.
    pub stable: bool,
}

/// The radius map with its maximum (NaN nodes ignored), where it is, and the verdict.
pub(super) fn result(map: Vec<f64>, grid: &Grid, tol: f64) -> RadiusResult {
    let (imax, max) = map.iter().enumerate().filter(|(_, v)| !v.is_nan()).fold(
        (0, f64::NEG_INFINITY),
        |b, (i, v)| if *v > b.1 { (i, *v) } else { b },
    );
    let mut idx = vec![0usize; grid.points.len()];
    grid.unravel(imax, &mut idx);
    RadiusResult {
        max,
        wavevector: grid.theta(&idx),
        stable: max <= 1.0 + tol,
        map,
    }
}
