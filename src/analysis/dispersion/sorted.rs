//! Where ascending frequency names the numerical modes, so that no ray has to
//! be followed.
//!
//! Suppose L(θ) = −i Σ_d κ_d(θ_d)/h_d · A_d + r(θ)·I with one central stencil of
//! modified wavenumber κ_d per axis, the model's own flux matrices A_d and a
//! real scalar r (added dissipation). Then L(θ) is the continuous symbol at the
//! real wavevector k* = (κ_d(θ_d)/h_d) shifted by r, and the numerical ω are
//! the model's frequencies at k* (real) plus i·r: Re ω are the eigenvalues of
//! A(k*) = Σ k*_d A_d. For the catalogue's hyperbolic models without source or
//! diffusion (advection, acoustics, Euler, shallow water, Maxwell; every one
//! about a uniform state with a positive wave speed c) those are u·k* ± c|k*|
//! and u·k* (or ±c|k*| and 0): real, with a multiplicity that does not depend on
//! the direction of k* ≠ 0, so two different ones never cross. Along the ray
//! sθ, s ∈ (0, 1], k*(sθ) is never zero when some axis has 0 < |θ_d| < π and
//! κ_d has no zero in (0, π). The ascending order of Re ω is then the same at
//! every point of the ray, and following the spectrum from θ = 0 (`ray::follow_ray`)
//! ends in ascending order at θ: sorting the eigenvalues at θ gives the same
//! names with one eigenproblem instead of about fifteen.
//!
//! That κ_d has no zero in (0, π) is certified once per case: an explicit
//! central stencil with integer offsets has κ(t) = sin t · Q(cos t), Q(c) =
//! Σ_j b_j U_{j−1}(c) with Chebyshev polynomials of the second kind and b_j = 2w_j
//! the weights at offsets j > 0, and Q is shown to keep one sign on [−1, 1] from
//! its values on a grid and a bound on its slope. Compact stencils, staggered
//! arrangements, upwinded fluxes, sources and user systems keep the ray.

use crate::operator::classes::TermClass;
use crate::operator::{flat, Factor, Operator, TermKind};
use crate::physics::ModelKind;
use crate::problem::Problem;
use crate::stencil::Stencil;
use std::f64::consts::PI;

/// Points of the grid on which Q's sign is checked.
const SIGN_GRID: usize = 2048;

/// Whether ascending Re ω names the numerical modes of `op` at every θ with
/// some axis inside (0, π) (see the module documentation). `homogeneous`: the
/// continuous system has no source and no diffusion.
pub fn ascending_names_modes(problem: &Problem, op: &Operator, homogeneous: bool) -> bool {
    let system = &problem.system;
    let hyperbolic_model = matches!(
        system.kind,
        ModelKind::Advection
            | ModelKind::Acoustics
            | ModelKind::Euler
            | ModelKind::ShallowWater
            | ModelKind::Maxwell
    );
    if !homogeneous || !hyperbolic_model || op.m != system.size() {
        return false;
    }
    if op.constant.iter().any(|z| z.norm() != 0.0) {
        return false;
    }
    let mut fluxes = vec![0usize; op.dims];
    for (term, class) in op.terms.iter().zip(op.term_classes()) {
        if let TermClass::ScalarReal(_) = class {
            continue;
        }
        let [(axis, Factor::Stencil { stencil, scale })] = &term.factors[..] else {
            return false;
        };
        let flux = system.flux.get(*axis);
        let same_matrix = flux.is_some_and(|a| flat(a) == term.matrix);
        if term.kind != TermKind::Flux
            || *axis != term.axis
            || !same_matrix
            || *scale >= 0.0
            || !stencil.is_central()
            || !keeps_sign_inside(stencil)
        {
            return false;
        }
        fluxes[*axis] += 1;
    }
    fluxes.iter().all(|&n| n == 1)
}

/// Whether some axis of `theta` is strictly inside (0, π) in modulus, so that
/// k*(sθ) ≠ 0 along the whole ray.
pub fn off_the_zeros(theta: &[f64]) -> bool {
    theta.iter().any(|t| t.abs() > 0.0 && t.abs() < PI)
}

/// Whether the modified wavenumber of an explicit central first-derivative
/// stencil with integer offsets has no zero in (0, π).
fn keeps_sign_inside(stencil: &Stencil) -> bool {
    if stencil.derivative != 1 || stencil.is_compact() {
        return false;
    }
    // b_j at integer offsets j > 0 (the antisymmetric partner is implied)
    let mut b: Vec<f64> = Vec::new();
    for (o, w) in stencil.offsets.iter().zip(&stencil.weights) {
        if o.fract() != 0.0 || o.abs() > 64.0 {
            return false;
        }
        if *o > 0.0 {
            let j = *o as usize;
            if b.len() < j {
                b.resize(j, 0.0);
            }
            b[j - 1] += 2.0 * w / stencil.implicit_weights[0];
        }
    }
    q_keeps_sign(&b)
}

/// Whether Q(c) = Σ_j b_{j} U_j(c) (b indexed from U₀) keeps one strict sign on
/// [−1, 1]: every grid value is of one sign and farther from zero than the
/// slope bound times half the grid step (|U′_n| ≤ n(n+1)(n+2)/3 on [−1, 1]),
/// with a margin for rounding.
fn q_keeps_sign(b: &[f64]) -> bool {
    if b.is_empty() {
        return false;
    }
    let slope: f64 = b
        .iter()
        .enumerate()
        .map(|(n, bn)| {
            let n = n as f64;
            bn.abs() * n * (n + 1.0) * (n + 2.0) / 3.0
        })
        .sum();
    let scale: f64 = b
        .iter()
        .enumerate()
        .map(|(n, bn)| bn.abs() * (n as f64 + 1.0))
        .sum();
    let step = 2.0 / SIGN_GRID as f64;
    let needed = slope * step / 2.0 + 1e-12 * scale;
    let values = (0..=SIGN_GRID).map(|i| chebyshev_u_sum(b, -1.0 + step * i as f64));
    let mut sign = 0.0;
    for q in values {
        if q.abs() <= needed {
            return false;
        }
        if sign == 0.0 {
            sign = q.signum();
        } else if q.signum() != sign {
            return false;
        }
    }
    true
}

/// Σ_n b_n U_n(c) by the three-term recurrence U_{n+1} = 2c U_n − U_{n−1}.
fn chebyshev_u_sum(b: &[f64], c: f64) -> f64 {
    let (mut prev, mut cur) = (0.0, 1.0);
    let mut total = 0.0;
    for bn in b {
        total += bn * cur;
        (prev, cur) = (cur, 2.0 * c * cur - prev);
    }
    total
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Q of a sum of sines, by definition: κ(t)/sin t.
    fn q_direct(b: &[f64], t: f64) -> f64 {
        let kappa: f64 = b
            .iter()
            .enumerate()
            .map(|(n, bn)| bn * ((n as f64 + 1.0) * t).sin())
            .sum();
        kappa / t.sin()
    }

    #[test]
    fn the_recurrence_is_the_quotient_of_sines() {
        // sin((n+1)t)/sin t = U_n(cos t), the defining identity
        let b = [1.3, -0.4, 0.25, 0.1];
        for k in 1..40 {
            let t = PI * k as f64 / 40.0;
            let q = chebyshev_u_sum(&b, t.cos());
            assert!((q - q_direct(&b, t)).abs() < 1e-12, "t = {t}");
        }
    }

    #[test]
    fn standard_central_stencils_keep_their_sign_inside() {
        // central2: κ = sin t; central4: κ = (8 sin t − sin 2t)/6 = sin t (4 − cos t)/3
        assert!(q_keeps_sign(&[1.0]));
        assert!(q_keeps_sign(&[4.0 / 3.0, -1.0 / 6.0]));
    }

    #[test]
    fn a_wide_difference_vanishing_at_half_pi_is_refused() {
        // (u_{j+2} − u_{j−2})/4: κ = sin(2t)/2, zero at t = π/2
        assert!(!q_keeps_sign(&[0.0, 0.5]));
        // and a sum whose Q changes sign inside: sin t + 0.9 sin 2t has Q = 1 + 1.8c
        assert!(!q_keeps_sign(&[1.0, 0.9]));
    }

    #[test]
    fn a_sum_touching_zero_at_the_end_is_refused() {
        // sin t + sin 2t / 2: Q = 1 + c, zero at c = −1 (a double zero of κ at π)
        assert!(!q_keeps_sign(&[1.0, 0.5]));
    }

    #[test]
    fn a_ray_needs_one_axis_strictly_inside() {
        assert!(off_the_zeros(&[0.3, 0.0]));
        assert!(off_the_zeros(&[PI, -0.2]));
        assert!(!off_the_zeros(&[PI, 0.0]));
        assert!(!off_the_zeros(&[-PI, PI]));
        assert!(!off_the_zeros(&[0.0, 0.0]));
    }
}
