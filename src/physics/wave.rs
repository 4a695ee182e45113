//! The scalar wave equation u_tt = Σ_d c_d² u_{x_d x_d}, second order in time.
//!
//! Its spatial operator is that of a diffusion term with coefficients c_d²
//! (L(θ) = Σ_d c_d² · symbol of the `space.second` stencil / h_d², real and
//! ≤ 0 for the central stencils), so the system stores c_d² as its diffusion
//! matrices and the operator is assembled exactly as for diffusion. What makes
//! it a wave is the time method: only the second-order-in-time methods
//! (`central-difference`, `newmark`) advance it, and they see z = Δt²μ. The
//! reference speed for Courant numbers is max_d c_d; there is no diffusion
//! number (c_d² is not a diffusivity).

use super::params::Reader;
use super::{real, ModelKind, System};
use crate::error::InputError;

/// u_tt = Σ_d c_d² u_{x_d x_d} with wave speed c_d along axis d.
pub fn wave(speed: &[f64]) -> System {
    let dims = speed.len();
    let flux = (0..dims).map(|_| real(1, |_, _| 0.0)).collect();
    let diffusion = speed.iter().map(|c| real(1, |_, _| c * c)).collect();
    let reference = speed.iter().copied().fold(0.0, f64::max);
    let mut s = System::from_parts(
        ModelKind::Wave,
        vec!["u".into()],
        flux,
        diffusion,
        real(1, |_, _| 0.0),
        Some(reference),
    );
    s.diffusivity_max = None;
    s.mode_names = vec!["wave".into()];
    s
}

pub(super) fn wave_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    let c = r
        .one_or_per_axis("speed", dims)?
        .ok_or_else(|| r.error("speed", "is required for model kind 'wave'"))?;
    for (i, x) in c.iter().enumerate() {
        if !(x.is_finite() && *x > 0.0) {
            let key = if dims == 1 {
                "speed".to_string()
            } else {
                format!("speed.{i}")
            };
            return Err(r.error(&key, format!("must be a positive wave speed, got {x}")));
        }
    }
    Ok(wave(&c))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_continuous_symbol_is_minus_c_squared_k_squared() {
        let s = wave(&[2.0, 0.5]);
        let l = s.continuous_symbol(&[3.0, 4.0]);
        assert!((l[(0, 0)].re + (4.0 * 9.0 + 0.25 * 16.0)).abs() < 1e-12);
        assert_eq!(s.reference_speed, 2.0);
        assert!(s.diffusivity_max.is_none());
    }
}
