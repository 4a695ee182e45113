//! Reduction of a complex square matrix to upper Hessenberg form by Householder
//! reflections, A = Q H Qᴴ (Golub & Van Loan, Matrix Computations, 4th ed.,
//! Algorithm 7.4.2, with the complex reflector of §5.1.13).
//!
//! Step k zeroes column k below the subdiagonal with the Hermitian reflector
//! P = I − τ u uᴴ, u = x + e^{iφ}‖x‖ e₁ (φ = arg x₁), applied as A ← P A P; x is
//! scaled by its largest entry first when ‖x‖² would underflow.
//! Columns already zero below the subdiagonal are skipped, so triangular and
//! Hessenberg inputs pass through unchanged. Q is accumulated only when asked for.

use super::cplx::{abs1, modulus, norm_sqr, scale2, unit, ZERO};
use super::square::Square;
use num_complex::Complex64 as C64;

/// Below this, ‖x‖² has lost accuracy to underflow (≈ 2^-900).
const SAFE_NORM2: f64 = 1e-270;

/// Overwrites `h` with its upper Hessenberg form; if `q` is given (on entry the
/// identity, or any unitary U), it is multiplied on the right by the reflectors,
/// so that U·A·Uᴴ = q·H·qᴴ on exit. `work` needs 2n entries.
#[inline]
pub(crate) fn reduce<H: Square>(h: &mut H, mut q: Option<&mut H>, work: &mut [C64]) {
    let n = h.dim();
    let (u, w) = work[..2 * n].split_at_mut(n);
    for k in 0..n.saturating_sub(2) {
        let Some(tau) = reflector(h, k, u) else {
            continue;
        };
        // Left: rows k+1.. of columns k+1.. (column k was set by `reflector`).
        w.fill(ZERO);
        for i in k + 1..n {
            let ui = u[i].conj();
            let row = &h[i];
            for j in k + 1..n {
                w[j] += ui * row[j];
            }
        }
        for i in k + 1..n {
            let ui = u[i] * tau;
            let row = &mut h[i];
            for j in k + 1..n {
                row[j] -= ui * w[j];
            }
        }
        // Right: columns k+1.. of every row.
        apply_right(h, u, tau, k + 1);
        if let Some(q) = q.as_deref_mut() {
            apply_right(q, u, tau, k + 1);
        }
    }
}

/// The reflector for column k: u (entries k+1..n, written into `u`) and the
/// returned τ = 2/(uᴴu), with the new subdiagonal entry written into `h[k+1][k]`
/// and the entries below zeroed. `None` when the column is already zero below
/// the subdiagonal. The input is in the kernels' safe range, so ‖x‖² is formed
/// directly unless it underflows, when x is first scaled by its largest entry.
#[inline(always)]
fn reflector<H: Square>(h: &mut H, k: usize, u: &mut [C64]) -> Option<f64> {
    let n = h.dim();
    let mut below = 0.0;
    for i in k + 2..n {
        u[i] = h[i][k];
        below += norm_sqr(u[i]);
    }
    if below == 0.0 {
        let all_zero = (k + 2..n).all(|i| h[i][k] == ZERO);
        if all_zero {
            return None;
        }
    }
    u[k + 1] = h[k + 1][k];
    let mut nrm2 = below + norm_sqr(u[k + 1]);
    // x is scaled by 2^e (exactly) when ‖x‖² would underflow.
    let mut e = 0;
    if nrm2 < SAFE_NORM2 {
        let xmax = (k + 1..n).map(|i| abs1(u[i])).fold(0.0, f64::max);
        e = -(xmax.log2().floor() as i32);
        nrm2 = 0.0;
        for z in &mut u[k + 1..n] {
            *z = scale2(*z, e);
            nrm2 += norm_sqr(*z);
        }
    }
    let nrm = nrm2.sqrt();
    let alpha = u[k + 1];
    let a_abs = modulus(alpha);
    let phase = if a_abs == 0.0 {
        C64::new(1.0, 0.0)
    } else {
        unit(alpha)
    };
    u[k + 1] = phase * (a_abs + nrm);
    h[k + 1][k] = scale2(-phase * nrm, -e);
    for i in k + 2..n {
        h[i][k] = ZERO;
    }
    // uᴴu = (|α| + ‖x‖)² + ‖x‖² − |α|² = 2‖x‖(‖x‖ + |α|).
    Some(1.0 / (nrm * (nrm + a_abs)))
}

/// m ← m·(I − τ u uᴴ) on columns `from..n` of every row.
#[inline]
fn apply_right<H: Square>(m: &mut H, u: &[C64], tau: f64, from: usize) {
    let n = m.dim();
    for i in 0..n {
        let row = &mut m[i];
        let mut s = ZERO;
        for j in from..n {
            s += row[j] * u[j];
        }
        let s = s * tau;
        for j in from..n {
            row[j] -= s * u[j].conj();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::cplx::{EPS, ONE};
    use crate::linalg::square::{Dyn, Fixed, Square};

    type Mat<const N: usize> = [[C64; N]; N];

    fn sample<const N: usize>(seed: u64) -> Mat<N> {
        let mut next = crate::linalg::product::uniform_sequence(seed);
        let mut a = [[ZERO; N]; N];
        for row in a.iter_mut() {
            for z in row.iter_mut() {
                *z = C64::new(next(), next());
            }
        }
        a
    }

    fn check_similarity<const N: usize>(a: Mat<N>) {
        let mut hf = Fixed(a);
        let mut qf = Fixed::<N>::ZERO;
        qf.set_identity();
        reduce(&mut hf, Some(&mut qf), &mut [ZERO; 16]);
        let (h, q) = (hf.0, qf.0);
        // The run-time-size storage gives the same result bit for bit.
        let mut hd = Dyn::zeros(N);
        hd.flat_mut().copy_from_slice(a.as_flattened());
        reduce(&mut hd, None, &mut [ZERO; 16]);
        assert_eq!(hd.flat(), h.as_flattened());
        let fro: f64 = crate::linalg::nonnormal::frobenius(a.iter().flatten().copied());
        for i in 0..N {
            for j in 0..N {
                if i > j + 1 {
                    assert_eq!(h[i][j], ZERO, "not Hessenberg at ({i},{j})");
                }
                // (Q H Qᴴ)_ij against a_ij, and (QᴴQ)_ij against δ_ij.
                let mut qhq = ZERO;
                let mut qq = ZERO;
                for k in 0..N {
                    for l in 0..N {
                        qhq += q[i][k] * h[k][l] * q[j][l].conj();
                    }
                    qq += q[k][i].conj() * q[k][j];
                }
                assert!((qhq - a[i][j]).norm() <= 8.0 * N as f64 * EPS * fro);
                let delta = if i == j { ONE } else { ZERO };
                assert!((qq - delta).norm() <= 8.0 * N as f64 * EPS);
            }
        }
    }

    #[test]
    fn reduction_is_a_unitary_similarity_onto_hessenberg_form() {
        check_similarity(sample::<3>(1));
        check_similarity(sample::<5>(2));
        check_similarity(sample::<8>(3));
    }

    #[test]
    fn hessenberg_input_passes_through_unchanged() {
        let mut a = sample::<6>(4);
        for (i, row) in a.iter_mut().enumerate() {
            for z in row.iter_mut().take(i.saturating_sub(1)) {
                *z = ZERO;
            }
        }
        let mut h = Fixed(a);
        reduce(&mut h, None, &mut [ZERO; 12]);
        assert_eq!(h.0, a);
    }
}
