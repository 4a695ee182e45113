//! Small dense complex linear algebra: the hot kernel of every sweep.
//!
//! Two levels, as in the rest of the crate:
//! * low level, [`EigSolver`]: eigenvalues of an m×m complex matrix given as a
//!   row-major slice, written into a caller-owned slice, with a workspace that is
//!   built once per worker and reused (no allocation per wavevector);
//! * high level, [`eigenvalues`] and friends: allocating wrappers for tests,
//!   `kgain check` and the refinement steps.
//!
//! m = 1 and m = 2 use closed forms; larger sizes use nalgebra's complex Schur
//! decomposition (Francis QR). The analyses only see this API, so a faster kernel
//! can replace the general path without touching them.

pub mod dense;
pub mod poly;

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Failure of an iterative kernel at one input: a value, not an abort.
#[derive(Debug, Clone, Copy, PartialEq, Eq, thiserror::Error)]
pub enum LinalgError {
    /// The QR iteration did not converge within its iteration cap.
    #[error("eigenvalue iteration did not converge")]
    NotConverged,
}

/// Reusable eigenvalue solver for one matrix size.
#[derive(Debug, Clone)]
pub struct EigSolver {
    m: usize,
    work: DMatrix<C64>,
}

impl EigSolver {
    /// A solver for m×m matrices.
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        Self {
            m,
            work: DMatrix::zeros(m, m),
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Eigenvalues of the row-major m×m matrix `a`, written into `out` (length m).
    /// The order of the eigenvalues is unspecified.
    pub fn eigenvalues(&mut self, a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(out.len(), m, "output slice has the wrong length");
        match m {
            1 => {
                out[0] = a[0];
                Ok(())
            }
            2 => {
                let (l1, l2) = eig2(a[0], a[1], a[2], a[3]);
                out[0] = l1;
                out[1] = l2;
                Ok(())
            }
            _ => {
                for i in 0..m {
                    for j in 0..m {
                        self.work[(i, j)] = a[i * m + j];
                    }
                }
                if a.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
                    return Err(LinalgError::NotConverged);
                }
                let mat = std::mem::replace(&mut self.work, DMatrix::zeros(0, 0));
                let Some(schur) =
                    nalgebra::linalg::Schur::try_new(mat, 4.0 * f64::EPSILON, 1000 * m)
                else {
                    self.work = DMatrix::zeros(m, m);
                    return Err(LinalgError::NotConverged);
                };
                let (_, t) = schur.unpack();
                for (i, o) in out.iter_mut().enumerate() {
                    *o = t[(i, i)];
                }
                self.work = t;
                Ok(())
            }
        }
    }
}

/// Eigenvalues of [[a, b], [c, d]] in closed form, arranged to avoid cancellation:
/// the larger root from the discriminant with the sign of the half-trace, the
/// smaller from the determinant.
pub fn eig2(a: C64, b: C64, c: C64, d: C64) -> (C64, C64) {
    let half_tr = (a + d) * 0.5;
    let half_diff = (a - d) * 0.5;
    let disc = (half_diff * half_diff + b * c).sqrt();
    let s = if (half_tr.conj() * disc).re >= 0.0 {
        half_tr + disc
    } else {
        half_tr - disc
    };
    let det = a * d - b * c;
    if s.norm() == 0.0 {
        (C64::new(0.0, 0.0), C64::new(0.0, 0.0))
    } else {
        (s, det / s)
    }
}

/// Eigenvalues of a row-major m×m matrix (allocating convenience wrapper).
pub fn eigenvalues(a: &[C64], m: usize) -> Result<Vec<C64>, LinalgError> {
    let mut solver = EigSolver::new(m);
    let mut out = vec![C64::new(0.0, 0.0); m];
    solver.eigenvalues(a, &mut out)?;
    Ok(out)
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
