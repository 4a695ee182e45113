//! The limit along one wave direction: the infimum of the first loss over the
//! ray θ = s n, 0 ≤ s ≤ s_max, to the boundary of the box.
//!
//! The ray is sampled uniformly from s = 0 (so an instability of the source at
//! θ = 0 is seen by every ray), every local minimum of the samples is refined by
//! golden-section search, and the long-wave limit along n ([`super::longwave`])
//! covers s → 0. A direction is reported stable up to a Δt only if every part of
//! its ray is. Where the long-wave samples of a ray stop being trusted after the
//! first (rounding in G at the large Δt that long waves allow, as for the Yee
//! scheme along some directions) the ray's own extrapolation says nothing; its
//! long-wave part is then bounded below by the certified overall limit
//! (`fallback`), which holds at every wavevector, instead of by 0.

use super::longwave;
use super::loss::FirstLoss;
use crate::numeric::minimise::golden_min;
use crate::sample::ray_length;

/// How many local minima of the samples are refined.
const REFINED: usize = 6;

/// (Δt, the wavevector that sets it) along the unit vector `n`, from `samples`
/// uniform samples; `fallback` is the certified overall limit, the floor of a
/// ray whose long-wave extrapolation is uninformative.
pub fn ray_limit(f: &dyn FirstLoss, n: &[f64], samples: usize, fallback: f64) -> (f64, Vec<f64>) {
    let smax = ray_length(n);
    let at = |s: f64| -> Vec<f64> { n.iter().map(|x| x * s).collect() };
    let s_of = |k: usize| smax * k as f64 / samples as f64;
    let values: Vec<f64> = (0..=samples)
        .map(|k| f.at(&at(s_of(k))).bound_or_inf())
        .collect();
    let mut best = (f64::INFINITY, at(0.0));
    for (k, v) in values.iter().enumerate() {
        if *v < best.0 {
            best = (*v, at(s_of(k)));
        }
    }
    let mut minima: Vec<usize> = (1..=samples)
        .filter(|&k| {
            let left = values[k - 1];
            let right = if k < samples {
                values[k + 1]
            } else {
                f64::INFINITY
            };
            values[k].is_finite() && values[k] <= left && values[k] <= right
        })
        .collect();
    minima.sort_by(|a, b| values[*a].total_cmp(&values[*b]));
    for &k in minima.iter().take(REFINED) {
        let g = |s: f64| f.at(&at(s)).bound_or_inf();
        let lo = s_of(k - 1).max(1e-12 * smax);
        let hi = s_of((k + 1).min(samples));
        let (s, v) = golden_min(&g, lo, hi);
        if v < best.0 {
            best = (v, at(s));
        }
    }
    let origin = vec![0.0; n.len()];
    let lw = longwave::along(f, &origin, n);
    approach(f, &mut best, &lw, &origin, fallback);
    // A ray that ends on a corner or face centre of the box (axes, diagonals)
    // approaches it like a long wave: there central differences vanish too,
    // and the limit can be set in the approach (Strang-split Crank–Nicolson,
    // seed 7110: unstable above Δt ≈ 299 only within 1e-3 of θ_x = π).
    let end = at(smax);
    let on_corner = end
        .iter()
        .all(|x| x.abs() < 1e-12 || (x.abs() - std::f64::consts::PI).abs() < 1e-12);
    if on_corner && smax > 0.0 {
        let back: Vec<f64> = n.iter().map(|x| -x).collect();
        let lw = longwave::along_deep(f, &end, &back);
        approach(f, &mut best, &lw, &end, fallback);
    }
    best
}

/// Takes a limit approached at an end of the ray (`origin`, along `lw`'s
/// direction) into `best`: its smallest sample, refined by golden-section
/// search in the distance from the origin between half and twice that of the
/// sample (a dip between two geometric samples), and its lower end when
/// informative (else `fallback`, the certified overall limit).
fn approach(
    f: &dyn FirstLoss,
    best: &mut (f64, Vec<f64>),
    lw: &longwave::LongWave,
    origin: &[f64],
    fallback: f64,
) {
    let point = |t: f64| -> Vec<f64> {
        origin
            .iter()
            .zip(&lw.direction)
            .map(|(o, x)| o + x * t)
            .collect()
    };
    // a value lower only by rounding does not move the witness (the first loss
    // is flat where the ray meets the box's boundary: the exact θ_d = π stays)
    let lower = |v: f64, than: f64| v < than * (1.0 - 1e-12);
    if lower(lw.sample.0, best.0) {
        *best = lw.sample.clone();
    }
    let t = lw
        .sample
        .1
        .iter()
        .zip(origin)
        .map(|(a, b)| (a - b).powi(2))
        .sum::<f64>()
        .sqrt();
    if lw.sample.0.is_finite() && t > 0.0 {
        let g = |t: f64| f.at(&point(t)).bound_or_inf();
        let (t, v) = golden_min(&g, 0.5 * t, 2.0 * t);
        if lower(v, best.0) {
            *best = (v, point(t));
        }
    }
    let near = point(longwave::S0 * 1e-6);
    let floor = if longwave::informative(lw) {
        (lw.limit - lw.uncertainty).max(0.0)
    } else {
        fallback.max(0.0)
    };
    if floor < best.0 {
        *best = (floor, near);
    }
}
