//! The one-sided Jacobi iteration (Hestenes 1958; Golub & Van Loan, Matrix
//! Computations, 4th ed., §8.6.3 with the 2×2 symmetric Schur decomposition of
//! Algorithm 8.5.1, made complex by a phase): the columns of A are rotated
//! pairwise until all are mutually orthogonal, A·V = W; the singular values
//! are then the column norms of W, the right singular vectors the columns of
//! the accumulated product of rotations V, the left ones the normalised
//! columns of W.
//!
//! A pair (p, q) is rotated while |a_pᴴ a_q| > √n·ε‖a_p‖‖a_q‖ (the tolerance of
//! LAPACK's `zgesvj`). The iteration ends after a sweep whose rotations, if
//! any, all had |a_pᴴ a_q| ≤ [`NOISE`]·√n·ε‖a_p‖‖a_q‖: such a pair is
//! orthogonal up to the rounding of its own inner product, and rotating it
//! again can cycle at that level for ever. [`MAX_SWEEPS`] sweeps without
//! that is [`LinalgError::NotConverged`]. Columns whose squared norm is at most
//! [`negligible`] (ε²‖A‖_F²) are not rotated: they carry rounding noise only,
//! which cannot be made orthogonal to working accuracy, and leaving them moves
//! no singular value by more than ε‖A‖_F. The input is scaled by a power of two
//! into the kernels' safe range like the eigen kernels (exact).

use super::cplx::{modulus, norm_sqr, EPS};
use super::square::{load_scaled, Square};
use super::LinalgError;
use num_complex::Complex64 as C64;

/// Sweeps allowed before the Jacobi iteration gives up (it converges
/// quadratically; 8×8 matrices need about 6–8).
pub const MAX_SWEEPS: usize = 40;

/// A sweep whose rotations all had a cosine |a_pᴴ a_q|/(‖a_p‖‖a_q‖) at most
/// this many times √n·ε was a sweep on rounding noise: the last one.
pub const NOISE: f64 = 16.0;

/// Squared column norms at or below this are rounding noise: ε²‖A‖_F².
#[inline(always)]
pub(crate) fn negligible(fro2: f64) -> f64 {
    EPS * EPS * fro2
}

/// Runs the iteration on the row-major `a`: on return the rows of `w` are the
/// mutually orthogonal columns of s·A·V (s the power-of-two scale), `norms`
/// their squared norms, and with `VECTORS` the rows of `v` are the columns of
/// the unitary V. Returns 1/s, or `None` for the zero matrix (then `w` is zero
/// and `v` the identity).
#[inline(always)]
pub(crate) fn orthogonalise<H: Square, const VECTORS: bool>(
    a: &[C64],
    w: &mut H,
    v: &mut H,
    norms: &mut [f64],
) -> Result<Option<f64>, LinalgError> {
    let n = w.dim();
    if VECTORS {
        v.set_identity();
    }
    let Some(back) = load_scaled(a, w, true)? else {
        norms.fill(0.0);
        return Ok(None);
    };
    let mut fro2 = 0.0;
    for (j, nj) in norms.iter_mut().enumerate() {
        *nj = column_norm2(&w[j]);
        fro2 += *nj;
    }
    let floor = negligible(fro2);
    let tol = (n as f64).sqrt() * EPS;
    let mut converged = n < 2;
    for _ in 0..MAX_SWEEPS {
        if converged {
            break;
        }
        let mut largest = 0.0f64;
        for p in 0..n - 1 {
            for q in p + 1..n {
                if let Some((rot, cosine)) = rotate_pair(w, norms, p, q, floor, tol) {
                    if VECTORS {
                        let (vp, vq) = v.row_pair(p, q);
                        rot.apply(vp, vq);
                    }
                    largest = largest.max(cosine);
                }
            }
        }
        converged = largest <= NOISE * tol;
    }
    if !converged {
        return Err(LinalgError::NotConverged);
    }
    for (j, nj) in norms.iter_mut().enumerate() {
        *nj = column_norm2(&w[j]);
    }
    Ok(Some(back))
}

/// Σ|x_i|² of one stored column.
#[inline(always)]
pub(crate) fn column_norm2(x: &[C64]) -> f64 {
    x.iter().map(|z| norm_sqr(*z)).sum()
}

/// The plane rotation of one Jacobi step: (x, y) ← (c·x − s·ē·y, s·e·x + c·y),
/// unitary since c² + s² = 1 and |e| = 1.
#[derive(Debug, Clone, Copy)]
struct JacobiRotation {
    c: f64,
    se: C64,
    sec: C64,
}

impl JacobiRotation {
    #[inline(always)]
    fn apply(self, cp: &mut [C64], cq: &mut [C64]) {
        for (x, y) in cp.iter_mut().zip(cq.iter_mut()) {
            let (xp, yq) = (*x, *y);
            *x = xp * self.c - self.sec * yq;
            *y = self.se * xp + yq * self.c;
        }
    }
}

/// Orthogonalises columns p and q if they are not orthogonal to working
/// accuracy, |a_pᴴ a_q| > `tol`·‖a_p‖‖a_q‖ (and neither is negligible);
/// returns the rotation applied and the cosine |a_pᴴ a_q|/(‖a_p‖‖a_q‖) it
/// removed. `norms` holds ‖a_j‖².
#[inline(always)]
fn rotate_pair<H: Square>(
    w: &mut H,
    norms: &mut [f64],
    p: usize,
    q: usize,
    floor: f64,
    tol: f64,
) -> Option<(JacobiRotation, f64)> {
    let (alpha, beta) = (norms[p], norms[q]);
    if alpha <= floor || beta <= floor {
        return None;
    }
    let (cp, cq) = w.row_pair(p, q);
    let gamma: C64 = cp.iter().zip(cq.iter()).map(|(x, y)| x.conj() * y).sum();
    let g = modulus(gamma);
    let size = alpha.sqrt() * beta.sqrt();
    if g <= tol * size {
        return None;
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
    let rot = JacobiRotation {
        c,
        se: e * s,
        sec: e.conj() * s,
    };
    rot.apply(cp, cq);
    // Refreshed from the columns, so that rounding does not accumulate.
    norms[p] = column_norm2(cp);
    norms[q] = column_norm2(cq);
    Some((rot, g / size))
}
