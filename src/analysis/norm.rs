//! The norm of the growth measures, ‖W u‖₂: W the model's symmetriser (or the
//! diagonal of `scan.weights`), repeated over the time levels of a multistep
//! method; G is measured as W G W⁻¹.

use crate::problem::Problem;
use nalgebra::{DMatrix, DVector};
use num_complex::Complex64 as C64;

/// W over the whole state and its inverse.
pub struct NormTransform {
    /// W.
    pub w: DMatrix<C64>,
    /// W⁻¹.
    pub inv: DMatrix<C64>,
    /// Whether W is the identity.
    pub identity: bool,
}

/// The W of a problem (or diag(`weights`)), block-diagonal over the time levels.
pub fn norm_matrix(problem: &Problem, weights: Option<&[f64]>) -> DMatrix<f64> {
    let m = problem.system.size();
    let base = match weights {
        Some(w) => DMatrix::from_diagonal(&DVector::from_vec(w.to_vec())),
        None => problem.system.norm_matrix.clone(),
    };
    let levels = problem.method.levels();
    let mut full = DMatrix::zeros(m * levels, m * levels);
    for l in 0..levels {
        full.view_mut((l * m, l * m), (m, m)).copy_from(&base);
    }
    full
}

impl NormTransform {
    /// The transform of a problem.
    pub fn new(problem: &Problem, weights: Option<&[f64]>) -> Self {
        let w = norm_matrix(problem, weights);
        let n = w.nrows();
        let identity = w == DMatrix::identity(n, n);
        let wc = w.map(|x| C64::new(x, 0.0));
        let inv = wc
            .clone()
            .try_inverse()
            .unwrap_or_else(|| DMatrix::identity(n, n));
        NormTransform {
            w: wc,
            inv,
            identity,
        }
    }

    /// W G W⁻¹: G in the weighted norm.
    pub fn weighted(&self, g: DMatrix<C64>) -> DMatrix<C64> {
        if self.identity {
            return g;
        }
        &self.w * g * &self.inv
    }

    /// W v, normalised: a mode in the weighted (energy-like) variables.
    pub fn scale_vector(&self, v: Vec<C64>) -> Vec<C64> {
        let n = v.len();
        let x = self.w.view((0, 0), (n, n)) * DVector::from_vec(v);
        let norm = x.norm();
        if norm > 0.0 && norm.is_finite() {
            (x / C64::new(norm, 0.0)).iter().copied().collect()
        } else {
            x.iter().copied().collect()
        }
    }
}
