//! Stability limits of composite schemes (forward–backward, splitting, IMEX,
//! Lax–Wendroff, Lax–Friedrichs), whose eigenvalues are not functions of eig(L).
//!
//! A Δt is stable when every |λ(G(θ, Δt))| ≤ 1 + tolerance. The search brackets
//! the first loss of stability by doubling or halving from the natural scale
//! 1/‖L‖, bisects with full sweeps that stop at the first unstable wavevector
//! (the last one found is tried first), refines the worst wavevector in
//! continuous θ by a per-wavevector bisection on Δt inside a compass search, and
//! finally scans Δt on a uniform grid below the limit, so that a stable window
//! cannot hide an earlier loss of stability.

use super::overall::{mirror_fill, opposites, wrap};
use super::{Limit, LimitKind};
use crate::linalg;
use crate::numeric::bracket::bisect;
use crate::numeric::minimise::{compass_min, golden_min};
use crate::operator::Operator;
use crate::problem::Problem;
use crate::sample::{ray_length, Grid, Progress};
use crate::time::composite::{self, Composite};
use rayon::prelude::*;
use std::sync::atomic::{AtomicUsize, Ordering};

/// How many uniformly spaced time steps below the limit are checked.
pub const VERIFY_STEPS: usize = 32;
const BISECTIONS: usize = 60;

/// ρ(G(θ, Δt)) of a composite scheme.
pub struct CompositeEval<'a> {
    problem: &'a Problem,
    op: &'a Operator,
    scheme: &'a Composite,
    tol: f64,
}

/// Result of the composite search.
#[derive(Debug, Clone)]
pub struct CompositeLimit {
    /// The limit.
    pub limit: Limit,
    /// Whether the scan below the limit found it stable everywhere (after any correction).
    pub verified: bool,
    /// Whether the scan found an earlier loss of stability and moved the limit down.
    pub corrected: bool,
}

impl<'a> CompositeEval<'a> {
    /// For a problem whose method is composite, with the stability tolerance.
    pub fn new(problem: &'a Problem, op: &'a Operator, scheme: &'a Composite, tol: f64) -> Self {
        Self {
            problem,
            op,
            scheme,
            tol,
        }
    }

    /// Spectral radius of G at (θ, Δt); NaN when the kernel fails.
    pub fn radius(&self, theta: &[f64], dt: f64) -> f64 {
        let g = composite::amplification(
            self.scheme,
            &self.problem.system,
            self.op,
            &self.problem.spacing,
            theta,
            dt,
        );
        linalg::spectral_radius(&linalg::from_matrix(&g), g.nrows()).unwrap_or(f64::NAN)
    }

    fn unstable(&self, theta: &[f64], dt: f64) -> bool {
        self.radius(theta, dt) > 1.0 + self.tol
    }

    /// Index of some unstable point at Δt (trying `hint` first), or None.
    fn any_unstable(&self, points: &[Vec<f64>], dt: f64, hint: &AtomicUsize) -> Option<usize> {
        let h = hint.load(Ordering::Relaxed);
        if h < points.len() && self.unstable(&points[h], dt) {
            return Some(h);
        }
        let found = points.par_iter().position_any(|p| self.unstable(p, dt));
        if let Some(i) = found {
            hint.store(i, Ordering::Relaxed);
        }
        found
    }

    /// First loss of stability over a set of wavevectors, searching upward from
    /// `start`: (stable Δt, unstable Δt) bracketing it to 1e-12 relative, or
    /// None when no loss is found up to start·2⁴⁰ (unconditional).
    fn first_loss(
        &self,
        points: &[Vec<f64>],
        start: f64,
        hint: &AtomicUsize,
    ) -> Option<(f64, f64)> {
        let mut lo;
        let mut hi;
        if self.any_unstable(points, start, hint).is_some() {
            hi = start;
            lo = start * 0.5;
            let mut k = 0;
            while self.any_unstable(points, lo, hint).is_some() {
                hi = lo;
                lo *= 0.5;
                k += 1;
                if k > 60 {
                    return Some((0.0, hi));
                }
            }
        } else {
            lo = start;
            hi = start * 2.0;
            let mut k = 0;
            while self.any_unstable(points, hi, hint).is_none() {
                lo = hi;
                hi *= 2.0;
                k += 1;
                if k > 40 {
                    return None;
                }
            }
        }
        let stable = |dt: f64| self.any_unstable(points, dt, hint).is_none();
        Some(bisect(stable, lo, hi, 1e-12, BISECTIONS))
    }

    /// First loss of stability at one wavevector within [lo, hi] (hi if stable there).
    fn exit_at(&self, theta: &[f64], lo: f64, hi: f64) -> f64 {
        if !self.unstable(theta, hi) {
            return hi;
        }
        if self.unstable(theta, lo) {
            return lo;
        }
        bisect(|dt| !self.unstable(theta, dt), lo, hi, 1e-12, 50).0
    }

    /// The worst point at Δt: largest radius.
    fn worst(&self, points: &[Vec<f64>], dt: f64) -> usize {
        let r: Vec<f64> = points.par_iter().map(|p| self.radius(p, dt)).collect();
        r.iter()
            .enumerate()
            .filter(|(_, v)| !v.is_nan())
            .fold(
                (0, f64::NEG_INFINITY),
                |b, (i, v)| if *v > b.1 { (i, *v) } else { b },
            )
            .0
    }

    /// The overall limit over the grid, refined and verified.
    pub fn overall(&self, grid: &Grid) -> CompositeLimit {
        let dims = grid.points.len();
        let mut idx = vec![0usize; dims];
        let points: Vec<Vec<f64>> = (0..grid.len())
            .map(|i| {
                grid.unravel(i, &mut idx);
                grid.theta(&idx)
            })
            .collect();
        let hint = AtomicUsize::new(usize::MAX);
        let start = 1.0 / self.op.scale().max(1e-300);
        let Some((mut lo, mut hi)) = self.first_loss(&points, start, &hint) else {
            return CompositeLimit {
                limit: Limit {
                    kind: LimitKind::Unconditional,
                    dt_max: f64::INFINITY,
                    wavevector: vec![0.0; dims],
                },
                verified: true,
                corrected: false,
            };
        };
        let mut corrected = false;
        let mut verified = true;
        // Scan below the limit for an earlier loss hidden behind a stable window.
        'scan: for _ in 0..4 {
            for j in 1..=VERIFY_STEPS {
                let dt = lo * j as f64 / (VERIFY_STEPS + 1) as f64;
                if self.any_unstable(&points, dt, &hint).is_some() {
                    corrected = true;
                    verified = false;
                    let below = lo * (j - 1) as f64 / (VERIFY_STEPS + 1) as f64;
                    match self.first_loss(&points, below.max(dt * 1e-6), &hint) {
                        Some((l, h)) if l < lo => {
                            lo = l;
                            hi = h;
                        }
                        _ => break 'scan,
                    }
                    continue 'scan;
                }
            }
            verified = true;
            break;
        }
        let iw = self.worst(&points, hi);
        let step = (0..dims)
            .map(|d| grid.step(d))
            .fold(f64::INFINITY, f64::min);
        let f = |x: &[f64]| self.exit_at(x, 0.5 * lo, hi);
        let (x, v) = compass_min(&f, &points[iw], step, 1e-9, 1500);
        let (dt, theta) = if v < lo {
            (v, x)
        } else {
            (lo, points[iw].clone())
        };
        let kind = if dt == 0.0 {
            LimitKind::None
        } else {
            LimitKind::Bounded
        };
        CompositeLimit {
            limit: Limit {
                kind,
                dt_max: dt,
                wavevector: theta.iter().map(|t| wrap(*t)).collect(),
            },
            verified,
            corrected,
        }
    }

    /// The limit along each direction, searching upward from `start` (the overall limit).
    pub fn by_direction(
        &self,
        directions: &[Vec<f64>],
        samples: usize,
        start: f64,
        progress: &dyn Progress,
    ) -> Vec<(f64, Vec<f64>)> {
        let opposite = opposites(directions, self.op.real_coefficients);
        let computed = directions
            .iter()
            .zip(&opposite)
            .map(|(n, opp)| {
                progress.advance(1);
                if opp.is_some() {
                    return (f64::NAN, Vec::new());
                }
                let smax = ray_length(n);
                let at = |s: f64| -> Vec<f64> { n.iter().map(|x| x * s).collect() };
                let pts: Vec<Vec<f64>> = (1..=samples)
                    .map(|k| at(smax * k as f64 / samples as f64))
                    .collect();
                let hint = AtomicUsize::new(usize::MAX);
                let s0 = if start.is_finite() && start > 0.0 {
                    start
                } else {
                    1.0 / self.op.scale().max(1e-300)
                };
                let Some((lo, hi)) = self.first_loss(&pts, s0, &hint) else {
                    return (f64::INFINITY, at(smax));
                };
                let k = self.worst(&pts, hi);
                let a = smax * k as f64 / samples as f64;
                let b = (smax * (k + 2) as f64 / samples as f64).min(smax);
                let g = |s: f64| self.exit_at(&at(s), 0.5 * lo, hi);
                let (s, v) = golden_min(&g, a.max(1e-12 * smax), b);
                if v < lo {
                    (v, at(s))
                } else {
                    (lo, pts[k].clone())
                }
            })
            .collect();
        mirror_fill(computed, &opposite)
    }
}
