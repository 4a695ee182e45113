//! Finite-difference stencils: explicit and compact (Padé-type), their Fourier
//! symbols, their order of accuracy from Taylor moments, and their largest
//! modified wavenumber.
//!
//! A stencil for the d-th derivative on a unit grid (h = 1) is
//! Σ_k a_k f^{(d)}(x + p_k) ≈ Σ_j w_j f(x + o_j). Substituting f = e^{iθx} gives
//! the symbol S(θ) = Σ_j w_j e^{iθ o_j} / Σ_k a_k e^{iθ p_k} ≈ (iθ)^d. On a grid of
//! spacing h the symbol of the derivative is S(θ)/h^d.
//!
//! Consistency and order follow from the Taylor moments: the coefficient of
//! f^{(n)} is Σ_j w_j o_j^n/n! on the right and Σ_k a_k p_k^{n−d}/(n−d)! on the
//! left; the order is the first n where they differ, minus d.

pub mod catalogue;
pub mod filter;
mod series;
mod series_cache;

use num_complex::Complex64 as C64;

/// A finite-difference stencil on a unit grid.
#[derive(Debug, Clone, PartialEq)]
pub struct Stencil {
    /// Name, as used in case files.
    pub name: String,
    /// Which derivative it approximates (1 or 2).
    pub derivative: u32,
    /// Offsets of the right-hand side, in cells.
    pub offsets: Vec<f64>,
    /// Weights of the right-hand side.
    pub weights: Vec<f64>,
    /// Offsets of the implicit (compact) left-hand side; `[0]` for explicit stencils.
    pub implicit_offsets: Vec<f64>,
    /// Weights of the implicit left-hand side; `[1]` for explicit stencils.
    pub implicit_weights: Vec<f64>,
    /// Formal order of accuracy, from the Taylor moments.
    pub order: u32,
    /// The long-wave series of the symbol, prepared on first use.
    series: series_cache::SeriesCache,
}

/// Why a stencil was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum StencilError {
    /// Offsets and weights differ in length, or are empty.
    #[error("stencil '{name}': {what}")]
    Shape {
        /// Stencil name.
        name: String,
        /// What is wrong.
        what: String,
    },
    /// The stencil does not approximate its derivative.
    #[error(
        "stencil '{name}' is not consistent with derivative {derivative}: the Taylor moment of order {moment} is {got:.6e} but should be {want:.6e}"
    )]
    Inconsistent {
        /// Stencil name.
        name: String,
        /// Derivative it claims.
        derivative: u32,
        /// Moment index that fails.
        moment: u32,
        /// Value found.
        got: f64,
        /// Value needed.
        want: f64,
    },
}

/// Largest moment examined when computing the order of accuracy.
const MAX_MOMENT: u32 = 24;

impl Stencil {
    /// Builds a stencil and computes its order; refuses inconsistent ones.
    pub fn new(
        name: &str,
        derivative: u32,
        offsets: Vec<f64>,
        weights: Vec<f64>,
        implicit: Option<(Vec<f64>, Vec<f64>)>,
    ) -> Result<Self, StencilError> {
        let shape = |what: &str| StencilError::Shape {
            name: name.to_string(),
            what: what.to_string(),
        };
        if !(1..=2).contains(&derivative) {
            return Err(shape("derivative must be 1 or 2"));
        }
        if offsets.is_empty() || offsets.len() != weights.len() {
            return Err(shape(
                "offsets and weights must be non-empty and of equal length",
            ));
        }
        let (io, iw) = implicit.unwrap_or((vec![0.0], vec![1.0]));
        if io.is_empty() || io.len() != iw.len() {
            return Err(shape(
                "implicit_offsets and implicit_weights must be non-empty and of equal length",
            ));
        }
        let all = offsets.iter().chain(&weights).chain(&io).chain(&iw);
        if all.clone().any(|x| !x.is_finite()) {
            return Err(shape("offsets and weights must be finite numbers"));
        }
        let mut s = Stencil {
            name: name.to_string(),
            derivative,
            offsets,
            weights,
            implicit_offsets: io,
            implicit_weights: iw,
            order: 0,
            series: Default::default(),
        };
        s.order = s.order_of_accuracy()?;
        Ok(s)
    }

    /// Whether the stencil has an implicit left-hand side.
    pub fn is_compact(&self) -> bool {
        !(self.implicit_offsets.len() == 1 && self.implicit_offsets[0] == 0.0)
    }

    /// Taylor-moment order of accuracy (see the module documentation).
    fn order_of_accuracy(&self) -> Result<u32, StencilError> {
        let d = self.derivative;
        let mut fact = 1.0_f64;
        for n in 0..=MAX_MOMENT {
            if n > 0 {
                fact *= n as f64;
            }
            let rhs_terms = self
                .offsets
                .iter()
                .zip(&self.weights)
                .map(|(o, w)| w * o.powi(n as i32) / fact);
            let rhs: f64 = rhs_terms.clone().sum();
            let mut scale: f64 = rhs_terms.map(f64::abs).sum();
            let lhs = if n >= d {
                let k = n - d;
                let kf: f64 = (1..=k).map(|x| x as f64).product();
                let terms = self
                    .implicit_offsets
                    .iter()
                    .zip(&self.implicit_weights)
                    .map(|(p, a)| a * p.powi(k as i32) / kf);
                scale += terms.clone().map(f64::abs).sum::<f64>();
                terms.sum()
            } else {
                0.0
            };
            // Relative 1e-7: published coefficients are often quoted to eight digits.
            let tol = 1e-7 * scale.max(1e-300) + 1e-14;
            if (rhs - lhs).abs() > tol {
                if n <= d {
                    return Err(StencilError::Inconsistent {
                        name: self.name.clone(),
                        derivative: d,
                        moment: n,
                        got: rhs,
                        want: lhs,
                    });
                }
                return Ok(n - d);
            }
        }
        Ok(MAX_MOMENT - d + 1)
    }

    /// The symbol S(θ) on a unit grid (≈ (iθ)^d for small θ).
    ///
    /// Weights at offsets ±o are combined first, (w₊ + w₋) cos θo + i(w₊ − w₋) sin θo,
    /// so an antisymmetric (central first-derivative) stencil has an exactly
    /// imaginary symbol and a symmetric one an exactly real symbol: roundoff cannot
    /// give a neutral scheme a spurious real part.
    ///
    /// At long wavelengths (|θ|·max|o| ≤ 1) the symbol is summed as a
    /// polynomial in sin²(θ/2) (`series`), so that a real part vanishing like
    /// a high power of θ keeps its relative accuracy.
    pub fn symbol(&self, theta: f64) -> C64 {
        if let Some((s, _)) = self.long_wave(theta) {
            return s;
        }
        let num = paired_sum(&self.offsets, &self.weights, theta);
        if !self.is_compact() {
            return num / self.implicit_weights[0];
        }
        num / paired_sum(&self.implicit_offsets, &self.implicit_weights, theta)
    }

    /// dS/dθ, the derivative of [`Stencil::symbol`]: Σ i·o·w_o e^{ioθ} over the
    /// explicit side, by the quotient rule for a compact stencil.
    pub fn symbol_derivative(&self, theta: f64) -> C64 {
        let slope = sum_derivative(&self.offsets, &self.weights, theta);
        if !self.is_compact() {
            return slope / self.implicit_weights[0];
        }
        let num = paired_sum(&self.offsets, &self.weights, theta);
        let den = paired_sum(&self.implicit_offsets, &self.implicit_weights, theta);
        let den_slope = sum_derivative(&self.implicit_offsets, &self.implicit_weights, theta);
        (slope * den - num * den_slope) / (den * den)
    }

    /// The rounding level of the real part of [`Stencil::symbol`] at θ: the real
    /// part is −2Σ(w_o + w_−o) sin²(θo/2) over the explicit side (divided by the
    /// implicit side for a compact stencil), whose terms cancel to a higher power
    /// of θ for biased stencils (θ⁴ for third-order upwinding) while each carries
    /// a relative rounding of ε.
    ///
    /// At long wavelengths the series' own rounding scale (`series`).
    pub fn real_noise(&self, theta: f64) -> f64 {
        if let Some((_, noise)) = self.long_wave(theta) {
            return noise;
        }
        // paired as in the symbol: w_o + w_−o per pair, so a central stencil
        // (w_o = −w_−o) has an exactly zero real part and no rounding in it
        let scale: f64 = self
            .offsets
            .iter()
            .zip(&self.weights)
            .filter(|(o, _)| !(**o < 0.0 && self.offsets.contains(&-**o)))
            .map(|(o, w)| {
                let partner = match *o > 0.0 {
                    true => self
                        .offsets
                        .iter()
                        .zip(&self.weights)
                        .find(|(p, _)| **p == -*o)
                        .map_or(0.0, |(_, wp)| *wp),
                    false => 0.0,
                };
                (w + partner).abs() * 2.0 * (0.5 * theta * o).sin().powi(2)
            })
            .sum();
        let lhs = if self.is_compact() {
            paired_sum(&self.implicit_offsets, &self.implicit_weights, theta).norm()
        } else {
            self.implicit_weights[0].abs()
        };
        let value = self.symbol(theta);
        4.0 * f64::EPSILON * (scale / lhs.max(1e-300) + value.re.abs())
    }

    /// The symbol and the rounding of its real part from the long-wave series,
    /// where it applies.
    fn long_wave(&self, theta: f64) -> Option<(C64, f64)> {
        let parts = [
            &self.offsets[..],
            &self.weights,
            &self.implicit_offsets,
            &self.implicit_weights,
        ];
        self.series.with(parts, |s| s?.symbol(theta))
    }

    /// The modified wavenumber: −i·S(θ) for a first derivative, −S(θ) for a second,
    /// so that it approximates θ or θ² respectively.
    pub fn modified_wavenumber(&self, theta: f64) -> C64 {
        match self.derivative {
            1 => self.symbol(theta) * C64::new(0.0, -1.0),
            _ => -self.symbol(theta),
        }
    }

    /// The mirror image (offsets negated), which approximates the same derivative:
    /// used for the left-going part of an upwinded flux.
    pub fn mirror(&self) -> Stencil {
        let sign = if self.derivative % 2 == 1 { -1.0 } else { 1.0 };
        Stencil {
            name: format!("{}-mirror", self.name),
            derivative: self.derivative,
            offsets: self.offsets.iter().map(|o| -o).collect(),
            weights: self.weights.iter().map(|w| sign * w).collect(),
            implicit_offsets: self.implicit_offsets.iter().map(|o| -o).collect(),
            implicit_weights: self.implicit_weights.clone(),
            order: self.order,
            series: Default::default(),
        }
    }

    /// Whether the stencil equals its mirror image (central): its symbol is then
    /// purely imaginary (first derivative) or real (second), i.e. non-dissipative.
    pub fn is_central(&self) -> bool {
        let m = self.mirror();
        (0..16).all(|k| {
            let t = 0.1 + 0.19 * k as f64;
            (self.symbol(t) - m.symbol(t)).norm() <= 1e-12 * (1.0 + self.symbol(t).norm())
        })
    }

    /// The largest |modified wavenumber| over θ ∈ [0, π] (real part of the modified
    /// wavenumber for first derivatives, the value itself for second), and where it is.
    /// Found on a fine grid and refined by golden-section search.
    pub fn max_modified_wavenumber(&self) -> (f64, f64) {
        let f = |t: f64| self.modified_wavenumber(t).norm();
        let n = 2048;
        let (mut best_t, mut best) = (0.0, f(0.0));
        for i in 1..=n {
            let t = std::f64::consts::PI * i as f64 / n as f64;
            let v = f(t);
            if v > best {
                best = v;
                best_t = t;
            }
        }
        let h = std::f64::consts::PI / n as f64;
        let (t, v) = crate::numeric::minimise::golden_max(
            &f,
            (best_t - h).max(0.0),
            (best_t + h).min(std::f64::consts::PI),
        );
        if v > best {
            (v, t)
        } else {
            (best, best_t)
        }
    }
}

impl Stencil {
    /// Resolving efficiency for a relative error `tol` of the modified wavenumber:
    /// the largest θ_r such that |k*(θ)/θ^d − 1| ≤ tol on (0, θ_r] (first
    /// derivatives compare Re k* with θ, second derivatives k* with θ²), returned
    /// as (θ_r/π, points per wavelength 2π/θ_r).
    pub fn resolving_efficiency(&self, tol: f64) -> (f64, f64) {
        let err = |t: f64| {
            let k = self.modified_wavenumber(t);
            match self.derivative {
                1 => (k.re / t - 1.0).abs(),
                _ => (k.re / (t * t) - 1.0).abs(),
            }
        };
        let n = 4096;
        let pi = std::f64::consts::PI;
        let mut last = 1e-6;
        for i in 1..=n {
            let t = pi * i as f64 / n as f64;
            if err(t) > tol {
                let (a, _) = crate::numeric::bracket::bisect(|x| err(x) <= tol, last, t, 0.0, 60);
                return (a / pi, 2.0 * pi / a);
            }
            last = t;
        }
        (1.0, 2.0)
    }
}

/// d/dθ Σ w_o e^{ioθ} = Σ o·w_o (−sin oθ + i cos oθ).
fn sum_derivative(offsets: &[f64], weights: &[f64], theta: f64) -> C64 {
    let (mut re, mut im) = (0.0, 0.0);
    for (&o, &w) in offsets.iter().zip(weights) {
        let (sin, cos) = (theta * o).sin_cos();
        re -= o * w * sin;
        im += o * w * cos;
    }
    C64::new(re, im)
}

/// Σ_j w_j e^{iθ o_j}, with the terms at ±o combined into cosine and sine parts
/// and the cosines written as cos x = 1 − 2 sin²(x/2): the real part is
/// Σ_j w_j − 2 Σ_j w_j sin²(θ o_j/2), so for a derivative stencil (Σ w_j = 0) it
/// is a sum of small terms at long wavelengths, free of the cancellation of
/// Σ w_j cos(θ o_j) (for the second difference, 2 cos θ − 2 loses all digits as
/// θ → 0 while −4 sin²(θ/2) keeps them). A zeroth moment that is zero to
/// rounding is taken as exactly zero.
fn paired_sum(offsets: &[f64], weights: &[f64], theta: f64) -> C64 {
    let total: f64 = weights.iter().sum();
    let size: f64 = weights.iter().map(|w| w.abs()).sum();
    let total = if total.abs() <= 4.0 * f64::EPSILON * size {
        0.0
    } else {
        total
    };
    let mut re = 0.0;
    let mut im = 0.0;
    for (j, (&o, &w)) in offsets.iter().zip(weights).enumerate() {
        if o < 0.0 && offsets.iter().any(|&p| p == -o) {
            continue; // added with its partner
        }
        let partner = if o > 0.0 {
            offsets
                .iter()
                .zip(weights)
                .enumerate()
                .find(|(k, (p, _))| *k != j && **p == -o)
                .map_or(0.0, |(_, (_, wp))| *wp)
        } else {
            0.0
        };
        let half = (0.5 * theta * o).sin();
        re -= 2.0 * (w + partner) * half * half;
        im += (w - partner) * (theta * o).sin();
    }
    C64::new(total + re, im)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn second_difference_keeps_its_digits_at_long_wavelengths() {
        // −4 sin²(θ/2) (common practice); 2 cos θ − 2 would lose every digit here.
        let st = catalogue::builtin("central2", 2).unwrap();
        for theta in [1e-3, 1e-6, 1e-9] {
            let want = -4.0 * (0.5f64 * theta).sin().powi(2);
            let got = st.symbol(theta);
            assert!(
                (got.re - want).abs() <= 4.0 * f64::EPSILON * want.abs(),
                "{theta}"
            );
            assert_eq!(got.im, 0.0);
        }
        let up = catalogue::builtin("upwind1", 1).unwrap();
        let theta = 1e-7;
        // 1 − e^{−iθ}: real part 2 sin²(θ/2)
        let want = 2.0 * (0.5f64 * theta).sin().powi(2);
        assert!((up.symbol(theta).re - want).abs() <= 4.0 * f64::EPSILON * want);
    }

    /// A biased compact stencil (¼f′ⱼ₋₁ + f′ⱼ = (f₋₂/12 − 9f₋₁/8 + 3f₀/4 +
    /// 7f₁/24)/h, third order, weights solved from the Taylor moments in the
    /// test's derivation): its real part vanishes like θ⁴, so Re S(θ)/θ⁴ tends
    /// to a constant. The constant is extrapolated from θ = 1e-2 and 5e-3
    /// (where the closed sums are accurate to ~1e-11) and the symbol must keep
    /// it to 1e-8 at θ = 1e-6, where the closed sums keep about 4 digits; the
    /// series and the closed sums agree on both sides of the switch.
    #[test]
    fn biased_compact_real_part_keeps_its_digits() {
        let st = Stencil::new(
            "biased-compact",
            1,
            vec![-2.0, -1.0, 0.0, 1.0],
            vec![1.0 / 12.0, -9.0 / 8.0, 0.75, 7.0 / 24.0],
            Some((vec![-1.0, 0.0], vec![0.25, 1.0])),
        )
        .unwrap();
        assert_eq!(st.order, 3);
        let closed = |t: f64| {
            paired_sum(&st.offsets, &st.weights, t)
                / paired_sum(&st.implicit_offsets, &st.implicit_weights, t)
        };
        let ratio = |t: f64| closed(t).re / t.powi(4);
        // Re S = C θ⁴ + O(θ⁶): Richardson on θ²
        let constant = (4.0 * ratio(5e-3) - ratio(1e-2)) / 3.0;
        assert!(
            constant.abs() > 1e-3,
            "a real part of order four: {constant}"
        );
        for t in [1e-6, 1e-7, 1e-8] {
            let got = st.symbol(t).re / t.powi(4);
            assert!(
                (got - constant).abs() <= 1e-8 * constant.abs(),
                "θ {t}: {got} against {constant}"
            );
            assert!(st.real_noise(t) <= 1e-12 * st.symbol(t).re.abs());
        }
        for t in [0.49, 0.51] {
            assert!((st.symbol(t) - closed(t)).norm() <= 1e-13, "θ {t}");
        }
    }

    #[test]
    fn inconsistent_stencil_is_refused() {
        let e = Stencil::new("bad", 1, vec![-1.0, 1.0], vec![-1.0, 1.0], None);
        assert!(matches!(e, Err(StencilError::Inconsistent { .. })));
    }

    #[test]
    fn mirror_of_upwind_is_consistent() {
        let s = Stencil::new("up", 1, vec![-1.0, 0.0], vec![-1.0, 1.0], None).unwrap();
        let m = s.mirror();
        let again = Stencil::new("m", 1, m.offsets.clone(), m.weights.clone(), None).unwrap();
        assert_eq!(again.order, 1);
    }
}
