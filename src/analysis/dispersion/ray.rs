//! Following the frequencies along a ray from θ = 0: the pairing of one
//! continuation step with the next (nearest clear winners, clusters of repeated
//! values as wholes, else an optimal assignment) and the adaptive geometric
//! steps of [`follow_ray`]. [`super::frequencies`] and the per-node workspace
//! ([`super::node`]) name modes with it where eigenvector shapes do not.

use super::clusters;
use crate::numeric::assignment::{optimal_assignment, optimal_assignment_into};
use num_complex::Complex64 as C64;

/// Nominal (geometric) steps of the continuation along a ray, each halved
/// where its pairing is not clear ([`follow_ray`]). Eight keep every pairing
/// of the bundled cases and the peer case equal to a 4,000-step continuation's
/// (four did too; fewer steps only move work into halvings near θ = ±π).
const TRACK_STEPS: usize = 8;
/// Relative start of the ray (long-wave limit).
const START: f64 = 1e-4;

/// Pairs `new` with `target` by the least total distance (an optimal
/// assignment); returns `new` reordered.
pub(in crate::analysis::dispersion) fn assign(target: &[C64], new: &[C64]) -> Vec<C64> {
    let mut out = Vec::with_capacity(target.len());
    pair_into(target, new, &mut out);
    out
}

/// Largest spectrum [`assign_into`] pairs without allocating.
const SMALL: usize = 8;

/// [`assign`] into `out` (cleared first); allocation-free for at most 8 values
/// when `out` has the capacity.
pub(in crate::analysis::dispersion) fn assign_into(
    target: &[C64],
    new: &[C64],
    out: &mut Vec<C64>,
) {
    let m = target.len();
    out.clear();
    let distance = |i: usize, j: usize| match new.get(j) {
        Some(n) => (target[i] - n).norm(),
        None => 0.0,
    };
    if m <= SMALL {
        let mut cost = [0.0; SMALL * SMALL];
        let mut order = [0usize; SMALL];
        for (ij, c) in cost[..m * m].iter_mut().enumerate() {
            *c = distance(ij / m, ij % m);
        }
        optimal_assignment_into(&cost[..m * m], m, &mut order[..m]);
        out.extend(order[..m].iter().map(|&j| new[j]));
    } else {
        let cost: Vec<f64> = (0..m * m).map(|ij| distance(ij / m, ij % m)).collect();
        out.extend(optimal_assignment(&cost, m).into_iter().map(|j| new[j]));
    }
}

/// `new` reordered to follow `target` into `out` (cleared first): the optimal
/// assignment of least total distance, as [`assign_into`] computes it. When every target's nearest
/// value is a clear winner (nearer than a quarter of the distance to the next)
/// and those are all different, that permutation is the unique optimum and is
/// taken directly; otherwise (clusters of equal values, ties) [`assign_into`] decides.
pub(in crate::analysis::dispersion) fn pair_into(target: &[C64], new: &[C64], out: &mut Vec<C64>) {
    if !nearest_winners_into(target, new, out) {
        assign_into(target, new, out);
    }
}

/// Each target's nearest value of `new` into `out` (cleared first) when every
/// one is a clear winner (nearer than a quarter of the distance to the next)
/// and they are all different: then that permutation is the unique optimal
/// assignment. False otherwise.
fn nearest_winners_into(target: &[C64], new: &[C64], out: &mut Vec<C64>) -> bool {
    let m = target.len();
    out.clear();
    let finite = target.iter().chain(new).all(|z| z.is_finite());
    let mut taken = 0u64;
    if finite && m <= 64 && new.len() >= m {
        for t in target {
            let (mut best, mut first, mut second) = (0, f64::INFINITY, f64::INFINITY);
            for (j, n) in new.iter().enumerate().take(m) {
                let d = (t - n).norm_sqr();
                if d < first {
                    (second, first, best) = (first, d, j);
                } else if d < second {
                    second = d;
                }
            }
            // squared distances: a quarter of the distance is a sixteenth here
            if taken & (1 << best) != 0 || first > second / 16.0 {
                break;
            }
            taken |= 1 << best;
            out.push(new[best]);
        }
        if out.len() == m {
            return true;
        }
    }
    false
}

/// The frequencies at `theta`, in the order they have at the start of the ray
/// from θ = 0 (ascending Re ω there), followed step by step: `freq(point,
/// out)` writes the unordered frequencies at a point into `out`.
///
/// The steps are geometric in s (the point sθ), [`TRACK_STEPS`] of them from
/// s = [`START`] to 1: in the long-wave limit ω grows in proportion to s, so
/// the first prediction scales the start values and later ones extrapolate
/// linearly. A step is accepted when the pairing of predicted and new values
/// is clear — every prediction's nearest value (or cluster of equal values) a
/// clear winner, [`pair_decided_into`] — and halved otherwise, up to
/// [`MAX_HALVINGS`] times and within [`MAX_EVALUATIONS`] per ray, before the
/// least-total-distance assignment decides it: where branches come close or the last stretch of the ray bends (the
/// frequencies of a grid-scale wave change fast near θ = ±π), a long step's
/// linear prediction can sit nearer the wrong branch.
pub(in crate::analysis::dispersion) fn follow_ray(
    theta: &[f64],
    mut freq: impl FnMut(&[f64], &mut Vec<C64>),
) -> Vec<C64> {
    let mut point = vec![0.0; theta.len()];
    let at = |s: f64, point: &mut Vec<f64>| {
        for (p, t) in point.iter_mut().zip(theta) {
            *p = t * s;
        }
    };
    let (mut prev, mut raw) = (Vec::new(), Vec::new());
    at(START, &mut point);
    freq(&point, &mut prev);
    prev.sort_by(|a, b| a.re.total_cmp(&b.re));
    let (mut prev2, mut predicted, mut next) = (Vec::new(), Vec::new(), Vec::new());
    let ratio = (1.0 / START).powf(1.0 / TRACK_STEPS as f64);
    // position along the ray in units of the shortest step (a nominal step
    // halved MAX_HALVINGS times), geometric in s
    let unit = 1u32 << MAX_HALVINGS;
    let end = TRACK_STEPS as u32 * unit;
    let s_at = |pos: u32| {
        if pos == end {
            1.0
        } else if pos.is_multiple_of(unit) {
            START * ratio.powi((pos / unit) as i32)
        } else {
            START * ratio.powf(f64::from(pos) / f64::from(unit))
        }
    };
    let (mut pos, mut halvings, mut evaluations) = (0u32, 0u32, 0usize);
    let mut s_prev = START;
    let mut s_prev2 = START;
    while pos < end {
        let refine = evaluations < MAX_EVALUATIONS;
        // out of budget: straight on to the next nominal point
        let step = if refine {
            unit >> halvings
        } else {
            unit - pos % unit
        };
        let s = s_at(pos + step);
        at(s, &mut point);
        freq(&point, &mut raw);
        evaluations += 1;
        predicted.clear();
        if pos == 0 {
            predicted.extend(prev.iter().map(|a| a * (s / s_prev)));
        } else {
            let slope = (s - s_prev) / (s_prev - s_prev2);
            predicted.extend(prev.iter().zip(&prev2).map(|(a, b)| a + (a - b) * slope));
        }
        if !pair_decided_into(&predicted, &raw, &mut next) {
            if refine && halvings < MAX_HALVINGS {
                halvings += 1;
                continue;
            }
            assign_into(&predicted, &raw, &mut next);
        }
        std::mem::swap(&mut prev2, &mut prev);
        std::mem::swap(&mut prev, &mut next);
        s_prev2 = s_prev;
        s_prev = s;
        pos += step;
        // back to longer steps once a refined stretch reaches their grid
        while halvings > 0 && pos.is_multiple_of(unit >> (halvings - 1)) {
            halvings -= 1;
        }
        if !refine {
            halvings = 0;
        }
    }
    prev
}

/// The most times a step of [`follow_ray`] is halved before an assignment
/// decides it.
const MAX_HALVINGS: u32 = 6;

/// Eigenproblems one ray may spend before it stops halving: beyond them it
/// goes on with nominal steps, each decided by the assignment where unclear,
/// so a spectrum that is nowhere clear (a stencil whose symbol oscillates
/// wildly) costs at most this plus [`TRACK_STEPS`] + 1 (a followed
/// wavevector of the bundled cases needs about 15).
const MAX_EVALUATIONS: usize = 256;

/// The pairing of one continuation step when it is clear ([`pair_into`]'s
/// nearest winners, or [`clusters::pair_clusters_into`] for repeated values);
/// false when an assignment would have to decide.
fn pair_decided_into(target: &[C64], new: &[C64], out: &mut Vec<C64>) -> bool {
    nearest_winners_into(target, new, out) || clusters::pair_clusters_into(target, new, out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Four frequencies at `point` that jump from point to point (no smooth
    /// branch to follow), like the symbol of a stencil with offsets of 1e95.
    fn jumping(point: &[f64], out: &mut Vec<C64>) {
        out.clear();
        let seed: f64 = point.iter().sum::<f64>() * 1e4;
        out.extend((1..=4).map(|k| {
            let x = (seed * k as f64 * 12.9898).sin() * 43758.5453;
            C64::new(x - x.floor(), 0.0)
        }));
    }

    #[test]
    fn a_ray_through_a_spectrum_that_is_nowhere_clear_keeps_its_budget() {
        let mut calls = 0usize;
        let out = follow_ray(&[2.5, -1.0], |point, out| {
            calls += 1;
            jumping(point, out);
        });
        // halvings stop after MAX_EVALUATIONS; the rest of the ray takes at most
        // its nominal steps (each nominal stretch ends on a nominal point), plus the start
        assert!(
            calls <= MAX_EVALUATIONS + TRACK_STEPS + 1,
            "{calls} eigenproblems on one ray"
        );
        // the budget was spent halving: the spectrum is unclear at almost every step
        assert!(calls > MAX_EVALUATIONS, "{calls} eigenproblems on one ray");
        // the result is still the spectrum at θ, in some order
        let mut end = Vec::new();
        jumping(&[2.5, -1.0], &mut end);
        let key = |v: &[C64]| {
            let mut r: Vec<f64> = v.iter().map(|z| z.re).collect();
            r.sort_by(f64::total_cmp);
            r
        };
        assert_eq!(key(&out), key(&end));
    }

    #[test]
    fn a_smooth_ray_takes_its_nominal_steps() {
        // ω = s·(1, 2, 3) along the ray: every step's pairing is clear
        let mut calls = 0usize;
        let out = follow_ray(&[1.0, 1.0], |point, out| {
            calls += 1;
            out.clear();
            out.extend((1..=3).map(|k| C64::new(k as f64 * point[0], 0.0)));
        });
        assert_eq!(calls, TRACK_STEPS + 1);
        assert_eq!(
            out,
            vec![C64::new(1.0, 0.0), C64::new(2.0, 0.0), C64::new(3.0, 0.0)]
        );
    }
}
