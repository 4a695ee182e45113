//! Single-shift complex QR iteration on an upper Hessenberg matrix
//! (Golub & Van Loan, Matrix Computations, 4th ed., §7.5: the implicit shifted
//! QR step as a chase of a one-element bulge by Givens rotations, §7.5.5
//! deflation), with the Wilkinson shift (Wilkinson, The Algebraic Eigenvalue
//! Problem, 1965; the eigenvalue of the trailing 2×2 block nearer its last
//! diagonal entry).
//!
//! The active block is the bottom-most unreduced window [l, i]. A subdiagonal
//! entry is set to zero when |h_{k,k−1}| ≤ ε(|h_kk| + |h_{k−1,k−1}|) (moduli in
//! the 1-norm |re| + |im|; neighbouring subdiagonals stand in when both diagonal
//! entries are zero). Windows of size 1 and, for eigenvalues only, size 2 are
//! solved directly (for the Schur form, a 2×2 block is made triangular by the
//! rotation onto its eigenvector). Every tenth iteration without deflation uses an exceptional
//! shift built from the magnitude of a subdiagonal entry, alternately at the top
//! and the bottom of the window (as LAPACK's `zlahqr`), which breaks the cycles
//! that defeat the Wilkinson shift (cyclic permutations, for one). From the
//! tenth iteration on, a subdiagonal entry below ε·max|h_ij| also counts as
//! negligible: still a backward-stable deflation, it ends the stall of highly
//! non-normal windows whose entries are all at rounding level relative to the
//! matrix (there rounding keeps |h_{k,k−1}| above the local test). Each
//! deflation has an iteration cap of 30·max(10, n); past it the kernel returns
//! [`LinalgError::NotConverged`], so no input can hang it. Written once against
//! [`Square`]: fixed-size stack matrices and the run-time-size path share it.

use super::cplx::{abs1, csqrt, Rot, EPS, ZERO};
use super::square::Square;
use super::{eig2_in_range, LinalgError};
use num_complex::Complex64 as C64;

/// Iterations allowed per deflation, as in LAPACK: 30·max(10, n).
pub(crate) const fn iteration_cap(n: usize) -> usize {
    30 * if n > 10 { n } else { 10 }
}

/// Every this many iterations without deflation, an exceptional shift.
pub(super) const EXCEPTIONAL_EVERY: usize = 10;
/// Weight of the subdiagonal in an exceptional shift (LAPACK's 3/4).
const EXCEPTIONAL_WEIGHT: f64 = 0.75;
/// Subdiagonal entries below this are negligible in any case.
pub(super) const SMALL: f64 = f64::MIN_POSITIVE / EPS;

/// Eigenvalues of the Hessenberg matrix `h` (destroyed) into `out`, in the order
/// they deflate into their diagonal positions.
#[inline]
pub(crate) fn eigenvalues<H: Square>(
    h: &mut H,
    out: &mut [C64],
    cap: usize,
) -> Result<(), LinalgError> {
    let n = h.dim();
    if n == 0 {
        return Ok(());
    }
    let hmax = max_entry(h);
    let mut i = n - 1;
    loop {
        let mut its = 0;
        loop {
            let l = deflation_point(h, i, stall_floor(its, hmax));
            if l == i {
                out[i] = h[i][i];
                if i == 0 {
                    return Ok(());
                }
                i -= 1;
                break;
            }
            if l + 1 == i {
                let (a, b) = eig2_in_range(h[l][l], h[l][i], h[i][l], h[i][i]);
                out[l] = a;
                out[i] = b;
                if l == 0 {
                    return Ok(());
                }
                i = l - 1;
                break;
            }
            if its == cap {
                return Err(LinalgError::NotConverged);
            }
            its += 1;
            let mu = shift(h, l, i, its);
            sweep::<H, false>(h, None, l, i, mu);
        }
    }
}

/// Complex Schur form: `h` (Hessenberg on entry) becomes upper triangular T and
/// `q` is multiplied on the right by every rotation, so that U·H·Uᴴ = q·T·qᴴ.
#[inline]
pub(crate) fn schur<H: Square>(h: &mut H, q: &mut H, cap: usize) -> Result<(), LinalgError> {
    let n = h.dim();
    if n == 0 {
        return Ok(());
    }
    let hmax = max_entry(h);
    let mut i = n - 1;
    loop {
        let mut its = 0;
        loop {
            let l = deflation_point(h, i, stall_floor(its, hmax));
            if l == i {
                if i == 0 {
                    return Ok(());
                }
                i -= 1;
                break;
            }
            if l + 1 == i {
                triangularise_2x2(h, q, l);
                if l == 0 {
                    return Ok(());
                }
                i = l - 1;
                break;
            }
            if its == cap {
                return Err(LinalgError::NotConverged);
            }
            its += 1;
            let mu = shift(h, l, i, its);
            sweep::<H, true>(h, Some(q), l, i, mu);
        }
    }
}

/// Makes the unreduced 2×2 block B at rows/columns l, l+1 upper triangular by
/// one rotation G (applied as H ← G H Gᴴ, q ← q Gᴴ) whose conjugate transpose
/// has as first column a unit eigenvector v of B: then G B Gᴴ e₁ = λ e₁. Of the
/// two candidates for v, [b, λ − a] and [λ − d, c], the larger is taken; the
/// second is never zero, as c ≠ 0 in an unreduced block.
#[inline(always)]
fn triangularise_2x2<H: Square>(h: &mut H, q: &mut H, l: usize) {
    let n = h.dim();
    let (a, b, c, d) = (h[l][l], h[l][l + 1], h[l + 1][l], h[l + 1][l + 1]);
    let (lam, _) = eig2_in_range(a, b, c, d);
    let (v1, v2) = ((b, lam - a), (lam - d, c));
    let (f, g) = if abs1(v1.0) + abs1(v1.1) > abs1(v2.0) + abs1(v2.1) {
        v1
    } else {
        v2
    };
    let (rot, _) = Rot::zeroing(f, g);
    rotate_rows(h, l, rot, l, n);
    rotate_cols(h, l, rot, 0, l + 2);
    rotate_cols(q, l, rot, 0, n);
    h[l + 1][l] = ZERO;
}

/// Largest |re| + |im| over the upper Hessenberg part.
#[inline(always)]
fn max_entry<H: Square>(h: &H) -> f64 {
    let n = h.dim();
    let mut m = 0.0f64;
    for i in 0..n {
        for z in &h[i][i.saturating_sub(1)..] {
            m = m.max(abs1(*z));
        }
    }
    m
}

/// The absolute deflation floor after `its` iterations without deflation: none
/// at first, ε·max|h_ij| once the iteration looks stalled.
#[inline(always)]
pub(super) fn stall_floor(its: usize, hmax: f64) -> f64 {
    if its >= EXCEPTIONAL_EVERY {
        EPS * hmax
    } else {
        0.0
    }
}

/// The top l of the bottom-most unreduced window ending at i; negligible
/// subdiagonal entries found on the way are set to zero. Entries at or below
/// `floor` are negligible too.
#[inline(always)]
fn deflation_point<H: Square>(h: &mut H, i: usize, floor: f64) -> usize {
    for k in (1..=i).rev() {
        let s = abs1(h[k][k - 1]);
        if s == 0.0 {
            return k;
        }
        let mut tst = abs1(h[k - 1][k - 1]) + abs1(h[k][k]);
        if tst == 0.0 {
            if k >= 2 {
                tst += abs1(h[k - 1][k - 2]);
            }
            if k < i {
                tst += abs1(h[k + 1][k]);
            }
        }
        if s <= EPS * tst || s <= SMALL || s <= floor {
            h[k][k - 1] = ZERO;
            return k;
        }
    }
    0
}

/// The shift for iteration `its` (counted from 1) on the window [l, i].
#[inline(always)]
fn shift<H: Square>(h: &H, l: usize, i: usize, its: usize) -> C64 {
    if !its.is_multiple_of(EXCEPTIONAL_EVERY) {
        return wilkinson(h[i - 1][i - 1], h[i - 1][i], h[i][i - 1], h[i][i]);
    }
    if (its / EXCEPTIONAL_EVERY) % 2 == 1 {
        h[l][l] + EXCEPTIONAL_WEIGHT * abs1(h[l + 1][l])
    } else {
        h[i][i] + EXCEPTIONAL_WEIGHT * abs1(h[i][i - 1])
    }
}

/// The eigenvalue of [[a, b], [c, d]] nearer d: d + x − y with x = (a − d)/2 and
/// y = √(x² + bc) of the sign of x. The subtraction may cancel, but only to an
/// absolute error of ε|x| ≤ ε‖H‖, which does not slow convergence (a shift
/// only has to be near an eigenvalue); it saves the division of the
/// cancellation-free form d − bc/(x + y).
#[inline(always)]
fn wilkinson(a: C64, b: C64, c: C64, d: C64) -> C64 {
    let x = (a - d) * 0.5;
    let mut y = csqrt(x * x + b * c);
    if x.re * y.re + x.im * y.im < 0.0 {
        y = -y;
    }
    d + (x - y)
}

/// One implicit single-shift QR step on the window [l, i] (i ≥ l + 2 for the
/// eigenvalue-only form): a rotation built from the first column of H − μI, then
/// a chase of the bulge down the subdiagonal. With `SCHUR` the rows are updated
/// to the last column, the columns from the first row, and `q` accumulates.
#[inline]
fn sweep<H: Square, const SCHUR: bool>(
    h: &mut H,
    mut q: Option<&mut H>,
    l: usize,
    i: usize,
    mu: C64,
) {
    let n = h.dim();
    let col_end = if SCHUR { n } else { i + 1 };
    let row_start = if SCHUR { 0 } else { l };
    for k in l..i {
        let rot = if k == l {
            Rot::zeroing(h[l][l] - mu, h[l + 1][l]).0
        } else {
            let (rot, r) = Rot::zeroing(h[k][k - 1], h[k + 1][k - 1]);
            h[k][k - 1] = r;
            h[k + 1][k - 1] = ZERO;
            rot
        };
        rotate_rows(h, k, rot, k, col_end);
        rotate_cols(h, k, rot, row_start, (k + 3).min(i + 1));
        if let Some(q) = q.as_deref_mut() {
            rotate_cols(q, k, rot, 0, n);
        }
    }
}

/// Rows k, k+1 ← G·(rows k, k+1) on columns `from..to`.
#[inline(always)]
fn rotate_rows<H: Square>(h: &mut H, k: usize, rot: Rot, from: usize, to: usize) {
    let (r0, r1) = h.two_rows(k);
    for (x, y) in r0[from..to].iter_mut().zip(r1[from..to].iter_mut()) {
        (*x, *y) = rot.left(*x, *y);
    }
}

/// Columns k, k+1 ← (columns k, k+1)·Gᴴ on rows `from..to`.
#[inline(always)]
fn rotate_cols<H: Square>(h: &mut H, k: usize, rot: Rot, from: usize, to: usize) {
    for i in from..to {
        let row = &mut h[i];
        (row[k], row[k + 1]) = rot.right(row[k], row[k + 1]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::cplx::ONE;
    use crate::linalg::square::{Dyn, Fixed, Square};

    /// The cyclic shift: ones on the subdiagonal and in the top-right corner.
    fn cyclic<const N: usize>() -> Fixed<N> {
        let mut p = Fixed::<N>::ZERO;
        for i in 1..N {
            p[i][i - 1] = ONE;
        }
        p[0][N - 1] = ONE;
        p
    }

    #[test]
    fn cyclic_permutation_converges_through_exceptional_shifts() {
        let mut h = cyclic::<6>();
        let mut out = [ZERO; 6];
        eigenvalues(&mut h, &mut out, iteration_cap(6)).unwrap();
        for z in out {
            assert!(
                (z.powi(6) - ONE).norm() <= 64.0 * EPS,
                "{z} is not a 6th root of 1"
            );
        }
    }

    #[test]
    fn iteration_cap_turns_a_stall_into_an_error() {
        // The Wilkinson shift of the cyclic shift is 0 and the step is a no-op:
        // below the first exceptional shift the iteration cannot progress.
        let mut h = cyclic::<5>();
        let mut out = [ZERO; 5];
        let cap = EXCEPTIONAL_EVERY - 1;
        assert_eq!(
            eigenvalues(&mut h, &mut out, cap),
            Err(LinalgError::NotConverged)
        );
        let mut h = cyclic::<5>();
        let mut q = Fixed::<5>::ZERO;
        assert_eq!(schur(&mut h, &mut q, cap), Err(LinalgError::NotConverged));
        let mut h = Dyn::zeros(5);
        h.flat_mut().copy_from_slice(cyclic::<5>().flat());
        assert_eq!(
            eigenvalues(&mut h, &mut out, cap),
            Err(LinalgError::NotConverged)
        );
    }

    #[test]
    fn wilkinson_shift_is_the_nearer_eigenvalue_of_the_trailing_block() {
        let (a, b, c, d) = (C64::new(4.0, 0.0), ONE, ONE, C64::new(1.0, 0.0));
        let mu = wilkinson(a, b, c, d);
        // Eigenvalues (5 ± √13)/2; the one nearer 1 is (5 − √13)/2.
        let want = (5.0 - 13f64.sqrt()) / 2.0;
        assert!((mu - C64::new(want, 0.0)).norm() <= 4.0 * EPS);
    }
}
