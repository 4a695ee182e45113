//! The brute-force search for the first loss of stability over a domain of
//! wavevectors: the "none" test (descending Δt), a ladder of Δt upward with early
//! exit, per-wavevector first loss at the best candidates and their refinement in
//! continuous θ by a pattern search, and the long-wave limit θ → 0 from
//! `longwave`.

use crate::domain::Domain;
use crate::longwave;
use crate::pattern::{BUDGET, MIN_STEP};
use crate::probe::{Point, PointSet};
use crate::radius::ROUNDOFF;
use crate::scheme::Scheme;

/// What kind of limit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// A finite first loss.
    Bounded,
    /// Stable for every Δt tried, up to 1e12 natural scales.
    Unconditional,
    /// Unstable at every Δt > 0.
    None,
}

/// The reference answer for a domain.
#[derive(Debug, Clone)]
pub struct Reference {
    /// Kind.
    pub kind: Kind,
    /// The first loss (∞ unconditional, 0 none).
    pub dt: f64,
    /// The wavevector that sets it (empty if none).
    pub witness: Vec<f64>,
    /// Whether the reference trusts its own answer (see `note`).
    pub conclusive: bool,
    /// Relative uncertainty of `dt` (0 when found by bisection at a
    /// transversal crossing; the extrapolation spread at a long-wave limit).
    pub uncertainty: f64,
    /// How the answer was reached.
    pub note: String,
    /// Relative amount by which the roundoff allowance lifts a bisected
    /// crossing above the crossing of ρ − 1 with 0 at the witness
    /// (allowance / slope of ρ − 1 in ln Δt; [`allowance_bias`]): the
    /// reference's value may be that much too high, never too low.
    pub allowance_bias: f64,
}

/// The relative lift of a crossing at `dt` on `witness` due to the roundoff
/// allowance: the allowance over the slope of ρ − 1 per unit relative change
/// of Δt (measured over 1e-6 with no allowance), capped at 1e-3; 0 where ρ − 1
/// does not rise there.
pub fn allowance_bias(s: &Scheme, witness: &[f64], dt: f64) -> f64 {
    if witness.len() != s.dims() || !(dt > 0.0 && dt.is_finite()) {
        return 0.0;
    }
    let exact = Point::new(s, witness.to_vec(), 0.0);
    let judged = Point::new(s, witness.to_vec(), ROUNDOFF);
    let above = dt * (1.0 + 1e-6);
    let at_above = exact.excess(above);
    let slope = (at_above - exact.excess(dt)) / 1e-6;
    let allowance = at_above - judged.excess(above);
    if slope > 0.0 && allowance > 0.0 {
        (allowance / slope).min(1e-3)
    } else {
        0.0
    }
}

/// Ladder ratio below 16 natural scales.
const COARSE_RATIO: f64 = std::f64::consts::SQRT_2;
/// Ratio of the downward steps looking for a stable start.
const FINE_RATIO: f64 = 1.090_507_732_665_257_7; // 2^(1/8)

/// Finds the first loss over `dom`; `start` is a Δt believed stable (skips the
/// "none" test), e.g. the overall limit when searching along one ray.
pub fn search(s: &Scheme, dom: &Domain, start: Option<f64>) -> Reference {
    let set = PointSet::new(s, dom.points.clone(), ROUNDOFF);
    let scale = set.natural_scale();
    let reference = |kind, dt, witness, conclusive, note: String| Reference {
        kind,
        dt,
        witness,
        conclusive,
        uncertainty: 0.0,
        note,
        allowance_bias: 0.0,
    };
    let stable_start = match start {
        Some(dt) if dt > 0.0 => stable_below(&set, dt),
        _ => None,
    };
    let dt_s = match stable_start {
        Some(dt) => dt,
        None => match crate::none_test::descend(&set, scale) {
            Ok(dt) => dt,
            Err(verdict) => {
                return reference(
                    Kind::None,
                    0.0,
                    verdict.witness,
                    verdict.conclusive,
                    verdict.note,
                )
            }
        },
    };
    // ladder upward with early exit: steps of √2, then the last one in eighths
    let (mut lo, mut hi, mut hint) = (dt_s, f64::NAN, 0);
    let mut dt = dt_s;
    while dt < 1e12 * scale {
        dt *= if dt < 16.0 * scale { COARSE_RATIO } else { 8.0 };
        if let Some(i) = set.any_unstable(dt, hint) {
            hint = i;
            hi = dt;
            break;
        }
        lo = dt;
    }
    if !hi.is_nan() {
        let fine = (hi / lo).powf(0.25);
        for k in 1..4 {
            let t = lo * fine.powi(k);
            if let Some(i) = set.any_unstable(t, hint) {
                hint = i;
                hi = t;
                break;
            }
        }
        let fine_lo = hi / fine;
        lo = lo.max(fine_lo);
    }
    if hi.is_nan() {
        let note = format!(
            "stable at every ladder step from {dt_s:.3e} to {lo:.3e} (1e12 natural scales)"
        );
        return reference(Kind::Unconditional, f64::INFINITY, Vec::new(), true, note);
    }
    let (mut best, mut witness) = refine_candidates(&set, dom, lo, hi);
    if best <= 0.0 {
        // a wavevector near a candidate found no stable Δt in 60 descents
        let note = format!("a wavevector with no stable Δt found below {lo:.3e} (at {witness:?})");
        return reference(Kind::None, 0.0, witness, false, note);
    }
    let mut note = format!("ladder bracket [{lo:.6e}, {hi:.6e}], refined at finite θ");
    let mut conclusive = set.points[hint].excess(hi) > 0.0;
    let mut uncertainty = 0.0;
    let lw = longwave::limit(s, dom, best);
    let converged_long_wave = lw.as_ref().is_some_and(|l| l.converged);
    if let Some(lw) = lw.as_ref().filter(|l| l.dt == 0.0) {
        let note = format!(
            "the first loss along {:?} extrapolates to 0 as θ → 0: unstable at every Δt",
            lw.direction
        );
        return reference(Kind::None, 0.0, lw.direction.clone(), true, note);
    }
    if let Some(lw) = lw {
        if lw.dt < best {
            best = lw.dt;
            witness = lw.direction.clone();
            conclusive = lw.converged;
            uncertainty = lw.spread;
            note = format!(
                "long-wave limit θ → 0 along {:?} (extrapolated, spread {:.1e})",
                lw.direction, lw.spread
            );
        }
    }
    if !note.starts_with("long-wave") {
        // the brief's test of a tangential transition: just above the limit the
        // witness must be unstable beyond roundoff
        let p = Point::new(s, witness.clone(), ROUNDOFF);
        if p.excess(best * (1.0 + 1e-6)) <= 0.0 {
            conclusive = false;
            note.push_str("; tangential: ρ − 1 stays within roundoff at 1.000001 × the limit");
        }
    }
    let near_origin = witness.iter().map(|x| x * x).sum::<f64>().sqrt() < 1e-2;
    if near_origin && !note.starts_with("long-wave") && !converged_long_wave {
        conclusive = false;
        note.push_str(
            "; the minimum is approached as θ → 0 and no long-wave extrapolation converged",
        );
    }
    let mut r = reference(Kind::Bounded, best, witness, conclusive, note);
    r.uncertainty = uncertainty;
    if !r.note.starts_with("long-wave") {
        r.allowance_bias = allowance_bias(s, &r.witness, r.dt);
    }
    r
}

/// `dt` (or a value below it) at which every point is stable.
fn stable_below(set: &PointSet, dt: f64) -> Option<f64> {
    let mut dt = dt;
    for _ in 0..40 {
        if set.any_unstable(dt, 0).is_none() {
            return Some(dt);
        }
        dt /= FINE_RATIO;
    }
    None
}

/// Per-point first loss at the best candidates of the bracket [lo, hi], each
/// refined by a pattern search in the domain's coordinates.
fn refine_candidates(set: &PointSet, dom: &Domain, lo: f64, hi: f64) -> (f64, Vec<f64>) {
    let excess = set.all_excess(hi);
    let mut order: Vec<usize> = (0..excess.len()).collect();
    order.sort_by(|a, b| excess[*b].total_cmp(&excess[*a]));
    let mut chosen: Vec<usize> = Vec::new();
    for &i in &order {
        let far = chosen.iter().all(|&j| dom.distance(i, j) > 2.5 * dom.step);
        if far {
            chosen.push(i);
        }
        if chosen.len() == dom.candidates {
            break;
        }
    }
    let mut best = (hi, dom.points[order[0]].clone());
    for &i in &chosen {
        let p = &set.points[i];
        if let Some(t) = p.first_loss_from(lo, hi, 12, 60) {
            if t < best.0 {
                best = (t, p.theta().to_vec());
            }
        }
    }
    let scheme = set.points[0].scheme();
    for &i in &chosen {
        let f = |x: &[f64], cap: f64| -> f64 {
            let p = Point::new(scheme, dom.theta_of(x), ROUNDOFF);
            p.first_loss_from(0.98 * lo, cap, 10, 60).unwrap_or(cap)
        };
        let (x, v) = crate::pattern::minimise(&f, &dom.params[i], dom.step, hi, (MIN_STEP, BUDGET));
        if v < best.0 {
            best = (v, dom.theta_of(&x));
        }
    }
    best
}
