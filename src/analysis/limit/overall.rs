//! The largest stable Δt of one-step and multistep methods over the whole box:
//! the best screened grid nodes evaluated exactly, every separated candidate
//! refined in continuous θ, and the limits approached at θ = 0 and at the
//! corners and faces of the box; the evidence gives the limit and its bracket
//! ([`super::certify`]). Also the bounded list of screened candidates the main
//! sweep keeps, and the pairing of opposite directions.

use super::abscissa;
use super::certify::Evidence;
use super::first_exit::ExitTimes;
use super::longwave;
use super::loss::{Exact, FirstLoss};
use super::Limit;
use crate::numeric::minimise::{compass_min, pattern_min};
use crate::operator::{Operator, Spectrum};
use crate::sample::Grid;
use num_complex::Complex64 as C64;
use rayon::prelude::*;
use std::f64::consts::PI;

/// Wraps an angle into [−π, π].
pub fn wrap(x: f64) -> f64 {
    let y = (x + PI).rem_euclid(2.0 * PI) - PI;
    if y == -PI && x > 0.0 {
        PI
    } else {
        y
    }
}

/// How many separated grid candidates are refined.
const CANDIDATES: usize = 16;

/// How many screened wavevectors are kept for the refinement.
pub const SCREEN_CANDIDATES: usize = 4096;

/// The `keep` best screened wavevectors (smallest t*, then largest |μ|), kept as
/// a bounded list while a sweep runs slab by slab.
pub struct Candidates {
    keep: usize,
    items: Vec<(usize, f64, f64)>,
}

impl Candidates {
    /// An empty list keeping `keep` entries.
    pub fn new(keep: usize) -> Self {
        Self {
            keep,
            items: Vec::with_capacity(2 * keep),
        }
    }

    fn key(x: &(usize, f64, f64)) -> (f64, f64, usize) {
        (x.1, -x.2, x.0)
    }

    /// Offers node `flat` with screening time `t` and modulus `w`.
    pub fn offer(&mut self, flat: usize, t: f64, w: f64) {
        self.items.push((flat, t, w));
        if self.items.len() >= 2 * self.keep {
            self.prune();
        }
    }

    fn prune(&mut self) {
        let k = self.keep.min(self.items.len());
        if k == 0 {
            return;
        }
        self.items.select_nth_unstable_by(k - 1, |a, b| {
            Self::key(a)
                .partial_cmp(&Self::key(b))
                .unwrap_or(std::cmp::Ordering::Equal)
        });
        self.items.truncate(k);
    }

    /// The kept entries, best first.
    pub fn into_sorted(mut self) -> Vec<(usize, f64, f64)> {
        self.prune();
        self.items.sort_by(|a, b| {
            Self::key(a)
                .partial_cmp(&Self::key(b))
                .unwrap_or(std::cmp::Ordering::Equal)
        });
        self.items
    }
}

/// How many of the best screened nodes are evaluated exactly.
const EXACT_CANDIDATES: usize = 256;

/// The overall limit from the best screened wavevectors `(flat, t*, |μ|)`, best
/// first, with its bracket.
pub fn overall(
    op: &Operator,
    exits: &ExitTimes,
    tolerance: f64,
    grid: &Grid,
    screen: &[(usize, f64, f64)],
) -> (Limit, Option<(f64, f64)>) {
    let dims = grid.points.len();
    let f = Exact::new(op, exits, tolerance);
    let mut evidence = Evidence::default();
    let origin = vec![0.0; dims];
    evidence.offer(f.at(&origin).bound_or_inf(), &origin);
    let mut idx = vec![0usize; dims];
    for &(i, _, _) in screen.iter().take(EXACT_CANDIDATES) {
        grid.unravel(i, &mut idx);
        let th = grid.theta(&idx);
        // an untrusted first loss is no evidence: at a node within rounding of
        // θ = 0 (−4.4e-16 on an odd grid) the eigenvalues of L are rounding
        // noise, and a purely imaginary one would read as "unstable at every
        // Δt" for a method without the imaginary axis (AB2 with upwinding);
        // long waves are the long-wave analysis's to decide
        evidence.offer(f.at(&th).bound_or_inf(), &th);
    }
    if evidence.witness.as_ref().is_some_and(|w| w.0 == 0.0) {
        return evidence.conclude(dims);
    }
    // an unstable region of L narrower than a grid cell
    if let Some(theta) = abscissa::unstable_wavevector(op, tolerance, grid) {
        evidence.offer(0.0, &theta);
        return evidence.conclude(dims);
    }
    let step = (0..dims)
        .map(|d| grid.step(d))
        .fold(f64::INFINITY, f64::min);
    // the candidates refined on the workers (each with its own evaluator) and
    // offered in their order, as one worker would
    let refined: Vec<[(Vec<f64>, f64); 2]> = separated(grid, screen)
        .into_par_iter()
        .map(|c| {
            let f = Exact::new(op, exits, tolerance);
            let g = |x: &[f64]| f.at(x).bound_or_inf();
            let compass = compass_min(&g, &grid.theta(&c), step, 1e-12, 3000);
            // continued along a valley oblique to the axes, where compass steps stall
            let pattern = pattern_min(&g, &compass.0, 0.25 * step, 1e-12, 400);
            [compass, pattern]
        })
        .collect();
    for (x, v) in refined.iter().flatten() {
        evidence.offer(*v, x);
    }
    let g = |x: &[f64]| f.at(x).bound_or_inf();
    super::composite::polish(&mut evidence, &g, step);
    let approaches: Vec<_> = longwave::origins(dims)
        .into_par_iter()
        .filter(|o| degenerate(op, tolerance, o))
        .map(|o| longwave::overall(&Exact::new(op, exits, tolerance), &o))
        .collect();
    for lw in approaches {
        evidence.approach(lw);
    }
    evidence.conclude(dims)
}

/// Up to `CANDIDATES` screened nodes at least three cells apart (periodically).
fn separated(grid: &Grid, screen: &[(usize, f64, f64)]) -> Vec<Vec<usize>> {
    let dims = grid.points.len();
    let mut idx = vec![0usize; dims];
    let mut chosen: Vec<Vec<usize>> = Vec::new();
    for &(i, _, _) in screen {
        grid.unravel(i, &mut idx);
        let far = chosen.iter().all(|c| {
            c.iter().zip(&idx).enumerate().any(|(d, (a, b))| {
                let n = grid.points[d] - 1;
                let diff = a.abs_diff(*b) % n;
                diff.min(n - diff) > 2
            })
        });
        if far {
            chosen.push(idx.clone());
            if chosen.len() == CANDIDATES {
                break;
            }
        }
    }
    chosen
}

/// Whether L has an eigenvalue at (or within 1e-8 of its size of) zero at θ:
/// there the first loss can tend to a limit no point attains.
pub fn degenerate(op: &Operator, tolerance: f64, theta: &[f64]) -> bool {
    let mut eig = vec![C64::new(0.0, 0.0); op.m];
    let mut s = Spectrum::new(op, tolerance);
    s.at(theta, &mut eig).is_ok() && eig.iter().any(|mu| mu.norm() <= 1e-8 * op.scale())
}

/// For each direction, the index of an earlier direction opposite to it (when
/// `even`, i.e. the limit is the same for n and −n).
pub fn opposites(directions: &[Vec<f64>], even: bool) -> Vec<Option<usize>> {
    directions
        .iter()
        .enumerate()
        .map(|(i, n)| {
            if !even {
                return None;
            }
            directions[..i]
                .iter()
                .position(|o| o.iter().zip(n).all(|(a, b)| (a + b).abs() <= 1e-12))
        })
        .collect()
}

/// Fills the directions that have an opposite from it (wavevector negated).
pub fn mirror_fill(
    computed: Vec<(f64, Vec<f64>)>,
    opposite: &[Option<usize>],
) -> Vec<(f64, Vec<f64>)> {
    computed
        .iter()
        .zip(opposite)
        .map(|(c, opp)| match opp {
            Some(j) => (computed[*j].0, computed[*j].1.iter().map(|x| -x).collect()),
            None => c.clone(),
        })
        .collect()
}
