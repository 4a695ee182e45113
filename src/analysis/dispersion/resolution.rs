//! The resolution each mode needs: the points per wavelength above which its
//! phase error (and, for damped modes, its decay-rate error) stays within a
//! tolerance in every direction, and the shortest wavelength (in physical
//! units) it carries that well.
//!
//! Along each physical direction the error |c_num/c_exact − 1| is scanned on the
//! curve samples from long waves towards the grid limit; between the last sample
//! within the tolerance and the first outside it the crossing is found by
//! bisection on the error itself (to 1e-10 in ln κ), and the requirement is the
//! side of the crossing where the error is still within tolerance. The phase
//! error is relative to the wave's own speed, which is ill-conditioned where that
//! speed vanishes (a wave crossing a mean flow almost at right angles): a
//! direction where the mode's exact long-wave phase speed is below
//! [`SLOW_FRACTION`] of its fastest is excluded and counted; likewise for the
//! decay rate, with the long-wave decay rate over |k|² in place of the speed.

use super::curves::{self, Curve};
use super::frequencies::Frequencies;
use super::{decay_ratio, phase_ratio};
use std::f64::consts::PI;

/// A direction where a mode's exact long-wave phase speed is below this share
/// of its fastest (over the curve directions) is excluded from its requirement.
pub const SLOW_FRACTION: f64 = 0.1;
/// Bisection steps on ln κ between two curve samples (their ratio is
/// 128^(1/47) ≈ 1.11, so 30 steps leave 1e-10).
const BISECTIONS: usize = 30;

/// Where the phase error of one mode reaches the tolerance along one direction.
#[derive(Debug, Clone, PartialEq)]
pub struct Crossing {
    /// Index of the direction.
    pub direction: usize,
    /// θ on the well-resolved side of the crossing.
    pub theta: Vec<f64>,
    /// Points per wavelength there, 2π/max_d |θ_d|.
    pub ppw: f64,
    /// Wavelength there (units of the grid spacing).
    pub wavelength: f64,
}

/// One mode's requirement (semi-discrete or fully discrete).
#[derive(Debug, Clone, PartialEq)]
pub struct Requirement {
    /// The direction needing the most points per wavelength.
    pub worst: Crossing,
    /// The shortest wavelength kept within the tolerance in every included
    /// direction (the longest crossing wavelength over directions).
    pub wavelength: f64,
}

impl Requirement {
    /// Points per wavelength needed in the worst direction.
    pub fn ppw(&self) -> f64 {
        self.worst.ppw
    }

    /// Cells per wavelength along each grid axis at the shortest well-resolved
    /// wavelength: λ/h_d.
    pub fn cells_by_axis(&self, spacing: &[f64]) -> Vec<f64> {
        spacing.iter().map(|h| self.wavelength / h).collect()
    }
}

/// The resolution of one mode.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Resolution {
    /// Semi-discrete requirement (None when the mode does not propagate).
    pub semi: Option<Requirement>,
    /// Fully discrete requirement.
    pub discrete: Option<Requirement>,
    /// Directions left out as near-zero speed (indices into the curve directions).
    pub excluded: Vec<usize>,
    /// Semi-discrete decay-rate requirement (None when the mode is not damped).
    pub decay: Option<Requirement>,
    /// Fully discrete decay-rate requirement.
    pub decay_discrete: Option<Requirement>,
    /// Directions left out of the decay requirement as near-zero damping.
    pub decay_excluded: Vec<usize>,
}

impl Resolution {
    /// Semi-discrete points per wavelength.
    pub fn semi_ppw(&self) -> Option<f64> {
        self.semi.as_ref().map(Requirement::ppw)
    }

    /// Fully discrete points per wavelength.
    pub fn discrete_ppw(&self) -> Option<f64> {
        self.discrete.as_ref().map(Requirement::ppw)
    }

    /// Semi-discrete decay-rate points per wavelength.
    pub fn decay_ppw(&self) -> Option<f64> {
        self.decay.as_ref().map(Requirement::ppw)
    }

    /// Fully discrete decay-rate points per wavelength.
    pub fn decay_discrete_ppw(&self) -> Option<f64> {
        self.decay_discrete.as_ref().map(Requirement::ppw)
    }

    /// Index of the semi-discrete worst direction (0 when there is none).
    pub fn worst_direction(&self) -> usize {
        self.semi.as_ref().map_or(0, |r| r.worst.direction)
    }
}

/// Which error a crossing is about.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// Phase speed, Re ω.
    Phase,
    /// Decay rate, Im ω.
    Decay,
}

impl Quantity {
    fn ratio(self) -> fn(num_complex::Complex64, num_complex::Complex64, f64) -> f64 {
        match self {
            Quantity::Phase => phase_ratio,
            Quantity::Decay => decay_ratio,
        }
    }
}

/// The crossings of every mode along one direction: `[mode][variant]` with the
/// variants phase semi-discrete, phase fully discrete, decay semi-discrete,
/// decay fully discrete; None where the mode does not move (is not damped) there.
pub fn crossings(
    f: &Frequencies,
    index: usize,
    n: &[f64],
    curve: &Curve,
    dt: f64,
    tol: f64,
) -> DirectionCrossings {
    let m = curve.phase.first().map_or(0, Vec::len);
    let ppw = &curve.ppw;
    (0..m)
        .map(|j| {
            let column = |rows: &[Vec<f64>]| -> Vec<f64> { rows.iter().map(|r| r[j]).collect() };
            let at = |rows: &[Vec<f64>], dt: Option<f64>, q: Quantity| {
                crossing(f, index, n, ppw, &column(rows), j, dt, q, tol)
            };
            [
                at(&curve.phase, None, Quantity::Phase),
                at(&curve.phase_discrete, Some(dt), Quantity::Phase),
                at(&curve.decay, None, Quantity::Decay),
                at(&curve.decay_discrete, Some(dt), Quantity::Decay),
            ]
        })
        .collect()
}

/// The crossing of one mode along direction n from its sampled phase ratios;
/// `dt` None for the semi-discrete ratio.
#[allow(clippy::too_many_arguments)]
fn crossing(
    f: &Frequencies,
    index: usize,
    n: &[f64],
    ppw: &[f64],
    ratio: &[f64],
    mode: usize,
    dt: Option<f64>,
    quantity: Quantity,
    tol: f64,
) -> Option<Crossing> {
    if ratio.iter().all(|r| r.is_nan()) {
        return None;
    }
    let spacing = &f.problem().spacing;
    let err = |r: f64| if r.is_nan() { 0.0 } else { (r - 1.0).abs() };
    let at = |p: f64| {
        let theta = curves::theta_at(n, spacing, p);
        let wavelength = p * curves::cell_along(n, spacing);
        Crossing {
            direction: index,
            ppw: curves::points_per_wavelength(&theta),
            theta,
            wavelength,
        }
    };
    let Some(first_bad) = ratio.iter().position(|r| err(*r) > tol) else {
        // within tolerance up to the grid limit
        return Some(at(*ppw.last()?));
    };
    if first_bad == 0 {
        return Some(at(ppw[0]));
    }
    // bisection on ln ppw between a good and a bad sample
    let error_at = |p: f64| {
        let theta = curves::theta_at(n, spacing, p);
        let (num, exact) = f.matched(&theta);
        let scale = curves::frequency_scale(&exact);
        let w = match dt {
            None => num[mode],
            Some(dt) => f.discrete(&theta, &num, dt)[mode],
        };
        err(quantity.ratio()(w, exact[mode], scale))
    };
    let (mut good, mut bad) = (ppw[first_bad - 1].ln(), ppw[first_bad].ln());
    for _ in 0..BISECTIONS {
        let mid = 0.5 * (good + bad);
        if error_at(mid.exp()) > tol {
            bad = mid;
        } else {
            good = mid;
        }
    }
    Some(at(good.exp()))
}

/// The crossings of every mode along one direction, `[mode][variant]` (see
/// [`crossings`]).
pub type DirectionCrossings = Vec<[Option<Crossing>; 4]>;

/// Each mode's resolution from the crossings of every direction
/// (`[direction][mode][variant]`) and the exact long-wave rates
/// (`[direction][mode]` = (phase speed, decay rate over |k|²), NaN where a mode
/// does not move or is not damped).
pub fn combine(all: &[DirectionCrossings], rates: &[Vec<(f64, f64)>], m: usize) -> Vec<Resolution> {
    (0..m)
        .map(|j| {
            let slow = |rate: &dyn Fn(usize) -> f64| -> Vec<usize> {
                let fastest = (0..all.len())
                    .map(|k| rate(k).abs())
                    .filter(|s| s.is_finite())
                    .fold(0.0, f64::max);
                (0..all.len())
                    .filter(|&k| {
                        let s = rate(k).abs();
                        // a NaN rate (the mode does not move there) counts as slow
                        fastest > 0.0 && (s.is_nan() || s < SLOW_FRACTION * fastest)
                    })
                    .collect()
            };
            let excluded = slow(&|k| rates[k][j].0);
            let decay_excluded = slow(&|k| rates[k][j].1);
            let pick = |variant: usize, left_out: &[usize]| -> Option<Requirement> {
                let kept = all
                    .iter()
                    .enumerate()
                    .filter(|(k, _)| !left_out.contains(k))
                    .filter_map(|(_, c)| c[j][variant].as_ref());
                let mut worst: Option<&Crossing> = None;
                let mut wavelength: f64 = 0.0;
                for c in kept {
                    if worst.is_none_or(|w| c.ppw > w.ppw) {
                        worst = Some(c);
                    }
                    wavelength = wavelength.max(c.wavelength);
                }
                worst.map(|w| Requirement {
                    worst: w.clone(),
                    wavelength,
                })
            };
            Resolution {
                semi: pick(0, &excluded),
                discrete: pick(1, &excluded),
                decay: pick(2, &decay_excluded),
                decay_discrete: pick(3, &decay_excluded),
                excluded,
                decay_excluded,
            }
        })
        .collect()
}

/// Each mode's exact phase speed Re ω/|k| and decay rate −Im ω/|k|² along n
/// at the longest curve sample (NaN where it does not move or is not damped).
pub fn long_wave_rates(f: &Frequencies, n: &[f64]) -> Vec<(f64, f64)> {
    let spacing = &f.problem().spacing;
    let p = curves::curve_ppw()[0];
    let theta = curves::theta_at(n, spacing, p);
    let kappa = 2.0 * PI / (p * curves::cell_along(n, spacing));
    let (_, exact) = f.matched(&theta);
    let scale = curves::frequency_scale(&exact);
    let or_nan = |x: f64, v: f64| if x.abs() <= 1e-9 * scale { f64::NAN } else { v };
    exact
        .iter()
        .map(|w| {
            (
                or_nan(w.re, w.re / kappa),
                or_nan(w.im, -w.im / (kappa * kappa)),
            )
        })
        .collect()
}

/// Every mode's resolution along the given directions (each with its curve).
pub fn resolve(
    f: &Frequencies,
    dirs: &[Vec<f64>],
    curves_: &[Curve],
    dt: f64,
    tol: f64,
    m: usize,
    par: crate::Par,
) -> Vec<Resolution> {
    use rayon::prelude::*;
    let per_direction: Vec<(DirectionCrossings, Vec<(f64, f64)>)> = par.run(|| {
        dirs.par_iter()
            .zip(curves_)
            .enumerate()
            .map(|(k, (n, c))| (crossings(f, k, n, c, dt, tol), long_wave_rates(f, n)))
            .collect()
    });
    let (all, rates): (Vec<_>, Vec<_>) = per_direction.into_iter().unzip();
    combine(&all, &rates, m)
}
