//! The long-wave limit of forward–backward (partitioned) stepping in closed form.
//!
//! Forward–backward updates the variables in rank order, each with the newest
//! values of those ranked before it: G = I + (I − ΔtN)⁻¹ΔtL, with N the part of
//! L coupling a variable to those updated earlier (N_ij = L_ij where
//! rank j < rank i), so G = I + ΔtL + Δt²NL + O(Δt³N²L). Along θ = s n with a
//! real-coefficient L that vanishes at θ = 0,
//!
//!   L(s n) = −i s B − s² K + O(s³),   N(s n) = −i s E + O(s²),
//!
//! B = Σ_d A_d n_d/h_d from the first differences, K the damping of order s²
//! (diffusion, first-order upwinding), E the rank-ordered part of B. For a simple
//! real eigenvalue λ of B with right and left eigenvectors r, l (l·r = 1),
//! first-order perturbation of the eigenvalue −isΔtλ of ΔtL gives
//!
//!   ζ = 1 − isΔtλ − s²(Δt l·K·r + Δt²λ l·E·r) + O(s³),
//!   |ζ|² − 1 = s² [Δt²(λ² − 2λ l·E·r) − 2Δt l·K·r] + O(s⁴)
//!
//! (even in s for real coefficients). A branch with damping κ = l·K·r > 0 is
//! stable for small s while Δt D < 2κ, D = λ² − 2λ l·E·r: its long-wave limit
//! is 2κ/D, none when D ≤ 0. With a single variable set (no N) this is forward
//! Euler's Δt ≤ 2D/a² (Hirsch's ν² ≤ 2r); for shallow water with the height
//! first and no damping D = λ² − λ² = 0: no long-wave limit, as for the
//! staggered forward–backward wave schemes of ocean models.
//!
//! B and K are read from L(s n) at s = 10⁻², …, 10⁻²/16 (B = −Im L/s,
//! K = −Re L/s², each with an error of order s², removed by Richardson
//! extrapolation); the formula's uncertainty is the change between the last
//! two Richardson values, as in [`super::closed_form`]. Any doubt (complex or
//! repeated eigenvalues of B, a branch without clear damping, D within rounding
//! of 0, L(0) ≠ 0, complex coefficients) gives None and the sampled long-wave
//! approach stands.

use super::closed_form::ClosedForm;
use super::eigenpairs;
use crate::operator::Operator;
use nalgebra::DMatrix;

/// First level s of the fit.
const S: f64 = 1e-2;
/// Levels s, s/2, …, s/16.
const LEVELS: usize = 5;
/// Relative size below which a damping, a denominator or an eigenvalue gap is
/// taken for rounding.
const CLEAR: f64 = 1e-9;

/// The long-wave limit along `n` (from θ = 0) of forward–backward stepping with
/// update ranks `rank`, or None when the closed form does not apply.
pub fn long_wave_limit(
    op: &Operator,
    rank: &[usize],
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    if !op.real_coefficients || origin.iter().any(|x| *x != 0.0) || rank.len() != op.m {
        return None;
    }
    let at_origin = op.symbol_matrix(origin);
    if at_origin.iter().any(|z| z.norm() != 0.0) {
        return None;
    }
    let m = op.m;
    let levels: Vec<(DMatrix<f64>, DMatrix<f64>)> = (0..LEVELS)
        .map(|j| {
            let s = S * 0.5f64.powi(j as i32);
            let theta: Vec<f64> = n.iter().map(|x| x * s).collect();
            let l = op.symbol_matrix(&theta);
            (
                DMatrix::from_fn(m, m, |i, k| -l[(i, k)].im / s),
                DMatrix::from_fn(m, m, |i, k| -l[(i, k)].re / (s * s)),
            )
        })
        .collect();
    // Richardson values from the last three levels and the two before
    let extrapolate = |pick: &dyn Fn(usize) -> DMatrix<f64>, last: usize| {
        let (p, l) = (pick(last - 1), pick(last));
        &l + (&l - &p) / 3.0
    };
    let b_of = |j: usize| levels[j].0.clone();
    let k_of = |j: usize| levels[j].1.clone();
    let best = limit_from(
        &extrapolate(&b_of, LEVELS - 1),
        &extrapolate(&k_of, LEVELS - 1),
        rank,
    )?;
    let before = limit_from(
        &extrapolate(&b_of, LEVELS - 2),
        &extrapolate(&k_of, LEVELS - 2),
        rank,
    )?;
    ClosedForm::from_fits(best, before)
}

/// The smallest branch limit 2κ/D from B, K and the ranks (∞ when no branch
/// limits), or None when a branch is not clearly decided.
fn limit_from(b: &DMatrix<f64>, k: &DMatrix<f64>, rank: &[usize]) -> Option<f64> {
    let m = b.nrows();
    let scale = b.norm();
    if !k.iter().all(|x| x.is_finite()) {
        return None;
    }
    let k_scale = k.norm().max(CLEAR * scale);
    let e = DMatrix::from_fn(m, m, |i, j| if rank[j] < rank[i] { b[(i, j)] } else { 0.0 });
    let mut limit = f64::INFINITY;
    for pair in eigenpairs::simple_real(b, CLEAR)? {
        let kappa = pair.project(k);
        if kappa <= CLEAR * k_scale {
            // no clear damping at order s²: higher orders decide
            return None;
        }
        let lambda = pair.lambda;
        if lambda.abs() <= CLEAR * scale {
            // a mode that does not move, damped: no limit from it
            continue;
        }
        let d = lambda * lambda - 2.0 * lambda * pair.project(&e);
        if d.abs() <= CLEAR * scale * scale {
            return None;
        }
        if d > 0.0 {
            limit = limit.min(2.0 * kappa / d);
        }
    }
    Some(limit)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// One variable: forward–backward is forward Euler, and the limit is FTCS's
    /// Δt ≤ 2D/a² (Hirsch, Numerical Computation of Internal and External
    /// Flows: ν² ≤ 2r).
    #[test]
    fn a_single_variable_gives_the_forward_euler_limit() {
        let (a, d, h) = (1.3, 0.17, 0.45);
        let p = Problem::builder()
            .spacing(&[h])
            .system(crate::physics::advection(&[a], &[d]))
            .first("central2")
            .second("central2")
            .method("euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        let form = long_wave_limit(&op, &[0], &[0.0], &[1.0]).unwrap();
        let exact = 2.0 * d / (a * a);
        assert!(
            (form.limit - exact).abs() <= 1e-9 * exact,
            "{form:?} vs {exact}"
        );
        assert!(form.uncertainty < 1e-9, "{form:?}");
    }

    /// A 2×2 system u_t = −(A u)_x + D u_xx (central differences, h = 1):
    /// L ≈ −isA − s²D, so B = A, K = D, E = the rank-ordered part of A. The
    /// formula, evaluated here by hand for a symmetric A (eigenvectors
    /// orthonormal), against the fit.
    #[test]
    fn a_two_variable_system_matches_the_formula_by_hand() {
        let (a11, a12, a22) = (0.8, 0.6, -0.3);
        let diffusion = [0.05, 0.02];
        let c = |x: f64| num_complex::Complex64::new(x, 0.0);
        let flux = DMatrix::from_row_slice(2, 2, &[c(a11), c(a12), c(a12), c(a22)]);
        let diff =
            DMatrix::from_row_slice(2, 2, &[c(diffusion[0]), c(0.0), c(0.0), c(diffusion[1])]);
        let sys = crate::physics::linear(
            vec!["p".into(), "q".into()],
            vec![flux],
            vec![diff],
            DMatrix::zeros(2, 2),
        );
        let p = Problem::builder()
            .spacing(&[1.0])
            .system(sys)
            .first("central2")
            .second("central2")
            .method("euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        // q first (rank 0), then p: E has only the (p, q) entry a12
        let rank = [1, 0];
        let form = long_wave_limit(&op, &rank, &[0.0], &[1.0]).unwrap();
        // eigenpairs of the symmetric A, by hand
        let tr = a11 + a22;
        let disc = ((a11 - a22).powi(2) / 4.0 + a12 * a12).sqrt();
        let mut by_hand = f64::INFINITY;
        for lambda in [tr / 2.0 + disc, tr / 2.0 - disc] {
            let (x, y) = (a12, lambda - a11);
            let norm = (x * x + y * y).sqrt();
            let (r0, r1) = (x / norm, y / norm);
            let kappa = diffusion[0] * r0 * r0 + diffusion[1] * r1 * r1;
            let le_r = r0 * a12 * r1;
            let d = lambda * lambda - 2.0 * lambda * le_r;
            if d > 0.0 {
                by_hand = by_hand.min(2.0 * kappa / d);
            }
        }
        assert!(
            (form.limit - by_hand).abs() <= 1e-9 * by_hand,
            "{form:?} vs {by_hand}"
        );
    }
}
