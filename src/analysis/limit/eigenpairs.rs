//! Simple real eigenvalues of a real matrix with their right and left
//! eigenvectors, for the long-wave closed forms whose leading flux matrix
//! B = Σ A_d n_d/h_d is hyperbolic ([`super::forward_backward`],
//! [`super::lax_friedrichs`]).

use nalgebra::{DMatrix, DVector};

/// One eigenvalue λ of B with right and left eigenvectors r, l scaled so that
/// l·r = 1.
pub struct EigenPair {
    /// λ.
    pub lambda: f64,
    /// Right eigenvector r (B r = λ r).
    pub right: DVector<f64>,
    /// Left eigenvector l (lᵀB = λ lᵀ), l·r = 1.
    pub left: DVector<f64>,
}

impl EigenPair {
    /// l·M·r.
    pub fn project(&self, m: &DMatrix<f64>) -> f64 {
        self.left.dot(&(m * &self.right))
    }
}

/// The eigenpairs of `b`, or None unless every eigenvalue is real (imaginary
/// part within `clear` of ‖B‖) and simple (apart by more than 1e-6 ‖B‖), with
/// eigenvectors that are not nearly orthogonal to their left partners.
pub fn simple_real(b: &DMatrix<f64>, clear: f64) -> Option<Vec<EigenPair>> {
    let m = b.nrows();
    let scale = b.norm();
    if !(scale > 0.0 && scale.is_finite()) {
        return None;
    }
    let mut lambdas: Vec<f64> = Vec::with_capacity(m);
    for z in b.clone().complex_eigenvalues().iter() {
        if z.im.abs() > clear * scale {
            return None;
        }
        lambdas.push(z.re);
    }
    lambdas.sort_by(f64::total_cmp);
    if lambdas.windows(2).any(|w| w[1] - w[0] <= 1e-6 * scale) {
        return None;
    }
    lambdas
        .into_iter()
        .map(|lambda| {
            let shifted = b - DMatrix::identity(m, m) * lambda;
            let right = null_vector(&shifted)?;
            let left = null_vector(&shifted.transpose())?;
            let norm = left.dot(&right);
            if norm.abs() <= 1e-6 {
                return None;
            }
            Some(EigenPair {
                lambda,
                right,
                left: left / norm,
            })
        })
        .collect()
}

/// A unit vector spanning the null space of a matrix of nullity one: the right
/// singular vector of its smallest singular value.
fn null_vector(a: &DMatrix<f64>) -> Option<DVector<f64>> {
    let svd = a.clone().svd(false, true);
    let v_t = svd.v_t?;
    let (i, _) = svd
        .singular_values
        .iter()
        .enumerate()
        .min_by(|x, y| x.1.total_cmp(y.1))?;
    Some(v_t.row(i).transpose())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A symmetric 2×2 matrix (eigenvalues 1 and 3) and a non-symmetric one
    /// (0 and 2): B r = λ r, lᵀB = λ lᵀ, l·r = 1; a rotation (complex
    /// eigenvalues) and a repeated eigenvalue give None.
    #[test]
    fn eigenpairs_of_a_nonsymmetric_matrix() {
        let b = DMatrix::from_row_slice(2, 2, &[2.0, 1.0, 1.0, 2.0]);
        let pairs = simple_real(&b, 1e-9).unwrap();
        assert_eq!(pairs.len(), 2);
        for p in &pairs {
            assert!((&b * &p.right - &p.right * p.lambda).norm() < 1e-12);
            assert!((b.transpose() * &p.left - &p.left * p.lambda).norm() < 1e-12);
            assert!((p.left.dot(&p.right) - 1.0).abs() < 1e-12);
        }
        let skewed = DMatrix::from_row_slice(2, 2, &[1.0, 4.0, 0.25, 1.0]);
        let pairs = simple_real(&skewed, 1e-9).unwrap();
        assert!((pairs[0].lambda - 0.0).abs() < 1e-12 && (pairs[1].lambda - 2.0).abs() < 1e-12);
        for p in &pairs {
            assert!((skewed.transpose() * &p.left - &p.left * p.lambda).norm() < 1e-12);
            assert!((p.left.dot(&p.right) - 1.0).abs() < 1e-12);
        }
        let rotation = DMatrix::from_row_slice(2, 2, &[0.0, -1.0, 1.0, 0.0]);
        assert!(simple_real(&rotation, 1e-9).is_none());
        assert!(simple_real(&DMatrix::identity(2, 2), 1e-9).is_none());
    }
}
