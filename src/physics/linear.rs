//! A user's own system: variable names, one flux matrix per axis, optional
//! diffusion matrices per axis and an optional source matrix (entries real or
//! [re, im]). Its reference speed is computed from the flux matrices.

use super::params::Reader;
use super::{symmetriser, ModelKind, System};
use crate::error::InputError;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A user system with given matrices. Its growth norm is the automatic diagonal
/// symmetriser of the flux matrices where one exists ([`symmetriser`]), else
/// the identity, with the flux's eigenvector condition number kept for the
/// caution.
pub fn linear(
    variables: Vec<String>,
    flux: Vec<DMatrix<C64>>,
    diffusion: Vec<DMatrix<C64>>,
    source: DMatrix<C64>,
) -> System {
    let mut s = System::from_parts(ModelKind::Linear, variables, flux, diffusion, source, None);
    match symmetriser::diagonal_symmetriser(&s.flux) {
        Some(w) => {
            s.norm_matrix = DMatrix::from_diagonal(&nalgebra::DVector::from_vec(w));
            s.norm_origin = symmetriser::NormOrigin::AutomaticDiagonal;
        }
        None => {
            s.norm_origin = symmetriser::NormOrigin::Identity {
                flux_condition: symmetriser::flux_condition(&s.flux),
            };
        }
    }
    s
}

pub(super) fn linear_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    let vars = r
        .texts("variables")?
        .ok_or_else(|| r.error("variables", "is required for model kind 'linear'"))?;
    if vars.is_empty() || vars.len() > 16 {
        return Err(r.error("variables", "needs between 1 and 16 variable names"));
    }
    for (i, v) in vars.iter().enumerate() {
        if vars[..i].contains(v) {
            return Err(r.error(&format!("variables.{i}"), format!("names '{v}' twice")));
        }
        if v.trim().is_empty() {
            return Err(r.error(&format!("variables.{i}"), "must not be empty"));
        }
    }
    let n = vars.len();
    let flux = r
        .matrices("flux", n, dims)?
        .ok_or_else(|| r.error("flux", "is required for model kind 'linear'"))?;
    let diffusion = r
        .matrices("diffusion", n, dims)?
        .unwrap_or_else(|| (0..dims).map(|_| DMatrix::zeros(n, n)).collect());
    let source = r
        .matrix("source", n)?
        .unwrap_or_else(|| DMatrix::zeros(n, n));
    Ok(linear(vars, flux, diffusion, source))
}
