//! The first-exit limit against a brute-force scan in Δt: just below Δt_max the
//! spectral radius stays within 1 + tolerance on a fine grid, just above it does
//! not (the rerun goes through `time.dt` overrides, as `--set` does).

use super::*;
use crate::support::*;

/// Runs the case for its limit, then reruns it at 0.999·Δt_max and 1.001·Δt_max
/// (radius only, on `fine_points`) through `time.dt` overrides: the spectral radius
/// must be within 1 + tolerance below the limit and exceed it above.
fn assert_limit_brackets_the_radius_threshold(text: &str, fine_points: &str) {
    let (_, r) = run(text);
    let dt = dt_max(&r);
    for (factor, should_be_stable) in [(0.999, true), (1.001, false)] {
        let c = case_with(
            text,
            &[
                format!("time.dt={:?}", factor * dt),
                format!("scan.points={fine_points}"),
                "scan.analyses=[\"radius\"]".to_string(),
            ],
        );
        assert_close(
            c.problem.dt(),
            factor * dt,
            4.0 * EPS,
            "the override sets Δt",
        );
        let rad = analyse(&c).radius.expect("radius ran");
        let tol = c.plan.tolerance;
        assert_eq!(
            rad.max <= 1.0 + tol,
            should_be_stable,
            "at {factor}·Δt_max = {}: max |λ| = {:.15} (tolerance {tol:e})",
            factor * dt,
            rad.max
        );
        assert_eq!(rad.stable, should_be_stable);
    }
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_rk4_central4() {
    let text = advection(&[1.0], &[1.0], "central4", "rk4", "courant = 1.0", &[65]);
    assert_limit_brackets_the_radius_threshold(&text, "[4097]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_ssprk3_upwind3() {
    // Biased stencil: eigenvalues off both axes, so the exit radius of a general
    // direction of the SSP RK3 region is exercised.
    let text = advection(&[1.0], &[1.0], "upwind3", "ssprk3", "courant = 1.0", &[65]);
    assert_limit_brackets_the_radius_threshold(&text, "[4097]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_peer_euler() {
    assert_limit_brackets_the_radius_threshold(PEER_EULER, "[129, 129]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_leapfrog_2d() {
    let text = advection(
        &[1.0, 0.5],
        &[0.6, 0.8],
        "central2",
        "leapfrog",
        "courant = 0.5",
        &[33, 33],
    );
    assert_limit_brackets_the_radius_threshold(&text, "[33, 33]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_ab3_upwind2_2d() {
    // A multistep method with eigenvalues in general directions.
    let text = advection(
        &[1.0, 1.0],
        &[0.7, -0.4],
        "upwind2",
        "ab3",
        "courant = 0.1",
        &[33, 33],
    );
    assert_limit_brackets_the_radius_threshold(&text, "[129, 129]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_rk4_advection_diffusion() {
    // Advection and diffusion together put the eigenvalues in the open left
    // half-plane, away from both axes.
    let text = advection(
        &[1.0, 0.5],
        &[1.0, -0.5],
        "central4",
        "rk4",
        "courant = 0.5",
        &[33, 33],
    )
    .replace(
        "velocity = [1.0, -0.5]",
        "velocity = [1.0, -0.5]\ndiffusivity = 0.3",
    );
    assert_limit_brackets_the_radius_threshold(&text, "[129, 129]");
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_ab2_upwind1() {
    let text = advection(&[1.0], &[1.0], "upwind1", "ab2", "courant = 0.1", &[65]);
    assert_limit_brackets_the_radius_threshold(&text, "[4097]");
}

/// The overall limit is a minimum over all wavevectors, the directional ones over
/// rays of them, so Δt_max ≤ min over directions (up to the refinement accuracy).
#[track_caller]
fn assert_overall_within_directional(text: &str) {
    let (_, r) = run(text);
    let overall = r.limit.as_ref().unwrap().dt_max;
    let d = &r.limit.as_ref().unwrap().by_direction;
    let worst = d.dt.iter().copied().fold(f64::INFINITY, f64::min);
    assert!(
        overall <= worst * (1.0 + 1e-9),
        "overall Δt_max = {overall:e} exceeds the directional minimum {worst:e}"
    );
}

#[test]
fn overall_limit_never_exceeds_the_smallest_directional_limit() {
    assert_overall_within_directional(PEER_EULER);
    assert_overall_within_directional(&advection(
        &[1.0, 0.5],
        &[0.6, -0.8],
        "upwind3",
        "rk4",
        "courant = 0.5",
        &[33, 33],
    ));
    assert_overall_within_directional(&advection(
        &[1.0, 2.0, 0.5],
        &[0.3, 0.2, -0.1],
        "compact4",
        "ssprk3",
        "courant = 0.5",
        &[9, 9, 9],
    ));
}

#[test]
fn coarse_scan_does_not_report_a_bounded_scheme_as_unconditional() {
    // RK4 + C2, a = (1, 0.5), h = 1: Δt_max = 2√2/1.5 at θ = (π/2, π/2), which lies
    // between the nodes of a 3-point scan (Hairer & Wanner II).
    let text = advection(
        &[1.0, 1.0],
        &[1.0, 0.5],
        "central2",
        "rk4",
        "courant = 0.5",
        &[3, 3],
    );
    assert_overall_within_directional(&text);
    let (_, r) = run(&text);
    assert_close(
        dt_max(&r),
        2.0 * std::f64::consts::SQRT_2 / 1.5,
        1e-9,
        "Δt_max",
    );
}

#[test]
fn first_exit_limit_brackets_brute_force_scan_for_upwinded_euler_system() {
    // Characteristic upwinding of the 4×4 Euler flux: non-normal symbol, eigenvalues
    // off both axes.
    let text = PEER_EULER
        .replace("first = \"central4\"", "first = \"upwind3\"")
        .replace("method = \"rk4\"", "method = \"ssprk3\"")
        .replace("points = [129, 129]", "points = [33, 33]");
    assert_limit_brackets_the_radius_threshold(&text, "[129, 129]");
}
