//! Dispersion curves along physical wave directions, and the resolution each
//! mode needs: the points per wavelength above which its phase error stays
//! within a tolerance in every direction.

use super::frequencies::Frequencies;
use super::{group_ratio, phase_ratio};
use std::f64::consts::PI;

/// Points per wavelength of a wavevector: 2π/(|k| h_min).
pub fn points_per_wavelength(theta: &[f64], spacing: &[f64]) -> f64 {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let k = theta
        .iter()
        .zip(spacing)
        .map(|(t, hd)| (t / hd).powi(2))
        .sum::<f64>()
        .sqrt();
    2.0 * PI / (k * h)
}

/// Physical wave directions for the curves: ±x in 1-D, 36 angles in 2-D, a
/// Fibonacci set in 3-D.
pub fn curve_directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    use crate::numeric::directions::unit_vectors;
    match dims {
        3 => unit_vectors(3, count.clamp(12, 60)),
        d => unit_vectors(d, 36),
    }
}

/// Finest points-per-wavelength of the curves.
const PPW_FINE: f64 = 256.0;
const CURVE_SAMPLES: usize = 48;

/// The wavenumbers |k| of the curve samples along the physical direction n:
/// geometric from 256 points per wavelength (of h_min) to the grid limit of
/// that direction, where some |θ_d| reaches π.
pub fn curve_wavenumbers(n: &[f64], spacing: &[f64]) -> Vec<f64> {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let kmax = PI
        / n.iter()
            .zip(spacing)
            .map(|(a, hd)| a.abs() * hd)
            .fold(0.0, f64::max);
    let kmin = 2.0 * PI / (PPW_FINE * h);
    (0..CURVE_SAMPLES)
        .map(|j| kmin * (kmax / kmin).powf(j as f64 / (CURVE_SAMPLES - 1) as f64))
        .collect()
}

/// Points per wavelength 2π/(|k| h_min) of the curve samples along the
/// physical direction n (the `ppw` of [`DispersionResult`] is that of the
/// first direction; the grid limit differs between directions).
pub fn curve_ppw(n: &[f64], spacing: &[f64]) -> Vec<f64> {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    curve_wavenumbers(n, spacing)
        .iter()
        .map(|kappa| 2.0 * PI / (kappa * h))
        .collect()
}

/// Dispersion curves along one physical direction n: (ppw, semi phase ratio,
/// discrete phase ratio, group ratio) per sample and mode.
pub fn curve(f: &Frequencies, n: &[f64], dt: f64) -> Curve {
    let spacing = &f.problem().spacing;
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let mut ppw = Vec::new();
    let (mut ps, mut pd, mut gr) = (Vec::new(), Vec::new(), Vec::new());
    for kappa in curve_wavenumbers(n, spacing) {
        let theta: Vec<f64> = n
            .iter()
            .zip(spacing)
            .map(|(a, hd)| a * kappa * hd)
            .collect();
        let (num, exact) = f.matched(&theta);
        let scale = exact
            .iter()
            .map(|w| w.norm())
            .fold(0.0, f64::max)
            .max(1e-300);
        let disc = f.discrete(&theta, &num, dt);
        let (gn, ge) = f.group_velocities(&theta, &num, &exact);
        ppw.push(2.0 * PI / (kappa * h));
        ps.push(
            num.iter()
                .zip(&exact)
                .map(|(a, b)| phase_ratio(*a, *b, scale))
                .collect(),
        );
        pd.push(
            disc.iter()
                .zip(&exact)
                .map(|(a, b)| phase_ratio(*a, *b, scale))
                .collect(),
        );
        gr.push(
            gn.iter()
                .zip(&ge)
                .map(|(a, b)| group_ratio(a, b).0)
                .collect(),
        );
    }
    (ppw, ps, pd, gr)
}

/// Points per wavelength needed for |ratio − 1| ≤ tol at every finer sample
/// (interpolated in log ppw); None when the mode does not propagate.
pub fn required_ppw(ppw: &[f64], ratio: &[f64], tol: f64) -> Option<f64> {
    if ratio.iter().all(|r| r.is_nan()) {
        return None;
    }
    let err = |r: f64| if r.is_nan() { 0.0 } else { (r - 1.0).abs() };
    for j in 0..ppw.len() {
        if err(ratio[j]) > tol {
            if j == 0 {
                return Some(ppw[0]);
            }
            let (e0, e1) = (err(ratio[j - 1]), err(ratio[j]));
            let t = ((tol - e0) / (e1 - e0)).clamp(0.0, 1.0);
            return Some((ppw[j - 1].ln() + t * (ppw[j].ln() - ppw[j - 1].ln())).exp());
        }
    }
    Some(*ppw.last().unwrap_or(&2.0))
}

/// Curves along one direction: (ppw, semi phase ratio, discrete phase ratio, group ratio).
pub type Curve = (Vec<f64>, Vec<Vec<f64>>, Vec<Vec<f64>>, Vec<Vec<f64>>);

/// Per mode: points per wavelength needed in the worst direction, semi-discrete
/// and fully discrete, and the index of that direction.
pub fn worst_resolution(
    curves: &[Curve],
    m: usize,
    tol: f64,
) -> Vec<(Option<f64>, Option<f64>, usize)> {
    (0..m)
        .map(|j| {
            let mut worst = (None::<f64>, None::<f64>, 0usize);
            for (k, (ppw, ps, pd, _)) in curves.iter().enumerate() {
                let semi: Vec<f64> = ps.iter().map(|row| row[j]).collect();
                let disc: Vec<f64> = pd.iter().map(|row| row[j]).collect();
                let a = required_ppw(ppw, &semi, tol);
                let b = required_ppw(ppw, &disc, tol);
                if a.unwrap_or(0.0) > worst.0.unwrap_or(0.0) {
                    worst.0 = a;
                    worst.2 = k;
                }
                if b.unwrap_or(0.0) > worst.1.unwrap_or(0.0) {
                    worst.1 = b;
                }
            }
            worst
        })
        .collect()
}
