//! Closed-form limits of hyperbolic schemes: unsplit 2-D Lax–Friedrichs and
//! Lax–Wendroff, a weakly unstable source, and classic calibration limits.

use super::{assert_limit, engine, engine_direction, reference_direction, D45};
use crate::compare::ABOVE;
use crate::engine::EngineKind;
use crate::handmade::{euler, heun, leapfrog, rk4, Scalar};
use crate::reference::{along_ray, overall};
use crate::scheme::{Method, Scheme};
use crate::search::Kind;

// ---------------------------------------------------------------------------
// Unsplit 2-D Lax–Friedrichs for scalar advection (the README's definition),
// G = ½(cos θx + cos θy) − i(νx sin θx + νy sin θy). Cauchy–Schwarz on both
// terms: |G|² ≤ ½(cx² + cy²) + |ν|²(sx² + sy²) = 1 + (sx² + sy²)(|ν|² − ½), so
// |ν|² ≤ ½ suffices; for |ν|² > ½ the long wave θ = ε ν/|ν| gives
// |G|² = 1 + ε²(|ν|² − ½) + O(ε⁴) > 1. Hence νx² + νy² ≤ ½ (the classic 2-D
// condition, as recalled from Strikwerda, Finite Difference Schemes and PDEs;
// re-derived here). With a = (1, 0.5), h = (1, 0.5): νx = νy = Δt,
// so Δt_max = ½. Along x: |G|² ≤ 1 ⇔ Δt² ≤ (3 + c)/(4(1 + c)), c = cos s,
// infimum at c → 1: Δt = √½. Along 45°: G = cos t − 2iΔt sin t, Δt ≤ ½.
fn lax_friedrichs_2d() -> Scheme {
    Scalar {
        spacing: &[1.0, 0.5],
        velocity: &[1.0, 0.5],
        diffusivity: &[0.0, 0.0],
        source: 0.0,
        first: "central2",
        second: "central2",
        dissipation: None,
        points: 65,
        directions: 8,
    }
    .with(Method::LaxFriedrichs)
}

#[test]
fn lax_friedrichs_2d_limit_is_nu_squared_sum_one_half_reference() {
    let s = lax_friedrichs_2d();
    assert_limit(overall(&s).dt, 0.5, "Lax–Friedrichs 2-D, reference");
    assert_limit(
        reference_direction(&s, &[1.0, 0.0]),
        0.5f64.sqrt(),
        "LF along x, reference",
    );
    assert_limit(
        reference_direction(&s, &D45),
        0.5,
        "LF along 45°, reference",
    );
}

#[test]
fn lax_friedrichs_2d_limit_is_nu_squared_sum_one_half_engine() {
    let e = engine(&lax_friedrichs_2d());
    assert_limit(e.dt_max, 0.5, "Lax–Friedrichs 2-D, engine");
    assert_limit(
        engine_direction(&e, &[1.0, 0.0]),
        0.5f64.sqrt(),
        "LF along x, engine",
    );
    assert_limit(engine_direction(&e, &D45), 0.5, "LF along 45°, engine");
}

// ---------------------------------------------------------------------------
// Unsplit 2-D Lax–Wendroff as the README defines it (with the ½ΣνdνeAdAe sinθd
// sinθe cross terms). Along x (θy = 0) it is the 1-D Lax–Wendroff scheme,
// |G|² = 1 − 4νx²(1 − νx²) sin⁴(θ/2), stable iff νx ≤ 1 (Strikwerda, from memory; the formula is re-derived by
// expanding |G|² directly):
// Δt = h_x/a_x = 1. Long waves bound the overall limit by the two-thirds law
// Δt ≤ (Σ_d |u_d/h_d|^{2/3})^{−3/2} (derived in `reference_errors`, seed 1611)
// = (1 + 0.5^{2/3})^{−3/2}; the overall limit is also computed by the
// independent reference, and the engine is compared with both.
fn lax_wendroff_2d() -> Scheme {
    Scalar {
        spacing: &[1.0, 1.0],
        velocity: &[1.0, 0.5],
        diffusivity: &[0.0, 0.0],
        source: 0.0,
        first: "central2",
        second: "central2",
        dissipation: None,
        points: 65,
        directions: 8,
    }
    .with(Method::LaxWendroff)
}

#[test]
fn lax_wendroff_2d_along_x_is_the_1d_courant_limit_reference() {
    let s = lax_wendroff_2d();
    assert_limit(
        reference_direction(&s, &[1.0, 0.0]),
        1.0,
        "LW along x, reference",
    );
    let r = overall(&s);
    assert!(
        r.kind == Kind::Bounded && r.dt <= 1.0 * (1.0 + ABOVE),
        "overall ≤ every ray: {r:?}"
    );
}

#[test]
fn lax_wendroff_2d_agrees_with_the_reference_search_engine() {
    let s = lax_wendroff_2d();
    let e = engine(&s);
    assert_limit(
        e.dt_max,
        overall(&s).dt,
        "LW 2-D overall, engine against reference",
    );
    assert_limit(engine_direction(&e, &[1.0, 0.0]), 1.0, "LW along x, engine");
    let two_thirds = (1.0 + 0.5f64.powf(2.0 / 3.0)).powf(-1.5);
    assert!(
        e.dt_max <= two_thirds * (1.0 + 1e-9),
        "engine {} above the long-wave bound {two_thirds}",
        e.dt_max
    );
}

// ---------------------------------------------------------------------------
// A weakly unstable source: q_t + q_x = 0.1 q_xx + εq, ε = 1e-3, central2, RK4.
// L(θ) = ε − 4D sin²(θ/2)/h² − i a sin θ/h has Re L > 0 exactly for
// sin²(θ/2) < ε/(4D), i.e. |θ| < 0.1: there |R(ΔtL)| ≈ e^{Δt Re L} > 1 for
// every Δt > 0 (every consistent method has R(z) = 1 + z + O(z²)). So the kind
// is none, and every ray (it starts at θ = 0) has an unstable segment: no
// direction may be reported stable.
fn weak_source() -> Scheme {
    Scalar {
        spacing: &[1.0],
        velocity: &[1.0],
        diffusivity: &[0.1],
        source: 1e-3,
        first: "central2",
        second: "central2",
        dissipation: None,
        points: 257,
        directions: 16,
    }
    .with(rk4())
}

#[test]
fn weak_source_growth_leaves_no_stable_time_step_reference() {
    let s = weak_source();
    assert_eq!(overall(&s).kind, Kind::None);
    assert_eq!(along_ray(&s, &[1.0], &overall(&s)).kind, Kind::None);
}

#[test]
fn weak_source_growth_leaves_no_stable_time_step_engine() {
    let e = engine(&weak_source());
    assert_eq!(e.kind, EngineKind::None, "overall kind (dt {})", e.dt_max);
    for (n, dt) in e.directions.iter().zip(&e.dt_by_direction) {
        let stable_somewhere = *dt > 0.0;
        assert!(
            !stable_somewhere,
            "direction {n:?} reported stable up to {dt}"
        );
    }
}

// ---------------------------------------------------------------------------
// Calibration: classic limits the engine should pass.
// RK4 + central2: eigenvalues −iν sin θ on the imaginary axis, RK4's imaginary
// interval is |y| ≤ 2√2 (Hairer & Wanner, Solving ODEs II; |R(iy)|² = 1 −
// y⁶/72 + y⁸/576 ≤ 1 ⇔ y² ≤ 8): ν ≤ 2√2. Leapfrog + central2: ζ² − 2iν sin θ ζ
// − 1 = 0 has |ζ| = 1 iff ν|sin θ| ≤ 1: ν ≤ 1 (common practice). Forward Euler +
// upwind1 in 2-D: at θ = (π, π), G = 1 − 2νx − 2νy ≥ −1 needs νx + νy ≤ 1, which
// also suffices (G is a convex combination of unimodular terms; LeVeque, Finite
// Volume Methods for Hyperbolic Problems, 2002). Heun + central2:
// |R(iy)|² = 1 + y⁴/4 > 1 for every y ≠ 0: none.
fn calibration(
    first: &str,
    spacing: &'static [f64],
    velocity: &'static [f64],
    method: Method,
) -> Scheme {
    Scalar {
        spacing,
        velocity,
        diffusivity: &[0.0, 0.0][..spacing.len()],
        source: 0.0,
        first,
        second: "central2",
        dissipation: None,
        points: if spacing.len() == 1 { 257 } else { 65 },
        directions: 8,
    }
    .with(method)
}

#[test]
fn classic_limits_pass_reference() {
    let rk = calibration("central2", &[1.0], &[1.0], rk4());
    assert_limit(overall(&rk).dt, 8f64.sqrt(), "RK4 + central2, reference");
    let lf = calibration("central2", &[1.0], &[1.0], leapfrog());
    assert_limit(overall(&lf).dt, 1.0, "leapfrog + central2, reference");
    let up = calibration("upwind1", &[1.0, 0.5], &[1.0, 0.5], euler());
    assert_limit(overall(&up).dt, 0.5, "Euler + upwind1 2-D, reference");
    let heun_central = calibration("central2", &[1.0], &[1.0], heun());
    assert_eq!(
        overall(&heun_central).kind,
        Kind::None,
        "Heun + central2, reference"
    );
}

#[test]
fn classic_limits_pass_engine() {
    let rk = engine(&calibration("central2", &[1.0], &[1.0], rk4()));
    assert_limit(rk.dt_max, 8f64.sqrt(), "RK4 + central2, engine");
    let lf = engine(&calibration("central2", &[1.0], &[1.0], leapfrog()));
    assert_limit(lf.dt_max, 1.0, "leapfrog + central2, engine");
    let up = engine(&calibration("upwind1", &[1.0, 0.5], &[1.0, 0.5], euler()));
    assert_limit(up.dt_max, 0.5, "Euler + upwind1 2-D, engine");
    let heun_central = engine(&calibration("central2", &[1.0], &[1.0], heun()));
    assert_eq!(
        heun_central.kind,
        EngineKind::None,
        "Heun + central2, engine"
    );
}

/// The overall cases of this module with their closed-form limits (NaN where
/// there is none: the limit comes from the reference search).
pub fn cases() -> Vec<(&'static str, Scheme, f64)> {
    vec![
        ("Lax-Friedrichs 2-D", lax_friedrichs_2d(), 0.5),
        ("Lax-Wendroff 2-D", lax_wendroff_2d(), f64::NAN),
        (
            "RK4 + central2",
            calibration("central2", &[1.0], &[1.0], rk4()),
            8f64.sqrt(),
        ),
        (
            "leapfrog + central2",
            calibration("central2", &[1.0], &[1.0], leapfrog()),
            1.0,
        ),
        (
            "Euler + upwind1 2-D",
            calibration("upwind1", &[1.0, 0.5], &[1.0, 0.5], euler()),
            0.5,
        ),
    ]
}
