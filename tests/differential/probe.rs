//! Stability at one wavevector: the excess ρ(G(θ, Δt)) − 1 − roundoff, and the
//! first Δt at which a wavevector loses stability, found by marching Δt upward
//! from a stable value and bisecting the first unstable step.

use crate::amplification::amplification;
use crate::delta::delta;
use crate::radius::{excess_of_delta, excess_with};
use crate::scheme::Scheme;
use crate::symbol::Parts;

/// Relative width at which a bisection in Δt stops.
const BISECTION_WIDTH: f64 = 1e-11;

/// The excess at one wavevector with precomputed pieces of L(θ).
pub struct Point<'a> {
    scheme: &'a Scheme,
    theta: Vec<f64>,
    parts: Parts,
    symbol_norm: f64,
    roundoff_scale: f64,
    allowance: f64,
}

impl<'a> Point<'a> {
    /// The wavevector θ of `scheme`, judged with the relative roundoff `allowance`.
    pub fn new(scheme: &'a Scheme, theta: Vec<f64>, allowance: f64) -> Point<'a> {
        let parts = Parts::at(scheme, &theta);
        let symbol_norm = parts.total().norm();
        let roundoff_scale = scheme.symbol_bound;
        Point {
            scheme,
            theta,
            parts,
            symbol_norm,
            roundoff_scale,
            allowance,
        }
    }

    /// The scheme.
    pub fn scheme(&self) -> &'a Scheme {
        self.scheme
    }

    /// The wavevector.
    pub fn theta(&self) -> &[f64] {
        &self.theta
    }

    /// ‖L(θ)‖_F.
    pub fn symbol_norm(&self) -> f64 {
        self.symbol_norm
    }

    /// ρ(G) − 1 − allowance·max(1, ‖G‖_F, Δt·max_θ‖L‖) at Δt (positive:
    /// unstable): roundoff in L is relative to its largest terms, wherever θ is.
    /// Where G − I has a direct form, ρ − 1 comes from it, and roundoff is
    /// relative to the local size of ΔtL (every entry of L is summed to full
    /// relative accuracy).
    pub fn excess(&self, dt: f64) -> f64 {
        if let Some(d) = delta(self.scheme, &self.parts, &self.theta, dt) {
            return excess_of_delta(&d, self.allowance, dt * self.symbol_norm);
        }
        let g = amplification(self.scheme, &self.parts, &self.theta, dt);
        excess_with(&g, self.allowance, dt * self.roundoff_scale)
    }

    /// The first loss of stability in (lo, hi], assuming stability at `lo`: `steps`
    /// geometric steps upward, then bisection of the first unstable one. None when
    /// every step up to `hi` is stable.
    pub fn first_loss_between(&self, lo: f64, hi: f64, steps: usize) -> Option<f64> {
        let ratio = (hi / lo).powf(1.0 / steps as f64);
        let mut a = lo;
        for k in 1..=steps {
            let b = if k == steps {
                hi
            } else {
                lo * ratio.powi(k as i32)
            };
            if self.excess(b) > 0.0 {
                return Some(self.bisect(a, b));
            }
            a = b;
        }
        None
    }

    /// Bisection between a stable `a` and an unstable `b`, finished by one
    /// secant step on the excess (which removes the half-width error where the
    /// excess is smooth and above noise at both ends).
    pub fn bisect(&self, mut a: f64, mut b: f64) -> f64 {
        let (mut ea, mut eb) = (self.excess(a), self.excess(b));
        while b - a > BISECTION_WIDTH * b {
            let mid = 0.5 * (a + b);
            let e = self.excess(mid);
            if e > 0.0 {
                (b, eb) = (mid, e);
            } else {
                (a, ea) = (mid, e);
            }
        }
        if ea.is_finite() && eb.is_finite() && eb > ea {
            a + (b - a) * (-ea / (eb - ea)).clamp(0.0, 1.0)
        } else {
            0.5 * (a + b)
        }
    }

    /// The first loss below `hi`, starting from `lo` and moving it down (factor
    /// 1.1, at most `descents` times) while it is unstable. Some(0) when no stable
    /// Δt was found, None when stable up to `hi`.
    pub fn first_loss_from(
        &self,
        mut lo: f64,
        hi: f64,
        steps: usize,
        descents: usize,
    ) -> Option<f64> {
        let mut k = 0;
        while self.excess(lo) > 0.0 {
            k += 1;
            if k > descents {
                return Some(0.0);
            }
            lo /= 1.1;
        }
        self.first_loss_between(lo, hi, steps)
    }
}

/// Many wavevectors with their pieces of L precomputed.
pub struct PointSet<'a> {
    /// The points.
    pub points: Vec<Point<'a>>,
}

impl<'a> PointSet<'a> {
    /// The set of wavevectors `thetas` of `scheme`.
    pub fn new(scheme: &'a Scheme, thetas: Vec<Vec<f64>>, allowance: f64) -> PointSet<'a> {
        PointSet {
            points: thetas
                .into_iter()
                .map(|t| Point::new(scheme, t, allowance))
                .collect(),
        }
    }

    /// 1 / max ‖L(θ)‖_F: the natural time scale.
    pub fn natural_scale(&self) -> f64 {
        let top = self
            .points
            .iter()
            .map(|p| p.symbol_norm())
            .fold(0.0, f64::max);
        1.0 / top.max(1e-300)
    }

    /// The largest excess at Δt and where.
    pub fn max_excess(&self, dt: f64) -> (f64, usize) {
        self.points
            .iter()
            .enumerate()
            .map(|(i, p)| (p.excess(dt), i))
            .fold((f64::NEG_INFINITY, 0), |a, b| if b.0 > a.0 { b } else { a })
    }

    /// Some unstable point at Δt (trying `hint` first), or None if all are stable.
    pub fn any_unstable(&self, dt: f64, hint: usize) -> Option<usize> {
        let n = self.points.len();
        (0..n)
            .map(|k| (hint + k) % n)
            .find(|&i| self.points[i].excess(dt) > 0.0)
    }

    /// The `count` points of largest excess at Δt.
    pub fn worst(&self, dt: f64, count: usize) -> Vec<usize> {
        let e = self.all_excess(dt);
        let mut order: Vec<usize> = (0..e.len()).collect();
        order.sort_by(|a, b| e[*b].total_cmp(&e[*a]));
        order.truncate(count);
        order
    }

    /// Excess of every point at Δt.
    pub fn all_excess(&self, dt: f64) -> Vec<f64> {
        self.points.iter().map(|p| p.excess(dt)).collect()
    }
}
