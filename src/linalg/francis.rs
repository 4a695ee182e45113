//! Eigenvalues of a real upper Hessenberg matrix by Francis' implicit
//! double-shift QR iteration (Golub & Van Loan, Matrix Computations, 4th ed.,
//! Algorithm 7.5.1: the double-shift step as the chase of a 3×3 bulge by
//! Householder reflections; §7.5.5 deflation).
//!
//! Used for the roots of real polynomials (their companion matrices are
//! already upper Hessenberg): in real arithmetic a step costs a quarter of the
//! complex single-shift kernel's ([`super::qr`]), and complex roots come out as
//! exact conjugate pairs. The rules follow that kernel: the active window is the
//! bottom-most unreduced block [l, i]; a subdiagonal entry is negligible when
//! |h_{k,k−1}| ≤ ε(|h_kk| + |h_{k−1,k−1}|) (neighbouring subdiagonals stand in
//! when both diagonal entries are zero) and, from the tenth iteration of a
//! deflation on, also when below ε·max|h_ij|; every tenth iteration uses an
//! exceptional shift, alternately from the top and the bottom of the window
//! (LAPACK's `dlahqr` ad hoc shift: 3/4 of the subdiagonal scale added to a
//! diagonal entry); and each deflation is capped at 30·max(10, n) iterations,
//! past which [`LinalgError::NotConverged`] is returned, so no input hangs it.
//! Windows of size 1 and 2 are solved directly. The caller scales the matrix
//! by a power of two into the kernels' safe range (largest entry within
//! 2^±100), which keeps the shift polynomial's first column, a sum of products
//! of two entries, far from overflow.

use super::cplx::EPS;
use super::qr::{iteration_cap, stall_floor, EXCEPTIONAL_EVERY, SMALL};
use super::{eig2_in_range, LinalgError};
use num_complex::Complex64 as C64;

/// Eigenvalues of the real upper Hessenberg `h` (destroyed) into `out`
/// (length N), in the order they deflate into their diagonal positions.
pub(crate) fn eigenvalues<const N: usize>(
    h: &mut [[f64; N]; N],
    out: &mut [C64],
) -> Result<(), LinalgError> {
    if N == 0 {
        return Ok(());
    }
    let hmax = h
        .iter()
        .flat_map(|row| row.iter())
        .fold(0.0f64, |a, x| a.max(x.abs()));
    let cap = iteration_cap(N);
    let mut i = N - 1;
    loop {
        let mut its = 0;
        loop {
            let l = deflation_point(h, i, stall_floor(its, hmax));
            if l == i {
                out[i] = C64::new(h[i][i], 0.0);
                if i == 0 {
                    return Ok(());
                }
                i -= 1;
                break;
            }
            if l + 1 == i {
                let re = |x: f64| C64::new(x, 0.0);
                let (a, b) = eig2_in_range(re(h[l][l]), re(h[l][i]), re(h[i][l]), re(h[i][i]));
                // a real 2×2 block's complex pair is conjugate: make it exactly so
                let (a, b) = if a.im != 0.0 {
                    (a, a.conj())
                } else {
                    (a, C64::new(b.re, 0.0))
                };
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
            let (trace, det) = shift(h, l, i, its);
            step(h, l, i, trace, det);
        }
    }
}

/// The top l of the unreduced window ending at row i; the negligible
/// subdiagonal entry above it (if any) is set to zero.
fn deflation_point<const N: usize>(h: &mut [[f64; N]; N], i: usize, floor: f64) -> usize {
    let mut l = i;
    while l > 0 {
        let sub = h[l][l - 1].abs();
        let mut s = h[l][l].abs() + h[l - 1][l - 1].abs();
        if s == 0.0 {
            if l >= 2 {
                s += h[l - 1][l - 2].abs();
            }
            if l + 1 < N {
                s += h[l + 1][l].abs();
            }
        }
        if sub <= EPS * s || sub <= floor || sub < SMALL {
            h[l][l - 1] = 0.0;
            return l;
        }
        l -= 1;
    }
    0
}

/// Trace and determinant of the 2×2 matrix whose eigenvalues are the shifts:
/// the trailing block of the window (Francis), or every tenth iteration an
/// exceptional pair built from the size of a subdiagonal entry.
fn shift<const N: usize>(h: &[[f64; N]; N], l: usize, i: usize, its: usize) -> (f64, f64) {
    if its.is_multiple_of(EXCEPTIONAL_EVERY) {
        let (s, d) = if (its / EXCEPTIONAL_EVERY) % 2 == 1 {
            (h[l + 1][l].abs() + h[l + 2][l + 1].abs(), h[l][l])
        } else {
            (h[i][i - 1].abs() + h[i - 1][i - 2].abs(), h[i][i])
        };
        let a = 0.75 * s + d;
        return (2.0 * a, a * a + 0.4375 * s * s);
    }
    let (a, b, c, d) = (h[i - 1][i - 1], h[i - 1][i], h[i][i - 1], h[i][i]);
    (a + d, a * d - b * c)
}

/// A Householder reflection I − τvvᵀ, v = (1, v₁, v₂), taking (x, y, z) to a
/// multiple of e₁ (Golub & Van Loan, Algorithm 5.1.1, with the sign of the
/// target chosen against x so that nothing cancels).
fn reflector(x: f64, y: f64, z: f64) -> (f64, f64, f64) {
    let scale = x.abs() + y.abs() + z.abs();
    if scale == 0.0 || (y == 0.0 && z == 0.0) {
        return (0.0, 0.0, 0.0);
    }
    let (x, y, z) = (x / scale, y / scale, z / scale);
    let norm = (x * x + y * y + z * z).sqrt();
    let alpha = if x >= 0.0 { -norm } else { norm };
    let d = x - alpha;
    (1.0 - x / alpha, y / d, z / d)
}

/// One implicit double-shift step on the window [l, i] (i ≥ l + 2), for the
/// shifts with the given sum and product.
#[allow(clippy::needless_range_loop)] // rows k..k+2 are updated together
fn step<const N: usize>(h: &mut [[f64; N]; N], l: usize, i: usize, trace: f64, det: f64) {
    // first column of (H − s₁)(H − s₂)
    let mut x = h[l][l] * h[l][l] + h[l][l + 1] * h[l + 1][l] - trace * h[l][l] + det;
    let mut y = h[l + 1][l] * (h[l][l] + h[l + 1][l + 1] - trace);
    let mut z = h[l + 1][l] * h[l + 2][l + 1];
    for k in l..=i - 2 {
        let (tau, v1, v2) = reflector(x, y, z);
        if tau != 0.0 {
            let first = if k > l { k - 1 } else { l };
            for j in first..=i {
                let w = tau * (h[k][j] + v1 * h[k + 1][j] + v2 * h[k + 2][j]);
                h[k][j] -= w;
                h[k + 1][j] -= w * v1;
                h[k + 2][j] -= w * v2;
            }
            if k > l {
                // the bulge's column is now a multiple of e₁ up to rounding
                h[k + 1][k - 1] = 0.0;
                h[k + 2][k - 1] = 0.0;
            }
            let last = (k + 3).min(i);
            for row in h.iter_mut().take(last + 1).skip(l) {
                let w = tau * (row[k] + v1 * row[k + 1] + v2 * row[k + 2]);
                row[k] -= w;
                row[k + 1] -= w * v1;
                row[k + 2] -= w * v2;
            }
        }
        x = h[k + 1][k];
        y = h[k + 2][k];
        if k + 3 <= i {
            z = h[k + 3][k];
        }
    }
    // the last reflection acts on rows i − 1 and i only
    let (tau, v1, _) = reflector(x, y, 0.0);
    if tau != 0.0 {
        for j in i - 2..=i {
            let w = tau * (h[i - 1][j] + v1 * h[i][j]);
            h[i - 1][j] -= w;
            h[i][j] -= w * v1;
        }
        h[i][i - 2] = 0.0;
        for row in h.iter_mut().take(i + 1).skip(l) {
            let w = tau * (row[i - 1] + v1 * row[i]);
            row[i - 1] -= w;
            row[i] -= w * v1;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sorted(mut v: Vec<C64>) -> Vec<C64> {
        v.sort_by(|a, b| a.re.total_cmp(&b.re).then(a.im.total_cmp(&b.im)));
        v
    }

    /// The companion matrix of ∏(z − r_k) has eigenvalues r_k (closed form).
    #[test]
    fn companion_of_known_roots() {
        let roots = [
            C64::new(-0.5, 0.0),
            C64::new(0.25, 0.75),
            C64::new(0.25, -0.75),
            C64::new(0.9, 0.0),
            C64::new(-0.1, 0.3),
            C64::new(-0.1, -0.3),
        ];
        let mut p = vec![C64::new(1.0, 0.0)];
        for r in roots {
            p = super::super::poly::mul(&p, &[-r, C64::new(1.0, 0.0)]);
        }
        let mut h = [[0.0; 6]; 6];
        for j in 0..6 {
            h[0][j] = -p[5 - j].re;
        }
        for k in 1..6 {
            h[k][k - 1] = 1.0;
        }
        let mut out = [C64::new(0.0, 0.0); 6];
        eigenvalues(&mut h, &mut out).unwrap();
        for (got, want) in sorted(out.to_vec()).iter().zip(sorted(roots.to_vec())) {
            assert!((got - want).norm() < 1e-13, "{got} vs {want}");
        }
    }

    /// A cyclic permutation (eigenvalues the fifth roots of unity) stalls
    /// unshifted and Francis-shifted QR alike; the exceptional shifts end it.
    #[test]
    fn cyclic_permutation_converges() {
        let mut h = [[0.0; 5]; 5];
        h[0][4] = 1.0;
        for k in 1..5 {
            h[k][k - 1] = 1.0;
        }
        let mut out = [C64::new(0.0, 0.0); 5];
        eigenvalues(&mut h, &mut out).unwrap();
        for z in out {
            assert!((z.powu(5) - 1.0).norm() < 1e-13, "{z}");
        }
    }
}
