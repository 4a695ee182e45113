//! The long-wave limit of unsplit Lax–Friedrichs in closed form, at θ = 0 and
//! at the corner of the box (every θ_d = ±π).
//!
//! Lax–Friedrichs replaces u by the average of its 2D neighbours and takes
//! central flux differences: G = I − (2/D) Σ_d sin²(θ_d/2) I − iΔt Σ_d A_d
//! sin θ_d/h_d + Δt R(θ), R the diffusion, dissipation and source terms. Along
//! θ = s n (|n| = 1), with B = Σ A_d n_d/h_d and R ≈ −s²K, a simple real
//! eigenvalue λ of B with eigenvectors r, l (l·r = 1) gives
//!
//!   ζ = 1 − s²/(2D) − isΔtλ − s²Δt l·K·r + O(s³),
//!   |ζ|² − 1 = s² (Δt²λ² − 2Δtκ − 1/D) + O(s⁴),   κ = l·K·r,
//!
//! so long waves are stable up to the positive root of the quadratic,
//! Δt = (1/D)/(√(κ² + λ²/D) − κ): for advection alone ν_x² + ν_y² ≤ ½ in 2-D
//! (the classical bound; Δt = 1/(√D |λ|)), none from a branch with λ = 0 and
//! κ ≥ 0. At the corner sin²(θ_d/2) → 1 and sin θ_d → −sin(θ_d − π): G → −I
//! with the same expansion, where R vanishes identically (no diffusion,
//! dissipation or source; else G is strictly inside the unit disc there).
//! K is read from R(s n) at s = 10⁻², …, 10⁻²/16 by Richardson extrapolation,
//! its change between the last two values giving the uncertainty.

use super::closed_form::ClosedForm;
use super::eigenpairs;
use crate::operator::{Operator, TermKind};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// First level s of the fit.
const S: f64 = 1e-2;
/// Levels s, s/2, …, s/16.
const LEVELS: usize = 5;
/// Relative size below which an imaginary part or an eigenvalue is rounding.
const CLEAR: f64 = 1e-9;

/// The long-wave limit of Lax–Friedrichs with flux matrices `flux` on spacings
/// `h` along `n` from `origin` (θ = 0 or a corner of the box), or None where
/// the closed form does not apply.
pub fn long_wave_limit(
    flux: &[DMatrix<C64>],
    h: &[f64],
    op: &Operator,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    let dims = h.len();
    let at_zero = origin.iter().all(|x| *x == 0.0);
    let at_corner = origin.iter().all(|x| (x.abs() - PI).abs() < 1e-12);
    if !op.real_coefficients || !(at_zero || at_corner) || flux.len() != dims {
        return None;
    }
    let m = op.m;
    if flux.iter().any(|a| a.iter().any(|z| z.im != 0.0)) {
        return None;
    }
    let b = DMatrix::from_fn(m, m, |i, j| {
        (0..dims)
            .map(|d| flux[d][(i, j)].re * n[d] / h[d])
            .sum::<f64>()
    });
    let rest = |s: f64| {
        let theta: Vec<f64> = origin.iter().zip(n).map(|(o, x)| o + x * s).collect();
        op.part_matrix(
            &theta,
            |t| {
                matches!(
                    t.kind,
                    TermKind::Diffusion | TermKind::Source | TermKind::Dissipation
                )
            },
            true,
        )
    };
    if rest(0.0).iter().any(|z| z.norm() != 0.0) {
        return None;
    }
    let k_of = |j: usize| {
        let s = S * 0.5f64.powi(j as i32);
        rest(s).map(|z| -z.re / (s * s))
    };
    let levels: Vec<DMatrix<f64>> = (0..LEVELS).map(k_of).collect();
    if at_corner && levels.iter().any(|k| k.iter().any(|x| *x != 0.0)) {
        return None;
    }
    let extrapolated = |last: usize| &levels[last] + (&levels[last] - &levels[last - 1]) / 3.0;
    let pairs = eigenpairs::simple_real(&b, CLEAR)?;
    let best = limit_from(&pairs, &extrapolated(LEVELS - 1), dims, b.norm())?;
    let before = limit_from(&pairs, &extrapolated(LEVELS - 2), dims, b.norm())?;
    ClosedForm::from_fits(best, before)
}

/// The smallest positive root over the branches of Δt²λ² − 2Δtκ − 1/D.
fn limit_from(
    pairs: &[eigenpairs::EigenPair],
    k: &DMatrix<f64>,
    dims: usize,
    scale: f64,
) -> Option<f64> {
    if !k.iter().all(|x| x.is_finite()) {
        return None;
    }
    let inv_d = 1.0 / dims as f64;
    let mut limit = f64::INFINITY;
    for p in pairs {
        let kappa = p.project(k);
        let lambda = if p.lambda.abs() <= CLEAR * scale {
            0.0
        } else {
            p.lambda
        };
        let den = (kappa * kappa + lambda * lambda * inv_d).sqrt() - kappa;
        if den > 0.0 {
            limit = limit.min(inv_d / den);
        }
    }
    Some(limit)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    fn lax_friedrichs(velocity: &[f64], diffusivity: &[f64], h: &[f64]) -> Problem {
        Problem::builder()
            .spacing(h)
            .system(crate::physics::advection(velocity, diffusivity))
            .first("central2")
            .second("central2")
            .method("lax-friedrichs")
            .dt(1e-3)
            .build()
            .unwrap()
    }

    /// 2-D advection: ν_x² + ν_y² ≤ ½ (the classical bound for unsplit
    /// Lax–Friedrichs, e.g. LeVeque, Finite Volume Methods for Hyperbolic
    /// Problems), i.e. Δt = 1/√(2 Σ(a_d/h_d)²) along the worst direction
    /// n ∝ (a_x/h_x, a_y/h_y), at θ = 0 and at the corner alike.
    #[test]
    fn advection_limit_is_the_classical_bound() {
        let (a, h) = ([-0.54, 1.68], [0.48, 0.53]);
        let p = lax_friedrichs(&a, &[0.0, 0.0], &h);
        let op = p.operator();
        let w = [a[0] / h[0], a[1] / h[1]];
        let norm = (w[0] * w[0] + w[1] * w[1]).sqrt();
        let n = [w[0] / norm, w[1] / norm];
        let exact = 1.0 / (2.0f64.sqrt() * norm);
        for origin in [[0.0, 0.0], [-PI, PI]] {
            let f = long_wave_limit(&p.system.flux, &h, &op, &origin, &n).unwrap();
            assert!(
                (f.limit - exact).abs() <= 1e-12 * exact,
                "{origin:?}: {f:?} vs {exact}"
            );
        }
    }

    /// 1-D advection–diffusion: the quadratic Δt²a²/h² − 2ΔtD/h² − 1 = 0
    /// (κ = D/h², D = 1) solved by hand; with diffusion the corner is strictly
    /// stable and gets no closed form.
    #[test]
    fn diffusion_raises_the_limit_by_the_quadratic() {
        let (a, d, h) = (1.1, 0.07, 0.3);
        let p = lax_friedrichs(&[a], &[d], &[h]);
        let op = p.operator();
        let f = long_wave_limit(&p.system.flux, &[h], &op, &[0.0], &[1.0]).unwrap();
        let (l2, kappa) = ((a / h).powi(2), d / (h * h));
        let exact = (kappa + (kappa * kappa + l2).sqrt()) / l2;
        assert!((f.limit - exact).abs() <= 1e-9 * exact, "{f:?} vs {exact}");
        assert!(long_wave_limit(&p.system.flux, &[h], &op, &[PI], &[-1.0]).is_none());
    }
}
