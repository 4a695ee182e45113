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
/// Rotations take the fast path for |f|² above this and |f|² + |g|² below the next.
const ROT_LO: f64 = 1.0e-150;
const ROT_HI: f64 = 1.0e150;
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
#[inline(always)]
pub(crate) fn modulus(z: C64) -> f64 {
    let s = norm_sqr(z);
    if s > SAFE_LO && s < SAFE_HI {
        s.sqrt()
    } else {
        z.re.hypot(z.im)
    }
}

/// ⌊log₂ a⌋ for a > 0 (subnormals included).
#[inline]
fn exponent(a: f64) -> i32 {
    a.log2().floor() as i32
}

/// z·2^e, exactly (two factors, so that 2^e itself never over- or underflows).
#[inline]
pub(crate) fn scale2(z: C64, e: i32) -> C64 {
    let h = e / 2;
    z * 2f64.powi(h) * 2f64.powi(e - h)
}

/// z/|z| for z ≠ 0, of modulus 1 to rounding even when z is subnormal.
#[inline]
pub(crate) fn unit(z: C64) -> C64 {
    let a = abs1(z);
    if a > ROT_LO && a < ROT_HI {
        return z * (1.0 / norm_sqr(z).sqrt());
    }
    let zs = scale2(z, -exponent(a));
    zs * (1.0 / zs.re.hypot(zs.im))
}

/// Principal square root (Re ≥ 0) by the algebraic formula.
#[inline(always)]
pub(crate) fn csqrt(z: C64) -> C64 {
    let (x, y) = (z.re, z.im);
    if x == 0.0 && y == 0.0 {
        return ZERO;
    }
    let r = modulus(z);
    if r < SAFE_LO {
        return csqrt_tiny(z);
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

/// √z for |z| below the safe range, where halving would drop bits of a
/// subnormal: √z = √(2^200·z)·2^-100, exactly scaled.
#[cold]
#[inline(never)]
fn csqrt_tiny(z: C64) -> C64 {
    csqrt(z * 2f64.powi(200)) * 2f64.powi(-100)
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
        // p and d away from underflow and overflow: p·d has full precision.
        if p > ROT_LO && d < ROT_HI {
            let pd = p * d;
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

    /// The same rotation for operands whose squares would under- or overflow:
    /// both are scaled by a common power of two (exact), and the phase of f is
    /// taken with [`unit`], so that the rotation stays unitary to rounding even
    /// when f or g is subnormal.
    #[cold]
    #[inline(never)]
    fn zeroing_scaled(f: C64, g: C64) -> (Rot, C64) {
        let e = -exponent(abs1(f).max(abs1(g)));
        let (f1, g1) = (scale2(f, e), scale2(g, e));
        let fa = f1.re.hypot(f1.im);
        let ga = g1.re.hypot(g1.im);
        let nrm = fa.hypot(ga);
        if f1.re == 0.0 && f1.im == 0.0 {
            let rot = Rot {
                c: 0.0,
                s: unit(g1).conj(),
            };
            return (rot, scale2(C64::new(ga, 0.0), -e));
        }
        let sgn = unit(f1);
        let gc = C64::new(g1.re / nrm, -g1.im / nrm);
        let rot = Rot {
            c: fa / nrm,
            s: sgn * gc,
        };
        (rot, scale2(sgn * nrm, -e))
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
            (C64::new(5e-324, 5e-324), C64::new(-1.0, 0.0)),
            (C64::new(5e-324, 0.0), C64::new(0.0, 1e-323)),
            (C64::new(1e-170, -1e-170), C64::new(1e-10, 0.0)),
        ];
        for (f, g) in pairs {
            let (rot, r) = Rot::zeroing(f, g);
            let (x, y) = rot.left(f, g);
            let scale = f.norm().max(g.norm());
            assert!((x - r).norm() <= 4.0 * EPS * scale, "{f} {g}");
            assert!(y.norm() <= 4.0 * EPS * scale, "{f} {g}: {y}");
            assert!(
                (rot.c * rot.c + rot.s.norm_sqr() - 1.0).abs() <= 4.0 * EPS,
                "not unitary for {f}, {g}"
            );
        }
    }

    #[test]
    fn unit_phase_has_modulus_one_even_for_subnormals() {
        for z in [
            C64::new(5e-324, 5e-324),
            C64::new(-3e-310, 1e-320),
            C64::new(1e300, -1e300),
        ] {
            assert!((unit(z).norm() - 1.0).abs() <= 2.0 * EPS, "{z}");
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
