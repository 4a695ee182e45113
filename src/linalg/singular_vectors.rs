//! From the converged one-sided Jacobi iteration (A·V = W, columns of W
//! mutually orthogonal; `jacobi`) to the factors of A = U Σ Vᴴ: columns sorted
//! by descending norm, V copied out, and U = W Σ⁻¹ column by column.
//!
//! A column of W whose squared norm is at most ε²‖A‖_F² is rounding noise
//! (the iteration leaves it alone), so w_j/σ_j would be neither of unit norm nor
//! orthogonal to the others. Such a column of U, as every column for the zero
//! matrix, is instead completed to an orthonormal basis: the unit vector e_k
//! least represented in the columns already set, made orthogonal to them by two
//! passes of classical Gram–Schmidt ("twice is enough": Giraud, Langou &
//! Rozložník, Numer. Math. 2005) and normalised. The residual A − UΣVᴴ gains
//! at most 2σ_j ≤ 2ε‖A‖_F per such column, within the backward error of the
//! iteration.

use super::cplx::{norm_sqr, ONE, ZERO};
use super::square::Square;
use num_complex::Complex64 as C64;

/// Reorders the stored columns (rows of `w`, and of `v` with `VECTORS`) and
/// their squared norms so that the norms descend; a selection sort, n ≤ 16 or
/// so, with at most n − 1 row swaps.
#[inline(always)]
pub(crate) fn sort_descending<H: Square, const VECTORS: bool>(
    w: &mut H,
    v: &mut H,
    norms: &mut [f64],
) {
    let n = norms.len();
    for p in 0..n.saturating_sub(1) {
        let mut best = p;
        for q in p + 1..n {
            if norms[q] > norms[best] {
                best = q;
            }
        }
        if best != p {
            norms.swap(p, best);
            let (x, y) = w.row_pair(p, best);
            x.swap_with_slice(y);
            if VECTORS {
                let (x, y) = v.row_pair(p, best);
                x.swap_with_slice(y);
            }
        }
    }
}

/// The columns of V (stored as the rows of `v`) into the row-major `out`.
#[inline(always)]
pub(crate) fn right_vectors<H: Square>(v: &H, out: &mut [C64]) {
    let n = v.dim();
    for j in 0..n {
        for (i, z) in v[j].iter().enumerate() {
            out[i * n + j] = *z;
        }
    }
}

/// U into the row-major `out`: column j is w_j/‖w_j‖ where ‖w_j‖² > `floor`,
/// and an orthonormal completion elsewhere. `norms` are the squared norms of
/// the (sorted, so the completed columns come last) rows of `w`.
#[inline(always)]
pub(crate) fn left_vectors<H: Square>(w: &H, norms: &[f64], floor: f64, out: &mut [C64]) {
    let n = w.dim();
    for j in 0..n {
        if norms[j] > floor {
            let inv = 1.0 / norms[j].sqrt();
            for (i, z) in w[j].iter().enumerate() {
                out[i * n + j] = *z * inv;
            }
        } else {
            complete_column(out, n, j);
        }
    }
}

/// Sets column j of the row-major n×n `u` to a unit vector orthogonal to its
/// columns 0..j (assumed orthonormal).
fn complete_column(u: &mut [C64], n: usize, j: usize) {
    // e_k with the smallest Σ_{c<j} |u_kc|² has a residual of squared norm
    // 1 − Σ|u_kc|² ≥ (n − j)/n after projection: never a cancellation.
    let mut k_best = 0;
    let mut r_best = f64::NEG_INFINITY;
    for k in 0..n {
        let taken: f64 = u[k * n..k * n + j].iter().map(|z| norm_sqr(*z)).sum();
        if 1.0 - taken > r_best {
            r_best = 1.0 - taken;
            k_best = k;
        }
    }
    for i in 0..n {
        u[i * n + j] = if i == k_best { ONE } else { ZERO };
    }
    for _pass in 0..2 {
        for c in 0..j {
            let mut p = ZERO;
            for i in 0..n {
                p += u[i * n + c].conj() * u[i * n + j];
            }
            for i in 0..n {
                let uc = u[i * n + c];
                u[i * n + j] -= p * uc;
            }
        }
    }
    let nrm2: f64 = (0..n).map(|i| norm_sqr(u[i * n + j])).sum();
    let inv = 1.0 / nrm2.sqrt();
    for i in 0..n {
        u[i * n + j] *= inv;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::cplx::EPS;

    #[test]
    fn completion_of_a_partial_basis_is_unitary() {
        let n = 4;
        let mut u = vec![ZERO; n * n];
        // First column (1, 1, 1, 1)/2, second (1, i, −1, −i)/2.
        for i in 0..n {
            u[i * n] = C64::new(0.5, 0.0);
            u[i * n + 1] = C64::new(0.0, std::f64::consts::FRAC_PI_2 * i as f64).exp() * 0.5;
        }
        complete_column(&mut u, n, 2);
        complete_column(&mut u, n, 3);
        for a in 0..n {
            for b in 0..n {
                let g: C64 = (0..n).map(|i| u[i * n + a].conj() * u[i * n + b]).sum();
                let want = if a == b { ONE } else { ZERO };
                assert!((g - want).norm() <= 8.0 * EPS, "({a}, {b}): {g}");
            }
        }
    }
}
