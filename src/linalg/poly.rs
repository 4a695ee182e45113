//! Polynomials with coefficients in ascending order: evaluation, products and roots.
//!
//! Roots come from the eigenvalues of the companion matrix (degree ≥ 3) or closed
//! forms (degree 1 and 2), then one Newton polish. Real polynomials of degree up
//! to [`REAL_KERNEL_MAX`] use the real double-shift kernel (`super::francis`)
//! on a stack companion matrix, with no allocation. Used for stability functions,
//! the characteristic polynomials of multistep methods and first-exit radii.

use super::cplx::pow2_scaling;
use super::{eigenvalues, francis, LinalgError};
use num_complex::Complex64 as C64;

/// p(z) by Horner's rule; `c[j]` multiplies z^j.
pub fn eval(c: &[C64], z: C64) -> C64 {
    c.iter()
        .rev()
        .fold(C64::new(0.0, 0.0), |acc, &cj| acc * z + cj)
}

/// p(x) for real coefficients.
pub fn eval_real(c: &[f64], x: f64) -> f64 {
    c.iter().rev().fold(0.0, |acc, &cj| acc * x + cj)
}

/// Product of two polynomials.
pub fn mul(a: &[C64], b: &[C64]) -> Vec<C64> {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![C64::new(0.0, 0.0); a.len() + b.len() - 1];
    for (i, ai) in a.iter().enumerate() {
        for (j, bj) in b.iter().enumerate() {
            out[i + j] += ai * bj;
        }
    }
    out
}

/// Derivative coefficients.
pub fn derivative(c: &[C64]) -> Vec<C64> {
    c.iter()
        .enumerate()
        .skip(1)
        .map(|(j, cj)| cj * j as f64)
        .collect()
}

/// Drops leading (highest-degree) coefficients that are zero relative to the largest.
pub fn trim(c: &[C64]) -> &[C64] {
    let scale = c.iter().map(|z| z.norm()).fold(0.0, f64::max);
    let mut n = c.len();
    while n > 0 && c[n - 1].norm() <= 1e-15 * scale {
        n -= 1;
    }
    &c[..n]
}

/// All complex roots of a polynomial (after trimming zero leading coefficients).
pub fn roots(c: &[C64]) -> Result<Vec<C64>, LinalgError> {
    let c = trim(c);
    let n = c.len().saturating_sub(1);
    match n {
        0 => Ok(Vec::new()),
        1 => Ok(vec![-c[0] / c[1]]),
        2 => {
            let (r1, r2) = quadratic(c[2], c[1], c[0]);
            Ok(vec![r1, r2])
        }
        _ => {
            let lead = c[n];
            let mut comp = vec![C64::new(0.0, 0.0); n * n];
            for j in 0..n {
                comp[j] = -c[n - 1 - j] / lead;
            }
            for i in 1..n {
                comp[i * n + i - 1] = C64::new(1.0, 0.0);
            }
            let mut r = eigenvalues(&comp, n)?;
            let dc = derivative(c);
            for z in r.iter_mut() {
                let d = eval(&dc, *z);
                if d.norm() > 0.0 {
                    let step = eval(c, *z) / d;
                    if step.norm() < 1e-6 * z.norm().max(1.0) {
                        *z -= step;
                    }
                }
            }
            Ok(r)
        }
    }
}

/// Roots of a z² + b z + c without cancellation.
pub fn quadratic(a: C64, b: C64, c: C64) -> (C64, C64) {
    let disc = (b * b - a * c * 4.0).sqrt();
    let q = if (b.conj() * disc).re >= 0.0 {
        (b + disc) * -0.5
    } else {
        (b - disc) * -0.5
    };
    if q.norm() == 0.0 {
        return (C64::new(0.0, 0.0), C64::new(0.0, 0.0));
    }
    (q / a, c / q)
}

/// Largest root modulus of a polynomial.
pub fn max_root_modulus(c: &[C64]) -> Result<f64, LinalgError> {
    // degrees 0–2 (one- and two-step methods) without allocating: the per-mode
    // radius of a multistep sweep lands here once per eigenvalue
    let t = trim(c);
    match t.len() {
        0 | 1 => Ok(0.0),
        2 => Ok((t[0] / t[1]).norm()),
        3 => {
            let (r1, r2) = quadratic(t[2], t[1], t[0]);
            Ok(r1.norm().max(r2.norm()))
        }
        _ => Ok(roots(t)?.iter().map(|z| z.norm()).fold(0.0, f64::max)),
    }
}

/// Largest degree solved by the real kernel; higher degrees use [`roots`].
pub const REAL_KERNEL_MAX: usize = 16;

/// Calls `$f::<N>($args)` for a run-time degree `$n` in 3..=16, else `$other`.
macro_rules! by_degree {
    ($n:expr, $f:ident, ( $($arg:expr),* ), $other:expr) => {
        match $n {
            3 => $f::<3>($($arg),*),
            4 => $f::<4>($($arg),*),
            5 => $f::<5>($($arg),*),
            6 => $f::<6>($($arg),*),
            7 => $f::<7>($($arg),*),
            8 => $f::<8>($($arg),*),
            9 => $f::<9>($($arg),*),
            10 => $f::<10>($($arg),*),
            11 => $f::<11>($($arg),*),
            12 => $f::<12>($($arg),*),
            13 => $f::<13>($($arg),*),
            14 => $f::<14>($($arg),*),
            15 => $f::<15>($($arg),*),
            16 => $f::<16>($($arg),*),
            _ => $other,
        }
    };
}

/// All complex roots of a polynomial with real coefficients, written into the
/// front of `out` (at least [`REAL_KERNEL_MAX`] long): the eigenvalues of its
/// companion matrix by the real double-shift kernel, each then given the same
/// Newton polish as in [`roots`]. `None` for a degree (after trimming zero
/// leading coefficients as [`trim`] does) the kernel does not take, below 3 or
/// above [`REAL_KERNEL_MAX`]: use [`roots`] then.
pub fn real_roots<'o>(c: &[f64], out: &'o mut [C64]) -> Result<Option<&'o [C64]>, LinalgError> {
    let scale = c.iter().map(|x| x.abs()).fold(0.0, f64::max);
    let mut len = c.len();
    while len > 0 && c[len - 1].abs() <= 1e-15 * scale {
        len -= 1;
    }
    let c = &c[..len];
    let n = len.saturating_sub(1);
    let found = by_degree!(n, companion_eigenvalues, (c, out), return Ok(None))?;
    let found = &mut out[..found];
    for z in found.iter_mut() {
        // p′(z) as `eval(&derivative(c), z)` computes it, without the vector
        let d = c
            .iter()
            .enumerate()
            .skip(1)
            .rev()
            .fold(C64::new(0.0, 0.0), |acc, (j, &cj)| {
                acc * *z + C64::new(cj, 0.0) * j as f64
            });
        if d.norm() > 0.0 {
            let p = c
                .iter()
                .rev()
                .fold(C64::new(0.0, 0.0), |acc, &cj| acc * *z + C64::new(cj, 0.0));
            let step = p / d;
            if step.norm() < 1e-6 * z.norm().max(1.0) {
                *z -= step;
            }
        }
    }
    Ok(Some(found))
}

/// Eigenvalues of the companion matrix of `c` (degree N, leading coefficient
/// non-zero) into `out`; returns N.
fn companion_eigenvalues<const N: usize>(c: &[f64], out: &mut [C64]) -> Result<usize, LinalgError> {
    let lead = c[N];
    let mut h = [[0.0f64; N]; N];
    let mut amax = 1.0f64;
    for j in 0..N {
        let x = -c[N - 1 - j] / lead;
        if !x.is_finite() {
            return Err(LinalgError::NonFinite);
        }
        h[0][j] = x;
        amax = amax.max(x.abs());
    }
    for (k, row) in h.iter_mut().enumerate().skip(1) {
        row[k - 1] = 1.0;
    }
    // a power of two keeps the scaling exact
    let (scale, back) = pow2_scaling(amax);
    if scale != 1.0 {
        h.iter_mut().flatten().for_each(|x| *x *= scale);
    }
    francis::eigenvalues(&mut h, &mut out[..N])?;
    if back != 1.0 {
        out[..N].iter_mut().for_each(|z| *z *= back);
    }
    Ok(N)
}

/// Positive real roots of a real polynomial, sorted ascending, each polished by Newton.
///
/// The variable is first scaled by ρ = |c_lo/c_hi|^{1/(hi−lo)} (lowest and
/// highest non-zero coefficients), which puts the roots' geometric mean at
/// modulus 1: a cluster of roots next to 0, as for −δr − δr³ + r⁴/4 with
/// δ = 1e-16, would otherwise be lost in the companion matrix's rounding.
pub fn positive_real_roots(c: &[f64]) -> Result<Vec<f64>, LinalgError> {
    let lo = c.iter().position(|x| *x != 0.0);
    let hi = c.iter().rposition(|x| *x != 0.0);
    let rho = match (lo, hi) {
        (Some(l), Some(h)) if h > l => (c[l] / c[h]).abs().powf(1.0 / (h - l) as f64),
        _ => 1.0,
    };
    let scaled = |rho: f64| -> Vec<f64> {
        c.iter()
            .enumerate()
            .map(|(j, &x)| x * rho.powi(j as i32))
            .collect()
    };
    let mut cc = scaled(rho);
    let rho = if rho.is_finite() && rho > 0.0 && cc.iter().all(|x| x.is_finite()) {
        rho
    } else {
        cc = scaled(1.0);
        1.0
    };
    let mut buffer = [C64::new(0.0, 0.0); REAL_KERNEL_MAX];
    let all: Vec<C64> = match real_roots(&cc, &mut buffer)? {
        Some(found) => found.iter().map(|z| z * rho).collect(),
        None => {
            let complex: Vec<C64> = cc.iter().map(|&x| C64::new(x, 0.0)).collect();
            roots(&complex)?.into_iter().map(|z| z * rho).collect()
        }
    };
    let dc: Vec<f64> = c
        .iter()
        .enumerate()
        .skip(1)
        .map(|(j, &cj)| cj * j as f64)
        .collect();
    let mut out: Vec<f64> = all
        .iter()
        .filter(|z| z.re > 0.0 && z.im.abs() <= 1e-6 * z.norm().max(1e-300))
        .map(|z| {
            let mut x = z.re;
            for _ in 0..3 {
                let d = eval_real(&dc, x);
                if d == 0.0 {
                    break;
                }
                let step = eval_real(c, x) / d;
                if step.is_nan() || step.abs() >= 1e-3 * x {
                    break;
                }
                x -= step;
            }
            x
        })
        .collect();
    out.sort_by(|a, b| a.total_cmp(b));
    out.dedup_by(|a, b| (*a - *b).abs() <= 1e-12 * b.abs());
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn positive_roots_of_known_quartic() {
        let f = |r: f64| [C64::new(-r, 0.0), C64::new(1.0, 0.0)];
        let p = mul(&mul(&f(1.0), &f(2.0)), &mul(&f(-3.0), &f(0.5)));
        let pr: Vec<f64> = p.iter().map(|z| z.re).collect();
        let r = positive_real_roots(&pr).unwrap();
        assert_eq!(r.len(), 3);
        for (x, want) in r.iter().zip([0.5, 1.0, 2.0]) {
            assert!((x - want).abs() < 1e-12, "{x} vs {want}");
        }
    }

    /// The real kernel's roots agree with the complex kernel's (the path every
    /// degree took before it) to 1e-9 on polynomials of degree 3 to 16 with
    /// known roots, real and in conjugate pairs, at least 0.15 apart, and the
    /// number of positive real roots found is unchanged.
    #[test]
    fn real_kernel_roots_match_the_complex_kernel() {
        let mut state = 0x9e37_79b9_7f4a_7c15u64;
        let mut uniform = move || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state >> 11) as f64 / (1u64 << 53) as f64
        };
        for degree in 3..=REAL_KERNEL_MAX {
            for _ in 0..20 {
                let mut want: Vec<C64> = Vec::new();
                let apart = |z: C64, have: &[C64]| have.iter().all(|w| (w - z).norm() >= 0.15);
                while want.len() < degree {
                    let re = 4.0 * uniform() - 2.0;
                    if want.len() + 2 <= degree && uniform() < 0.5 {
                        let z = C64::new(re, 0.1 + 1.9 * uniform());
                        if apart(z, &want) && apart(z.conj(), &want) {
                            want.extend([z, z.conj()]);
                        }
                    } else if apart(C64::new(re, 0.0), &want) {
                        want.push(C64::new(re, 0.0));
                    }
                }
                let mut p = vec![C64::new(1.0, 0.0)];
                for r in &want {
                    p = mul(&p, &[-r, C64::new(1.0, 0.0)]);
                }
                let real: Vec<f64> = p.iter().map(|z| z.re).collect();
                let mut buffer = [C64::new(0.0, 0.0); REAL_KERNEL_MAX];
                let fast = real_roots(&real, &mut buffer).unwrap().unwrap().to_vec();
                let full = roots(&p).unwrap();
                assert_eq!(fast.len(), degree);
                for z in &fast {
                    let d = full
                        .iter()
                        .map(|w| (w - z).norm())
                        .fold(f64::INFINITY, f64::min);
                    assert!(
                        d <= 1e-9 * z.norm().max(1.0),
                        "degree {degree}: {z} is {d} from the complex kernel's"
                    );
                }
                let positive = |r: &[C64]| {
                    r.iter()
                        .filter(|z| z.re > 0.0 && z.im.abs() <= 1e-6 * z.norm())
                        .count()
                };
                assert_eq!(positive(&fast), positive(&full), "degree {degree}");
            }
        }
    }

    #[test]
    fn quadratic_is_accurate_for_small_root() {
        let (r1, r2) = quadratic(C64::new(1.0, 0.0), C64::new(-1e8, 0.0), C64::new(1.0, 0.0));
        let small = if r1.norm() < r2.norm() { r1 } else { r2 };
        assert!((small.re - 1e-8).abs() < 1e-20);
    }
}
