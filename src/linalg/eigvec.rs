//! Eigenvectors from a complex Schur form A = Q T Qᴴ by back-substitution
//! (Golub & Van Loan, Matrix Computations, 4th ed., §7.6.4; as LAPACK's
//! `ztrevc`): for each k, x solves (T − t_kk I) x = 0 with x_k = 1 and x_j = 0 for
//! j > k, and v_k = Q x / ‖Q x‖₂.
//!
//! Diagonal differences smaller than ε·max|t_ij| are replaced by that bound, so
//! that repeated or defective eigenvalues give finite (nearly parallel) vectors
//! with a small residual; x is rescaled whenever it grows past 2^300, so nothing
//! overflows. Each vector has unit 2-norm and its largest component real and
//! positive. Works on flat row-major slices, so the fixed-size kernels and the
//! general path share it.

use super::cplx::{abs1, cdiv, modulus, norm_sqr, EPS, ZERO};
use num_complex::Complex64 as C64;

/// x is rescaled when an entry grows past this (2^300).
const GROWTH: f64 = 2.037035976334486e90;

/// The pivot floor of the back-substitution for T: ε·max|t_ij| (moduli in the
/// 1-norm |re| + |im|), at least the smallest normal number.
pub(crate) fn pivot_floor(t: &[C64], n: usize) -> f64 {
    let tmax = (0..n)
        .flat_map(|i| (i..n).map(move |j| (i, j)))
        .map(|(i, j)| abs1(t[i * n + j]))
        .fold(0.0, f64::max);
    (EPS * tmax).max(f64::MIN_POSITIVE)
}

/// x (length n) ← a solution of (T − t_kk I) x = 0 with x_j = 0 for j > k and
/// x_k a positive real (1 unless rescaled against growth); pivots smaller than
/// `floor` in modulus are replaced by `floor`.
pub(crate) fn back_substitute(t: &[C64], n: usize, k: usize, floor: f64, x: &mut [C64]) {
    substitute(t, n, k, floor, None, x);
}

/// [`back_substitute`] that keeps a cluster's eigenvectors apart: a component
/// x_i whose pivot t_ii − t_kk is at most `cluster.0` in modulus (t_ii in the
/// cluster of t_kk) and whose right-hand side is at most `cluster.1` times the
/// largest |x_j| so far is set to zero instead of dividing rounding by
/// rounding. For an eigenvalue repeated in a complete eigenspace (a normal T
/// with equal diagonal entries) the division gives an arbitrary, possibly
/// nearly parallel, basis of that eigenspace; zero gives the one the Schur
/// vectors span, orthonormal where T is normal. A right-hand side above the
/// rounding level is still divided (close but distinct eigenvalues coupled by
/// T, whose eigenvectors are genuinely nearly parallel).
pub(crate) fn back_substitute_in_clusters(
    t: &[C64],
    n: usize,
    k: usize,
    floor: f64,
    cluster: (f64, f64),
    x: &mut [C64],
) {
    substitute(t, n, k, floor, Some(cluster), x);
}

fn substitute(
    t: &[C64],
    n: usize,
    k: usize,
    floor: f64,
    cluster: Option<(f64, f64)>,
    x: &mut [C64],
) {
    let lam = t[k * n + k];
    x.fill(ZERO);
    x[k] = C64::new(1.0, 0.0);
    for i in (0..k).rev() {
        let row = &t[i * n..(i + 1) * n];
        let mut rhs = ZERO;
        for j in i + 1..=k {
            rhs -= row[j] * x[j];
        }
        let mut d = row[i] - lam;
        if let Some((gap, noise)) = cluster {
            if modulus(d) <= gap {
                let largest = x[i + 1..=k].iter().map(|z| modulus(*z)).fold(0.0, f64::max);
                if modulus(rhs) <= noise * largest {
                    continue; // x[i] stays zero
                }
            }
        }
        if abs1(d) < floor {
            d = C64::new(floor, 0.0);
        }
        x[i] = cdiv(rhs, d);
        let big = abs1(x[i]);
        if big > GROWTH {
            let s = 1.0 / big;
            for z in &mut x[i..=k] {
                *z *= s;
            }
        }
    }
}

/// Eigenvectors of Q T Qᴴ (T upper triangular, both n×n row-major; the strict
/// lower triangle of T is ignored) as the columns of the row-major n×n `vectors`.
/// `x` is a workspace of length n.
pub(crate) fn schur_vectors(t: &[C64], q: &[C64], n: usize, x: &mut [C64], vectors: &mut [C64]) {
    assert!(t.len() == n * n && q.len() == n * n && vectors.len() == n * n && x.len() == n);
    let smin = pivot_floor(t, n);
    for k in 0..n {
        back_substitute(t, n, k, smin, x);
        // v = Q x, then unit norm with the largest component real positive.
        let mut vmax = 0.0f64;
        let mut imax = 0;
        for r in 0..n {
            let qr = &q[r * n..r * n + k + 1];
            let v: C64 = qr.iter().zip(&x[..=k]).map(|(a, b)| a * b).sum();
            vectors[r * n + k] = v;
            let a = abs1(v);
            if a > vmax {
                vmax = a;
                imax = r;
            }
        }
        let inv = 1.0 / vmax;
        let mut nrm2 = 0.0;
        for r in 0..n {
            nrm2 += norm_sqr(vectors[r * n + k] * inv);
        }
        let lead = vectors[imax * n + k] * inv;
        let phase = lead.conj() * (1.0 / modulus(lead));
        let s = phase * (inv / nrm2.sqrt());
        for r in 0..n {
            vectors[r * n + k] *= s;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn identity(n: usize) -> Vec<C64> {
        let mut q = vec![ZERO; n * n];
        for i in 0..n {
            q[i * n + i] = C64::new(1.0, 0.0);
        }
        q
    }

    #[test]
    fn triangular_eigenvectors_have_small_residuals() {
        let n = 4;
        let mut t = vec![ZERO; n * n];
        for i in 0..n {
            for j in i..n {
                t[i * n + j] = C64::new((i + 2 * j) as f64 * 0.25, (j as f64 - i as f64) * 0.5);
            }
        }
        let q = identity(n);
        let mut v = vec![ZERO; n * n];
        let mut x = vec![ZERO; n];
        schur_vectors(&t, &q, n, &mut x, &mut v);
        for k in 0..n {
            let lam = t[k * n + k];
            let mut res = 0.0f64;
            let mut nrm = 0.0;
            for i in 0..n {
                let tv: C64 = (0..n).map(|j| t[i * n + j] * v[j * n + k]).sum();
                res = res.max((tv - lam * v[i * n + k]).norm());
                nrm += v[i * n + k].norm_sqr();
            }
            assert!(res <= 16.0 * EPS * n as f64, "residual {res} for k = {k}");
            assert!((nrm - 1.0).abs() <= 4.0 * EPS);
        }
    }

    #[test]
    fn jordan_block_gives_finite_parallel_vectors() {
        let n = 5;
        let mut t = identity(n);
        for i in 0..n - 1 {
            t[i * n + i + 1] = C64::new(1.0, 0.0);
        }
        let q = identity(n);
        let mut v = vec![ZERO; n * n];
        let mut x = vec![ZERO; n];
        schur_vectors(&t, &q, n, &mut x, &mut v);
        assert!(v.iter().all(|z| z.re.is_finite() && z.im.is_finite()));
        for k in 0..n {
            // Residual ‖(T − I) v‖ stays at the level of the perturbed pivots.
            let res: f64 = (0..n - 1)
                .map(|i| v[(i + 1) * n + k].norm())
                .fold(0.0, f64::max);
            assert!(res <= 4.0 * EPS, "residual {res} for k = {k}");
        }
    }
}
