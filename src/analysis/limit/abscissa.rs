//! Instability of the spatial operator itself: a wavevector where some
//! eigenvalue of L(θ) has a positive real part makes every consistent time
//! method unstable at every small Δt (G = I + ΔtL + O(Δt²), so ρ(G) ≈ 1 + Δt·Re μ).
//!
//! Such a region can be narrower than a grid cell (a random biased compact
//! stencil whose real part turns positive on a short interval of θ that diffusion
//! does not cover). The spectral abscissa α(θ) = max Re eig L(θ) is evaluated on
//! the grid and maximised in continuous θ from the best separated nodes by a
//! compass search; a trusted positive maximum ([`crate::operator::Spectrum`]) is
//! the witness of a scheme that no Δt makes stable.

use crate::numeric::minimise::{compass_min, golden_max};
use crate::operator::{Operator, Spectrum};
use crate::sample::{ray_length, Grid};
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// How many separated grid nodes are refined.
const REFINED: usize = 8;
/// Points per axis of the grid that seeds the search.
const COARSE: usize = 33;

/// The spectral abscissa at θ when it can be trusted, −∞ otherwise. L is
/// 2π-periodic in each θ_d, and θ is wrapped into [−π, π] first: a search
/// stepping past π would otherwise read L near θ_d = 2π from sums whose
/// rounding is that of θ_d = 2π, not of the long wave it is (a compass search
/// from θ_y = π reached θ_y = 2π − 2.2e-4, where rounding read as a trusted
/// Re μ > 0, and reported none for a stable scheme, seed 10758).
fn abscissa(spectrum: &mut Spectrum, eig: &mut [C64], theta: &[f64]) -> f64 {
    let theta: Vec<f64> = theta.iter().map(|x| super::wrap(*x)).collect();
    match spectrum.at(&theta, eig) {
        Ok(true) => eig.iter().map(|z| z.re).fold(f64::NEG_INFINITY, f64::max),
        _ => f64::NEG_INFINITY,
    }
}

/// A wavevector where L(θ) has an eigenvalue with a positive real part (beyond
/// rounding), searched on the grid and refined from its best nodes; None when
/// the largest real part found is not positive.
pub fn unstable_wavevector(op: &Operator, tolerance: f64, grid: &Grid) -> Option<Vec<f64>> {
    // Every node of the scan grid is already checked by the first-loss screen
    // (a node with Re μ > 0 has first loss 0); this search is for regions
    // narrower than a cell, so a grid of at most COARSE points per axis seeds it.
    let coarse = Grid::new(
        &grid
            .points
            .iter()
            .map(|&n| if n > COARSE { COARSE | 1 } else { n })
            .collect::<Vec<_>>(),
    );
    let grid = &coarse;
    let dims = grid.points.len();
    let scored: Vec<(f64, usize)> = (0..grid.len())
        .into_par_iter()
        .map_init(
            || {
                (
                    Spectrum::new(op, tolerance),
                    vec![C64::new(0.0, 0.0); op.m],
                    vec![0usize; dims],
                )
            },
            |(s, eig, idx), i| {
                grid.unravel(i, idx);
                (abscissa(s, eig, &grid.theta(idx)), i)
            },
        )
        .collect();
    let mut idx = vec![0usize; dims];
    if let Some((_, i)) = scored
        .iter()
        .filter(|(a, _)| *a > 0.0)
        .max_by(|a, b| a.0.total_cmp(&b.0))
    {
        grid.unravel(*i, &mut idx);
        return Some(grid.theta(&idx));
    }
    let mut order: Vec<(f64, usize)> = scored.into_iter().filter(|(a, _)| a.is_finite()).collect();
    order.sort_by(|a, b| b.0.total_cmp(&a.0));
    let far = 3.0 * (0..dims).map(|d| grid.step(d)).fold(0.0, f64::max);
    let step = (0..dims)
        .map(|d| grid.step(d))
        .fold(f64::INFINITY, f64::min);
    let mut starts: Vec<Vec<f64>> = Vec::new();
    for (_, i) in order {
        grid.unravel(i, &mut idx);
        let p = grid.theta(&idx);
        if starts
            .iter()
            .all(|c| c.iter().zip(&p).any(|(a, b)| (a - b).abs() > far))
        {
            starts.push(p);
            if starts.len() == REFINED {
                break;
            }
        }
    }
    starts.into_par_iter().find_map_any(|x0| {
        let mut s = Spectrum::new(op, tolerance);
        let mut eig = vec![C64::new(0.0, 0.0); op.m];
        let cell = std::cell::RefCell::new((&mut s, &mut eig));
        let minus = |x: &[f64]| {
            let mut c = cell.borrow_mut();
            let (s, eig) = &mut *c;
            -abscissa(s, eig, x)
        };
        let (x, v) = compass_min(&minus, &x0, 0.5 * step, 1e-9, 400);
        (-v > 0.0).then_some(x)
    })
}

/// A wavevector on the ray θ = s n (0 ≤ s to the box boundary) where L(θ) has
/// an eigenvalue with a positive real part beyond rounding, among `samples`
/// uniform samples (s = 0 included) and geometric ones inside the first; None
/// when none is found. A direction whose
/// ray meets such a wavevector has no stable Δt, however small the rounding
/// tolerance lets the first exit look. The samples are not refined: between
/// them, and close to s = 0 where L is nearly zero and a degenerate cluster
/// (Maxwell's static pair) spreads by rounding, the ray's own first-loss search
/// decides.
pub fn unstable_on_ray(
    op: &Operator,
    tolerance: f64,
    n: &[f64],
    samples: usize,
) -> Option<Vec<f64>> {
    if op.neutral_everywhere() {
        return None;
    }
    let smax = ray_length(n);
    let at = |s: f64| -> Vec<f64> { n.iter().map(|x| x * s).collect() };
    let work =
        std::cell::RefCell::new((Spectrum::new(op, tolerance), vec![C64::new(0.0, 0.0); op.m]));
    let alpha = |s: f64| {
        let mut w = work.borrow_mut();
        let (spectrum, eig) = &mut *w;
        abscissa(spectrum, eig, &at(s))
    };
    let s_of = |k: usize| smax * k as f64 / samples as f64;
    let uniform: Vec<f64> = (0..=samples).map(|k| alpha(s_of(k))).collect();
    if let Some(k) = uniform.iter().position(|a| *a > 0.0) {
        return Some(at(s_of(k)));
    }
    // Between samples: the abscissa maximised around its largest local maxima
    // (an unstable window narrower than the sample spacing near the end of
    // the ray, seed 9537).
    let mut peaks: Vec<usize> = (1..samples)
        .filter(|&k| {
            uniform[k].is_finite() && uniform[k] >= uniform[k - 1] && uniform[k] >= uniform[k + 1]
        })
        .collect();
    if samples >= 1 && uniform[samples].is_finite() && uniform[samples] >= uniform[samples - 1] {
        peaks.push(samples);
    }
    peaks.sort_by(|a, b| uniform[*b].total_cmp(&uniform[*a]));
    for &k in peaks.iter().take(RAY_PEAKS) {
        let (lo, hi) = (s_of(k - 1), s_of((k + 1).min(samples)));
        let (s, v) = golden_max(&alpha, lo, hi);
        if v > 0.0 {
            return Some(at(s));
        }
    }
    // Inside the first sample: a weak source whose real part wins only at
    // long waves (a rotation against the non-normal flux, seed 5084: Re μ > 0
    // near s = 0.003). Geometric samples s₁ 2⁻ʲ towards 0, then the abscissa
    // maximised between the neighbours of the best of them.
    let first = smax / samples as f64;
    let levels: Vec<f64> = (0..LONG_WAVE_LEVELS)
        .map(|j| first * 0.5f64.powi(j as i32))
        .collect();
    let values: Vec<f64> = levels.iter().map(|s| alpha(*s)).collect();
    let (j, best) =
        values.iter().enumerate().fold(
            (0, f64::NEG_INFINITY),
            |b, (j, v)| if *v > b.1 { (j, *v) } else { b },
        );
    if best > 0.0 {
        return Some(at(levels[j]));
    }
    if !best.is_finite() {
        return None;
    }
    let hi = levels[j.saturating_sub(1)];
    let lo = levels[(j + 1).min(LONG_WAVE_LEVELS - 1)];
    let (s, v) = golden_max(&alpha, lo, hi);
    (v > 0.0).then(|| at(s))
}

/// How many local maxima of the abscissa along a ray are refined.
const RAY_PEAKS: usize = 2;
/// Halvings of the first ray sample checked towards s = 0 (down to 6e-8 of it).
const LONG_WAVE_LEVELS: usize = 24;
