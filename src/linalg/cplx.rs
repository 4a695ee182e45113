//! Scalar complex helpers for the small kernels: the 1-norm modulus |re| + |im|,
//! an algebraic square root, a guarded division, plane (Givens) rotations and
//! power-of-two scaling into a safe exponent range.
//!
//! `num_complex` computes `sqrt` through the polar form (atan2, sin, cos) and
//! `norm` through `hypot`; both are slow in an inner loop. Here the square root is
//! the algebraic formula √z = (t, y/2t) with t = √((|z| + x)/2) (Higham, Accuracy
//! and Stability of Numerical Algorithms, §27), and rotations need one real square
//! root each. The fast paths assume the operands lie in a safe range, which the
//! kernels ensure by scaling every input by a power of two (an exact operation);
//! operands outside it take a slower path built on `hypot`, so results stay finite
//! for every finite input. Rotations follow Golub & Van Loan, Matrix Computations
//! (4th ed.), §5.1.8 (complex Givens rotations), with the phase convention of
//! LAPACK's `zlartg`: c real, r = sign(f)·√(|f|² + |g|²).

use num_complex::Complex64 as C64;

/// Complex zero.
pub(crate) const ZERO: C64 = C64::new(0.0, 0.0);
/// Complex one.
pub(crate) const ONE: C64 = C64::new(1.0, 0.0);
/// Unit roundoff of f64 arithmetic (relative spacing at 1).
pub(crate) const EPS: f64 = f64::EPSILON;
/// Below this, squares and products of moduli are no longer trusted (≈ 2^-900).
const SAFE_LO: f64 = 1.0e-270;
/// Above this, squares and products of moduli are no longer trusted (≈ 2^900).
const SAFE_HI: f64 = 1.0e270;
/// Inputs whose largest entry lies in [2^-100, 2^100] are used unscaled.
const RANGE_EXP: i32 = 100;

/// |re| + |im|: a modulus within a factor √2 of |z|, without a square root.
#[inline(always)]
pub(crate) fn abs1(z: C64) -> f64 {
    z.re.abs() + z.im.abs()
}

/// |z|².
#[inline(always)]
pub(crate) fn norm_sqr(z: C64) -> f64 {
    z.re * z.re + z.im * z.im
}

/// |z| without overflow or underflow of the square.
#[inline]
pub(crate) fn modulus(z: C64) -> f64 {
    let s = norm_sqr(z);
    if s > SAFE_LO && s < SAFE_HI {
        s.sqrt()
    } else {
        z.re.hypot(z.im)
    }
}

/// Principal square root (Re ≥ 0) by the algebraic formula.
#[inline]
pub(crate) fn csqrt(z: C64) -> C64 {
    let (x, y) = (z.re, z.im);
    if x == 0.0 && y == 0.0 {
        return ZERO;
    }
    let r = modulus(z);
    if r < SAFE_LO {
        // Halving a subnormal drops bits: √z = √(2^200·z)·2^-100, exactly scaled.
        return csqrt(z * 2f64.powi(200)) * 2f64.powi(-100);
    }
    // With w = r + |x| > 0: t = √(w/2) and y/(2t) = y·t/w; the square root and
    // the division are independent, so their latencies overlap.
    let w = r + x.abs();
    let t = (0.5 * w).sqrt();
    let o = y * (t * (1.0 / w));
    if x >= 0.0 {
        C64::new(t, o)
    } else {
        C64::new(o.abs(), t.copysign(y))
    }
}

/// a / b: one real division when |b|² is in the safe range, Smith's algorithm
/// (Higham §27.8) otherwise. Division by zero gives non-finite values, as for f64.
#[inline]
pub(crate) fn cdiv(a: C64, b: C64) -> C64 {
    let d = norm_sqr(b);
    if d > SAFE_LO && d < SAFE_HI {
        let inv = 1.0 / d;
        C64::new(
            (a.re * b.re + a.im * b.im) * inv,
            (a.im * b.re - a.re * b.im) * inv,
        )
    } else if b.re.abs() >= b.im.abs() {
        let r = b.im / b.re;
        let den = b.re + b.im * r;
        C64::new((a.re + a.im * r) / den, (a.im - a.re * r) / den)
    } else {
        let r = b.re / b.im;
        let den = b.re * r + b.im;
        C64::new((a.re * r + a.im) / den, (a.im * r - a.re) / den)
    }
}

/// A plane rotation G = [[c, s], [−s̄, c]] with c real and |c|² + |s|² = 1.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Rot {
    /// Cosine (real, ≥ 0).
    pub c: f64,
    /// Sine (complex).
    pub s: C64,
}

impl Rot {
    /// The identity rotation.
    pub const IDENTITY: Rot = Rot { c: 1.0, s: ZERO };

    /// The rotation G and r with G·[f; g] = [r; 0].
    #[inline]
    pub fn zeroing(f: C64, g: C64) -> (Rot, C64) {
        if g.re == 0.0 && g.im == 0.0 {
            return (Rot::IDENTITY, f);
        }
        let p = norm_sqr(f);
        let d = p + norm_sqr(g);
        let pd = p * d;
        if pd > SAFE_LO && pd < SAFE_HI {
            // c = |f|/√d, s = (f/|f|)·ḡ/√d, r = (f/|f|)·√d, all from 1/t with
            // t = |f|·√d = √(pd); 1/t = √(pd)·(1/pd) overlaps the two latencies.
            let it = pd.sqrt() * (1.0 / pd);
            let rot = Rot {
                c: p * it,
                s: f * g.conj() * it,
            };
            (rot, f * (d * it))
        } else {
            Self::zeroing_scaled(f, g)
        }
    }

    /// The same rotation for operands whose squares would under- or overflow.
    #[cold]
    fn zeroing_scaled(f: C64, g: C64) -> (Rot, C64) {
        let fa = f.re.hypot(f.im);
        let ga = g.re.hypot(g.im);
        let nrm = fa.hypot(ga);
        if fa == 0.0 {
            let s = C64::new(g.re / ga, -g.im / ga);
            return (Rot { c: 0.0, s }, C64::new(ga, 0.0));
        }
        let sgn = C64::new(f.re / fa, f.im / fa);
        let gc = C64::new(g.re / nrm, -g.im / nrm);
        let rot = Rot {
            c: fa / nrm,
            s: sgn * gc,
        };
        (rot, sgn * nrm)
    }

    /// [x; y] ← G·[x; y] (a row operation).
    #[inline(always)]
    pub fn left(self, x: C64, y: C64) -> (C64, C64) {
        (x * self.c + self.s * y, y * self.c - self.s.conj() * x)
    }

    /// [p, q] ← [p, q]·Gᴴ (a column operation).
    #[inline(always)]
    pub fn right(self, p: C64, q: C64) -> (C64, C64) {
        (p * self.c + self.s.conj() * q, q * self.c - self.s * p)
    }
}

/// The power-of-two pair (scale, back) that brings a largest entry `amax` > 0
/// into [2^-100, 2^100]: the kernels work on scale·A and multiply results by
/// `back`. Both are 1 when `amax` is already in range.
#[inline]
pub(crate) fn pow2_scaling(amax: f64) -> (f64, f64) {
    let lo = 2f64.powi(-RANGE_EXP);
    let hi = 2f64.powi(RANGE_EXP);
    if (lo..=hi).contains(&amax) {
        return (1.0, 1.0);
    }
    let e = (amax.log2().floor() as i32).clamp(-1022, 1022);
    (2f64.powi(-e), 2f64.powi(e))
}

/// Largest |re| + |im| over a slice, or an error if any entry is NaN or infinite.
#[inline]
pub(crate) fn max_abs1(a: &[C64]) -> Result<f64, super::LinalgError> {
    let mut amax = 0.0f64;
    let mut sum = 0.0f64;
    for &z in a {
        let v = abs1(z);
        amax = amax.max(v);
        sum += v;
    }
    // A non-finite sum means a non-finite entry, or finite entries near overflow.
    if !sum.is_finite() && a.iter().any(|z| !(z.re.is_finite() && z.im.is_finite())) {
        return Err(super::LinalgError::NonFinite);
    }
    Ok(amax)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: C64, b: C64, tol: f64) -> bool {
        (a - b).norm() <= tol * b.norm().max(f64::MIN_POSITIVE)
    }

    #[test]
    fn algebraic_sqrt_matches_the_principal_branch() {
        let samples = [
            C64::new(4.0, 0.0),
            C64::new(-4.0, 0.0),
            C64::new(-4.0, -0.0),
            C64::new(0.0, 2.0),
            C64::new(-3.0, 4.0),
            C64::new(1e-300, -1e-300),
            C64::new(-1e300, 1e300),
        ];
        for z in samples {
            let r = csqrt(z);
            assert!(close(r, z.sqrt(), 4.0 * EPS), "{z}: {r} vs {}", z.sqrt());
            assert!(r.re >= 0.0);
        }
        // Subnormal input: as accurate as the real square root.
        let x = 1e-310f64;
        assert!((csqrt(C64::new(x, 0.0)).re / x.sqrt() - 1.0).abs() <= 4.0 * EPS);
    }

    #[test]
    fn guarded_division_survives_extreme_denominators() {
        let a = C64::new(1.0, 2.0);
        for b in [
            C64::new(3.0, -1.0),
            C64::new(1e-200, 1e-200),
            C64::new(1e200, -3e200),
        ] {
            let q = cdiv(a, b);
            assert!(close(q * b, a, 8.0 * EPS), "{a}/{b} = {q}");
        }
    }

    #[test]
    fn rotation_zeroes_the_second_component_and_is_unitary() {
        let pairs = [
            (C64::new(1.0, 2.0), C64::new(-3.0, 0.5)),
            (C64::new(0.0, 0.0), C64::new(2.0, -1.0)),
            (C64::new(1e-300, 0.0), C64::new(1e-300, 1e-300)),
            (C64::new(1e250, 1.0), C64::new(-1e250, 1e249)),
            (C64::new(1.0, 0.0), C64::new(1e-200, 0.0)),
        ];
        for (f, g) in pairs {
            let (rot, r) = Rot::zeroing(f, g);
            let (x, y) = rot.left(f, g);
            let scale = f.norm().max(g.norm());
            assert!((x - r).norm() <= 4.0 * EPS * scale, "{f} {g}");
            assert!(y.norm() <= 4.0 * EPS * scale, "{f} {g}: {y}");
            assert!((rot.c * rot.c + rot.s.norm_sqr() - 1.0).abs() <= 4.0 * EPS);
        }
    }

    #[test]
    fn scaling_is_a_power_of_two_into_range() {
        for amax in [1e-300, 1e-40, 1.0, 1e40, 1e300, f64::MAX, 5e-324] {
            let (s, back) = pow2_scaling(amax);
            assert_eq!(s.log2().fract(), 0.0);
            assert_eq!(s * back, 1.0);
            let scaled = amax * s;
            assert!(scaled >= 2f64.powi(-RANGE_EXP) || amax < 1e-300, "{amax}");
            assert!(scaled <= 2f64.powi(RANGE_EXP));
        }
    }
}
