//! The largest stable Δt of one-step and multistep methods: screening on the
//! grid, exact first-exit times at the candidates, refinement in continuous θ;
//! and the same along each wave direction.

use super::first_exit::{min_over_modes, ExitTimes};
use super::{Limit, LimitKind};
use crate::linalg::EigSolver;
use crate::numeric::minimise::{compass_min, golden_min};
use crate::operator::Operator;
use crate::sample::{ray_length, Grid, Progress};
use num_complex::Complex64 as C64;
use rayon::prelude::*;
use std::cell::RefCell;
use std::f64::consts::PI;

/// Exact min over modes of t*(μ(θ)) at any θ.
pub struct Evaluator<'a> {
    op: &'a Operator,
    exits: &'a ExitTimes<'a>,
    work: RefCell<(EigSolver, Vec<C64>, Vec<C64>)>,
}

impl<'a> Evaluator<'a> {
    /// For an operator and its method's exit times.
    pub fn new(op: &'a Operator, exits: &'a ExitTimes<'a>) -> Self {
        let m = op.m;
        Self {
            op,
            exits,
            work: RefCell::new((
                EigSolver::new(m),
                vec![C64::new(0.0, 0.0); m * m],
                vec![C64::new(0.0, 0.0); m],
            )),
        }
    }

    fn eval(&self, theta: &[f64], exact: bool) -> (f64, f64) {
        let mut w = self.work.borrow_mut();
        let (solver, sym, eig) = &mut *w;
        self.op.symbol_into(theta, sym);
        if solver.eigenvalues(sym, eig).is_err() {
            return (f64::NAN, 0.0);
        }
        let noise = super::first_exit::noise_level(sym);
        if exact {
            min_over_modes(eig, |mu| self.exits.exact(mu, noise))
        } else {
            min_over_modes(eig, |mu| self.exits.estimate(mu, noise))
        }
    }

    /// Exact first-exit time at θ.
    pub fn exact(&self, theta: &[f64]) -> f64 {
        self.eval(theta, true).0
    }

    /// Screening value at θ.
    pub fn estimate(&self, theta: &[f64]) -> f64 {
        self.eval(theta, false).0
    }
}

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
const CANDIDATES: usize = 8;

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

/// The overall limit from the best screened wavevectors `(flat, t*, |μ|)`, best first.
pub fn overall(
    op: &Operator,
    exits: &ExitTimes,
    grid: &Grid,
    screen: &[(usize, f64, f64)],
) -> Limit {
    let dims = grid.points.len();
    if screen.is_empty() {
        return Limit {
            kind: LimitKind::None,
            dt_max: f64::NAN,
            wavevector: vec![0.0; dims],
        };
    }
    let order: Vec<usize> = screen.iter().map(|c| c.0).collect();
    let mut idx = vec![0usize; dims];
    let mut chosen: Vec<Vec<usize>> = Vec::new();
    for &i in &order {
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
    let best_node = order[0];
    let best_t = screen[0].1;
    grid.unravel(best_node, &mut idx);
    let best_theta = grid.theta(&idx);
    let eval = Evaluator::new(op, exits);
    if best_t == 0.0 {
        return Limit {
            kind: LimitKind::None,
            dt_max: 0.0,
            wavevector: best_theta,
        };
    }
    if best_t == f64::INFINITY {
        return Limit {
            kind: LimitKind::Unconditional,
            dt_max: f64::INFINITY,
            wavevector: best_theta,
        };
    }
    let step = (0..dims)
        .map(|d| grid.step(d))
        .fold(f64::INFINITY, f64::min);
    let f = |x: &[f64]| {
        let v = eval.exact(x);
        if v.is_nan() {
            f64::INFINITY
        } else {
            v
        }
    };
    let mut best = (f(&best_theta), best_theta);
    for c in &chosen {
        let x0 = grid.theta(c);
        let (x, v) = compass_min(&f, &x0, step, 1e-11, 2000);
        if v < best.0 {
            best = (v, x);
        }
    }
    let (dt, theta) = best;
    let kind = if dt == 0.0 {
        LimitKind::None
    } else if dt.is_infinite() {
        LimitKind::Unconditional
    } else {
        LimitKind::Bounded
    };
    Limit {
        kind,
        dt_max: dt,
        wavevector: theta.iter().map(|x| wrap(*x)).collect(),
    }
}

/// The limit along each direction: min over the ray θ = s n, 0 < s ≤ s_max.
/// Returns, per direction, Δt and the wavevector that sets it. With `even`
/// (a real-coefficient scheme), directions n and −n share their limit, and a
/// direction whose opposite is also in the list is computed once.
pub fn by_direction(
    op: &Operator,
    exits: &ExitTimes,
    directions: &[Vec<f64>],
    samples: usize,
    even: bool,
    progress: &dyn Progress,
) -> Vec<(f64, Vec<f64>)> {
    let opposite = opposites(directions, even);
    let computed: Vec<(f64, Vec<f64>)> = directions
        .par_iter()
        .zip(&opposite)
        .map(|(n, opp)| {
            if opp.is_some() {
                progress.advance(1);
                return (f64::NAN, Vec::new());
            }
            ray_limit(op, exits, n, samples, progress)
        })
        .collect();
    mirror_fill(computed, &opposite)
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

fn ray_limit(
    op: &Operator,
    exits: &ExitTimes,
    n: &[f64],
    samples: usize,
    progress: &dyn Progress,
) -> (f64, Vec<f64>) {
    let eval = Evaluator::new(op, exits);
    let smax = ray_length(n);
    let at = |s: f64| -> Vec<f64> { n.iter().map(|x| x * s).collect() };
    let mut best = (f64::INFINITY, 1usize);
    for k in 1..=samples {
        let v = eval.estimate(&at(smax * k as f64 / samples as f64));
        if v < best.0 {
            best = (v, k);
        }
    }
    progress.advance(1);
    let k = best.1;
    let s_k = smax * k as f64 / samples as f64;
    let exact_k = eval.exact(&at(s_k));
    if !(exact_k.is_finite() && exact_k > 0.0) {
        return (exact_k, at(s_k));
    }
    let lo = smax * (k - 1) as f64 / samples as f64;
    let hi = (smax * (k + 1) as f64 / samples as f64).min(smax);
    let g = |s: f64| {
        let v = eval.exact(&at(s));
        if v.is_nan() {
            f64::INFINITY
        } else {
            v
        }
    };
    let (s, v) = golden_min(&g, lo.max(1e-12 * smax), hi);
    if v < exact_k {
        (v, at(s))
    } else {
        (exact_k, at(s_k))
    }
}
