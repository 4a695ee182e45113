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
//! The stretch that ends on the first unstable rung is sampled the same way
//! before the bisection, so that the bracket holds the first crossing, not a
//! later one (a bisection converges on some transition of its bracket).

use super::loss::{FirstLoss, Loss};
use super::search::{power_law, CompositeEval, BISECTIONS, SMALL_DT_LEVELS};
use crate::numeric::bracket::bisect;
use crate::numeric::minimise::golden_max;

/// Ratio of successive rungs of the per-wavevector ladder.
const LADDER: f64 = 1.25;
/// Pieces a suspicious stretch is cut into, per level.
const PIECES: usize = 8;
/// Levels of cutting (8³ = 512 pieces of a rung at the finest).
const LEVELS: usize = 3;
/// Relative step of the one-sided slopes at the ends of a stretch.
const SLOPE_STEP: f64 = 1e-6;

/// The first loss of a composite scheme at one wavevector: a ladder upward from
/// `floor` (a Δt stable at every point of the grid) and bisection; below the
/// floor when the point is already unstable there.
pub struct PerTheta<'a> {
    ev: &'a CompositeEval<'a>,
    floor: f64,
}

impl<'a> PerTheta<'a> {
    /// For `ev`, starting from `floor`.
    pub fn new(ev: &'a CompositeEval<'a>, floor: f64) -> Self {
        PerTheta { ev, floor }
    }
}

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
            let excess = |dt: f64| self.ev.excess(theta, dt);
            let mut k = 0;
            let mut prev = (lo, excess(lo));
            let mut before: Option<(f64, f64)> = None;
            hi = lo * LADDER;
            loop {
                let e = excess(hi);
                if e > 0.0 {
                    break;
                }
                if let Some((l, h)) = hidden_crossing(&excess, prev, (hi, e), LEVELS) {
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
            (lo, hi) = first_unstable_piece(&excess, prev, hi, LEVELS);
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
        let (g0, noise) = self.ev.growth_and_noise(theta, hi);
        let (g1, _) = self.ev.growth_and_noise(theta, hi * (1.0 + 1e-6));
        let slope = (g1 - g0) / 1e-6;
        let trusted = g1 > 10.0 * noise && slope > 0.0;
        let offset = if trusted {
            (2.0 * noise / slope).min(1e-6)
        } else {
            0.0
        };
        Loss {
            dt: lo * (1.0 - offset),
            trusted,
            bound: true,
        }
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
    excess: &dyn Fn(f64) -> f64,
    (a, ea): (f64, f64),
    (b, eb): (f64, f64),
    levels: usize,
) -> Option<(f64, f64)> {
    if levels == 0 || b.partial_cmp(&a) != Some(std::cmp::Ordering::Greater) {
        return None;
    }
    let slope_a = (excess(a * (1.0 + SLOPE_STEP)) - ea) / (a * SLOPE_STEP);
    let slope_b = (eb - excess(b * (1.0 - SLOPE_STEP))) / (b * SLOPE_STEP);
    let from_a = slope_a > 0.0 && a - ea / slope_a < b;
    let from_b = slope_b < 0.0 && b - eb / slope_b > a;
    if !(from_a || from_b) {
        return None;
    }
    let mut left = (a, ea);
    for t in cuts(a, b).chain(std::iter::once(b)) {
        let e = if t == b { eb } else { excess(t) };
        if e > 0.0 {
            return Some((left.0, t));
        }
        if let Some(found) = hidden_crossing(excess, left, (t, e), levels - 1) {
            return Some(found);
        }
        left = (t, e);
    }
    None
}

/// The piece of [lo, hi] (lo stable with excess `at_lo.1`, hi unstable) that
/// holds the first crossing: the first unstable cut, with the stable stretches
/// before it examined by [`hidden_crossing`], cut again `levels` deep.
fn first_unstable_piece(
    excess: &dyn Fn(f64) -> f64,
    at_lo: (f64, f64),
    hi: f64,
    levels: usize,
) -> (f64, f64) {
    if levels == 0 {
        return (at_lo.0, hi);
    }
    let mut left = at_lo;
    for t in cuts(at_lo.0, hi) {
        let e = excess(t);
        if e > 0.0 {
            return first_unstable_piece(excess, left, t, levels - 1);
        }
        if let Some(found) = hidden_crossing(excess, left, (t, e), levels - 1) {
            return found;
        }
        left = (t, e);
    }
    first_unstable_piece(excess, left, hi, levels - 1)
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
        let (l, h) = hidden_crossing(&f, (2.3, f(2.3)), (2.88, f(2.88)), LEVELS).unwrap();
        let opening = 2.6 - (0.06f64 / 0.96).sqrt();
        assert!(l <= opening && opening <= h, "[{l}, {h}] misses {opening}");
        assert!(f(l) <= 0.0 && f(h) > 0.0);
    }

    /// A concave excess whose tangents stay below 0 is not searched: no crossing.
    #[test]
    fn a_stretch_below_its_tangents_has_no_crossing() {
        let calls = std::cell::Cell::new(0);
        let f = |t: f64| {
            calls.set(calls.get() + 1);
            -1.0 - 0.1 * (t - 2.0) * (t - 2.0)
        };
        assert_eq!(
            hidden_crossing(&f, (1.0, f(1.0)), (3.0, f(3.0)), LEVELS),
            None
        );
        // the two ends and their two slopes
        assert_eq!(calls.get(), 4);
    }

    /// When the end of a stretch is unstable after a window that closes again,
    /// the piece returned holds the window's opening, not the later crossing.
    #[test]
    fn the_first_of_two_crossings_is_bracketed() {
        let f = |t: f64| {
            if t < 2.0 {
                -0.5 + 0.4 * (t - 1.0)
            } else if t < 2.2 {
                0.01
            } else if t < 2.9 {
                -0.2
            } else {
                0.3
            }
        };
        // the window [2.0, 2.2) is wider than a cut of [1.0, 3.0] (ratio 3^(1/8))
        let (l, h) = first_unstable_piece(&f, (1.0, f(1.0)), 3.0, LEVELS);
        assert!(l < 2.0 && (2.0..2.2).contains(&h), "[{l}, {h}]");
    }
}
