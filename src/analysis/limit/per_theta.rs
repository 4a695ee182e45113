//! The first loss of stability of a composite scheme at one wavevector: the
//! smallest Δt where ρ(G(θ, Δt)) − 1 rises past its rounding level.
//!
//! A ladder of ratio 1.25 climbs from a Δt known to be stable. Between two
//! stable rungs the excess ρ − 1 − rounding can still rise above 0 and fall back
//! (one eigenvalue branch unstable on a window of Δt, another taking over
//! later), so each stretch between rungs is examined before it is passed:
//! - by its tangents: where the excess is concave, it lies below the tangent
//!   at either end, so a stretch whose tangents stay below 0 has no crossing;
//!   a stretch where one of them reaches 0 is sampled more finely, down to a
//!   ratio of 1.25^(1/512) ≈ 1.0004;
//! - by its shape: a local maximum of the rung values between rungs is found by
//!   golden-section search.
//!
//! The stretch that ends on the first unstable rung is bisected as it is: its
//! readings next to a crossing where two eigenvalues collide (the Yee scheme
//! at its limit) carry errors of order √ε, far above the rounding level, and
//! cutting it finer finds those slivers instead of the crossing.

use super::closed_form::ClosedForm;
use super::growth_orders;
use super::loss::{FirstLoss, Loss};
use super::search::{power_law, CompositeEval, BISECTIONS, SMALL_DT_LEVELS};
use crate::numeric::bracket::bisect;
use crate::numeric::minimise::golden_max;

/// Ratio of successive rungs of the per-wavevector ladder.
const LADDER: f64 = 1.25;
/// Relative steps over which a crossing's rise past ten times its rounding is
/// looked for: within the first the crossing is trusted; within a later one it
/// is rough, a sample of a long-wave approach that has no trusted one (IMEX
/// CNAB2 with fourth-order dissipation, seed 1314: every crossing rises slowly).
const RISE_STEPS: [f64; 3] = [1e-6, 1e-5, 1e-4];
/// Pieces a suspicious stretch is cut into, per level.
const PIECES: usize = 8;
/// Levels of cutting (8³ = 512 pieces of a rung at the finest).
const LEVELS: usize = 3;
/// Relative step of the one-sided slopes at the ends of a stretch.
const SLOPE_STEP: f64 = 1e-6;
/// A change of ρ − 1 over that step is a slope, and a cut's excess an
/// instability, only beyond this many times its rounding.
const SLOPE_CLARITY: f64 = 16.0;

/// The first loss of a composite scheme at one wavevector: a ladder upward from
/// `floor` (a Δt stable at every point of the grid) and bisection; below the
/// floor when the point is already unstable there.
pub struct PerTheta<'a> {
    ev: &'a CompositeEval<'a>,
    floor: f64,
    tolerance: f64,
}

impl<'a> PerTheta<'a> {
    /// For `ev`, starting from `floor`, with the stability tolerance of the
    /// imaginary-axis rule (for the long-wave orders of L).
    pub fn new(ev: &'a CompositeEval<'a>, floor: f64, tolerance: f64) -> Self {
        PerTheta {
            ev,
            floor,
            tolerance,
        }
    }
}

/// Where below the floor the per-wavevector search looks for growth that the
/// floor hides (2⁻²⁴ of it).
const SMALL_DT_PROBE: f64 = 1.0 / 16_777_216.0;

impl FirstLoss for PerTheta<'_> {
    fn at(&self, theta: &[f64]) -> Loss {
        let unstable = |dt: f64| self.ev.unstable(theta, dt);
        let (mut lo, mut hi) = (self.floor, self.floor);
        if unstable(lo) {
            let mut trail: Vec<(f64, usize)> = Vec::new();
            while unstable(lo) {
                trail.push((0.0, 0));
                hi = lo;
                lo *= 0.5;
                if trail.len() > SMALL_DT_LEVELS {
                    return Loss::exact(0.0);
                }
            }
            // unstable down to the rounding level, decaying as a power of Δt:
            // unstable for every Δt > 0 at this wavevector
            if power_law(&trail, |d| self.ev.growth_and_noise(theta, d), lo) {
                return Loss::exact(0.0);
            }
        } else {
            // stable at the floor, but growing like a power of Δt far below it
            // (a first-order term with a positive real part, damped by the
            // second-order one before the floor: Lax–Wendroff on seed 3472):
            // unstable on every (0, Δt]
            let probe = self.floor * SMALL_DT_PROBE;
            let (g, noise) = self.ev.growth_and_noise(theta, probe);
            if g > 16.0 * noise
                && power_law(
                    &[(0.0, 0); 8],
                    |d| self.ev.growth_and_noise(theta, d),
                    probe,
                )
            {
                return Loss::exact(0.0);
            }
            // (ρ − 1 − rounding, rounding)
            let eval = |dt: f64| {
                let (growth, noise) = self.ev.growth_and_noise(theta, dt);
                (growth - noise, noise)
            };
            let excess = |dt: f64| eval(dt).0;
            let mut k = 0;
            let mut prev = (lo, excess(lo));
            let mut before: Option<(f64, f64)> = None;
            hi = lo * LADDER;
            loop {
                let e = excess(hi);
                if e > 0.0 {
                    break;
                }
                if let Some((l, h)) = hidden_crossing(&eval, prev, (hi, e), LEVELS) {
                    return self.bisected(theta, l, h);
                }
                if let Some(b) = before {
                    if prev.1 > b.1 && prev.1 > e {
                        let (t, v) = golden_max(&excess, b.0, hi);
                        if v > 0.0 {
                            // the window opens between b and t
                            return self.bisected(theta, b.0, t);
                        }
                    }
                }
                before = Some(prev);
                prev = (hi, e);
                hi *= LADDER;
                k += 1;
                // 1.25^145 ≈ 1e14 times the floor: stable that far is unconditional
                if k > 145 {
                    return Loss::exact(f64::INFINITY);
                }
            }
            lo = prev.0;
        }
        let (lo, hi) = bisect(|dt| !unstable(dt), lo, hi, 1e-13, BISECTIONS);
        let loss = self.refined(theta, lo, hi);
        // A crossing where ρ − 1 only creeps past its rounding level (not
        // trusted), at a wavevector where L has no real part by construction,
        // and grows above it like a power of Δt is no limit: without a real part
        // nothing damps the growth C·Δtᵖ as Δt → 0, it runs on below the
        // rounding level (AB2's explicit part on an exactly imaginary μ:
        // ρ − 1 ≈ (Δt|μ|)⁴/4). With damping (Re μ < 0, however small) the
        // crossing is real, even when the growth above it looks like a power.
        let trail = [(0.0, 0); 8];
        if !loss.trusted
            && self.ev.exactly_imaginary(theta)
            && power_law(&trail, |d| self.ev.growth_and_noise(theta, d), hi)
        {
            return Loss::exact(0.0);
        }
        loss
    }

    fn long_wave(&self, origin: &[f64], n: &[f64]) -> Option<ClosedForm> {
        use crate::time::composite::Composite;
        let op = self.ev.operator();
        let special = match self.ev.scheme() {
            Composite::ForwardBackward { rank } => {
                super::forward_backward::long_wave_limit(op, rank, origin, n)
            }
            Composite::LaxFriedrichs => {
                let p = self.ev.problem();
                super::lax_friedrichs::long_wave_limit(&p.system.flux, &p.spacing, op, origin, n)
            }
            Composite::Imex(crate::time::composite::Imex::Euler) => {
                super::imex_euler::long_wave_limit(op, origin, n)
            }
            Composite::LaxWendroff => {
                let p = self.ev.problem();
                super::lax_wendroff::long_wave_limit(&p.system.flux, &p.spacing, op, origin, n)
            }
            Composite::Split { inner, kind } => {
                single_part_split(inner, op, self.tolerance, origin, n).or_else(|| {
                    match &inner.scheme {
                        crate::time::Scheme::OneStep(os) => {
                            super::split::long_wave_limit(os, *kind, op, self.tolerance, origin, n)
                        }
                        _ => None,
                    }
                })
            }
            _ => None,
        };
        if special.is_some() {
            return special;
        }
        growth_orders::imex_closed_form(self.ev, self.tolerance, origin, n).or_else(|| {
            growth_orders::verdict(self.ev, self.tolerance, origin, n).map(|limit| ClosedForm {
                limit,
                uncertainty: 0.0,
            })
        })
    }
}

impl PerTheta<'_> {
    /// The loss from a bracket [lo, hi] (stable, unstable) of a crossing that
    /// is known to be the first.
    fn bisected(&self, theta: &[f64], lo: f64, hi: f64) -> Loss {
        let (l, h) = bisect(|dt| !self.ev.unstable(theta, dt), lo, hi, 1e-13, BISECTIONS);
        self.refined(theta, l, h)
    }

    /// The loss from a bisected bracket [lo, hi] of the first crossing.
    fn refined(&self, theta: &[f64], lo: f64, hi: f64) -> Loss {
        // The bisection finds where ρ − 1 rises past its rounding level δ, which
        // is above the crossing of ρ − 1 with 0 by about δ/slope. The slope of
        // ρ − 1 (per unit relative change of Δt) is measured over 1e-6 beyond,
        // the value is moved down by twice that offset (to where the linear model
        // reaches −δ: the safe end of what rounding allows), and it is trusted
        // when ρ − 1 grows past 10δ within 1e-6 (an offset of at most 1e-7).
        // One that does so only within a longer step is rough: unmoved, and
        // used only by an approach with no trusted sample at all.
        let (g0, noise) = self.ev.growth_and_noise(theta, hi);
        let rises = |step: f64| {
            let (g1, _) = self.ev.growth_and_noise(theta, hi * (1.0 + step));
            let slope = (g1 - g0) / step;
            (g1 > 10.0 * noise && slope > 0.0).then_some(slope)
        };
        let first = rises(RISE_STEPS[0]);
        let trusted = first.is_some();
        // a rough value's bias: the linear model's 2δ/slope over the step
        // that shows the rise
        let rough = if trusted {
            0.0
        } else {
            RISE_STEPS[1..]
                .iter()
                .find_map(|h| rises(*h))
                .map_or(0.0, |slope| 2.0 * noise / slope)
        };
        let offset = first.map_or(0.0, |slope| (2.0 * noise / slope).min(1e-6));
        Loss {
            dt: lo * (1.0 - offset),
            trusted,
            bound: true,
            rough,
        }
    }
}

/// The long-wave closed form of a dimension-split one-step method whose split
/// has a single part: in 1-D with no source terms, Lie and Strang splitting
/// both apply the method once to the whole of L ([`crate::time::increment::split_parts`]:
/// one part, the terms along the only axis), so G = R(ΔtL) and the one-step
/// closed form ([`super::closed_form::long_wave_limit`]) holds as it is
/// (Heun split in 1-D, seed 5904). None with several parts, where the
/// sub-steps do not commute.
fn single_part_split(
    inner: &crate::time::Method,
    op: &crate::operator::Operator,
    tolerance: f64,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    use crate::operator::TermKind;
    use crate::time::Scheme;
    let single = op.dims == 1
        && op
            .terms
            .iter()
            .all(|t| t.axis == 0 && t.kind != TermKind::Source);
    if !single {
        return None;
    }
    match &inner.scheme {
        Scheme::OneStep(os) => super::closed_form::long_wave_limit(os, op, tolerance, origin, n),
        _ => None,
    }
}

/// Points cutting [a, b] into [`PIECES`] pieces of equal ratio, b excluded.
fn cuts(a: f64, b: f64) -> impl Iterator<Item = f64> {
    let ratio = b / a;
    (1..PIECES).map(move |j| a * ratio.powf(j as f64 / PIECES as f64))
}

/// A bracket (stable, unstable) of a crossing inside the stretch between two
/// stable Δt `a` and `b` (with their excesses), or None where none was found.
///
/// Searched only where a tangent at an end reaches 0 inside the stretch
/// (without that, a concave excess stays below 0 throughout; a convex one lies
/// below its chord, which is below 0), by cutting it into pieces, `levels` deep.
fn hidden_crossing(
    eval: &dyn Fn(f64) -> (f64, f64),
    (a, ea): (f64, f64),
    (b, eb): (f64, f64),
    levels: usize,
) -> Option<(f64, f64)> {
    if levels == 0 || b.partial_cmp(&a) != Some(std::cmp::Ordering::Greater) {
        return None;
    }
    // a difference within rounding is no slope (a neutral mode's ρ − 1 is
    // rounding at every Δt)
    let slope = |x: f64, h: f64, e: f64| {
        let (ex, noise) = eval(x * (1.0 + h));
        let d = ex - e;
        if d.abs() > SLOPE_CLARITY * noise {
            d / (x * h)
        } else {
            0.0
        }
    };
    let slope_a = slope(a, SLOPE_STEP, ea);
    let slope_b = -slope(b, -SLOPE_STEP, eb);
    let from_a = slope_a > 0.0 && a - ea / slope_a < b;
    let from_b = slope_b < 0.0 && b - eb / slope_b > a;
    if !(from_a || from_b) {
        return None;
    }
    let mut left = (a, ea);
    for t in cuts(a, b).chain(std::iter::once(b)) {
        let (e, noise) = if t == b { (eb, 0.0) } else { eval(t) };
        if e > SLOPE_CLARITY * noise {
            return Some((left.0, t));
        }
        if e > 0.0 {
            // unstable only by a hair: rounding (near-defective eigenvalues
            // cost more than the rounding level) can say that; no verdict
            return None;
        }
        if let Some(found) = hidden_crossing(eval, left, (t, e), levels - 1) {
            return Some(found);
        }
        left = (t, e);
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    /// An excess below 0 at both ends and at the rungs, positive on a window
    /// narrower than a rung: found, with the window's opening inside the bracket.
    #[test]
    fn a_window_between_stable_ends_is_found() {
        // rises through 0 at 2.35, peaks at 2.6, falls below 0 at 2.85,
        // then another branch climbs to -0.005 at 2.88
        let f = |t: f64| {
            let hump = 0.06 - 0.96 * (t - 2.6) * (t - 2.6);
            let late = -0.06 + 2.0 * (t - 2.85);
            hump.max(late.min(-0.005))
        };
        let eval = |t: f64| (f(t), 0.0);
        let (l, h) = hidden_crossing(&eval, (2.3, f(2.3)), (2.88, f(2.88)), LEVELS).unwrap();
        let opening = 2.6 - (0.06f64 / 0.96).sqrt();
        assert!(l <= opening && opening <= h, "[{l}, {h}] misses {opening}");
        assert!(f(l) <= 0.0 && f(h) > 0.0);
    }

    /// A concave excess whose tangents stay below 0 is not searched: no crossing.
    /// Nor is one whose changes are rounding (a neutral mode).
    #[test]
    fn a_stretch_below_its_tangents_has_no_crossing() {
        let calls = std::cell::Cell::new(0);
        let f = |t: f64| {
            calls.set(calls.get() + 1);
            -1.0 - 0.1 * (t - 2.0) * (t - 2.0)
        };
        let eval = |t: f64| (f(t), 0.0);
        assert_eq!(
            hidden_crossing(&eval, (1.0, f(1.0)), (3.0, f(3.0)), LEVELS),
            None
        );
        // the two ends and their two slopes
        assert_eq!(calls.get(), 4);
        let jitter = |t: f64| (-1e-16 + 1e-16 * (t * 1e6).sin(), 1e-16);
        let e = |t: f64| jitter(t).0;
        assert_eq!(
            hidden_crossing(&jitter, (1.0, e(1.0)), (1.25, e(1.25)), LEVELS),
            None
        );
    }
}
