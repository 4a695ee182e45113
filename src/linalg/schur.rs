//! The complex Schur form A = Q T Qᴴ of a small square matrix, on the same
//! kernels as the eigenvalues: Householder reduction to Hessenberg form with Q
//! accumulated, then the shifted QR iteration with every rotation applied to Q
//! (Golub & Van Loan, Matrix Computations, 4th ed., §7.4–7.5; `hessenberg`,
//! `qr`).
//!
//! [`SchurSolver`] is built once per matrix size and reused: for m ≤
//! [`MAX_FIXED`] everything lives on the stack, above it in a run-time-size
//! workspace allocated by the constructor. The input is checked for NaN and
//! infinities and scaled by a power of two into the kernels' safe range (exact),
//! T is scaled back on the way out, Q needs no scaling. The QR iteration has the
//! cap of [`qr::iteration_cap`], so every finite input returns, as a result or
//! as [`LinalgError::NotConverged`].

use super::cplx::ZERO;
use super::general::Workspace;
use super::small::{dispatch, MAX_FIXED};
use super::square::{load_scaled, Fixed, Square};
use super::{hessenberg, qr, LinalgError};
use num_complex::Complex64 as C64;

/// Reusable Schur decomposition for one matrix size.
#[derive(Debug, Clone)]
pub struct SchurSolver {
    m: usize,
    /// Workspace of the general path (`None` for m ≤ [`MAX_FIXED`]: stack only).
    general: Option<Workspace>,
}

impl SchurSolver {
    /// A solver for m×m matrices (m ≥ 1).
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        Self {
            m,
            general: (m > MAX_FIXED).then(|| Workspace::new(m)),
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Schur form of the row-major m×m matrix `a`: on success `t` (row-major
    /// m×m) is upper triangular with its strictly lower part exactly zero, `q`
    /// (row-major m×m) is unitary and A = Q T Qᴴ to rounding. The eigenvalues
    /// are the diagonal of T, in no particular order. The slices are only
    /// written to, and are left unspecified on error.
    pub fn decompose(
        &mut self,
        a: &[C64],
        t: &mut [C64],
        q: &mut [C64],
    ) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(
            t.len(),
            m * m,
            "triangular factor slice has the wrong length"
        );
        assert_eq!(q.len(), m * m, "unitary factor slice has the wrong length");
        dispatch!(m, fixed, (a, t, q), {
            let ws = self.general.get_or_insert_with(|| Workspace::new(m));
            let (h, z, work) = ws.parts();
            schur_in(a, h, z, work, t, q)
        })
    }
}

/// The Schur form of the row-major N×N `a` on the stack.
fn fixed<const N: usize>(a: &[C64], t: &mut [C64], q: &mut [C64]) -> Result<(), LinalgError> {
    let mut h = Fixed::<N>::ZERO;
    let mut z = Fixed::<N>::ZERO;
    let mut work = [ZERO; 2 * MAX_FIXED];
    schur_in(a, &mut h, &mut z, &mut work, t, q)
}

/// The Schur form of the row-major `a`, with `h`, `z` and `work` (2n entries)
/// as workspace, written into the row-major `t_out` and `q_out`.
#[inline(always)]
pub(crate) fn schur_in<H: Square>(
    a: &[C64],
    h: &mut H,
    z: &mut H,
    work: &mut [C64],
    t_out: &mut [C64],
    q_out: &mut [C64],
) -> Result<(), LinalgError> {
    let n = h.dim();
    z.set_identity();
    let Some(back) = load_scaled(a, h, false)? else {
        t_out.fill(ZERO);
        q_out.copy_from_slice(z.flat());
        return Ok(());
    };
    hessenberg::reduce(h, Some(z), work);
    qr::schur(h, z, qr::iteration_cap(n))?;
    for i in 0..n {
        let row = &mut t_out[i * n..(i + 1) * n];
        row[..i].fill(ZERO);
        for (o, x) in row[i..].iter_mut().zip(&h[i][i..]) {
            *o = *x * back;
        }
    }
    q_out.copy_from_slice(z.flat());
    Ok(())
}

/// Schur form A = Q T Qᴴ of a row-major m×m matrix, as row-major `(t, q)`
/// (allocating convenience wrapper of [`SchurSolver::decompose`]).
pub fn schur(a: &[C64], m: usize) -> Result<(Vec<C64>, Vec<C64>), LinalgError> {
    let mut t = vec![ZERO; m * m];
    let mut q = vec![ZERO; m * m];
    SchurSolver::new(m).decompose(a, &mut t, &mut q)?;
    Ok((t, q))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::cplx::{EPS, ONE};

    fn residual(a: &[C64], t: &[C64], q: &[C64], m: usize) -> f64 {
        let mut worst = 0.0f64;
        for i in 0..m {
            for j in 0..m {
                let mut s = ZERO;
                for k in 0..m {
                    for l in 0..m {
                        s += q[i * m + k] * t[k * m + l] * q[j * m + l].conj();
                    }
                }
                worst = worst.max((s - a[i * m + j]).norm());
            }
        }
        worst
    }

    #[test]
    fn fixed_and_general_paths_both_reconstruct_the_cyclic_shift() {
        for m in [3, 8, 11] {
            let mut a = vec![ZERO; m * m];
            for i in 0..m {
                a[((i + 1) % m) * m + i] = ONE;
            }
            let (t, q) = schur(&a, m).unwrap();
            assert!(residual(&a, &t, &q, m) <= 16.0 * m as f64 * EPS, "m = {m}");
            for i in 0..m {
                assert!(t[i * m..i * m + i].iter().all(|z| *z == ZERO));
            }
        }
    }

    #[test]
    fn zero_matrix_gives_zero_t_and_identity_q() {
        let (t, q) = schur(&[ZERO; 9], 3).unwrap();
        assert!(t.iter().all(|z| *z == ZERO));
        for i in 0..3 {
            for j in 0..3 {
                assert_eq!(q[i * 3 + j], if i == j { ONE } else { ZERO });
            }
        }
    }
}
