//! Stability limits of classic schemes for scalar advection and diffusion in 1, 2
//! and 3 dimensions (Strikwerda; LeVeque 2002; common practice), with the worst
//! wavevector and direction where they are meaningful.

use super::*;
use crate::support::*;
use std::f64::consts::{FRAC_PI_2, PI, SQRT_2};

#[test]
fn rk4_central2_advection_limit_is_two_root_two_at_half_pi() {
    // Hairer & Wanner II: RK4 + C2, 1D, ν ≤ 2√2; the largest |sin θ| is at θ = ±π/2.
    let (c, r) = run(&advection(
        &[1.0],
        &[1.0],
        "central2",
        "rk4",
        "courant = 1.0",
        &[33],
    ));
    let dt = dt_max(&r);
    assert_close(
        c.problem.courant_of(dt).unwrap(),
        2.0 * SQRT_2,
        1e-12,
        "ν_max",
    );
    let th = r.limit.as_ref().unwrap().wavevector[0];
    assert_close(th.abs(), FRAC_PI_2, extremum_position_tol(), "worst |θ|");
    // The case's Courant number 1 is inside the limit.
    assert!(r.radius.as_ref().unwrap().stable);
}

#[test]
fn rk4_central4_advection_limit_is_two_root_two_over_the_c4_maximum() {
    // Hairer & Wanner II for 2√2: ν ≤ 2√2/1.37222 = 2.06120 (computed); here from the closed-form
    // maximum of (8 sin θ − sin 2θ)/6. Speed and spacing are not 1, to exercise
    // the scaling ν = a Δt/h.
    let (m, at) = c4_max();
    let want = 2.0 * SQRT_2 / m;
    assert_close(
        want,
        2.06120,
        quoted(2.06120, 5),
        "closed form vs published",
    );
    let (c, r) = run(&advection(
        &[0.25],
        &[-3.0],
        "central4",
        "rk4",
        "courant = 1.0",
        &[65],
    ));
    let dt = dt_max(&r);
    assert_close(dt, want * 0.25 / 3.0, 1e-9, "Δt_max = ν_max h/|a|");
    assert_close(c.problem.courant_of(dt).unwrap(), want, 1e-9, "ν_max");
    let th = r.limit.as_ref().unwrap().wavevector[0];
    assert_close(th.abs(), at, extremum_position_tol(), "worst |θ|");
}

#[test]
fn forward_euler_upwind_2d_limit_is_courant_sum_at_most_one() {
    // LeVeque (2002): unsplit forward Euler + first-order upwind in 2D is stable
    // iff |ν_x| + |ν_y| ≤ 1, ν_d = |a_d| Δt/h_d. With a = (3, −4), h = (1, 2):
    // Δt_max = 1/(3/1 + 4/2) = 1/5; s = |a| = 5, h = 1, so ν_max = 1.
    // G = 1 − ν_x(1 − e^{−iθx}) − ν_y(1 − e^{iθy}) (the y part upwinds the other
    // way) first leaves the unit disc along the whole antidiagonal θy = −θx.
    let text = advection(
        &[1.0, 2.0],
        &[3.0, -4.0],
        "upwind1",
        "euler",
        "courant = 0.9",
        &[33, 33],
    );
    let (c, r) = run(&text);
    let dt = dt_max(&r);
    assert_close(dt, 0.2, 1e-9, "Δt_max = 1/(|a_x|/h_x + |a_y|/h_y)");
    assert_close(
        c.problem.courant_of(dt).unwrap(),
        1.0,
        1e-9,
        "ν_max in the reference speed",
    );
    let w = &r.limit.as_ref().unwrap().wavevector;
    assert_close_to_scale(
        wrap_angle(w[0] + w[1]),
        0.0,
        extremum_position_tol(),
        PI,
        "worst θ on θy = −θx",
    );
    // By direction: along +x only a_x acts (h_x/|a_x| = 1/3), along +y only a_y
    // (h_y/|a_y| = 1/2), and the worst directions are the antidiagonal ones.
    let d = &r.limit.as_ref().unwrap().by_direction;
    let at_angle = |deg: f64| {
        let i = d
            .directions
            .iter()
            .position(|n| {
                (n[1].atan2(n[0]).to_degrees().rem_euclid(360.0) - deg).abs() <= 64.0 * EPS * 360.0
            })
            .unwrap_or_else(|| panic!("direction {deg}° is scanned"));
        d.dt[i]
    };
    assert_close(at_angle(0.0), 1.0 / 3.0, 1e-9, "limit along +x");
    assert_close(at_angle(90.0), 0.5, 1e-9, "limit along +y");
    assert_close(at_angle(135.0), 0.2, 1e-9, "limit along the antidiagonal");
    let worst = d.dt.iter().copied().fold(f64::INFINITY, f64::min);
    assert_close(worst, 0.2, 1e-9, "worst direction gives the overall limit");
    // At ν = 0.9 the scheme is stable and |G| peaks at θ = 0, where G = 1.
    let rad = r.radius.as_ref().unwrap();
    assert!(rad.stable);
    assert_close(rad.max, 1.0, 4.0 * EPS, "max |G| = G(0) = 1");
}

#[test]
fn leapfrog_central2_2d_limit_is_courant_sum_at_most_one() {
    // Strikwerda: leapfrog + C2 in 2D is stable iff |ν_x| + |ν_y| < 1 (the double
    // root at the limit is on the unit circle). With a = (0.6, 0.8), h = (1, 0.5):
    // ν_x + ν_y = (0.6 + 1.6) Δt, Δt_max = 1/2.2; s = 1, h = 0.5 so ν_max = 2/2.2.
    // The worst wavevector is θ = ±(π/2, π/2), direction 45° (or 225°).
    let text = advection(
        &[1.0, 0.5],
        &[0.6, 0.8],
        "central2",
        "leapfrog",
        "courant = 0.5",
        &[33, 33],
    );
    let (c, r) = run(&text);
    let dt = dt_max(&r);
    assert_close(dt, 1.0 / 2.2, 1e-9, "Δt_max = 1/(a_x/h_x + a_y/h_y)");
    assert_close(
        c.problem.courant_of(dt).unwrap(),
        2.0 / 2.2,
        1e-9,
        "ν_max in the reference speed",
    );
    let w = &r.limit.as_ref().unwrap().wavevector;
    assert_close(w[0].abs(), FRAC_PI_2, extremum_position_tol(), "worst |θx|");
    assert_close(w[1].abs(), FRAC_PI_2, extremum_position_tol(), "worst |θy|");
    assert!(
        w[0] * w[1] > 0.0,
        "worst θx and θy have the same sign: {w:?}"
    );
    let d = &r.limit.as_ref().unwrap().by_direction;
    let (imin, worst) =
        d.dt.iter().enumerate().fold(
            (0, f64::INFINITY),
            |b, (i, v)| if *v < b.1 { (i, *v) } else { b },
        );
    assert_close(
        worst,
        1.0 / 2.2,
        1e-9,
        "worst direction gives the overall limit",
    );
    let n = &d.directions[imin];
    let deg = n[1].atan2(n[0]).to_degrees().rem_euclid(180.0);
    assert_close(deg, 45.0, 1e-9, "worst direction is the diagonal");
    // Along +x only a_x acts: Δt = h_x/a_x.
    let i0 = d
        .directions
        .iter()
        .position(|n| n[1] == 0.0 && n[0] > 0.0)
        .unwrap();
    assert_close(d.dt[i0], 1.0 / 0.6, 1e-9, "limit along +x");
}

#[test]
fn forward_euler_diffusion_limit_is_diffusion_number_sum_at_most_half() {
    // common practice: forward Euler + C2 diffusion is stable iff Σ_d D Δt/h_d² ≤ ½.
    // D = 0.5, h = (1, 2): Δt_max = 1/(2·0.5·(1 + 1/4)) = 0.8, set at θ = (±π, ±π).
    // README (Output folder): r = Δt·D_max/h², h = min h_d: r_max = 0.8·0.5/1 = 0.4.
    let (c, r) = run(&diffusion(&[1.0, 2.0], "0.5", "euler", 0.1, &[33, 33]));
    let dt = dt_max(&r);
    assert_close(dt, 0.8, 1e-12, "Δt_max");
    let w = &r.limit.as_ref().unwrap().wavevector;
    assert_close(w[0].abs(), PI, 4.0 * EPS, "worst |θx| = π");
    assert_close(w[1].abs(), PI, 4.0 * EPS, "worst |θy| = π");
    let s = kgain::report::summary_json(&c.problem, &r);
    let r_max = s["limit"]["diffusion_number_max"]
        .as_f64()
        .expect("a diffusion number");
    assert_close(
        r_max,
        0.4,
        1e-12,
        "diffusion_number_max = Δt_max D_max / h_min²",
    );
    assert!(
        s["limit"]["courant_max"].is_null(),
        "no wave speed, no Courant number"
    );
}

#[test]
fn forward_euler_diffusion_limit_with_per_axis_diffusivities() {
    // common practice: Σ_d D_d Δt/h_d² ≤ ½. D = (0.2, 1.0), h = (1, 2):
    // Σ D_d/h_d² = 0.45, Δt_max = 1/0.9. D_max = 1 and h_min = 1 come from different
    // axes: r_max = Δt_max·1/1 = 1/0.9 (README definition).
    let (c, r) = run(&diffusion(
        &[1.0, 2.0],
        "[0.2, 1.0]",
        "euler",
        0.1,
        &[33, 33],
    ));
    let dt = dt_max(&r);
    assert_close(dt, 1.0 / 0.9, 1e-12, "Δt_max");
    let s = kgain::report::summary_json(&c.problem, &r);
    let r_max = s["limit"]["diffusion_number_max"]
        .as_f64()
        .expect("a diffusion number");
    assert_close(r_max, 1.0 / 0.9, 1e-12, "diffusion_number_max");
}

#[test]
fn forward_euler_diffusion_limit_in_three_dimensions() {
    // common practice: Σ_d D Δt/h_d² ≤ ½ in d = 3. D = 0.25, h = (1, 2, 0.5):
    // Σ 1/h_d² = 5.25, Δt_max = 1/(2·0.25·5.25); r_max = Δt_max·0.25/0.5².
    let (c, r) = run(&diffusion(
        &[1.0, 2.0, 0.5],
        "0.25",
        "euler",
        0.1,
        &[9, 9, 9],
    ));
    let dt = dt_max(&r);
    let want = 1.0 / (2.0 * 0.25 * 5.25);
    assert_close(dt, want, 1e-12, "Δt_max");
    assert_close(
        c.problem.diffusion_number_of(dt).unwrap(),
        want * 0.25 / 0.25,
        1e-12,
        "r_max",
    );
}

#[test]
fn theta_method_below_one_half_limits_the_diffusion_number() {
    // common practice (Strikwerda, θ-schemes for the heat equation): for θ < ½,
    // R(−x) = (1 − (1−θ)x)/(1 + θx) reaches −1 at x = 2/(1 − 2θ), so with C2
    // (max |μ| = 4D/h²) Δt_max = h²/(2D(1 − 2θ)). θ = ¼, D = 1, h = 1: Δt_max = 1.
    let text = diffusion(&[1.0], "1.0", "theta", 0.1, &[33])
        .replace("method = \"theta\"", "method = \"theta\"\ntheta = 0.25");
    let (_, r) = run(&text);
    assert_close(dt_max(&r), 1.0, 1e-12, "θ = ¼ diffusion limit");
    let text = text.replace("theta = 0.25", "theta = 0.5");
    let (_, r) = run(&text);
    assert_eq!(kind(&r), LimitKind::Unconditional, "θ = ½ is A-stable");
}

#[test]
fn heun_and_forward_euler_with_central_advection_have_no_stable_dt() {
    // Closed form: |R(iy)|² = 1 + y² (Euler), 1 + y⁴/4 (Heun) exceed 1 for every
    // y > 0, so with C2 (imaginary μ) no Δt > 0 is stable: kind "none", dt_max 0.
    for method in ["heun", "euler"] {
        let (c, r) = run(&advection(
            &[1.0, 1.0],
            &[1.0, 0.5],
            "central2",
            method,
            "courant = 0.1",
            &[33, 33],
        ));
        assert_eq!(kind(&r), LimitKind::None, "{method} + C2");
        let s = kgain::report::summary_json(&c.problem, &r);
        assert_eq!(s["limit"]["kind"], "none");
        assert_eq!(
            s["limit"]["dt_max"].as_f64(),
            Some(0.0),
            "{method}: dt_max is 0"
        );
        assert!(
            !r.radius.as_ref().unwrap().stable,
            "{method} is unstable at ν = 0.1"
        );
    }
}

#[test]
fn crank_nicolson_and_backward_euler_are_unconditional_for_advection_and_diffusion() {
    // common practice: both are A-stable; C2 advection gives imaginary μ and C2
    // diffusion negative real μ, so every Δt > 0 is stable (dt_max null).
    for method in ["crank-nicolson", "backward-euler"] {
        let (c, r) = run(&advection(
            &[1.0, 2.0],
            &[1.0, -0.5],
            "central2",
            method,
            "courant = 4.0",
            &[33, 33],
        ));
        assert_eq!(
            kind(&r),
            LimitKind::Unconditional,
            "{method} + C2 advection"
        );
        let s = kgain::report::summary_json(&c.problem, &r);
        assert_eq!(s["limit"]["kind"], "unconditional");
        assert!(s["limit"]["dt_max"].is_null(), "{method}: dt_max is null");
        let rad = r.radius.as_ref().unwrap();
        assert!(rad.stable, "{method} stable at ν = 4");
        let (_, r) = run(&diffusion(&[1.0, 2.0], "1.5", method, 30.0, &[33, 33]));
        assert_eq!(
            kind(&r),
            LimitKind::Unconditional,
            "{method} + C2 diffusion"
        );
        assert!(r.radius.as_ref().unwrap().stable);
    }
}

#[test]
fn rk4_central2_3d_limit_is_two_root_two_over_the_sum_of_axis_rates() {
    // From the C2 modified wavenumber: μ = −i Σ_d (a_d/h_d) sin θ_d, largest at
    // θ = (π/2, π/2, π/2) for positive speeds, so Δt_max = 2√2 / Σ_d a_d/h_d.
    let (a, h) = ([0.3, 0.4, 1.2], [1.0, 0.5, 2.0]);
    let (_, r) = run(&advection(
        &h,
        &a,
        "central2",
        "rk4",
        "courant = 0.5",
        &[9, 9, 9],
    ));
    let rate: f64 = a.iter().zip(&h).map(|(a, h)| a / h).sum();
    assert_close(dt_max(&r), 2.0 * SQRT_2 / rate, 1e-9, "3-D RK4 + C2");
    for th in &r.limit.as_ref().unwrap().wavevector {
        assert_close(
            th.abs(),
            FRAC_PI_2,
            extremum_position_tol(),
            "worst |θ_d| = π/2",
        );
    }
}

#[test]
fn forward_euler_upwind_3d_limit_is_courant_sum_at_most_one() {
    // LeVeque (2002): the unsplit donor-cell upwind method is stable iff
    // Σ_d |a_d| Δt/h_d ≤ 1.
    let (a, h) = ([1.0, -2.0, 0.5], [1.0, 2.0, 0.25]);
    let (_, r) = run(&advection(
        &h,
        &a,
        "upwind1",
        "euler",
        "courant = 0.5",
        &[9, 9, 9],
    ));
    let rate: f64 = a.iter().zip(&h).map(|(a, h)| a.abs() / h).sum();
    assert_close(dt_max(&r), 1.0 / rate, 1e-9, "3-D forward Euler + upwind1");
}

#[test]
fn second_order_dissipation_of_strength_two_turns_central_into_upwind() {
    // 1 − e^{−iθ} = i sin θ + 2 sin²(θ/2): first-order upwind is the central
    // difference plus −σ (s/h) sin²(θ/2) with σ = 2 (LeVeque 2002, upwind as
    // centred flux plus numerical diffusion). Forward Euler is then stable iff ν ≤ 1.
    let text = advection(&[0.5], &[2.0], "central2", "euler", "courant = 0.5", &[65]).replace(
        "[time]",
        "dissipation = { order = 2, strength = 2.0 }\n\n[time]",
    );
    let (c, r) = run(&text);
    assert_close(
        c.problem.courant_of(dt_max(&r)).unwrap(),
        1.0,
        1e-9,
        "ν_max = 1 as for upwind1",
    );
    let up = case(&advection(
        &[0.5],
        &[2.0],
        "upwind1",
        "euler",
        "courant = 0.5",
        &[65],
    ));
    let ops = [&c, &up].map(|k| k.problem.operator());
    for k in 0..=16 {
        let th = [-PI + 2.0 * PI * k as f64 / 16.0];
        let (a, b) = (ops[0].symbol(&th)[0], ops[1].symbol(&th)[0]);
        assert_close_to_scale(
            (a - b).norm(),
            0.0,
            16.0 * EPS,
            8.0,
            &format!("symbols at θ = {th:?}"),
        );
    }
}
