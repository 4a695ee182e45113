//! Long-wave limits of dimension-split one-step methods in closed form.
//!
//! Along θ = s n each split part (the terms of one axis; no sources) is
//! P_d(s) = i s B_d + s² D_d + O(s³) with B_d, D_d real (real coefficients:
//! Re P_d even in s, Im P_d odd), and the method's stability function
//! R(z) = 1 + z + γ z² + O(z³). A sweep of sub-steps R(c_f Δt P_f), applied in
//! the order f = 1, 2, … (Lie: each part once with c = 1; Strang: halves of the
//! first parts around a whole step of the last), gives
//! G = I + i s Δt B + s² (Δt D − Δt² M) + O(s³), B = Σ B_d, D = Σ D_d,
//! M = γ Σ_f c_f² B_f² + Σ_{f<g} c_g c_f B_g B_f (later sub-steps on the left).
//! For a simple eigenvalue a of B with left and right eigenvectors l, r
//! (lᵀr = 1), first-order perturbation theory (Golub & Van Loan, Matrix
//! Computations, §7.2.2) gives λ = 1 + i s Δt a + s² (−Δt b − Δt² Q) + O(s³),
//! b = −lᵀ D r the branch's second-order damping (μ = i a s − b s² + … of L)
//! and Q = lᵀ M r, so that |λ|² − 1 = s² Δt (Δt (a² − 2Q) − 2b) + O(s⁴) and
//! the branch is stable for small s exactly when Δt ≤ 2b / (a² − 2Q). With one
//! part and γ = 0 this is forward Euler's 2D/a² (Hirsch, Numerical Computation
//! of Internal and External Flows). Q is read as the derivative of the
//! eigenvalue of B + εM at a (a central difference in ε), which needs no
//! eigenvectors.
//!
//! None (the samples decide) where a² − 2Q is not clearly of one sign, where a
//! branch does not move or is damped at an order other than 2 with
//! a² − 2Q > 0 unresolved, where B's eigenvalues cannot be matched to the
//! branches, with sources, or with complex coefficients.

use super::closed_form::{branches, ClosedForm, UNCERTAINTY_FLOOR};
use crate::operator::{Operator, TermKind};
use crate::time::composite::Splitting;
use crate::time::OneStep;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Levels of the first-order coefficient fit of each part.
const S: f64 = 1e-3;

/// γ of R(z) = P(z)/Q(z) = 1 + z + γ z² + O(z³), or None when R is not
/// consistent (the z coefficient is not 1).
fn second_coefficient(os: &OneStep) -> Option<f64> {
    let c = |v: &[f64], j: usize| v.get(j).copied().unwrap_or(0.0);
    let (p, q) = (&os.p, &os.q);
    if c(q, 0) != 1.0 || c(p, 0) != 1.0 {
        return None;
    }
    let (p1, q1) = (c(p, 1), c(q, 1));
    if ((p1 - q1) - 1.0).abs() > 1e-14 {
        return None;
    }
    // 1/Q = 1 − q1 z + (q1² − q2) z² + …
    Some(c(p, 2) - p1 * q1 + q1 * q1 - c(q, 2))
}

/// Eigenvalues of a complex matrix.
fn eigenvalues(m: &DMatrix<C64>) -> Option<Vec<C64>> {
    let e = m.clone().schur().eigenvalues()?;
    let v: Vec<C64> = e.iter().copied().collect();
    v.iter()
        .all(|z| z.re.is_finite() && z.im.is_finite())
        .then_some(v)
}

/// The eigenvalue of `m` nearest `a` when it is clearly the nearest (the next
/// at least 1e-6 · `scale` farther).
fn nearest(m: &DMatrix<C64>, a: f64, scale: f64) -> Option<C64> {
    let mut e = eigenvalues(m)?;
    e.sort_by(|x, y| (x - a).norm().total_cmp(&(y - a).norm()));
    if e.len() > 1 && (e[1] - a).norm() - (e[0] - a).norm() <= 1e-6 * scale {
        return None;
    }
    Some(e[0])
}

/// The long-wave limit of a dimension-split one-step method along `origin + s n`
/// (origin 0 only: the parts vanish there), or None where the closed form does
/// not apply.
pub fn long_wave_limit(
    os: &OneStep,
    kind: Splitting,
    op: &Operator,
    tolerance: f64,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    if origin.iter().any(|o| *o != 0.0)
        || !op.real_coefficients
        || op.terms.iter().any(|t| t.kind == TermKind::Source)
        || op.constant.iter().any(|z| z.norm() != 0.0)
    {
        return None;
    }
    let gamma = second_coefficient(os)?;
    let dims = op.dims;
    let m = op.m;
    // B_d: Im P_d(s n)/s, Richardson over s and s/2 (the error is O(s²))
    let part = |d: usize, s: f64| -> DMatrix<f64> {
        let theta: Vec<f64> = n.iter().map(|x| x * s).collect();
        op.part_matrix(&theta, |t| t.axis == d && t.kind != TermKind::Source, false)
            .map(|z| z.im / s)
    };
    let b: Vec<DMatrix<f64>> = (0..dims)
        .map(|d| {
            let (p, l) = (part(d, S), part(d, 0.5 * S));
            &l + (&l - &p) / 3.0
        })
        .collect();
    // the sweep: (part, fraction of Δt) in the order applied
    let sweep: Vec<(usize, f64)> = match kind {
        Splitting::Lie => (0..dims).map(|d| (d, 1.0)).collect(),
        Splitting::Strang => {
            let mut v: Vec<(usize, f64)> = (0..dims - 1).map(|d| (d, 0.5)).collect();
            v.push((dims - 1, 1.0));
            v.extend((0..dims - 1).rev().map(|d| (d, 0.5)));
            v
        }
    };
    let mut mm = DMatrix::<f64>::zeros(m, m);
    for (f, &(pf, cf)) in sweep.iter().enumerate() {
        mm += &b[pf] * &b[pf] * (gamma * cf * cf);
        for &(pg, cg) in &sweep[f + 1..] {
            mm += &b[pg] * &b[pf] * (cg * cf);
        }
    }
    let total: DMatrix<f64> = b.iter().fold(DMatrix::zeros(m, m), |acc, x| acc + x);
    let all = branches(op, tolerance, origin, n)?;
    let scale = all.iter().fold(0.0_f64, |acc, br| acc.max(br.a.abs()));
    if scale == 0.0 {
        return None;
    }
    let size_m = mm.iter().fold(0.0_f64, |acc, x| acc.max(x.abs()));
    let cplx = |x: &DMatrix<f64>| x.map(|v| C64::new(v, 0.0));
    let speeds: Vec<f64> = all.iter().map(|br| br.a).collect();
    let mut limit = f64::INFINITY;
    let mut lowest = f64::INFINITY;
    for br in &all {
        if br.a.abs() <= 1e-9 * scale {
            return None;
        }
        // the branch's eigenvalue of B
        let gap = speeds
            .iter()
            .filter(|x| **x != br.a)
            .fold(f64::INFINITY, |acc, x| acc.min((x - br.a).abs()))
            .min(scale);
        let here = nearest(&cplx(&total), br.a, scale)?;
        if (here.re - br.a).abs() > 1e-6 * scale || here.im.abs() > 1e-6 * scale {
            return None;
        }
        // Q = d/dε of the eigenvalue of B + εM at a: central differences at ε
        // and ε/2 (ε|M| a thousandth of the gap to the next speed), Richardson,
        // with their difference plus the eigenvalues' rounding over ε as the error
        let (q, q_err) = if size_m == 0.0 {
            (0.0, 0.0)
        } else {
            let derivative = |eps: f64| -> Option<f64> {
                let up = nearest(&cplx(&(&total + &mm * eps)), br.a, gap)?;
                let down = nearest(&cplx(&(&total - &mm * eps)), br.a, gap)?;
                Some(((up - down) / (2.0 * eps)).re)
            };
            let eps = 1e-3 * gap / size_m;
            let (q1, q2) = (derivative(eps)?, derivative(0.5 * eps)?);
            (q2 + (q2 - q1) / 3.0, (q2 - q1).abs() + 1e-14 * scale / eps)
        };
        let a2 = br.a * br.a;
        let denominator = a2 - 2.0 * q;
        let slack = 1e-6 * (a2 + 2.0 * q.abs()) + 2.0 * q_err;
        if denominator.abs() <= slack {
            return None;
        }
        let (value, spread) = match (br.r, denominator > 0.0) {
            (_, false) => (f64::INFINITY, 0.0),
            (Some(2), true) => (
                2.0 * br.b / denominator,
                br.b_spread + 1e-12 + (2.0 * a2 * br.a_spread + 2.0 * q_err) / denominator,
            ),
            (None, true) => (0.0, 0.0),
            (Some(r), true) if r > 2 => (0.0, 0.0),
            _ => return None,
        };
        limit = limit.min(value);
        lowest = lowest.min(value * (1.0 - spread));
    }
    let uncertainty = if limit.is_finite() && limit > 0.0 {
        ((limit - lowest) / limit).max(UNCERTAINTY_FLOOR)
    } else {
        0.0
    };
    Some(ClosedForm { limit, uncertainty })
}
