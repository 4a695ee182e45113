//! The long-wave limit of IMEX Euler (and so of forward Euler, its explicit
//! part) in closed form at θ = 0, from the leading matrices of L.
//!
//! Along θ = s n (|n| = 1), for real coefficients L(sn) = isB − s²K + O(s³)
//! (B = lim Im L/s, K = −lim Re L/s²: diffusion, first-order upwinding, second-
//! order dissipation). IMEX Euler's G = (I − ΔtL_I)⁻¹(I + ΔtL_E) is
//! I + ΔtL + Δt²L_I L + … with L_I = O(s²), so G = I + ΔtL + O(s³). For a simple
//! real eigenvalue λ of B with eigenvectors r, l (l·r = 1) the branch is
//! ζ = 1 + isΔtλ − s²Δt l·K·r + O(s³) (first-order perturbation; the
//! second-order term −s⁴(…)/(is Δλ) is imaginary at order s³), so
//!
//!   |ζ|² − 1 = s² Δt (Δtλ² − 2κ) + O(s⁴),   κ = l·K·r,
//!
//! and long waves are stable up to Δt = 2κ/λ² (for advection–diffusion with
//! central differences ν² ≤ 2r, Hirsch, Numerical Computation of Internal and
//! External Flows; here per characteristic branch). This reads κ from the
//! projected matrix K rather than from the real parts of eigenvalues of L,
//! whose O(s⁴) remainder is large when two speeds are close or κ is small.
//! B and K are read from L(sn) at s = 10⁻², …, 10⁻²/16 by Richardson
//! extrapolation, the change between the last two levels giving the
//! uncertainty.

use super::closed_form::ClosedForm;
use super::eigenpairs;
use crate::operator::Operator;
use nalgebra::DMatrix;

/// First level s of the fit.
const S: f64 = 1e-2;
/// Levels s, s/2, …, s/16.
const LEVELS: usize = 5;
/// Relative size below which an imaginary part or an eigenvalue is rounding.
const CLEAR: f64 = 1e-9;

/// The long-wave limit of IMEX Euler along `n` from θ = 0, or None where the
/// closed form does not apply.
pub fn long_wave_limit(op: &Operator, origin: &[f64], n: &[f64]) -> Option<ClosedForm> {
    if !op.real_coefficients || origin.iter().any(|x| *x != 0.0) {
        return None;
    }
    let m = op.m;
    let zero: Vec<f64> = vec![0.0; n.len()];
    if op.symbol_matrix(&zero).iter().any(|z| z.norm() != 0.0) {
        return None;
    }
    // Im L(s)/s and −Re L(s)/s², each erring like s² (odd and even in s)
    let levels: Vec<(DMatrix<f64>, DMatrix<f64>)> = (0..LEVELS)
        .map(|j| {
            let s = S * 0.5f64.powi(j as i32);
            let theta: Vec<f64> = n.iter().map(|x| x * s).collect();
            let l = op.symbol_matrix(&theta);
            (l.map(|z| z.im / s), l.map(|z| -z.re / (s * s)))
        })
        .collect();
    if levels
        .iter()
        .any(|(a, b)| a.iter().chain(b.iter()).any(|x| !x.is_finite()))
    {
        return None;
    }
    // a real part of lower order than s² (growing as s falls) is another balance
    let settles = |v: &dyn Fn(usize) -> f64| {
        let (a, b, c) = (v(LEVELS - 3), v(LEVELS - 2), v(LEVELS - 1));
        let scale = a.abs().max(b.abs()).max(c.abs());
        scale == 0.0 || (c - b).abs() <= 0.3 * (b - a).abs() + 1e-9 * scale
    };
    for i in 0..m {
        for j in 0..m {
            if !settles(&|l| levels[l].0[(i, j)]) || !settles(&|l| levels[l].1[(i, j)]) {
                return None;
            }
        }
    }
    let extrapolated = |last: usize| {
        let b = &levels[last].0 + (&levels[last].0 - &levels[last - 1].0) / 3.0;
        let k = &levels[last].1 + (&levels[last].1 - &levels[last - 1].1) / 3.0;
        (b, k)
    };
    let of = |last: usize| {
        let (b, k) = extrapolated(last);
        let pairs = eigenpairs::simple_real(&b, CLEAR)?;
        limit_from(&pairs, &k, b.norm())
    };
    let best = of(LEVELS - 1)?;
    let before = of(LEVELS - 2)?;
    ClosedForm::from_fits(best, before).filter(|f| f.limit > 0.0)
}

/// The smallest 2κ/λ² over the moving branches; None where a branch is not
/// damped at order s² (κ ≤ 0 clear of rounding: growth, or a damping of higher
/// order whose balance is another one) or does not move.
fn limit_from(pairs: &[eigenpairs::EigenPair], k: &DMatrix<f64>, scale: f64) -> Option<f64> {
    let mut limit = f64::INFINITY;
    for p in pairs {
        let kappa = p.project(k);
        if p.lambda.abs() <= 1e-6 * scale
            || kappa.partial_cmp(&(1e-9 * k.norm())) != Some(std::cmp::Ordering::Greater)
        {
            return None;
        }
        limit = limit.min(2.0 * kappa / (p.lambda * p.lambda));
    }
    Some(limit)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// 1-D advection–diffusion with central differences: Δt = 2D/a² (FTCS's
    /// ν² ≤ 2r, whose explicit part IMEX Euler shares at long waves).
    #[test]
    fn advection_diffusion_limit_is_two_d_over_a_squared() {
        let (a, d, h) = (1.1, 0.07, 0.3);
        let p = Problem::builder()
            .spacing(&[h])
            .system(crate::physics::advection(&[a], &[d]))
            .first("central2")
            .second("central2")
            .method("imex-euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let f = long_wave_limit(&p.operator(), &[0.0], &[1.0]).unwrap();
        let exact = 2.0 * d / (a * a);
        assert!((f.limit - exact).abs() <= 1e-9 * exact, "{f:?} vs {exact}");
    }
}
