//! Eigen drivers: load a row-major slice into matrix storage (checking it is
//! finite and scaling it by a power of two into a safe range), reduce it to
//! Hessenberg form, run the shifted QR iteration, and optionally accumulate Q
//! and back-substitute for eigenvectors.
//!
//! The drivers are generic over [`Square`] storage. For m ≤ [`MAX_FIXED`] they
//! run on [`Fixed`] stack matrices with no allocation at all, and [`dispatch!`]
//! maps a run-time m to the monomorphised kernel; larger sizes use the [`Dyn`]
//! workspace of [`super::general`]. Power-of-two scaling is exact, so eigenvalues
//! of s·A are s times those of A to rounding in every case.
//!
//! [`Dyn`]: super::square::Dyn

use super::cplx::ZERO;
use super::square::{load_scaled, scale_in_place, Fixed, Square};
use super::{eigvec, hessenberg, qr, LinalgError};
use num_complex::Complex64 as C64;

/// Largest size with a fixed-size (stack) kernel.
pub const MAX_FIXED: usize = 8;

/// Calls `$f::<N>($args)` for the run-time size `$m` in 1..=8, else evaluates `$other`.
macro_rules! dispatch {
    ($m:expr, $($f:ident)::+, ( $($arg:expr),* ), $other:expr) => {
        match $m {
            1 => $($f)::+::<1>($($arg),*),
            2 => $($f)::+::<2>($($arg),*),
            3 => $($f)::+::<3>($($arg),*),
            4 => $($f)::+::<4>($($arg),*),
            5 => $($f)::+::<5>($($arg),*),
            6 => $($f)::+::<6>($($arg),*),
            7 => $($f)::+::<7>($($arg),*),
            8 => $($f)::+::<8>($($arg),*),
            _ => $other,
        }
    };
}
pub(crate) use dispatch;

/// Eigenvalues of the row-major `a` into `out`, using `h` and `work` (2n
/// entries) as workspace.
#[inline(always)]
pub(crate) fn eigenvalues_in<H: Square>(
    a: &[C64],
    h: &mut H,
    work: &mut [C64],
    out: &mut [C64],
) -> Result<(), LinalgError> {
    let back = load_scaled(a, h, false)?;
    eigenvalues_loaded(h, back, work, out)
}

/// Eigenvalues of `h`, already loaded and scaled (`back` as from [`scale_in_place`]).
#[inline(always)]
fn eigenvalues_loaded<H: Square>(
    h: &mut H,
    back: Option<f64>,
    work: &mut [C64],
    out: &mut [C64],
) -> Result<(), LinalgError> {
    let Some(back) = back else {
        out.fill(ZERO);
        return Ok(());
    };
    hessenberg::reduce(h, None, work);
    qr::eigenvalues(h, out, qr::iteration_cap(h.dim()))?;
    if back != 1.0 {
        for z in out.iter_mut() {
            *z *= back;
        }
    }
    Ok(())
}

/// Eigenvalues into `values` and unit eigenvectors as the columns of the
/// row-major `vectors`; values\[k\] belongs to column k. `t`, `q` and `work`
/// (2n entries) are workspace.
#[inline(always)]
pub(crate) fn eigenvalues_and_vectors_in<H: Square>(
    a: &[C64],
    t: &mut H,
    q: &mut H,
    work: &mut [C64],
    values: &mut [C64],
    vectors: &mut [C64],
) -> Result<(), LinalgError> {
    let n = t.dim();
    q.set_identity();
    let Some(back) = load_scaled(a, t, false)? else {
        values.fill(ZERO);
        vectors.copy_from_slice(q.flat());
        return Ok(());
    };
    hessenberg::reduce(t, Some(q), work);
    qr::schur(t, q, qr::iteration_cap(n))?;
    for (k, v) in values.iter_mut().enumerate() {
        *v = t[k][k] * back;
    }
    eigvec::schur_vectors(t.flat(), q.flat(), n, &mut work[..n], vectors);
    Ok(())
}

/// Eigenvalues of the row-major N×N matrix `a` into `out` (length N).
pub(crate) fn eigenvalues<const N: usize>(a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
    let mut h = Fixed::<N>::from_row_major(a);
    let back = scale_in_place(&mut h)?;
    let mut work = [ZERO; 2 * MAX_FIXED];
    eigenvalues_loaded(&mut h, back, &mut work, out)
}

/// Eigenvalues and unit eigenvectors of the row-major N×N matrix `a`.
pub(crate) fn eigenvalues_and_vectors<const N: usize>(
    a: &[C64],
    values: &mut [C64],
    vectors: &mut [C64],
) -> Result<(), LinalgError> {
    let mut t = Fixed::<N>::ZERO;
    let mut q = Fixed::<N>::ZERO;
    let mut work = [ZERO; 2 * MAX_FIXED];
    eigenvalues_and_vectors_in(a, &mut t, &mut q, &mut work, values, vectors)
}
