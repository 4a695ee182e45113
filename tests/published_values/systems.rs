//! Systems: the linearised Euler case of the benchmark peer, acoustics with
//! characteristic and Rusanov upwinding (LeVeque 2002), a user-defined linear
//! system, and the semi-discrete dispersion relations of the symbols.

use super::*;
use crate::support::*;
use std::f64::consts::{PI, SQRT_2};

#[test]
fn characteristic_and_rusanov_upwinding_give_courant_one_for_acoustics() {
    // LeVeque (2002): first-order upwinding of a hyperbolic system by characteristic
    // decomposition, and the local Lax–Friedrichs (Rusanov) flux, are stable with
    // forward Euler iff ρ(A) Δt/h ≤ 1. Acoustics with c = 1 and mean flow 0.5 has
    // speeds 1.5 and −0.5: ν_max = 1 in the reference speed |U| + c.
    for upwind in ["characteristic", "rusanov"] {
        let text = format!(
            r#"
[grid]
spacing = [0.1]
[model]
kind = "acoustics"
sound_speed = 1.0
density = 1.2
velocity = [0.5]
[space]
first = "upwind1"
upwind = "{upwind}"
[time]
method = "euler"
courant = 0.5
[scan]
analyses = ["radius", "limit"]
points = [65]
"#
        );
        let (c, r) = run(&text);
        assert_close(
            c.problem.system.reference_speed,
            1.5,
            4.0 * EPS,
            "s = |U| + c",
        );
        assert_close(
            c.problem.courant_of(dt_max(&r)).unwrap(),
            1.0,
            1e-9,
            &format!("{upwind}: ν_max"),
        );
    }
}

/// Fourth-order modified wavenumbers of the peer case and its closed-form limit:
/// μ = −i{u·κ, u·κ, u·κ ± c|κ|} with κ_d = m(θ_d)/h_d; f = |u·κ| + c|κ| is convex in
/// κ over the box |κ_d| ≤ M, so its maximum is at a corner: (|u_x| + |u_y| + c√2) M.
#[test]
fn peer_euler_2d_courant_limit_matches_closed_form_and_a_fine_search() {
    // Linearised Euler, acoustic speeds u·n ± c (common practice); RK4 imaginary
    // limit 2√2 (Hairer & Wanner II): Δt_max = 2√2 / max_θ(|u·κ| + c|κ|).
    let (rho, p, gamma): (f64, f64, f64) = (1.0, 0.7142857142857143, 1.4);
    let (ux, uy): (f64, f64) = (0.5, 0.2);
    let c = (gamma * p / rho).sqrt();
    let s = (ux * ux + uy * uy).sqrt() + c;
    let (m, at) = c4_max();
    let closed = s * 2.0 * SQRT_2 / ((ux + uy + c * SQRT_2) * m);
    assert_close(
        closed,
        1.4999401157,
        quoted(1.4999401157, 10),
        "closed form vs published",
    );
    // An independent fine search over θ: scan, then coordinate-wise golden search.
    let f = |tx: f64, ty: f64| {
        let (kx, ky) = (c4(tx), c4(ty));
        (ux * kx + uy * ky).abs() + c * (kx * kx + ky * ky).sqrt()
    };
    let n = 400;
    let node = |i: usize| -PI + 2.0 * PI * i as f64 / n as f64;
    let (mut bx, mut by, mut best) = (0.0, 0.0, 0.0);
    for i in 0..=n {
        for j in 0..=n {
            let v = f(node(i), node(j));
            if v > best {
                (bx, by, best) = (node(i), node(j), v);
            }
        }
    }
    let h = 2.0 * PI / n as f64;
    for _ in 0..4 {
        bx = golden_max(|x| f(x, by), bx - h, bx + h).0;
        by = golden_max(|y| f(bx, y), by - h, by + h).0;
    }
    let searched = s * 2.0 * SQRT_2 / f(bx, by);
    assert_close(searched, closed, 4.0 * EPS, "fine search vs closed form");
    // The engine, from the case text.
    let (case, r) = run(PEER_EULER);
    assert_close(
        case.problem.system.reference_speed,
        s,
        4.0 * EPS,
        "s = |u| + c",
    );
    let courant = case.problem.courant_of(dt_max(&r)).unwrap();
    assert_close(courant, closed, 1e-9, "peer Euler Courant limit");
    let w = &r.limit.as_ref().unwrap().wavevector;
    assert_close(
        w[0].abs(),
        at,
        extremum_position_tol(),
        "worst |θx| at the C4 peak",
    );
    assert_close(
        w[1].abs(),
        at,
        extremum_position_tol(),
        "worst |θy| at the C4 peak",
    );
    assert!(
        w[0] * w[1] > 0.0,
        "u_x, u_y > 0: both components of one sign, {w:?}"
    );
}

/// Size of the rounding in an evaluated symbol and its eigenvalues: ‖L‖_F plus
/// Σ_d ‖A_d‖_F Σ_j|w_j| / h_d (each stencil sum is rounded at that scale).
fn symbol_scale(sym: &[C64], case: &kgain::case::Case, weight_sum: f64) -> f64 {
    let norm = sym.iter().map(|z| z.norm_sqr()).sum::<f64>().sqrt();
    let terms: f64 = case
        .problem
        .system
        .flux
        .iter()
        .zip(&case.problem.spacing)
        .map(|(a, h)| a.norm() * weight_sum / h)
        .sum();
    norm + terms
}

#[test]
fn euler_symbol_eigenvalues_follow_the_dispersion_relation_with_modified_wavenumbers() {
    // common practice: the linearised Euler equations have ω = u·k (entropy and
    // vorticity) and ω = u·k ± c|k| (acoustic); the semi-discrete symbol has the
    // same with k replaced by the modified wavenumbers κ_d = m(θ_d)/h_d, μ = −iω.
    let text = PEER_EULER.replace("spacing = [1.0, 1.0]", "spacing = [1.0, 0.5]");
    let case = case(&text);
    let op = kgain::operator::Operator::assemble(
        &case.problem.system,
        &case.problem.spacing,
        &case.problem.space,
    )
    .unwrap();
    let (ux, uy, c) = (0.5, 0.2, (1.4f64 * 0.7142857142857143).sqrt());
    for th in [
        [0.0, 0.0],
        [PI, -PI],
        [0.3, 1.1],
        [-2.0, 0.7],
        [1.7974775, 1.7974775],
        [3.0, -0.01],
    ] {
        let (kx, ky) = (c4(th[0]) / 1.0, c4(th[1]) / 0.5);
        let adv = ux * kx + uy * ky;
        let k = (kx * kx + ky * ky).sqrt();
        let want: Vec<C64> = [adv, adv, adv + c * k, adv - c * k]
            .iter()
            .map(|w| C64::new(0.0, -w))
            .collect();
        let sym = op.symbol(&th);
        let got = kgain::linalg::eigenvalues(&sym, 4).unwrap();
        let d = spectrum_distance(&got, &want);
        let scale = symbol_scale(&sym, &case, 1.5);
        assert_close_to_scale(d, 0.0, 64.0 * EPS * 2.0, scale, &format!("θ = {th:?}"));
    }
}

#[test]
fn acoustics_3d_symbol_eigenvalues_follow_the_dispersion_relation() {
    // common practice: linear acoustics about a mean flow U has ω = U·k ± c|k| and
    // ω = U·k (twice in 3D); with C2, κ_d = sin(θ_d)/h_d.
    let text = r#"
[grid]
spacing = [1.0, 0.5, 2.0]
[model]
kind = "acoustics"
sound_speed = 2.0
density = 1.3
velocity = [0.3, -0.2, 0.1]
[time]
method = "rk4"
courant = 0.5
[scan]
analyses = ["radius", "limit"]
points = [9, 9, 9]
"#;
    let case = case(text);
    let h = [1.0, 0.5, 2.0];
    let u = [0.3, -0.2, 0.1];
    let op = kgain::operator::Operator::assemble(
        &case.problem.system,
        &case.problem.spacing,
        &case.problem.space,
    )
    .unwrap();
    for th in [
        [0.4, -1.2, 2.5],
        [PI / 2.0, PI / 2.0, PI / 2.0],
        [0.0, 0.0, 0.0],
        [-3.0, 0.1, 1.0],
    ] {
        let kap: Vec<f64> = (0..3).map(|d| th[d].sin() / h[d]).collect();
        let adv: f64 = (0..3).map(|d| u[d] * kap[d]).sum();
        let k = kap.iter().map(|x| x * x).sum::<f64>().sqrt();
        let want: Vec<C64> = [adv, adv, adv + 2.0 * k, adv - 2.0 * k]
            .iter()
            .map(|w| C64::new(0.0, -w))
            .collect();
        let sym = op.symbol(&th);
        let got = kgain::linalg::eigenvalues(&sym, 4).unwrap();
        let d = spectrum_distance(&got, &want);
        let scale = symbol_scale(&sym, &case, 1.0);
        assert_close_to_scale(d, 0.0, 64.0 * EPS * 2.0, scale, &format!("θ = {th:?}"));
    }
}

#[test]
fn linear_model_reference_speed_and_limit_follow_its_characteristic_speeds() {
    // A_x = diag(1, 0), A_y = diag(0, 2): the characteristic speed along n is
    // max(|n_x|, 2|n_y|), largest 2 (README, case file: s = largest speed over all
    // directions). With C2 the eigenvalues are −i sin θx and −2i sin θy (h = 1), so
    // RK4 gives Δt_max = 2√2/2 and ν_max = s Δt_max / h = 2√2 (Hairer & Wanner II).
    let text = r#"
[grid]
spacing = [1.0, 1.0]
[model]
kind = "linear"
variables = ["a", "b"]
flux = [[[1.0, 0.0], [0.0, 0.0]], [[0.0, 0.0], [0.0, 2.0]]]
[time]
method = "rk4"
courant = 1.0
[scan]
analyses = ["radius", "limit"]
points = [33, 33]
"#;
    let (c, r) = run(text);
    assert_close(c.problem.system.reference_speed, 2.0, 1e-9, "s");
    assert_close(dt_max(&r), SQRT_2, 1e-9, "Δt_max");
    assert_close(
        c.problem.courant_of(dt_max(&r)).unwrap(),
        2.0 * SQRT_2,
        1e-9,
        "ν_max",
    );
}
