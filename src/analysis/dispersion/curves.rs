//! Dispersion curves along physical wave directions, sampled on one shared
//! axis of points per wavelength (from 256 down to the grid limit, 2).
//!
//! Points per wavelength count cells along the grid axis where the wave is
//! least resolved: a wavevector θ (phase advance per cell θ_d = k_d h_d) has
//! 2π/max_d |θ_d| of them, so 2 is the grid limit in every direction and an
//! anisotropic grid is not charged for its larger cells. The requirement each
//! mode needs is found from these curves in [`super::resolution`].

use super::frequencies::Frequencies;
use super::node::{NodeSlots, NodeWork};
use super::{decay_ratio, group_ratio, phase_ratio};
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// Points per wavelength of a wavevector in θ-space: 2π/max_d |θ_d| (cells per
/// wavelength along the least-resolved axis).
pub fn points_per_wavelength(theta: &[f64]) -> f64 {
    2.0 * PI / theta.iter().map(|t| t.abs()).fold(0.0, f64::max)
}

/// Physical wave directions for the curves: ±x in 1-D, `count` angles in 2-D
/// (rounded up to a multiple of 8: axes and diagonals among them), `count`
/// points of a Fibonacci set in 3-D.
pub fn curve_directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    crate::numeric::directions::unit_vectors(dims, count.max(1))
}

/// Finest points per wavelength of the curves.
const PPW_FINE: f64 = 256.0;
/// Coarsest: the grid limit.
const PPW_COARSE: f64 = 2.0;
/// Samples per curve.
const CURVE_SAMPLES: usize = 48;

/// The points per wavelength of the curve samples, the same along every
/// direction: geometric from 256 to 2.
pub fn curve_ppw() -> Vec<f64> {
    (0..CURVE_SAMPLES)
        .map(|j| PPW_FINE * (PPW_COARSE / PPW_FINE).powf(j as f64 / (CURVE_SAMPLES - 1) as f64))
        .collect()
}

/// The length of one cell along the physical direction n, max_d |n_d| h_d: a
/// wave of wavenumber κ along n has 2π/(κ·this) points per wavelength.
pub fn cell_along(n: &[f64], spacing: &[f64]) -> f64 {
    n.iter()
        .zip(spacing)
        .map(|(a, h)| a.abs() * h)
        .fold(0.0, f64::max)
}

/// θ of the wave with `ppw` points per wavelength along the physical direction n.
pub fn theta_at(n: &[f64], spacing: &[f64], ppw: f64) -> Vec<f64> {
    let kappa = 2.0 * PI / (ppw * cell_along(n, spacing));
    n.iter().zip(spacing).map(|(a, h)| a * kappa * h).collect()
}

/// Dispersion and dissipation curves along one physical direction n, per
/// sample and mode (each sample computed like a node of the maps, by
/// [`NodeWork`]).
pub fn curve(f: &Frequencies, n: &[f64], dt: f64) -> Curve {
    let spacing = &f.problem().spacing;
    let ppw = curve_ppw();
    let mut c = Curve {
        ppw: ppw.clone(),
        ..Curve::default()
    };
    let (m, d) = (f.problem().system.size(), n.len());
    let mut work = NodeWork::new(m, d);
    let zero = C64::new(0.0, 0.0);
    let (mut num, mut exact) = (vec![zero; m], vec![zero; m]);
    let mut disc = vec![zero; m];
    let (mut gn, mut ge, mut gd) = (vec![0.0; m * d], vec![0.0; m * d], vec![0.0; m * d]);
    for p in &ppw {
        let theta = theta_at(n, spacing, *p);
        work.evaluate(
            f,
            &theta,
            dt,
            NodeSlots {
                numerical: &mut num,
                exact: &mut exact,
                discrete: &mut disc,
                group: &mut gn,
                group_exact: &mut ge,
                group_discrete: &mut gd,
            },
        );
        let scale = frequency_scale(&exact);
        let ratios = |w: &[C64], ratio: fn(_, _, f64) -> f64| -> Vec<f64> {
            w.iter()
                .zip(&exact)
                .map(|(a, b)| ratio(*a, *b, scale))
                .collect()
        };
        c.phase.push(ratios(&num, phase_ratio));
        c.phase_discrete.push(ratios(&disc, phase_ratio));
        c.decay.push(ratios(&num, decay_ratio));
        c.decay_discrete.push(ratios(&disc, decay_ratio));
        c.group.push(
            gn.chunks(d)
                .zip(ge.chunks(d))
                .map(|(a, b)| group_ratio(a, b).0)
                .collect(),
        );
    }
    c
}

/// The largest |ω| of the exact modes (the scale below which a mode counts as
/// not moving).
pub fn frequency_scale(exact: &[C64]) -> f64 {
    exact
        .iter()
        .map(|w| w.norm())
        .fold(0.0, f64::max)
        .max(1e-300)
}

/// Curves along one direction, each `[sample][mode]`.
#[derive(Debug, Clone, Default)]
pub struct Curve {
    /// Points per wavelength of the samples.
    pub ppw: Vec<f64>,
    /// Semi-discrete phase-speed ratio.
    pub phase: Vec<Vec<f64>>,
    /// Fully discrete phase-speed ratio.
    pub phase_discrete: Vec<Vec<f64>>,
    /// Semi-discrete group-speed ratio.
    pub group: Vec<Vec<f64>>,
    /// Semi-discrete decay-rate ratio.
    pub decay: Vec<Vec<f64>>,
    /// Fully discrete decay-rate ratio.
    pub decay_discrete: Vec<Vec<f64>>,
}
