//! G = P(Z)/q₀ of an explicit one-step method for a small Z, on stack
//! buffers: Horner's rule with row-major m×m arrays instead of heap matrices,
//! for the per-wavevector loops of the growth analysis. Starting from the
//! highest coefficient times I (rather than from zero) saves one product of
//! the heap version, and each entry of a product is summed in k order with one
//! complex multiplication per term; the result equals
//! [`Method::amplification_matrix`](super::Method::amplification_matrix)'s to
//! rounding (the two differ in how they round, not in what they compute).

use crate::linalg::multiply_into;
use num_complex::Complex64 as C64;

/// Largest m handled on the stack.
pub const MAX: usize = 8;

/// P(Z)/q₀ into `out` (row-major m×m, m ≤ [`MAX`]) for the row-major Z, with
/// P's coefficients `p` in ascending powers: Horner's rule acc ← acc·Z + c·I
/// from the highest coefficient down, starting from acc = (highest)·I.
pub fn explicit_into(p: &[f64], q0: f64, z: &[C64], m: usize, out: &mut [C64]) {
    let n = m * m;
    let zero = C64::new(0.0, 0.0);
    let (mut acc, mut product) = ([zero; MAX * MAX], [zero; MAX * MAX]);
    let Some((top, rest)) = p.split_last() else {
        out[..n].fill(zero);
        return;
    };
    for i in 0..m {
        acc[i * m + i] = C64::new(*top, 0.0);
    }
    for c in rest.iter().rev() {
        multiply_into(&acc[..n], z, &mut product[..n], m);
        acc[..n].copy_from_slice(&product[..n]);
        for i in 0..m {
            acc[i * m + i] += *c;
        }
    }
    for (o, a) in out[..n].iter_mut().zip(&acc[..n]) {
        *o = a / q0;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use nalgebra::DMatrix;

    fn random(m: usize, seed: u64) -> Vec<C64> {
        let mut next = crate::linalg::product::uniform_sequence(seed);
        (0..m * m).map(|_| C64::new(next(), next())).collect()
    }

    const RK4: [f64; 5] = [1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0];

    #[test]
    fn equals_the_heap_horner_to_rounding() {
        let euler = [1.0, 1.0];
        let ssp3 = [1.0, 1.0, 0.5, 1.0 / 6.0];
        for m in 1..=MAX {
            let z = random(m, 101 + m as u64);
            for (p, q0) in [(&RK4[..], 1.0), (&euler[..], 1.0), (&ssp3[..], 2.0)] {
                let mut got = vec![C64::new(0.0, 0.0); m * m];
                explicit_into(p, q0, &z, m, &mut got);
                // the heap version, written as Method::amplification_matrix writes it
                let zm = DMatrix::from_row_slice(m, m, &z);
                let id = DMatrix::<C64>::identity(m, m);
                let mut acc = DMatrix::<C64>::zeros(m, m);
                for c in p.iter().rev() {
                    acc = &acc * &zm + &id * C64::new(*c, 0.0);
                }
                let want = acc / C64::new(q0, 0.0);
                let scale = want.norm();
                for (rc, g) in got.iter().enumerate() {
                    let w = want[(rc / m, rc % m)];
                    assert!(
                        (g - w).norm() <= 1e-14 * scale,
                        "m = {m}, p = {p:?}: {g} vs {w}"
                    );
                }
            }
        }
    }

    #[test]
    fn a_diagonal_z_gives_the_stability_function_on_the_diagonal() {
        // G = diag(R(z_i)) for Z = diag(z_i), R(z) = Σ z^k/k! to fourth order (RK4)
        let values = [
            C64::new(-1.2, 0.4),
            C64::new(0.0, 2.5),
            C64::new(-0.3, -1.9),
        ];
        let m = values.len();
        let mut z = vec![C64::new(0.0, 0.0); m * m];
        for (i, v) in values.iter().enumerate() {
            z[i * m + i] = *v;
        }
        let mut g = vec![C64::new(0.0, 0.0); m * m];
        explicit_into(&RK4, 1.0, &z, m, &mut g);
        for i in 0..m {
            for j in 0..m {
                let v = values[i];
                let want = if i == j {
                    C64::new(1.0, 0.0) + v + v * v / 2.0 + v * v * v / 6.0 + v * v * v * v / 24.0
                } else {
                    C64::new(0.0, 0.0)
                };
                assert!((g[i * m + j] - want).norm() <= 1e-15 * (1.0 + want.norm()));
            }
        }
    }
}
