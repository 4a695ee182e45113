//! Dense factorisations for the non-normality measures on nalgebra matrices:
//! Schur form, singular values, 2-norms and smallest singular values, the
//! dominant right singular vector, eigenvectors of a triangular matrix,
//! Henrici's departure from normality and the condition number of the
//! eigenvector matrix with a rank test for defective eigenvalues.
//!
//! Allocating wrappers over the crate's own kernels ([`SchurSolver`],
//! [`SvdSolver`], [`super::nonnormal`]): each copies its `DMatrix` into a
//! row-major vector, runs the kernel and copies the result back. They are used
//! once per wavevector by the growth analysis, not inside a power loop; a hot
//! loop calls the kernels and [`super::nonnormal`] on slices instead. Every
//! function returns promptly for every input: the kernels scale by powers of
//! two (so entries below 1e-155, subnormals included, are fine) and cap their
//! iterations. A kernel failure (NaN or infinite input, no convergence) is
//! `None` from [`schur`] and NaN from the numeric functions.

use super::nonnormal::{self, ConditionWorkspace};
use super::{from_matrix, SchurSolver, SvdSolver};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Complex Schur form G = Q T Qᴴ as (Q, T), T upper triangular with its strict
/// lower part zero; `None` for a non-square G, NaN or infinite entries, or an
/// iteration that hit its cap.
pub fn schur(g: &DMatrix<C64>) -> Option<(DMatrix<C64>, DMatrix<C64>)> {
    let m = g.nrows();
    if g.ncols() != m {
        return None;
    }
    if m == 0 {
        return Some((g.clone(), g.clone()));
    }
    let mut t = vec![C64::new(0.0, 0.0); m * m];
    let mut q = vec![C64::new(0.0, 0.0); m * m];
    SchurSolver::new(m)
        .decompose(&from_matrix(g), &mut t, &mut q)
        .ok()?;
    Some((
        DMatrix::from_row_slice(m, m, &q),
        DMatrix::from_row_slice(m, m, &t),
    ))
}

/// The matrix as a row-major n×n slice, n = max(rows, columns), padded with
/// zeros: its singular values are those of A and n − min(rows, columns) zeros.
fn padded_square(a: &DMatrix<C64>) -> (Vec<C64>, usize) {
    let (r, c) = a.shape();
    let n = r.max(c);
    let mut out = vec![C64::new(0.0, 0.0); n * n];
    for i in 0..r {
        for j in 0..c {
            out[i * n + j] = a[(i, j)];
        }
    }
    (out, n)
}

/// Singular values, largest first (min(rows, columns) of them; NaN if the
/// kernel fails).
pub fn singular_values(a: &DMatrix<C64>) -> Vec<f64> {
    let k = a.nrows().min(a.ncols());
    if k == 0 {
        return Vec::new();
    }
    let (sq, n) = padded_square(a);
    let mut s = vec![0.0; n];
    if SvdSolver::new(n).singular_values(&sq, &mut s).is_err() {
        s.fill(f64::NAN);
    }
    s.truncate(k);
    s
}

/// ‖A‖₂ (0 for an empty matrix).
pub fn norm2(a: &DMatrix<C64>) -> f64 {
    singular_values(a).first().copied().unwrap_or(0.0)
}

/// Smallest singular value (0 for an empty matrix).
pub fn sigma_min(a: &DMatrix<C64>) -> f64 {
    singular_values(a).last().copied().unwrap_or(0.0)
}

/// The largest singular value of a square A and a unit right singular vector
/// for it (the input direction A stretches most); `None` for a non-square or
/// empty A or a kernel failure.
pub fn dominant_right_singular_vector(a: &DMatrix<C64>) -> Option<(f64, Vec<C64>)> {
    let m = a.nrows();
    if a.ncols() != m || m == 0 {
        return None;
    }
    let mut sigma = vec![0.0; m];
    let mut v = vec![C64::new(0.0, 0.0); m * m];
    SvdSolver::new(m)
        .decompose(&from_matrix(a), &mut sigma, None, Some(&mut v))
        .ok()?;
    Some((sigma[0], (0..m).map(|i| v[i * m]).collect()))
}

/// Frobenius norm, without overflow for entries anywhere in the f64 range.
pub fn frobenius(a: &DMatrix<C64>) -> f64 {
    nonnormal::frobenius(a.iter().copied())
}

/// Relative Henrici departure from normality √(‖G‖F² − Σ|λ|²)/‖G‖F, from the
/// strictly upper part of the Schur factor T (equal in exact arithmetic, and free
/// of cancellation).
pub fn departure(t: &DMatrix<C64>) -> f64 {
    if t.nrows() != t.ncols() {
        return f64::NAN;
    }
    nonnormal::departure(&from_matrix(t), t.nrows())
}

/// Unit eigenvectors of an upper triangular T (columns), by back-substitution,
/// column k with its k-th entry real and positive. Near-equal diagonal entries
/// are separated by ε·max|t_ij|, so the columns of a defective T come out
/// (nearly) parallel rather than infinite.
pub fn triangular_eigenvectors(t: &DMatrix<C64>) -> DMatrix<C64> {
    let m = t.nrows();
    if t.ncols() != m {
        return DMatrix::from_element(m, t.ncols(), C64::new(f64::NAN, 0.0));
    }
    let mut x = vec![C64::new(0.0, 0.0); m];
    let mut y = vec![C64::new(0.0, 0.0); m * m];
    nonnormal::triangular_eigenvectors(&from_matrix(t), m, &mut x, &mut y);
    DMatrix::from_row_slice(m, m, &y)
}

/// 2-norm condition number of the (unit-column) eigenvector matrix of G = QTQᴴ;
/// infinite when G is defective: an eigenvalue cluster (relative gap ≤ 1e-7) whose
/// geometric multiplicity, the nullity of T − λ̄I by a relative rank test (the
/// same as that of G − λ̄I), is smaller than the cluster's size. G itself only
/// fixes the size (NaN when G and T differ in shape); see
/// [`nonnormal::eigvec_condition`].
pub fn eigvec_condition(g: &DMatrix<C64>, t: &DMatrix<C64>) -> f64 {
    let m = t.nrows();
    if g.shape() != t.shape() || t.ncols() != m {
        return f64::NAN;
    }
    if m == 0 {
        return 1.0;
    }
    let mut ws = ConditionWorkspace::new(m);
    nonnormal::eigvec_condition(&from_matrix(t), &mut ws).unwrap_or(f64::NAN)
}

/// The largest modulus among the defective eigenvalue clusters of G = Q T Qᴴ
/// (None when G is not defective, or when the rank test fails).
pub fn defective_modulus(t: &DMatrix<C64>) -> Option<f64> {
    let m = t.nrows();
    let flat = super::from_matrix(t);
    let mut ws = super::nonnormal::ConditionWorkspace::new(m);
    super::nonnormal::defective_modulus(&flat, &mut ws)
        .ok()
        .flatten()
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

    #[test]
    fn tiny_and_subnormal_matrices_have_scaled_singular_values() {
        // nalgebra's SVD does not return on these; the kernel scales them.
        for s in [1e-160, 1e-300, 1e-310] {
            let a = DMatrix::from_row_slice(
                2,
                2,
                &[
                    C64::new(3.0 * s, 0.0),
                    C64::new(0.0, 0.0),
                    C64::new(0.0, 0.0),
                    C64::new(0.0, -4.0 * s),
                ],
            );
            let sv = singular_values(&a);
            assert_eq!(sv, vec![4.0 * s, 3.0 * s], "scale {s}");
        }
    }
}
