//! Slow references and the shared comparator for the fast kernels, used by the
//! accuracy tests, the benchmarks and `examples/kernel_throughput.rs`.
//!
//! The references are nalgebra's general complex Schur decomposition (for every
//! size, including m ≤ 2 where the solver uses closed forms) and nalgebra's SVD:
//! the only place in the crate that calls either. nalgebra's SVD does not
//! return for matrices whose entries are all below about 1e-155 (subnormals
//! included), so [`singular_values`] scales its input by a power of two into
//! [1, 2) first (exact) and caps the iterations.
//! Eigenvalues come back in no particular order, so they are compared through a
//! greedy pairing: repeatedly match the closest remaining pair. For the
//! well-separated spectra of tests this is the optimal (Hungarian) matching;
//! for clusters it can only overstate the error.

use super::LinalgError;
use num_complex::Complex64 as C64;

/// Iterations nalgebra's Schur decomposition may take per unit of size.
const ITERATIONS_PER_SIZE: usize = 200;

/// Eigenvalues of a row-major m×m matrix by nalgebra's complex Schur form.
/// Non-finite input is refused (nalgebra would iterate to its cap on it).
pub fn eigenvalues(a: &[C64], m: usize) -> Result<Vec<C64>, LinalgError> {
    if a.iter().any(|z| !(z.re.is_finite() && z.im.is_finite())) {
        return Err(LinalgError::NonFinite);
    }
    let schur = nalgebra::linalg::Schur::try_new(
        super::to_matrix(a, m),
        f64::EPSILON,
        ITERATIONS_PER_SIZE * m,
    )
    .ok_or(LinalgError::NotConverged)?;
    let (_, t) = schur.unpack();
    Ok((0..m).map(|i| t[(i, i)]).collect())
}

/// nalgebra's complex Schur decomposition on a reused matrix: the path the
/// eigenvalue kernel replaced, for throughput comparisons.
#[derive(Debug, Clone)]
pub struct NalgebraEigenvalues {
    m: usize,
    work: nalgebra::DMatrix<C64>,
}

impl NalgebraEigenvalues {
    /// A reference solver for m×m matrices.
    pub fn new(m: usize) -> Self {
        NalgebraEigenvalues {
            m,
            work: nalgebra::DMatrix::zeros(m, m),
        }
    }

    /// Eigenvalues of the row-major m×m `a` into `out` (no finiteness check).
    pub fn eigenvalues(&mut self, a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
        let m = self.m;
        for i in 0..m {
            for j in 0..m {
                self.work[(i, j)] = a[i * m + j];
            }
        }
        let mat = std::mem::replace(&mut self.work, nalgebra::DMatrix::zeros(0, 0));
        let schur = nalgebra::linalg::Schur::try_new(mat, f64::EPSILON, ITERATIONS_PER_SIZE * m)
            .ok_or(LinalgError::NotConverged);
        let (_, t) = match schur {
            Ok(s) => s.unpack(),
            Err(e) => {
                self.work = nalgebra::DMatrix::zeros(m, m);
                return Err(e);
            }
        };
        for (i, o) in out.iter_mut().enumerate() {
            *o = t[(i, i)];
        }
        self.work = t;
        Ok(())
    }
}

/// Schur form A = Q T Qᴴ of a row-major m×m matrix by nalgebra, as row-major
/// `(t, q)` with the strict lower part of T set to zero.
pub fn schur(a: &[C64], m: usize) -> Result<(Vec<C64>, Vec<C64>), LinalgError> {
    if a.iter().any(|z| !(z.re.is_finite() && z.im.is_finite())) {
        return Err(LinalgError::NonFinite);
    }
    let schur = nalgebra::linalg::Schur::try_new(
        super::to_matrix(a, m),
        f64::EPSILON,
        ITERATIONS_PER_SIZE * m,
    )
    .ok_or(LinalgError::NotConverged)?;
    let (q, mut t) = schur.unpack();
    for j in 0..m {
        for i in j + 1..m {
            t[(i, j)] = C64::new(0.0, 0.0);
        }
    }
    Ok((super::from_matrix(&t), super::from_matrix(&q)))
}

/// Singular values of a row-major m×m matrix by nalgebra's SVD, descending,
/// computed on the input scaled by a power of two into [1, 2).
pub fn singular_values(a: &[C64], m: usize) -> Result<Vec<f64>, LinalgError> {
    if a.iter().any(|z| !(z.re.is_finite() && z.im.is_finite())) {
        return Err(LinalgError::NonFinite);
    }
    let amax = a
        .iter()
        .map(|z| z.re.abs().max(z.im.abs()))
        .fold(0.0, f64::max);
    if amax == 0.0 {
        return Ok(vec![0.0; m]);
    }
    let e = amax.log2().floor() as i32;
    let (down, up) = (pow2(-e), pow2(e));
    let scaled = super::to_matrix(a, m).map(|z| C64::new(scale(z.re, down), scale(z.im, down)));
    let svd = nalgebra::linalg::SVD::try_new(
        scaled,
        false,
        false,
        f64::EPSILON,
        ITERATIONS_PER_SIZE * m.max(1),
    )
    .ok_or(LinalgError::NotConverged)?;
    let mut s: Vec<f64> = svd.singular_values.iter().map(|x| scale(*x, up)).collect();
    s.sort_unstable_by(|x, y| y.total_cmp(x));
    Ok(s)
}

/// 2^e as a pair of factors, each in the normal range (|e| ≤ 2100).
fn pow2(e: i32) -> (f64, f64) {
    let h = e / 2;
    (2f64.powi(h), 2f64.powi(e - h))
}

/// x·2^e with 2^e given as [`pow2`] factors (exact unless the result is
/// subnormal).
fn scale(x: f64, f: (f64, f64)) -> f64 {
    x * f.0 * f.1
}

/// Frobenius norm ‖A‖_F of a matrix given by its entries.
pub fn frobenius(a: &[C64]) -> f64 {
    let amax = a.iter().map(|z| z.norm()).fold(0.0, f64::max);
    if amax == 0.0 {
        return 0.0;
    }
    let s: f64 = a.iter().map(|z| (z / amax).norm_sqr()).sum();
    amax * s.sqrt()
}

/// A greedy pairing of two equally long lists: `x[i]` is matched with
/// `y[p[i]]`, closest pairs first.
pub fn pairing(x: &[C64], y: &[C64]) -> Vec<usize> {
    assert_eq!(x.len(), y.len(), "paired lists differ in length");
    let n = x.len();
    let mut pairs: Vec<(f64, usize, usize)> = Vec::with_capacity(n * n);
    for (i, xi) in x.iter().enumerate() {
        for (j, yj) in y.iter().enumerate() {
            pairs.push(((xi - yj).norm(), i, j));
        }
    }
    pairs.sort_unstable_by(|a, b| a.0.total_cmp(&b.0));
    let mut p = vec![usize::MAX; n];
    let mut taken = vec![false; n];
    for (_, i, j) in pairs {
        if p[i] == usize::MAX && !taken[j] {
            p[i] = j;
            taken[j] = true;
        }
    }
    p
}

/// max_i |x_i − y_{p(i)}| under [`pairing`].
pub fn pairing_error(x: &[C64], y: &[C64]) -> f64 {
    pairing(x, y)
        .iter()
        .enumerate()
        .map(|(i, &j)| (x[i] - y[j]).norm())
        .fold(0.0, f64::max)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pairing_matches_permuted_lists_exactly() {
        let x: Vec<C64> = (0..6).map(|k| C64::new(k as f64, -(k as f64))).collect();
        let y: Vec<C64> = [3, 0, 5, 1, 4, 2].iter().map(|&k| x[k]).collect();
        assert_eq!(pairing_error(&x, &y), 0.0);
        assert_eq!(pairing(&x, &y), vec![1, 3, 5, 0, 4, 2]);
    }

    #[test]
    fn frobenius_norm_survives_huge_entries() {
        let a = [C64::new(3e300, 0.0), C64::new(0.0, 4e300)];
        assert!((frobenius(&a) / 5e300 - 1.0).abs() < 4.0 * f64::EPSILON);
    }
}
