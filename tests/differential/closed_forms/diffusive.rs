//! Closed-form limits set by long waves with diffusion or dissipation: FTCS in
//! 1-D and 2-D, IMEX Euler with upwind advection, Heun with fourth-order
//! dissipation.

use super::{assert_limit, engine, engine_direction, reference_direction, D45};
use crate::engine::EngineKind;
use crate::handmade::{euler, heun, Scalar};
use crate::reference::overall;
use crate::scheme::{Dissipation, Method, Scheme};

// ---------------------------------------------------------------------------
// 1-D FTCS advection–diffusion (Hirsch, Numerical Computation of Internal and
// External Flows, vol. 1, von Neumann analysis of the explicit central scheme).
// G = 1 − 2r(1 − cos θ) − iν sin θ, r = DΔt/h², ν = uΔt/h. With c = 1 − cos θ,
// |G|² − 1 = c[−4r + 4r²c + ν²(2 − c)], so Δt ≤ 4D/(4D²c + u²(2 − c)) for every
// c ∈ (0, 2]; for u² > 4D² the bound grows with c and its infimum is c → 0:
// Δt_max = 2D/u² (ν² ≤ 2r), here 2·0.1/1 = 0.2; r ≤ ½ (c = 2, Δt ≤ 5) does not bind.
fn ftcs_1d() -> Scheme {
    Scalar {
        spacing: &[1.0],
        velocity: &[1.0],
        diffusivity: &[0.1],
        source: 0.0,
        first: "central2",
        second: "central2",
        dissipation: None,
        points: 1025,
        directions: 16,
    }
    .with(euler())
}

#[test]
fn ftcs_1d_limit_is_two_d_over_u_squared_reference() {
    assert_limit(overall(&ftcs_1d()).dt, 0.2, "FTCS 1-D, reference");
}

#[test]
fn ftcs_1d_limit_is_two_d_over_u_squared_engine() {
    let e = engine(&ftcs_1d());
    assert_eq!(e.kind, EngineKind::Bounded);
    assert_limit(e.dt_max, 0.2, "FTCS 1-D, engine");
    for (n, dt) in e.directions.iter().zip(&e.dt_by_direction) {
        assert_limit(*dt, 0.2, &format!("FTCS 1-D, engine, direction {n:?}"));
    }
}

// ---------------------------------------------------------------------------
// 2-D FTCS, a = (0.8, 0.8), D = 0.1 per axis, h = 1. Long waves θ = s n: with
// G ≈ 1 + Δt(−i a·θ − D|θ|²) + ½Δt²(−i a·θ)², |G|² = 1 + s²[Δt²(a·n)² − 2ΔtD] +
// O(s³), so along n the long-wave bound is Δt ≤ 2D/(a·n)² (ν_n² ≤ 2r_n, the 1-D
// condition with the velocity projected on n, as in Hirsch). Along n = (1, 0)
// the ray is exactly 1-D FTCS with u = 0.8: 2D/u² = 0.3125 (monotone in c, as
// above). Along n = (1, 1)/√2, θ_x = θ_y = t: G = 1 − 4r(1 − cos t) − 2iν sin t
// is 1-D FTCS with r' = 2r, ν' = 2ν, whose bound 4r'/(2ν'²)·Δt at c → 0 is
// 2·0.2/(2·1.6²) = 0.15625 = 2D/|a|²; by Cauchy–Schwarz no direction has a
// smaller long-wave bound, so the overall limit is 0.15625 unless a finite
// wavevector binds first (the reference checks the whole box).
fn ftcs_2d() -> Scheme {
    Scalar {
        spacing: &[1.0, 1.0],
        velocity: &[0.8, 0.8],
        diffusivity: &[0.1, 0.1],
        source: 0.0,
        first: "central2",
        second: "central2",
        dissipation: None,
        points: 65,
        directions: 8,
    }
    .with(euler())
}

#[test]
fn ftcs_2d_limits_follow_the_projected_long_wave_condition_reference() {
    let s = ftcs_2d();
    assert_limit(overall(&s).dt, 0.15625, "FTCS 2-D overall, reference");
    assert_limit(
        reference_direction(&s, &[1.0, 0.0]),
        0.3125,
        "FTCS 2-D along x, reference",
    );
    assert_limit(
        reference_direction(&s, &D45),
        0.15625,
        "FTCS 2-D along 45°, reference",
    );
}

#[test]
fn ftcs_2d_limits_follow_the_projected_long_wave_condition_engine() {
    let e = engine(&ftcs_2d());
    assert_limit(e.dt_max, 0.15625, "FTCS 2-D overall, engine");
    assert_limit(
        engine_direction(&e, &[1.0, 0.0]),
        0.3125,
        "FTCS 2-D along x, engine",
    );
    assert_limit(
        engine_direction(&e, &D45),
        0.15625,
        "FTCS 2-D along 45°, engine",
    );
}

// ---------------------------------------------------------------------------
// IMEX Euler: diffusion implicit (central2), advection explicit with upwind1
// (a > 0: symbol (1 − e^{−iθ})/h ≈ (iθ + θ²/2)/h). G = (1 + ΔtL_E)/(1 − ΔtL_I),
// L_E ≈ −a(iθ + θ²/2)/h, L_I ≈ −Dθ²/h². To second order in θ,
// |G|² ≈ 1 + θ²[−Δt a/h + Δt²a²/h² − 2ΔtD/h²], so long waves need
// Δt ≤ h/|a| + 2D/a² (the upwind term adds the scheme's own numerical
// diffusion a h/2 to D; with a central advection stencil it would be 2D/a²).
// In 2-D along n (h = 1): Δt_n = (Σ|a_d|n_d² + 2Σ D_d n_d²)/(a·n)².
// Here 1-D a = 1, D = 0.1, h = 1: 1.2, if no finite wavevector binds first
// (θ = π gives Δt ≤ h/(a − 2D/h) = 1.25); the reference checks the whole range.
fn imex_euler_1d() -> Scheme {
    Scalar {
        spacing: &[1.0],
        velocity: &[1.0],
        diffusivity: &[0.1],
        source: 0.0,
        first: "upwind1",
        second: "central2",
        dissipation: None,
        points: 1025,
        directions: 16,
    }
    .with(Method::ImexEuler)
}

// 2-D, a = (1, 0.5), D = 0.1, h = 1: along x 1.2 (the 1-D case), along 45°
// (0.5·1 + 0.5·0.5 + 0.2)/((1.5)²/2) = 0.95/1.125.
fn imex_euler_2d() -> Scheme {
    Scalar {
        spacing: &[1.0, 1.0],
        velocity: &[1.0, 0.5],
        diffusivity: &[0.1, 0.1],
        source: 0.0,
        first: "upwind1",
        second: "central2",
        dissipation: None,
        points: 65,
        directions: 8,
    }
    .with(Method::ImexEuler)
}

#[test]
fn imex_euler_long_wave_limit_is_h_over_a_plus_two_d_over_a_squared_reference() {
    assert_limit(
        overall(&imex_euler_1d()).dt,
        1.2,
        "IMEX Euler 1-D, reference",
    );
    let s = imex_euler_2d();
    assert_limit(
        reference_direction(&s, &[1.0, 0.0]),
        1.2,
        "IMEX Euler 2-D along x, reference",
    );
    assert_limit(
        reference_direction(&s, &D45),
        0.95 / 1.125,
        "IMEX Euler 2-D along 45°, reference",
    );
}

#[test]
fn imex_euler_long_wave_limit_is_h_over_a_plus_two_d_over_a_squared_engine() {
    let e = engine(&imex_euler_1d());
    assert_limit(e.dt_max, 1.2, "IMEX Euler 1-D, engine");
    let e = engine(&imex_euler_2d());
    assert_limit(
        engine_direction(&e, &[1.0, 0.0]),
        1.2,
        "IMEX Euler 2-D along x, engine",
    );
    assert_limit(
        engine_direction(&e, &D45),
        0.95 / 1.125,
        "IMEX Euler 2-D along 45°, engine",
    );
}

// ---------------------------------------------------------------------------
// Heun + central2 + 4th-order dissipation σ = 1e-6 (s = 1, h = 1):
// z = Δt(−i s sin θ/h − σ s sin⁴(θ/2)/h) = −x + iy with y = ν sin θ,
// x = νσ sin⁴(θ/2). R(z) = 1 + z + z²/2, |R(iy)|² = 1 + y⁴/4 and
// ∂|R|²/∂x at x = 0 is −2 Re(conj R(iy)(1 + iy)) = −2(1 + y²/2), so
// |R|² = 1 + y⁴/4 − 2x(1 + y²/2) + O(x²). Stable iff y⁴/4 ≤ 2x(1 + y²/2):
// ν³ · 16cos⁴(θ/2) ≤ 8σ(1 + …), whose infimum over θ is θ → 0:
// ν³ ≤ σ/2, Δt_max = (h/s)(σ/2)^{1/3} (a long-wave limit; common practice for
// the stabilisation of central schemes by high-order dissipation).
fn heun_dissipation() -> Scheme {
    Scalar {
        spacing: &[1.0],
        velocity: &[1.0],
        diffusivity: &[0.0],
        source: 0.0,
        first: "central2",
        second: "central2",
        dissipation: Some(Dissipation {
            order: 4,
            strength: 1e-6,
        }),
        points: 1025,
        directions: 16,
    }
    .with(heun())
}

#[test]
fn heun_with_fourth_order_dissipation_limit_is_cube_root_of_half_sigma_reference() {
    let r = overall(&heun_dissipation());
    assert_limit(
        r.dt,
        (0.5e-6f64).cbrt(),
        &format!("Heun + dissipation, reference {r:?}"),
    );
}

#[test]
fn heun_with_fourth_order_dissipation_limit_is_cube_root_of_half_sigma_engine() {
    let e = engine(&heun_dissipation());
    assert_eq!(e.kind, EngineKind::Bounded);
    assert_limit(e.dt_max, (0.5e-6f64).cbrt(), "Heun + dissipation, engine");
}

/// The overall cases of this module with their closed-form limits.
pub fn cases() -> Vec<(&'static str, Scheme, f64)> {
    vec![
        ("FTCS 1-D", ftcs_1d(), 0.2),
        ("FTCS 2-D", ftcs_2d(), 0.15625),
        ("IMEX Euler 1-D", imex_euler_1d(), 1.2),
        ("Heun + dissipation", heun_dissipation(), (0.5e-6f64).cbrt()),
    ]
}
