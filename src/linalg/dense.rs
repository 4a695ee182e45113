//! Dense factorisations for the non-normality measures: Schur form, 2-norms and
//! smallest singular values, eigenvectors of a triangular matrix, Henrici's
//! departure from normality and the condition number of the eigenvector matrix
//! with a rank test for defective eigenvalues.
//!
//! Allocating helpers on nalgebra's Schur decomposition and SVD (Golub & Van Loan,
//! Matrix Computations); used once per wavevector, not inside a power loop.

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Complex Schur form G = Q T Qᴴ (T upper triangular), or None if QR fails.
pub fn schur(g: &DMatrix<C64>) -> Option<(DMatrix<C64>, DMatrix<C64>)> {
    if g.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
        return None;
    }
    let m = g.nrows();
    let s = nalgebra::linalg::Schur::try_new(g.clone(), 4.0 * f64::EPSILON, 1000 * m.max(1))?;
    let (q, mut t) = s.unpack();
    for j in 0..m {
        for i in j + 1..m {
            t[(i, j)] = C64::new(0.0, 0.0);
        }
    }
    Some((q, t))
}

/// Singular values, largest first.
pub fn singular_values(a: &DMatrix<C64>) -> Vec<f64> {
    let mut s: Vec<f64> = a
        .clone()
        .svd(false, false)
        .singular_values
        .iter()
        .copied()
        .collect();
    s.sort_by(|x, y| y.total_cmp(x));
    s
}

/// ‖A‖₂.
pub fn norm2(a: &DMatrix<C64>) -> f64 {
    singular_values(a).first().copied().unwrap_or(0.0)
}

/// Smallest singular value.
pub fn sigma_min(a: &DMatrix<C64>) -> f64 {
    singular_values(a).last().copied().unwrap_or(0.0)
}

/// Frobenius norm.
pub fn frobenius(a: &DMatrix<C64>) -> f64 {
    a.iter().map(|z| z.norm_sqr()).sum::<f64>().sqrt()
}

/// Relative Henrici departure from normality √(‖G‖F² − Σ|λ|²)/‖G‖F, from the
/// strictly upper part of the Schur factor T (equal in exact arithmetic, and free
/// of cancellation).
pub fn departure(t: &DMatrix<C64>) -> f64 {
    let m = t.nrows();
    let fro = frobenius(t);
    if fro == 0.0 {
        return 0.0;
    }
    let mut off = 0.0;
    for i in 0..m {
        for j in i + 1..m {
            off += t[(i, j)].norm_sqr();
        }
    }
    off.sqrt() / fro
}

/// Unit eigenvectors of an upper triangular T (columns), by back-substitution.
/// Near-equal diagonal entries are separated by a tiny relative amount, so the
/// columns of a defective T come out (nearly) parallel rather than infinite.
pub fn triangular_eigenvectors(t: &DMatrix<C64>) -> DMatrix<C64> {
    let m = t.nrows();
    let scale = frobenius(t).max(1e-300);
    let small = f64::EPSILON * scale;
    let mut y = DMatrix::<C64>::zeros(m, m);
    for k in 0..m {
        y[(k, k)] = C64::new(1.0, 0.0);
        for i in (0..k).rev() {
            let mut s = C64::new(0.0, 0.0);
            for j in i + 1..=k {
                s += t[(i, j)] * y[(j, k)];
            }
            let mut d = t[(k, k)] - t[(i, i)];
            if d.norm() < small {
                d = C64::new(small, 0.0);
            }
            y[(i, k)] = s / d;
        }
        let n = (0..m).map(|i| y[(i, k)].norm_sqr()).sum::<f64>().sqrt();
        if n.is_finite() && n > 0.0 {
            for i in 0..m {
                y[(i, k)] /= n;
            }
        }
    }
    y
}

/// 2-norm condition number of the (unit-column) eigenvector matrix of G = QTQᴴ;
/// infinite when G is defective: an eigenvalue cluster (relative gap ≤ 1e-7) whose
/// geometric multiplicity, the nullity of G − λ̄I by a relative rank test, is
/// smaller than the cluster's size.
pub fn eigvec_condition(g: &DMatrix<C64>, t: &DMatrix<C64>) -> f64 {
    let m = t.nrows();
    let scale = frobenius(g).max(1e-300);
    let lam: Vec<C64> = (0..m).map(|i| t[(i, i)]).collect();
    let mut seen = vec![false; m];
    for i in 0..m {
        if seen[i] {
            continue;
        }
        let members: Vec<usize> = (0..m)
            .filter(|&j| (lam[j] - lam[i]).norm() <= 1e-7 * scale)
            .collect();
        for &j in &members {
            seen[j] = true;
        }
        if members.len() > 1 {
            let mean = members.iter().map(|&j| lam[j]).sum::<C64>() / members.len() as f64;
            let shifted = g - DMatrix::<C64>::identity(m, m) * mean;
            let sv = singular_values(&shifted);
            let nullity = sv.iter().filter(|s| **s <= 1e-6 * scale).count();
            if nullity < members.len() {
                return f64::INFINITY;
            }
        }
    }
    let y = triangular_eigenvectors(t);
    let sv = singular_values(&y);
    let (hi, lo) = (sv[0], sv[m - 1]);
    if lo <= f64::EPSILON * hi {
        f64::INFINITY
    } else {
        hi / lo
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn departure_of_a_two_by_two_triangular_matrix_has_its_closed_form() {
        // Henrici (1962): dep_F² = ‖G‖F² − Σ|λ|² = |b|² for [[a, b], [0, d]].
        let t = DMatrix::from_row_slice(
            2,
            2,
            &[
                C64::new(0.5, 0.1),
                C64::new(2.0, -1.0),
                C64::new(0.0, 0.0),
                C64::new(-0.3, 0.0),
            ],
        );
        let fro2: f64 = 0.26 + 5.0 + 0.09;
        let want = (5.0f64).sqrt() / fro2.sqrt();
        assert!((departure(&t) - want).abs() <= 1e-15 * 4.0);
    }

    #[test]
    fn jordan_block_is_reported_defective() {
        let j = DMatrix::from_row_slice(
            2,
            2,
            &[
                C64::new(0.0, 1.0),
                C64::new(1.0, 0.0),
                C64::new(0.0, 0.0),
                C64::new(0.0, 1.0),
            ],
        );
        let (_, t) = schur(&j).unwrap();
        assert!(eigvec_condition(&j, &t).is_infinite());
        let id = DMatrix::<C64>::identity(3, 3);
        let (_, t) = schur(&id).unwrap();
        assert!((eigvec_condition(&id, &t) - 1.0).abs() < 1e-12);
    }
}
