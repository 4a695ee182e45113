//! Singular values and the spectral norm ‖A‖₂ of small complex matrices by the
//! one-sided Jacobi method (Hestenes 1958; Golub & Van Loan, Matrix Computations,
//! 4th ed., §8.6.3 with the 2×2 symmetric Schur decomposition of Algorithm 8.5.1,
//! made complex by a phase): columns are rotated pairwise until all are
//! mutually orthogonal, and the singular values are then the column norms.
//!
//! A pair (p, q) is rotated while |a_pᴴ a_q| > ε‖a_p‖‖a_q‖; a sweep with no
//! rotation ends the iteration, and [`MAX_SWEEPS`] sweeps without that is
//! [`LinalgError::NotConverged`]. One-sided Jacobi computes every singular value
//! to high relative accuracy in the column norms, so the result is as good as
//! the reference SVD. The input is scaled by a power of two like the eigen
//! kernels. Columns whose norm is below ε‖A‖_F are not rotated further: they
//! carry rounding noise only, which cannot be made orthogonal to working
//! accuracy, and rotating them moves no singular value by more than ε‖A‖_F.
//! Fixed-size stack storage for m ≤ 8, a reused run-time-size matrix above.

use super::cplx::{modulus, norm_sqr, EPS};
use super::small::{dispatch, MAX_FIXED};
use super::square::{load_scaled, Dyn, Fixed, Square};
use super::LinalgError;
use num_complex::Complex64 as C64;

/// Sweeps allowed before the Jacobi iteration gives up (it converges
/// quadratically; 8×8 matrices need about 6–8).
pub const MAX_SWEEPS: usize = 40;

/// Reusable singular-value solver for one matrix size.
#[derive(Debug, Clone)]
pub struct SvdSolver {
    m: usize,
    /// Columns and squared column norms of the general path (m > 8 only).
    general: Option<(Dyn, Vec<f64>)>,
}

impl SvdSolver {
    /// A solver for m×m matrices.
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        Self {
            m,
            general: (m > MAX_FIXED).then(|| (Dyn::zeros(m), vec![0.0; m])),
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Singular values of the row-major m×m matrix `a`, in descending order, into
    /// `out` (length m).
    pub fn singular_values(&mut self, a: &[C64], out: &mut [f64]) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(out.len(), m, "output slice has the wrong length");
        dispatch!(m, fixed, (a, out), self.general(a, out))?;
        out.sort_unstable_by(|x, y| y.total_cmp(x));
        Ok(())
    }

    /// The spectral norm ‖A‖₂ = σ_max of the row-major m×m matrix `a`.
    pub fn norm2(&mut self, a: &[C64]) -> Result<f64, LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        let mut fixed_out = [0.0; MAX_FIXED];
        let mut general_out = Vec::new();
        let s = if m <= MAX_FIXED {
            &mut fixed_out[..m]
        } else {
            general_out.resize(m, 0.0);
            &mut general_out[..]
        };
        dispatch!(m, fixed, (a, s), self.general(a, s))?;
        Ok(s.iter().copied().fold(0.0, f64::max))
    }

    fn general(&mut self, a: &[C64], out: &mut [f64]) -> Result<(), LinalgError> {
        let m = self.m;
        let (w, norms) = self
            .general
            .get_or_insert_with(|| (Dyn::zeros(m), vec![0.0; m]));
        jacobi(a, w, norms, out)
    }
}

/// Unsorted singular values of the row-major N×N `a` on the stack.
fn fixed<const N: usize>(a: &[C64], out: &mut [f64]) -> Result<(), LinalgError> {
    let mut w = Fixed::<N>::ZERO;
    let mut norms = [0.0; MAX_FIXED];
    jacobi(a, &mut w, &mut norms[..N], out)
}

/// Unsorted singular values of the row-major `a` by one-sided Jacobi, with `w`
/// (its rows become the columns of the scaled matrix) and `norms` as workspace.
#[inline(always)]
fn jacobi<H: Square>(
    a: &[C64],
    w: &mut H,
    norms: &mut [f64],
    out: &mut [f64],
) -> Result<(), LinalgError> {
    let n = w.dim();
    let Some(back) = load_scaled(a, w, true)? else {
        out.fill(0.0);
        return Ok(());
    };
    let mut fro2 = 0.0;
    for (j, nj) in norms.iter_mut().enumerate() {
        *nj = w[j].iter().map(|z| norm_sqr(*z)).sum();
        fro2 += *nj;
    }
    let negligible = EPS * EPS * fro2;
    let mut converged = n < 2;
    for _ in 0..MAX_SWEEPS {
        if converged {
            break;
        }
        converged = true;
        for p in 0..n - 1 {
            for q in p + 1..n {
                if rotate_pair(w, norms, p, q, negligible) {
                    converged = false;
                }
            }
        }
    }
    if !converged {
        return Err(LinalgError::NotConverged);
    }
    for (o, j) in out.iter_mut().zip(0..n) {
        let s: f64 = w[j].iter().map(|z| norm_sqr(*z)).sum();
        *o = s.sqrt() * back;
    }
    Ok(())
}

/// Orthogonalises columns p and q if they are not orthogonal to working
/// accuracy (and neither is negligible); returns whether a rotation was applied.
/// `norms` holds ‖a_j‖².
#[inline(always)]
fn rotate_pair<H: Square>(
    w: &mut H,
    norms: &mut [f64],
    p: usize,
    q: usize,
    negligible: f64,
) -> bool {
    let (alpha, beta) = (norms[p], norms[q]);
    if alpha <= negligible || beta <= negligible {
        return false;
    }
    let (cp, cq) = w.row_pair(p, q);
    let gamma: C64 = cp.iter().zip(cq.iter()).map(|(x, y)| x.conj() * y).sum();
    let g = modulus(gamma);
    if g <= EPS * alpha.sqrt() * beta.sqrt() {
        return false;
    }
    // Real symmetric 2×2 Schur on [[α, |γ|], [|γ|, β]], then the phase e = γ/|γ|.
    let zeta = (beta - alpha) / (2.0 * g);
    let t = if zeta.abs() > 1e150 {
        0.5 / zeta
    } else {
        zeta.signum() / (zeta.abs() + (1.0 + zeta * zeta).sqrt())
    };
    let c = 1.0 / (1.0 + t * t).sqrt();
    let s = c * t;
    let e = gamma / g;
    let (se, sec) = (e * s, e.conj() * s);
    for (x, y) in cp.iter_mut().zip(cq.iter_mut()) {
        let (xp, yq) = (*x, *y);
        *x = xp * c - sec * yq;
        *y = se * xp + yq * c;
    }
    // Refreshed from the columns, so that rounding does not accumulate.
    norms[p] = cp.iter().map(|z| norm_sqr(*z)).sum();
    norms[q] = cq.iter().map(|z| norm_sqr(*z)).sum();
    true
}
