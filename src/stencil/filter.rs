//! Spatial low-pass filters applied once per time step, as aeroacoustics and
//! geophysical codes use them to remove grid-scale noise, and their transfer
//! functions T(θ) along one axis.
//!
//! * Explicit centred filter of order 2p (p = 1..5): the solution minus σ times
//!   the scaled 2p-th difference, û_i = u_i − σ (−1)^p 4^{−p} (δ^{2p} u)_i, a
//!   (2p + 1)-point stencil with T(θ) = 1 − σ sin^{2p}(θ/2). σ = 1 removes the
//!   two-cell wave (T(π) = 0).
//! * Compact (Padé-type) filter of order 2N (N = 1..5) with parameter α_f:
//!   α_f û_{i−1} + û_i + α_f û_{i+1} = Σ_{n=0}^{N} (a_n/2)(u_{i+n} + u_{i−n}),
//!   T(θ) = Σ a_n cos(nθ) / (1 + 2α_f cos θ), with the coefficients a_n(α_f) of
//!   Gaitonde & Visbal (2000) (the same family as Lele 1992; the table is
//!   written from memory of the published one and checked in the tests against
//!   the closed form T(θ) = 1 − (1 − 2α_f) sin^{2N}(θ/2) / (1 + 2α_f cos θ) that
//!   the maximally flat filter with T(π) = 0 must have). −½ < α_f < ½; α_f → ½
//!   leaves more of the resolved band untouched.
//!
//! On a grid of several axes the filter is applied along each axis in turn, so
//! F(θ) = Π_d T(θ_d): a scalar, the same for every variable (each variable is
//! filtered on its own grid, so staggering does not change it).

/// The kind of filter and its parameter.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FilterKind {
    /// Explicit centred filter of strength σ in (0, 1].
    Explicit {
        /// σ: the fraction of the two-cell wave removed per application.
        strength: f64,
    },
    /// Compact filter with parameter α_f in (−½, ½).
    Compact {
        /// α_f: the left-hand side's off-diagonal weight.
        alpha: f64,
    },
}

/// A spatial filter: kind and even order 2..10.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SpatialFilter {
    /// Explicit or compact, with its parameter.
    pub kind: FilterKind,
    /// Formal order of accuracy, even, 2..=10 (1 − T = O(θ^order)).
    pub order: u32,
}

/// Why a filter was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FilterError {
    /// The order is not one of 2, 4, 6, 8, 10.
    #[error("order must be 2, 4, 6, 8 or 10, got {0}")]
    Order(i64),
    /// σ outside (0, 1].
    #[error("strength must lie in (0, 1] (1 removes the two-cell wave), got {0}")]
    Strength(f64),
    /// α_f outside (−½, ½).
    #[error("alpha must lie in (-0.5, 0.5) (typical 0.4 to 0.49), got {0}")]
    Alpha(f64),
}

impl SpatialFilter {
    /// An explicit centred filter, checked.
    pub fn explicit(order: i64, strength: f64) -> Result<Self, FilterError> {
        let order = check_order(order)?;
        if !(strength > 0.0 && strength <= 1.0) {
            return Err(FilterError::Strength(strength));
        }
        Ok(Self {
            kind: FilterKind::Explicit { strength },
            order,
        })
    }

    /// A compact filter, checked.
    pub fn compact(order: i64, alpha: f64) -> Result<Self, FilterError> {
        let order = check_order(order)?;
        if !(alpha > -0.5 && alpha < 0.5) {
            return Err(FilterError::Alpha(alpha));
        }
        Ok(Self {
            kind: FilterKind::Compact { alpha },
            order,
        })
    }

    /// Short label, e.g. "compact 10th-order filter (alpha_f = 0.49)".
    pub fn label(&self) -> String {
        match self.kind {
            FilterKind::Explicit { strength } => {
                format!("explicit order-{} filter (sigma = {strength})", self.order)
            }
            FilterKind::Compact { alpha } => {
                format!("compact order-{} filter (alpha_f = {alpha})", self.order)
            }
        }
    }

    /// 1 − T(θ) along one axis, formed without cancellation (the damping per
    /// step of the wave θ; tiny and exact at long waves).
    pub fn damping(&self, theta: f64) -> f64 {
        let p = (self.order / 2) as i32;
        let s = (0.5 * theta).sin().powi(2 * p);
        match self.kind {
            FilterKind::Explicit { strength } => strength * s,
            FilterKind::Compact { alpha } => {
                (1.0 - 2.0 * alpha) * s / (1.0 + 2.0 * alpha * theta.cos())
            }
        }
    }

    /// T(θ) along one axis.
    pub fn transfer(&self, theta: f64) -> f64 {
        1.0 - self.damping(theta)
    }

    /// 1 − F(θ) of the filter applied along every axis, F = Π_d T(θ_d), formed
    /// without cancellation: 1 − (1 − a)(1 − b) = a + b − ab.
    pub fn damping_nd(&self, theta: &[f64]) -> f64 {
        theta.iter().fold(0.0, |acc, t| {
            let s = self.damping(*t);
            acc + s - acc * s
        })
    }

    /// The stencil as written in a code: right-hand weights w_{−n..n} (offsets
    /// −n..n) and the left-hand weights (α_f, 1, α_f), or (0, 1, 0) for the
    /// explicit filter.
    pub fn stencil(&self) -> (Vec<f64>, [f64; 3]) {
        let n = (self.order / 2) as usize;
        match self.kind {
            FilterKind::Explicit { strength } => {
                // û = u − σ (−1)^p 4^{−p} δ^{2p} u, and δ^{2p} has the weight
                // (−1)^{p+j} C(2p, p + j) at offset j: the filter's weight there
                // is [j = 0] − σ 4^{−p} (−1)^j C(2p, p + j)
                let scale = strength * 4f64.powi(-(n as i32));
                let mut w: Vec<f64> = (0..=2 * n)
                    .map(|k| {
                        let sign = if (k + n).is_multiple_of(2) { 1.0 } else { -1.0 };
                        -scale * sign * binomial(2 * n, k)
                    })
                    .collect();
                w[n] += 1.0;
                (w, [0.0, 1.0, 0.0])
            }
            FilterKind::Compact { alpha } => {
                let a = compact_coefficients(n, alpha);
                let mut w = vec![0.0; 2 * n + 1];
                w[n] = a[0];
                for (k, ak) in a.iter().enumerate().skip(1) {
                    w[n + k] = 0.5 * ak;
                    w[n - k] = 0.5 * ak;
                }
                (w, [alpha, 1.0, alpha])
            }
        }
    }

    /// T(θ) evaluated from [`SpatialFilter::stencil`] (the weights a code uses),
    /// independent of the closed form of [`SpatialFilter::transfer`].
    pub fn transfer_from_stencil(&self, theta: f64) -> f64 {
        let (w, lhs) = self.stencil();
        let n = (w.len() / 2) as i64;
        let rhs: f64 = w
            .iter()
            .enumerate()
            .map(|(k, wk)| wk * ((k as i64 - n) as f64 * theta).cos())
            .sum();
        rhs / (lhs[1] + 2.0 * lhs[0] * theta.cos())
    }
}

fn check_order(order: i64) -> Result<u32, FilterError> {
    match order {
        2 | 4 | 6 | 8 | 10 => Ok(order as u32),
        _ => Err(FilterError::Order(order)),
    }
}

fn binomial(n: usize, k: usize) -> f64 {
    (0..k).fold(1.0, |acc, i| acc * (n - i) as f64 / (i + 1) as f64)
}

/// a_0..a_N of the compact filter of order 2N (Gaitonde & Visbal 2000, Table;
/// written from memory, checked against the closed form in the tests).
pub fn compact_coefficients(n: usize, alpha: f64) -> Vec<f64> {
    let a = alpha;
    match n {
        1 => vec![0.5 + a, 0.5 + a],
        2 => vec![5.0 / 8.0 + 3.0 * a / 4.0, 0.5 + a, -1.0 / 8.0 + a / 4.0],
        3 => vec![
            11.0 / 16.0 + 5.0 * a / 8.0,
            15.0 / 32.0 + 17.0 * a / 16.0,
            -3.0 / 16.0 + 3.0 * a / 8.0,
            1.0 / 32.0 - a / 16.0,
        ],
        4 => vec![
            (93.0 + 70.0 * a) / 128.0,
            (7.0 + 18.0 * a) / 16.0,
            (-7.0 + 14.0 * a) / 32.0,
            (1.0 - 2.0 * a) / 16.0,
            (-1.0 + 2.0 * a) / 128.0,
        ],
        _ => vec![
            (193.0 + 126.0 * a) / 256.0,
            (105.0 + 302.0 * a) / 256.0,
            15.0 * (-1.0 + 2.0 * a) / 64.0,
            45.0 * (1.0 - 2.0 * a) / 512.0,
            5.0 * (-1.0 + 2.0 * a) / 256.0,
            (1.0 - 2.0 * a) / 512.0,
        ],
    }
}
