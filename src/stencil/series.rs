//! A stencil's symbol at long wavelengths without cancellation.
//!
//! With offsets that are multiples of a step q (1 on a collocated grid, ½ on a
//! staggered one), write φ = qθ, n = o/q and v = sin²(φ/2). Then
//! cos(nφ) = Tₙ(1 − 2v) and sin(nφ) = sin φ · Uₙ₋₁(1 − 2v) (Chebyshev
//! polynomials), so a weighted sum Σ w_o e^{iθo} is C(v) + i sin φ · S(v) with
//! polynomials C and S whose coefficients come from the weights alone. For a
//! biased stencil the real part vanishes like a high power of θ (θ⁴ for
//! second- and third-order upwinding): summing Σ w_o cos(θo), or even
//! −2Σ w_o sin²(θo/2), cancels terms of order θ² down to that power and keeps
//! a relative accuracy of only ε/θ², while C(v) has its low coefficients
//! exactly (or, for weights given to rounding, nearly) zero and keeps the
//! relative accuracy of its leading term. A compact stencil's real part,
//! Re(N/D) = (N_C D_C + sin²φ N_S D_S)/|D|², is the polynomial
//! N_C D_C + 4v(1 − v) N_S D_S over |D|², again free of cancellation.
//!
//! The series is used for |θ|·max|o| ≤ 1, where its terms fall off like
//! 1/(2k)!; beyond, the closed sums are accurate.

use num_complex::Complex64 as C64;
use std::sync::OnceLock;

/// Largest n = o/q the series handles.
const MAX_STEPS: usize = 64;

/// Coefficients in v of Tₙ(1 − 2v) (index n) and Uₙ(1 − 2v).
struct Chebyshev {
    t: Vec<Vec<f64>>,
    u: Vec<Vec<f64>>,
}

fn chebyshev() -> &'static Chebyshev {
    static TABLE: OnceLock<Chebyshev> = OnceLock::new();
    TABLE.get_or_init(|| {
        // P_{n+1} = 2(1 − 2v)P_n − P_{n−1}
        let next = |a: &[f64], b: &[f64]| -> Vec<f64> {
            let mut out = vec![0.0; a.len() + 1];
            for (k, x) in a.iter().enumerate() {
                out[k] += 2.0 * x;
                out[k + 1] -= 4.0 * x;
            }
            for (k, x) in b.iter().enumerate() {
                out[k] -= x;
            }
            out
        };
        let mut t = vec![vec![1.0], vec![1.0, -2.0]];
        let mut u = vec![vec![1.0], vec![2.0, -4.0]];
        for n in 1..MAX_STEPS {
            t.push(next(&t[n], &t[n - 1]));
            u.push(next(&u[n], &u[n - 1]));
        }
        Chebyshev { t, u }
    })
}

/// A polynomial in v with, per coefficient, the sum of the magnitudes that
/// made it (its rounding scale).
#[derive(Debug, Clone, Default)]
struct Poly {
    c: Vec<f64>,
    size: Vec<f64>,
}

impl Poly {
    fn add(&mut self, k: usize, term: f64) {
        if self.c.len() <= k {
            self.c.resize(k + 1, 0.0);
            self.size.resize(k + 1, 0.0);
        }
        self.c[k] += term;
        self.size[k] += term.abs();
    }

    /// Coefficients within rounding of zero are taken as exactly zero, with
    /// no rounding (the vanishing moments of a stencil whose weights are given
    /// to rounding, as the zeroth moment of every derivative stencil).
    fn cleaned(mut self) -> Self {
        for (c, s) in self.c.iter_mut().zip(self.size.iter_mut()) {
            if c.abs() <= 4.0 * f64::EPSILON * *s {
                *c = 0.0;
                *s = 0.0;
            }
        }
        self
    }

    fn product(&self, other: &Poly) -> Poly {
        Poly {
            c: convolve(&self.c, &other.c),
            size: convolve(&self.size, &other.size),
        }
    }

    /// Multiplied by 4v(1 − v) = sin²φ.
    fn times_sin_squared(&self) -> Poly {
        let factor = Poly {
            c: vec![0.0, 4.0, -4.0],
            size: vec![0.0, 4.0, 4.0],
        };
        self.product(&factor)
    }

    fn sum(&self, other: &Poly) -> Poly {
        let n = self.c.len().max(other.c.len());
        let at = |x: &[f64], k: usize| x.get(k).copied().unwrap_or(0.0);
        Poly {
            c: (0..n).map(|k| at(&self.c, k) + at(&other.c, k)).collect(),
            size: (0..n)
                .map(|k| at(&self.size, k) + at(&other.size, k))
                .collect(),
        }
    }

    fn value(&self, v: f64) -> f64 {
        self.c.iter().rev().fold(0.0, |acc, c| acc * v + c)
    }

    fn scale(&self, v: f64) -> f64 {
        self.size.iter().rev().fold(0.0, |acc, c| acc * v + c)
    }
}

fn convolve(a: &[f64], b: &[f64]) -> Vec<f64> {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![0.0; a.len() + b.len() - 1];
    for (j, x) in a.iter().enumerate() {
        for (k, y) in b.iter().enumerate() {
            out[j + k] += x * y;
        }
    }
    out
}

/// One side of a stencil, Σ w_o e^{iθo} = C(v) + i sin(qθ)·S(v).
#[derive(Debug, Clone)]
struct Side {
    cos: Poly,
    sin: Poly,
}

/// The common step of the offsets (1 or ½), or None.
fn step(offsets: &[f64]) -> Option<f64> {
    let fits = |q: f64| {
        offsets.iter().all(|o| {
            let n = o / q;
            n == n.round() && n.abs() <= MAX_STEPS as f64
        })
    };
    [1.0, 0.5].into_iter().find(|q| fits(*q))
}

fn side(offsets: &[f64], weights: &[f64], q: f64) -> Side {
    let table = chebyshev();
    let (mut cos, mut sin) = (Poly::default(), Poly::default());
    // even and odd parts per |n|, so that a central stencil's cancel exactly
    let reach = offsets
        .iter()
        .fold(0usize, |m, o| m.max((o.abs() / q) as usize));
    let mut even = vec![0.0; reach + 1];
    let mut odd = vec![0.0; reach + 1];
    for (&o, &w) in offsets.iter().zip(weights) {
        let n = (o.abs() / q).round() as usize;
        even[n] += w;
        odd[n] += if o < 0.0 { -w } else { w };
    }
    for n in 0..=reach {
        if even[n] != 0.0 {
            for (k, t) in table.t[n].iter().enumerate() {
                cos.add(k, even[n] * t);
            }
        }
        if n > 0 && odd[n] != 0.0 {
            for (k, u) in table.u[n - 1].iter().enumerate() {
                sin.add(k, odd[n] * u);
            }
        }
    }
    Side {
        cos: cos.cleaned(),
        sin: sin.cleaned(),
    }
}

/// A stencil's long-wave series, prepared once: its polynomials in v depend
/// on the weights alone, so evaluating the symbol at a θ costs a few Horner
/// sums and no allocation.
#[derive(Debug, Clone)]
pub struct Series {
    /// max |o| over both sides: the series applies for |θ|·reach ≤ 1.
    reach: f64,
    /// The common step of the offsets.
    q: f64,
    num: Side,
    den: Side,
    /// Re(N D̄) = N_C D_C + sin²φ N_S D_S as one polynomial.
    real: Poly,
}

impl Series {
    /// The series of Σ w e^{iθo} / Σ a e^{iθp}, or None where it does not
    /// apply (offsets that are not multiples of ½ within 64 steps).
    pub fn new(
        offsets: &[f64],
        weights: &[f64],
        implicit_offsets: &[f64],
        implicit_weights: &[f64],
    ) -> Option<Series> {
        let reach = offsets
            .iter()
            .chain(implicit_offsets)
            .fold(0.0_f64, |m, o| m.max(o.abs()));
        let all: Vec<f64> = offsets.iter().chain(implicit_offsets).copied().collect();
        let q = step(&all)?;
        let mut num = side(offsets, weights, q);
        // the zeroth moment Σ w (the constant coefficient of the real part) is
        // summed from the paired sums w_o + w_−o, whose own rounding (ε|w_o| each)
        // the sizes do not carry: a weight total within rounding of Σ|w| is zero,
        // as in the closed sum beyond the series' range (seed 5000: a user
        // stencil whose weights sum to −5.6e-17 gave L(0) a positive real part,
        // and forward Euler was reported unstable at every Δt)
        let total_size: f64 = weights.iter().map(|w| w.abs()).sum();
        let within_rounding = |c: &f64| c.abs() <= 4.0 * f64::EPSILON * total_size;
        if num.cos.c.first().is_some_and(within_rounding) {
            num.cos.c[0] = 0.0;
            num.cos.size[0] = 0.0;
        }
        let den = side(implicit_offsets, implicit_weights, q);
        let real = num
            .cos
            .product(&den.cos)
            .sum(&num.sin.product(&den.sin).times_sin_squared())
            .cleaned();
        Some(Series {
            reach,
            q,
            num,
            den,
            real,
        })
    }

    /// The symbol and the rounding level of its real part at θ; None outside
    /// the series' range (|θ|·max|o| > 1).
    pub fn symbol(&self, theta: f64) -> Option<(C64, f64)> {
        if theta.abs() * self.reach > 1.0 || !theta.is_finite() {
            return None;
        }
        let phi = self.q * theta;
        let v = (0.5 * phi).sin().powi(2);
        let sin_phi = phi.sin();
        let (num, den) = (&self.num, &self.den);
        let (dc, ds) = (den.cos.value(v), sin_phi * den.sin.value(v));
        let modulus = dc * dc + ds * ds;
        // Im(N D̄) = sin φ (N_S D_C − N_C D_S)
        let re = self.real.value(v) / modulus;
        let im = sin_phi * (num.sin.value(v) * dc - num.cos.value(v) * den.sin.value(v)) / modulus;
        let noise = 4.0 * f64::EPSILON * (self.real.scale(v) / modulus + re.abs());
        Some((C64::new(re, im), noise))
    }
}

/// The symbol Σ w e^{iθo} / Σ a e^{iθp} and the rounding level of its real
/// part at θ, from the series; None outside its range (|θ|·max|o| > 1, or
/// offsets that are not multiples of ½ within 64 steps).
#[cfg(test)]
pub fn symbol(
    offsets: &[f64],
    weights: &[f64],
    implicit_offsets: &[f64],
    implicit_weights: &[f64],
    theta: f64,
) -> Option<(C64, f64)> {
    Series::new(offsets, weights, implicit_offsets, implicit_weights)?.symbol(theta)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The tables reproduce cos(nφ) and sin(nφ)/sin φ.
    #[test]
    fn chebyshev_tables_reproduce_multiple_angles() {
        let table = chebyshev();
        let phi = 0.37f64;
        let v = (0.5 * phi).sin().powi(2);
        for n in 0..12 {
            let value = |c: &[f64]| c.iter().rev().fold(0.0, |acc, x| acc * v + x);
            let t = value(&table.t[n]);
            assert!(((n as f64 * phi).cos() - t).abs() < 1e-12, "T_{n}");
            let u = value(&table.u[n]) * phi.sin();
            assert!((((n + 1) as f64 * phi).sin() - u).abs() < 1e-12, "U_{n}");
        }
    }

    /// Second-order upwinding (½, −2, 3⁄2 at −2, −1, 0): the real part is
    /// 3/2 − 2cos θ + ½cos 2θ = 4 sin⁴(θ/2) exactly (derived with
    /// cos θ = 1 − 2v, cos 2θ = 1 − 8v + 8v²), kept to a few ulps at θ = 1e-6,
    /// where −2Σ w sin²(θo/2) keeps only about 4 digits.
    #[test]
    fn biased_real_part_keeps_its_digits() {
        let (o, w) = ([-2.0, -1.0, 0.0], [0.5, -2.0, 1.5]);
        for theta in [1e-1, 1e-3, 2e-6, 1e-9] {
            let (s, noise) = symbol(&o, &w, &[0.0], &[1.0], theta).unwrap();
            let want = 4.0 * (0.5f64 * theta).sin().powi(4);
            assert!(
                (s.re - want).abs() <= 8.0 * f64::EPSILON * want,
                "θ {theta}: {} against {want}",
                s.re
            );
            assert!(
                noise <= 64.0 * f64::EPSILON * want,
                "θ {theta}: noise {noise}"
            );
            let im = (4.0 * theta.sin() - (2.0 * theta).sin()) / 2.0;
            assert!((s.im - im).abs() <= 8.0 * f64::EPSILON * im.abs());
        }
    }

    /// A central stencil's real part is exactly zero.
    #[test]
    fn central_stencil_stays_imaginary() {
        let o = [-2.0, -1.0, 1.0, 2.0];
        let w = [1.0 / 12.0, -2.0 / 3.0, 2.0 / 3.0, -1.0 / 12.0];
        let (s, _) = symbol(&o, &w, &[0.0], &[1.0], 1e-4).unwrap();
        assert_eq!(s.re, 0.0);
        assert!((s.im - 1e-4).abs() < 1e-15);
    }

    /// Outside |θ|·max|o| ≤ 1, or with offsets off the half-grid, no series.
    #[test]
    fn series_declines_outside_its_range() {
        assert!(symbol(&[-2.0, 0.0], &[-0.5, 0.5], &[0.0], &[1.0], 0.6).is_none());
        assert!(symbol(&[-0.3, 0.0], &[-1.0, 1.0], &[0.0], &[1.0], 0.1).is_none());
        assert!(symbol(&[-0.5, 0.5], &[-1.0, 1.0], &[0.0], &[1.0], 0.1).is_some());
    }
}
