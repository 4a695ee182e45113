//! Small dense complex linear algebra: the hot kernel of every sweep.
//!
//! Two levels, as in the rest of the crate:
//! * in place, with a caller-owned workspace, for hot loops: a solver is built
//!   once per matrix size (per rayon worker) and reused; it reads a row-major
//!   m×m slice and writes into caller-owned slices, with no heap allocation per
//!   call for m ≤ [`MAX_FIXED`] (fixed-size stack kernels) and none above either
//!   (a run-time-size workspace allocated by the constructor):
//!   - [`EigSolver`]: `eigenvalues(a, out)`, `eigenvalues_and_vectors(a,
//!     values, vectors)`;
//!   - [`SchurSolver`]: `decompose(a, t, q)`, A = Q T Qᴴ with T upper
//!     triangular (strict lower part zero) and Q unitary;
//!   - [`SvdSolver`]: `singular_values(a, sigma)`, `norm2(a)`, `sigma_min(a)`
//!     and `decompose(a, sigma, Some(u), Some(v))`, A = U Σ Vᴴ with σ
//!     descending;
//!   - [`LuSolver`]: `factor(a)`, `solve_in_place(b, nrhs)`, `solve(a, b,
//!     nrhs)` for A X = B with one or several columns;
//!   - [`nonnormal`]: departure from normality, triangular eigenvectors and the
//!     eigenvector condition number from a Schur factor T, with a
//!     [`nonnormal::ConditionWorkspace`];
//! * allocating wrappers for tests, `kgain check` and once-per-wavevector
//!   analyses: [`eigenvalues`], [`eigenvalues_and_vectors`], [`schur`],
//!   [`singular_values`], [`svd`] (an [`Svd`]), [`norm2`], [`sigma_min`], [`solve`],
//!   [`spectral_radius`], and [`dense`] (the same on nalgebra `DMatrix`
//!   values, for the growth analysis).
//!
//! Dispatch by m: closed forms for eigenvalues at m = 1 and 2; for m ≤ 8
//! fixed-size stack kernels (Householder reduction to Hessenberg form, then
//! single-shift QR with the Wilkinson shift, Golub & Van Loan, Matrix
//! Computations, §7.4–7.5; `small`, `hessenberg`, `qr`, `schur`); above 8 the
//! same algorithms on run-time-size storage (`general`, `square`).
//! Eigenvectors come from back-substitution on the Schur form (`eigvec`),
//! singular values and vectors from one-sided Jacobi (`jacobi`,
//! `singular_vectors`), solutions from LU with partial pivoting (`lu`).
//! Within this module nalgebra's complex Schur decomposition and SVD are used
//! nowhere but in [`reference`](mod@reference), the slow references of the tests; nalgebra
//! stays as a container type.
//!
//! Robustness, the same on every path: NaN or infinite input is
//! [`LinalgError::NonFinite`]; the input is scaled by a power of two (exact) so
//! that entries anywhere in the f64 range, subnormals included, are handled
//! without overflow or underflow; every iteration has a cap and reports
//! [`LinalgError::NotConverged`] past it, so no finite input hangs or panics.
//! A linear system whose matrix is singular to working accuracy is
//! [`LinalgError::Singular`], a solution beyond the f64 range
//! [`LinalgError::OutOfRange`]. Slices of the wrong length are a programming
//! error and panic.

mod cplx;
pub mod dense;
mod eigvec;
mod francis;
mod general;
mod hessenberg;
mod jacobi;
mod lu;
pub mod nonnormal;
pub mod poly;
pub(crate) mod product;
mod qr;
pub mod reference;
mod schur;
mod singular_vectors;
mod small;
mod square;
mod svd;

pub use lu::{solve, LuSolver};
pub use product::multiply_into;
pub use schur::{schur, SchurSolver};
pub use small::MAX_FIXED;
pub use svd::{sigma_min, svd, Svd, SvdSolver, MAX_SWEEPS};

use cplx::{abs1, cdiv, csqrt, pow2_scaling};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use small::dispatch;

/// Failure of a kernel at one input: a value, not an abort.
#[derive(Debug, Clone, Copy, PartialEq, Eq, thiserror::Error)]
pub enum LinalgError {
    /// The iteration did not converge within its iteration cap.
    #[error("iteration did not converge within its cap")]
    NotConverged,
    /// The matrix has a NaN or infinite entry.
    #[error("matrix has a NaN or infinite entry")]
    NonFinite,
    /// The matrix of a linear system is singular to working accuracy.
    #[error("matrix is singular to working accuracy")]
    Singular,
    /// The result lies outside the f64 range.
    #[error("result lies outside the f64 range")]
    OutOfRange,
}

/// Reusable eigenvalue solver for one matrix size.
#[derive(Debug, Clone)]
pub struct EigSolver {
    m: usize,
    /// Workspace of the general path (`None` for m ≤ [`MAX_FIXED`]: stack only).
    general: Option<general::Workspace>,
}

impl EigSolver {
    /// A solver for m×m matrices.
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        Self {
            m,
            general: (m > MAX_FIXED).then(|| general::Workspace::new(m)),
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    fn workspace(&mut self) -> &mut general::Workspace {
        let m = self.m;
        self.general
            .get_or_insert_with(|| general::Workspace::new(m))
    }

    /// Eigenvalues of the row-major m×m matrix `a`, written into `out` (length m).
    /// The order of the eigenvalues is unspecified.
    pub fn eigenvalues(&mut self, a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(out.len(), m, "output slice has the wrong length");
        match m {
            1 => {
                cplx::max_abs1(a)?;
                out[0] = a[0];
                Ok(())
            }
            2 => {
                cplx::max_abs1(a)?;
                (out[0], out[1]) = eig2(a[0], a[1], a[2], a[3]);
                Ok(())
            }
            _ => dispatch!(
                m,
                small::eigenvalues,
                (a, out),
                self.workspace().eigenvalues(a, out)
            ),
        }
    }

    /// Eigenvalues of the row-major m×m matrix `a` into `values` (length m) and
    /// eigenvectors into `vectors` (row-major m×m): column k is a unit-2-norm
    /// eigenvector for `values[k]`, with its largest component real and positive.
    /// For a defective matrix the columns of a Jordan block come out nearly
    /// parallel (each still with a small residual ‖Av − λv‖).
    pub fn eigenvalues_and_vectors(
        &mut self,
        a: &[C64],
        values: &mut [C64],
        vectors: &mut [C64],
    ) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(values.len(), m, "eigenvalue slice has the wrong length");
        assert_eq!(
            vectors.len(),
            m * m,
            "eigenvector slice has the wrong length"
        );
        dispatch!(
            m,
            small::eigenvalues_and_vectors,
            (a, values, vectors),
            self.workspace().eigenvalues_and_vectors(a, values, vectors)
        )
    }
}

/// Eigenvalues of [[a, b], [c, d]] in closed form, arranged to avoid cancellation:
/// the larger root λ₁ = t/2 ± √((a − d)²/4 + bc) (t = a + d) with the sign of the
/// half-trace; the smaller from the determinant, det/λ₁, which keeps its
/// relative accuracy when |λ₂| ≪ |λ₁|, unless that disagrees with t − λ₁ by
/// more than rounding. It then does so because the block is nearly defective
/// (det/λ₁ would break Σλ = trace by O(√ε)), and t − λ₁ is used: the pair is then
/// the exact spectrum of a matrix within ε‖B‖ of the block. Entries of any
/// magnitude are handled by scaling with a power of two; NaN entries give NaN
/// eigenvalues.
#[inline]
pub fn eig2(a: C64, b: C64, c: C64, d: C64) -> (C64, C64) {
    let amax = abs1(a).max(abs1(b)).max(abs1(c)).max(abs1(d));
    let (scale, back) = if amax > 0.0 && amax.is_finite() {
        pow2_scaling(amax)
    } else {
        (1.0, 1.0)
    };
    if scale == 1.0 {
        return eig2_in_range(a, b, c, d);
    }
    let (l1, l2) = eig2_in_range(a * scale, b * scale, c * scale, d * scale);
    (l1 * back, l2 * back)
}

/// [`eig2`] for entries already scaled into the kernels' safe range.
#[inline(always)]
pub(crate) fn eig2_in_range(a: C64, b: C64, c: C64, d: C64) -> (C64, C64) {
    let tr = a + d;
    let half_tr = tr * 0.5;
    let half_diff = (a - d) * 0.5;
    let disc = csqrt(half_diff * half_diff + b * c);
    let s = if half_tr.re * disc.re + half_tr.im * disc.im >= 0.0 {
        half_tr + disc
    } else {
        half_tr - disc
    };
    if s.re == 0.0 && s.im == 0.0 {
        return (s, s);
    }
    let by_trace = tr - s;
    let by_det = cdiv(a * d - b * c, s);
    let rounding = 4.0 * cplx::EPS * (abs1(a) + abs1(d) + abs1(s));
    if abs1(by_det - by_trace) <= rounding {
        (s, by_det)
    } else {
        (s, by_trace)
    }
}

/// Eigenvalues of a row-major m×m matrix (allocating convenience wrapper).
pub fn eigenvalues(a: &[C64], m: usize) -> Result<Vec<C64>, LinalgError> {
    let mut solver = EigSolver::new(m);
    let mut out = vec![C64::new(0.0, 0.0); m];
    solver.eigenvalues(a, &mut out)?;
    Ok(out)
}

/// Eigenvalues and unit eigenvectors (columns of the returned row-major m×m
/// matrix) of a row-major m×m matrix (allocating convenience wrapper).
pub fn eigenvalues_and_vectors(a: &[C64], m: usize) -> Result<(Vec<C64>, Vec<C64>), LinalgError> {
    let mut solver = EigSolver::new(m);
    let mut values = vec![C64::new(0.0, 0.0); m];
    let mut vectors = vec![C64::new(0.0, 0.0); m * m];
    solver.eigenvalues_and_vectors(a, &mut values, &mut vectors)?;
    Ok((values, vectors))
}

/// Singular values, descending, of a row-major m×m matrix (allocating wrapper).
pub fn singular_values(a: &[C64], m: usize) -> Result<Vec<f64>, LinalgError> {
    let mut out = vec![0.0; m];
    SvdSolver::new(m).singular_values(a, &mut out)?;
    Ok(out)
}

/// The spectral norm ‖A‖₂ (largest singular value) of a row-major m×m matrix.
pub fn norm2(a: &[C64], m: usize) -> Result<f64, LinalgError> {
    SvdSolver::new(m).norm2(a)
}

/// Spectral radius max |λ| of a row-major m×m matrix.
pub fn spectral_radius(a: &[C64], m: usize) -> Result<f64, LinalgError> {
    Ok(eigenvalues(a, m)?
        .iter()
        .map(|z| z.norm())
        .fold(0.0, f64::max))
}

/// Converts a row-major slice into an nalgebra matrix.
pub fn to_matrix(a: &[C64], m: usize) -> DMatrix<C64> {
    DMatrix::from_fn(m, m, |i, j| a[i * m + j])
}

/// Converts an nalgebra matrix into a row-major vector.
pub fn from_matrix(a: &DMatrix<C64>) -> Vec<C64> {
    let m = a.nrows();
    let mut out = Vec::with_capacity(m * a.ncols());
    for i in 0..m {
        for j in 0..a.ncols() {
            out.push(a[(i, j)]);
        }
    }
    out
}

/// Sylvester's formula: f(A) for a diagonalisable matrix A from its distinct
/// eigenvalues, f(A) = Σ_i f(λ_i) Π_{j≠i} (A − λ_j I)/(λ_i − λ_j).
///
/// Eigenvalues closer than `cluster` are merged. Returns `None` when A is not
/// diagonalisable to that accuracy (the minimal polynomial over the distinct
/// eigenvalues does not annihilate A).
pub fn diagonalisable_function(
    a: &DMatrix<C64>,
    cluster: f64,
    f: impl Fn(C64) -> C64,
) -> Option<DMatrix<C64>> {
    let m = a.nrows();
    let lam = eigenvalues(&from_matrix(a), m).ok()?;
    let mut distinct: Vec<C64> = Vec::new();
    for l in lam {
        if !distinct.iter().any(|d| (d - l).norm() <= cluster) {
            distinct.push(l);
        }
    }
    let id = DMatrix::<C64>::identity(m, m);
    let scale = a.norm().max(1.0);
    let mut annihilator = id.clone();
    for d in &distinct {
        annihilator = &annihilator * (a - &id * *d);
    }
    if annihilator.norm() > 1e-7 * scale.powi(distinct.len() as i32) {
        return None;
    }
    let mut out = DMatrix::<C64>::zeros(m, m);
    for (i, li) in distinct.iter().enumerate() {
        let mut term = id.clone() * f(*li);
        for (j, lj) in distinct.iter().enumerate() {
            if i != j {
                term *= (a - &id * *lj) / (li - lj);
            }
        }
        out += term;
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn eig2_matches_trace_and_determinant() {
        let (a, b, c, d) = (
            C64::new(1.0, 2.0),
            C64::new(-0.5, 0.1),
            C64::new(3.0, 0.0),
            C64::new(1e-9, -1.0),
        );
        let (l1, l2) = eig2(a, b, c, d);
        assert!((l1 + l2 - (a + d)).norm() < 1e-14 * 4.0);
        assert!((l1 * l2 - (a * d - b * c)).norm() < 1e-13 * 4.0);
    }
}
