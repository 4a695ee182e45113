//! The product of two small row-major complex matrices on flat slices, for the
//! per-wavevector loops that must not allocate (eigenvalue slopes, the stack
//! amplification matrix, probed solvers' step matrices), and a reproducible
//! pseudo-random sequence for the kernels' tests.

use num_complex::Complex64 as C64;

/// c = a b for row-major m×m `a`, `b`: each entry summed from zero over k in
/// ascending order.
pub fn multiply_into(a: &[C64], b: &[C64], c: &mut [C64], m: usize) {
    for i in 0..m {
        for j in 0..m {
            let mut acc = C64::new(0.0, 0.0);
            for k in 0..m {
                acc += a[i * m + k] * b[k * m + j];
            }
            c[i * m + j] = acc;
        }
    }
}

/// Uniform numbers in [−1, 1) from a 64-bit linear congruential generator
/// (Knuth's MMIX constants): reproducible test matrices without a dependency.
#[cfg(test)]
pub(crate) fn uniform_sequence(seed: u64) -> impl FnMut() -> f64 {
    let mut s = seed;
    move || {
        s = s
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((s >> 11) as f64 / (1u64 << 53) as f64) * 2.0 - 1.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn product_of_two_by_two_matrices_is_the_closed_form() {
        let c = |re: f64, im: f64| C64::new(re, im);
        let a = [c(1.0, 1.0), c(2.0, 0.0), c(0.0, -1.0), c(3.0, 0.5)];
        let b = [c(0.5, 0.0), c(0.0, 2.0), c(1.0, -1.0), c(4.0, 0.0)];
        let mut got = [C64::new(0.0, 0.0); 4];
        multiply_into(&a, &b, &mut got, 2);
        let want = [
            a[0] * b[0] + a[1] * b[2],
            a[0] * b[1] + a[1] * b[3],
            a[2] * b[0] + a[3] * b[2],
            a[2] * b[1] + a[3] * b[3],
        ];
        assert_eq!(got, want);
    }

    #[test]
    fn the_sequence_is_reproducible_and_in_range() {
        let (mut x, mut y) = (uniform_sequence(7), uniform_sequence(7));
        for _ in 0..1000 {
            let v = x();
            assert_eq!(v, y());
            assert!((-1.0..1.0).contains(&v));
        }
    }
}
