//! The long-wave limit of unsplit Lax–Wendroff in closed form, at θ = 0.
//!
//! Unsplit Lax–Wendroff takes the Taylor terms up to second order with central
//! differences of the fluxes: with A_d = ΔtF_d/h_d,
//! G = I − iΣ A_d sin θ_d − Σ A_d² 2sin²(θ_d/2) − ½Σ_{d≠f} A_dA_f sin θ_d sin θ_f +
//! Δt R(θ), R the diffusion, dissipation and source terms. Along θ = s n
//! (|n| = 1), with B = Σ F_d n_d/h_d, the series give
//! G = I − isΔtB − ½s²Δt²B² + is³ΔtC₃ + s⁴Δt²Q₄ + ΔtR(sn) + O(s⁵) with
//! C₃ = Σ F_d n_d³/(6h_d) and
//! Q₄ = Σ_d F_d² n_d⁴/(24h_d²) + Σ_{d≠f} F_dF_f (n_d n_f³ + n_d³ n_f)/(12h_dh_f).
//! The first two terms commute with B, so for a simple real eigenvalue λ of B
//! with eigenvectors r, l (l·r = 1) the branch is 1 − isΔtλ − ½s²Δt²λ² plus
//! l·(the rest)·r to O(s⁵) (first-order perturbation of an O(s³) term; the
//! second-order term is O(s⁶/s)). With R(sn) = is³K₃ + s⁴K₄ + O(s⁵) (no order
//! below: else None) and c₃ = l·C₃·r, k₃ = l·K₃·r, q₄ = l·Q₄·r, κ = l·K₄·r,
//!
//!   |ζ|² − 1 = s⁴ (¼Δt⁴λ⁴ + Δt²(2q₄ − 2λ(c₃ + k₃)) + 2Δtκ) + O(s⁶),
//!
//! and long waves are stable up to the positive root of
//! ¼λ⁴Δt³ + βΔt + 2κ (β = 2q₄ − 2λ(c₃ + k₃)). For scalar advection with
//! nothing added this is Δt² ≤ Σ a_d² n_d⁴/(a·n)⁴, the two-thirds law of the
//! unsplit scheme (Strikwerda, Finite Difference Schemes and Partial
//! Differential Equations, re-derived). K₃, K₄ are read from R(sn) at
//! s = 10⁻², …, 10⁻²/16 by Richardson extrapolation, the change between the
//! last two values giving the uncertainty.

use super::closed_form::ClosedForm;
use super::eigenpairs;
use crate::operator::{Operator, TermKind};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// First level s of the fit.
const S: f64 = 1e-2;
/// Levels s, s/2, …, s/16.
const LEVELS: usize = 5;
/// Relative size below which an imaginary part or an eigenvalue is rounding.
const CLEAR: f64 = 1e-9;

/// The long-wave limit of Lax–Wendroff with flux matrices `flux` on spacings
/// `h` along `n` from θ = 0, or None where the closed form does not apply.
pub fn long_wave_limit(
    flux: &[DMatrix<C64>],
    h: &[f64],
    op: &Operator,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    let dims = h.len();
    if !op.real_coefficients || origin.iter().any(|x| *x != 0.0) || flux.len() != dims {
        return None;
    }
    let m = op.m;
    if flux.iter().any(|a| a.iter().any(|z| z.im != 0.0)) {
        return None;
    }
    let f: Vec<DMatrix<f64>> = flux.iter().map(|a| a.map(|z| z.re)).collect();
    let b = DMatrix::from_fn(m, m, |i, j| {
        (0..dims).map(|d| f[d][(i, j)] * n[d] / h[d]).sum::<f64>()
    });
    let mut c3 = DMatrix::<f64>::zeros(m, m);
    let mut q4 = DMatrix::<f64>::zeros(m, m);
    for d in 0..dims {
        c3 += &f[d] * (n[d].powi(3) / (6.0 * h[d]));
        q4 += &f[d] * &f[d] * (n[d].powi(4) / (24.0 * h[d] * h[d]));
        for e in 0..dims {
            if e != d {
                let w = (n[d] * n[e].powi(3) + n[d].powi(3) * n[e]) / (12.0 * h[d] * h[e]);
                q4 += &f[d] * &f[e] * w;
            }
        }
    }
    let rest = |s: f64| {
        let theta: Vec<f64> = n.iter().map(|x| x * s).collect();
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
    // R(s)/s⁴ (real) and R(s)/s³ (imaginary) at the levels; even and odd in s
    // for real coefficients, so each errs like s² when no lower order is there
    let levels: Vec<(DMatrix<f64>, DMatrix<f64>)> = (0..LEVELS)
        .map(|j| {
            let s = S * 0.5f64.powi(j as i32);
            let r = rest(s);
            (r.map(|z| z.re / s.powi(4)), r.map(|z| z.im / s.powi(3)))
        })
        .collect();
    if levels
        .iter()
        .any(|(a, b)| a.iter().chain(b.iter()).any(|x| !x.is_finite()))
    {
        return None;
    }
    // a lower order (diffusion at s², a first-order rest) shows as values that
    // grow as s falls: the leading balance is another one
    let grows = |v: &dyn Fn(usize) -> f64| {
        let (a, b, c) = (v(LEVELS - 3), v(LEVELS - 2), v(LEVELS - 1));
        let scale = a.abs().max(b.abs()).max(c.abs());
        scale > 0.0 && (c - b).abs() > 0.3 * (b - a).abs() + 1e-9 * scale
    };
    for i in 0..m {
        for j in 0..m {
            if grows(&|l| levels[l].0[(i, j)]) || grows(&|l| levels[l].1[(i, j)]) {
                return None;
            }
        }
    }
    let extrapolated = |last: usize, im: bool| {
        let pick = |l: usize| if im { &levels[l].1 } else { &levels[l].0 };
        pick(last) + (pick(last) - pick(last - 1)) / 3.0
    };
    let pairs = eigenpairs::simple_real(&b, CLEAR)?;
    let scale = b.norm();
    let of = |last: usize| {
        limit_from(
            &pairs,
            &c3,
            &q4,
            &extrapolated(last, true),
            &extrapolated(last, false),
            scale,
        )
    };
    let best = of(LEVELS - 1)?;
    let before = of(LEVELS - 2)?;
    ClosedForm::from_fits(best, before)
}

/// The smallest positive root over the branches of ¼λ⁴Δt³ + βΔt + 2κ; None
/// when a branch does not move (λ = 0) or grows at every Δt (κ > 0), where the
/// leading orders alone do not settle it.
fn limit_from(
    pairs: &[eigenpairs::EigenPair],
    c3: &DMatrix<f64>,
    q4: &DMatrix<f64>,
    k3: &DMatrix<f64>,
    k4: &DMatrix<f64>,
    scale: f64,
) -> Option<f64> {
    let mut limit = f64::INFINITY;
    for p in pairs {
        if p.lambda.abs() <= 1e-6 * scale {
            return None;
        }
        let lambda = p.lambda;
        let alpha = 0.25 * lambda.powi(4);
        let beta = 2.0 * p.project(q4) - 2.0 * lambda * (p.project(c3) + p.project(k3));
        let gamma = 2.0 * p.project(k4);
        if gamma > 0.0 || !(alpha.is_finite() && beta.is_finite() && gamma.is_finite()) {
            return None;
        }
        // h(Δt) = αΔt³ + βΔt + γ, h(0) = γ ≤ 0, one positive root (h falls, if
        // at all, before it rises for good); with γ = 0 it is √(−β/α)
        let root = if gamma == 0.0 {
            if beta >= 0.0 {
                // |ζ| > 1 at order s⁴ for every Δt: not a balance of the
                // leading orders
                return None;
            }
            (-beta / alpha).sqrt()
        } else {
            let h = |t: f64| (alpha * t * t + beta) * t + gamma;
            let mut hi = 1.0 / scale.max(f64::MIN_POSITIVE);
            let mut k = 0;
            while h(hi) <= 0.0 {
                hi *= 2.0;
                k += 1;
                if k > 200 {
                    return None;
                }
            }
            let mut lo = 0.0;
            for _ in 0..200 {
                let mid = 0.5 * (lo + hi);
                if mid <= lo || mid >= hi {
                    break;
                }
                if h(mid) <= 0.0 {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            lo
        };
        limit = limit.min(root);
    }
    Some(limit)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// 3-D scalar advection with nothing added: the closed form is the
    /// two-thirds law along each direction, Δt² = Σ a_d² n_d⁴/(a·n)⁴
    /// (a_d = u_d/h_d), re-derived in the module comment.
    #[test]
    fn advection_limit_is_the_two_thirds_law() {
        let (u, h) = ([0.7, -1.3, 0.4], [0.3, 0.5, 0.2]);
        let p = Problem::builder()
            .spacing(&h)
            .system(crate::physics::advection(&u, &[0.0, 0.0, 0.0]))
            .first("central2")
            .second("central2")
            .method("lax-wendroff")
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        let a: Vec<f64> = (0..3).map(|d| u[d] / h[d]).collect();
        for n in [
            [0.6, 0.0, 0.8],
            [0.48, -0.6, 0.64],
            [0.2, -0.3, 0.932_737_905_308_881_5],
        ] {
            let an: f64 = (0..3).map(|d| a[d] * n[d]).sum();
            let q: f64 = (0..3).map(|d| a[d] * a[d] * n[d].powi(4)).sum();
            let exact = q.sqrt() / (an * an);
            let f = long_wave_limit(&p.system.flux, &h, &op, &[0.0; 3], &n).unwrap();
            assert!(
                (f.limit - exact).abs() <= 1e-12 * exact,
                "{n:?}: {f:?} vs {exact}"
            );
        }
    }
}
