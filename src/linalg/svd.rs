//! The singular value decomposition A = U Σ Vᴴ of a small complex matrix by
//! one-sided Jacobi (`jacobi`, `singular_vectors`): the singular values alone
//! (for ‖A‖₂ and σ_min, the cheap path), or with the right singular vectors
//! (the accumulated rotations) and the left ones (U = AV/σ, completed to an
//! orthonormal basis where σ is at rounding level).
//!
//! One-sided Jacobi computes every singular value to an absolute accuracy of a
//! few ε‖A‖_F (and the larger ones to high relative accuracy), as good as the
//! reference SVD, and returns promptly for every finite input: entries of any
//! magnitude, subnormals included, are brought into range by an exact
//! power-of-two scaling, and the sweeps are capped ([`MAX_SWEEPS`]).
//! Fixed-size stack storage for m ≤ [`MAX_FIXED`] (no allocation per call), a
//! workspace allocated by the constructor above.

use super::cplx::ZERO;
use super::jacobi::{negligible, orthogonalise};
use super::singular_vectors::{left_vectors, right_vectors, sort_descending};
use super::small::{dispatch, MAX_FIXED};
use super::square::{Dyn, Fixed, Square};
use super::LinalgError;
use num_complex::Complex64 as C64;

pub use super::jacobi::MAX_SWEEPS;

/// Reusable singular value decomposition for one matrix size.
#[derive(Debug, Clone)]
pub struct SvdSolver {
    m: usize,
    /// Workspace of the general path (m > [`MAX_FIXED`] only).
    general: Option<General>,
}

/// Run-time-size workspace: the rotated columns, the accumulated rotations,
/// squared column norms and singular values.
#[derive(Debug, Clone)]
struct General {
    w: Dyn,
    v: Dyn,
    norms: Vec<f64>,
    sigma: Vec<f64>,
}

impl General {
    fn new(m: usize) -> Self {
        General {
            w: Dyn::zeros(m),
            v: Dyn::zeros(m),
            norms: vec![0.0; m],
            sigma: vec![0.0; m],
        }
    }
}

impl SvdSolver {
    /// A solver for m×m matrices (m ≥ 1).
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        Self {
            m,
            general: (m > MAX_FIXED).then(|| General::new(m)),
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Singular values of the row-major m×m matrix `a`, in descending order, into
    /// `out` (length m).
    pub fn singular_values(&mut self, a: &[C64], out: &mut [f64]) -> Result<(), LinalgError> {
        self.decompose(a, out, None, None)
    }

    /// A = U Σ Vᴴ for the row-major m×m matrix `a`: the singular values, in
    /// descending order, into `sigma` (length m); if given, U into `u` and V
    /// into `v` (row-major m×m, unitary), column k belonging to `sigma[k]`.
    /// Where σ_k ≤ ε‖A‖_F the column u_k is an orthonormal completion (any
    /// such choice satisfies A = UΣVᴴ to rounding). The outputs are left
    /// unspecified on error.
    pub fn decompose(
        &mut self,
        a: &[C64],
        sigma: &mut [f64],
        u: Option<&mut [C64]>,
        v: Option<&mut [C64]>,
    ) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        assert_eq!(sigma.len(), m, "singular value slice has the wrong length");
        let u_ok = u.as_ref().is_none_or(|u| u.len() == m * m);
        let v_ok = v.as_ref().is_none_or(|v| v.len() == m * m);
        assert!(u_ok && v_ok, "singular vector slice has the wrong length");
        dispatch!(m, fixed, (a, sigma, u, v), {
            let g = self.general.get_or_insert_with(|| General::new(m));
            decompose_in(a, &mut g.w, &mut g.v, &mut g.norms, sigma, u, v)
        })
    }

    /// The spectral norm ‖A‖₂ = σ_max of the row-major m×m matrix `a`.
    pub fn norm2(&mut self, a: &[C64]) -> Result<f64, LinalgError> {
        Ok(self.extreme_values(a)?.0)
    }

    /// The smallest singular value σ_min of the row-major m×m matrix `a` (the
    /// distance to the nearest singular matrix in the 2-norm; 1/σ_min(zI − G)
    /// is the resolvent norm), to an absolute accuracy of a few ε‖A‖_F.
    pub fn sigma_min(&mut self, a: &[C64]) -> Result<f64, LinalgError> {
        Ok(self.extreme_values(a)?.1)
    }

    /// (σ_max, σ_min) without allocation on either path.
    fn extreme_values(&mut self, a: &[C64]) -> Result<(f64, f64), LinalgError> {
        let m = self.m;
        if m <= MAX_FIXED {
            let mut out = [0.0; MAX_FIXED];
            self.singular_values(a, &mut out[..m])?;
            return Ok((out[0], out[m - 1]));
        }
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        let g = self.general.get_or_insert_with(|| General::new(m));
        let General { w, v, norms, sigma } = g;
        decompose_in(a, w, v, norms, sigma, None, None)?;
        Ok((sigma[0], sigma[m - 1]))
    }
}

/// The decomposition of the row-major N×N `a` on the stack.
fn fixed<const N: usize>(
    a: &[C64],
    sigma: &mut [f64],
    u: Option<&mut [C64]>,
    v: Option<&mut [C64]>,
) -> Result<(), LinalgError> {
    let mut w = Fixed::<N>::ZERO;
    let mut vm = Fixed::<N>::ZERO;
    let mut norms = [0.0; MAX_FIXED];
    decompose_in(a, &mut w, &mut vm, &mut norms[..N], sigma, u, v)
}

/// The decomposition with `w`, `vm` and `norms` as workspace.
#[inline(always)]
fn decompose_in<H: Square>(
    a: &[C64],
    w: &mut H,
    vm: &mut H,
    norms: &mut [f64],
    sigma: &mut [f64],
    u: Option<&mut [C64]>,
    v: Option<&mut [C64]>,
) -> Result<(), LinalgError> {
    if u.is_none() && v.is_none() {
        let back = orthogonalise::<H, false>(a, w, vm, norms)?.unwrap_or(1.0);
        for (s, n2) in sigma.iter_mut().zip(norms.iter()) {
            *s = n2.sqrt() * back;
        }
        sigma.sort_unstable_by(|x, y| y.total_cmp(x));
        return Ok(());
    }
    let back = orthogonalise::<H, true>(a, w, vm, norms)?.unwrap_or(1.0);
    let fro2: f64 = norms.iter().sum();
    sort_descending::<H, true>(w, vm, norms);
    for (s, n2) in sigma.iter_mut().zip(norms.iter()) {
        *s = n2.sqrt() * back;
    }
    if let Some(u) = u {
        left_vectors(w, norms, negligible(fro2), u);
    }
    if let Some(v) = v {
        right_vectors(vm, v);
    }
    Ok(())
}

/// The factors of A = U Σ Vᴴ from [`svd`]: U and V row-major, column k of
/// each belonging to `sigma[k]`.
#[derive(Debug, Clone, PartialEq)]
pub struct Svd {
    /// Singular values, descending.
    pub sigma: Vec<f64>,
    /// Left singular vectors (columns), row-major m×m.
    pub u: Vec<C64>,
    /// Right singular vectors (columns), row-major m×m.
    pub v: Vec<C64>,
}

/// A = U Σ Vᴴ of a row-major m×m matrix (allocating convenience wrapper of
/// [`SvdSolver::decompose`]).
pub fn svd(a: &[C64], m: usize) -> Result<Svd, LinalgError> {
    let mut out = Svd {
        sigma: vec![0.0; m],
        u: vec![ZERO; m * m],
        v: vec![ZERO; m * m],
    };
    SvdSolver::new(m).decompose(a, &mut out.sigma, Some(&mut out.u), Some(&mut out.v))?;
    Ok(out)
}

/// The smallest singular value of a row-major m×m matrix (allocating wrapper).
pub fn sigma_min(a: &[C64], m: usize) -> Result<f64, LinalgError> {
    SvdSolver::new(m).sigma_min(a)
}
