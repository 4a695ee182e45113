//! Stability intervals of the time methods on the imaginary and negative real
//! axes (Hairer & Wanner, Solving ODEs I and II; Gottlieb & Shu, Math. Comp. 67,
//! 1998), and the limits they set for advection, diffusion and source terms.

use super::*;
use crate::support::*;
use kgain::time;
use std::f64::consts::{FRAC_PI_2, PI, SQRT_2};

#[test]
fn explicit_runge_kutta_imaginary_axis_limits_follow_from_their_polynomials() {
    // |R(iy)|² − 1: Euler y², Heun y⁴/4 (both > 0 for every y > 0: limit 0);
    // SSP RK3 −y⁴/12 + y⁶/36 (root y² = 3); RK4 −y⁶/72 + y⁸/576 (root y² = 8).
    // Hairer & Wanner II; Gottlieb & Shu (1998) for SSP RK3.
    assert_eq!(time::builtin("euler").unwrap().imaginary_limit(), 0.0);
    assert_eq!(time::builtin("heun").unwrap().imaginary_limit(), 0.0);
    let ssp = time::builtin("ssprk3").unwrap().imaginary_limit();
    assert_close(ssp, 3f64.sqrt(), 16.0 * EPS, "SSP RK3 imaginary limit √3");
    let rk4 = time::builtin("rk4").unwrap().imaginary_limit();
    assert_close(rk4, 2.0 * SQRT_2, 16.0 * EPS, "RK4 imaginary limit 2√2");
}

#[test]
fn explicit_runge_kutta_real_axis_limits_follow_from_their_polynomials() {
    // Euler and Heun: R(−2) = −1 and 1 resp., limit 2. SSP RK3: R(−x) decreases
    // monotonically and reaches −1 at 2.5127453; RK4: R(−x) = 1 again at 2.7852935
    // (x³ − 4x² + 12x − 24 = 0). Values computed from that cubic; Hairer & Wanner II.
    let ssp_root = bisect(|x| taylor_r(3, -x) + 1.0, 2.0, 3.0);
    let rk4_root = bisect(|x| taylor_r(4, -x) - 1.0, 2.0, 3.0);
    assert_close(
        ssp_root,
        2.5127453,
        quoted(2.5127453, 7),
        "SSP RK3 root vs published",
    );
    assert_close(
        rk4_root,
        2.7852935,
        quoted(2.7852935, 7),
        "RK4 root vs published",
    );
    for (name, want) in [
        ("euler", 2.0),
        ("heun", 2.0),
        ("ssprk3", ssp_root),
        ("rk4", rk4_root),
    ] {
        let got = time::builtin(name).unwrap().real_limit();
        assert_close(
            got,
            want,
            64.0 * EPS,
            &format!("{name} negative real-axis limit"),
        );
    }
}

#[test]
fn runge_kutta_intervals_set_the_limits_of_advection_and_diffusion_cases() {
    // Advection with C2 (a = h = 1): max |μ| = 1 on the imaginary axis, so
    // Δt_max = imaginary limit. Diffusion with C2 (D = h = 1): μ ∈ [−4, 0], so
    // Δt_max = real limit / 4 (common practice; limits from Hairer & Wanner II).
    let ssp_real = bisect(|x| taylor_r(3, -x) + 1.0, 2.0, 3.0);
    let rk4_real = bisect(|x| taylor_r(4, -x) - 1.0, 2.0, 3.0);
    for (name, imag, real) in [
        ("ssprk3", 3f64.sqrt(), ssp_real),
        ("rk4", 2.0 * SQRT_2, rk4_real),
    ] {
        let (_, r) = run(&advection(
            &[1.0],
            &[1.0],
            "central2",
            name,
            "courant = 0.5",
            &[33],
        ));
        assert_close(dt_max(&r), imag, 1e-12, &format!("{name} + C2 advection"));
        let (_, r) = run(&diffusion(&[1.0], "1.0", name, 0.1, &[33]));
        assert_close(
            dt_max(&r),
            real / 4.0,
            1e-12,
            &format!("{name} + C2 diffusion"),
        );
    }
    for name in ["euler", "heun"] {
        let (_, r) = run(&diffusion(&[1.0], "1.0", name, 0.1, &[33]));
        assert_close(
            dt_max(&r),
            0.5,
            1e-12,
            &format!("{name} + C2 diffusion: 2/4"),
        );
    }
}

#[test]
fn adams_bashforth_and_leapfrog_intervals_match_their_boundary_loci() {
    // Textbook coefficients (common practice; Hairer & Wanner I):
    // AB2: ρ = ζ² − ζ, σ = (3ζ − 1)/2; AB3: ρ = ζ³ − ζ², σ = (23ζ² − 16ζ + 5)/12;
    // leapfrog: ρ = ζ² − 1, σ = 2ζ.
    let ab2 = ([0.0, -1.0, 1.0], [-0.5, 1.5, 0.0]);
    let ab3 = (
        [0.0, 0.0, -1.0, 1.0],
        [5.0 / 12.0, -16.0 / 12.0, 23.0 / 12.0, 0.0],
    );
    let lf = ([-1.0, 0.0, 1.0], [0.0, 2.0, 0.0]);
    // Real-axis limits: the locus at ω = π, z = ρ(−1)/σ(−1): AB2 −1, AB3 −6/11.
    let ab2_real = -locus(&ab2.0, &ab2.1, PI).re;
    let ab3_real = -locus(&ab3.0, &ab3.1, PI).re;
    assert_close(ab2_real, 1.0, 4.0 * EPS, "AB2 real interval (−1, 0)");
    assert_close(
        ab3_real,
        6.0 / 11.0,
        4.0 * EPS,
        "AB3 real interval (−6/11, 0)",
    );
    // AB3 imaginary limit: where the locus crosses the imaginary axis away from 0.
    let omega = bisect(|w| locus(&ab3.0, &ab3.1, w).re, 1.3, 1.6);
    let ab3_imag = locus(&ab3.0, &ab3.1, omega).im;
    let get = |n: &str| time::builtin(n).unwrap();
    assert_close(get("ab2").real_limit(), ab2_real, 1e-9, "AB2 real limit");
    assert_eq!(
        get("ab2").imaginary_limit(),
        0.0,
        "AB2 is unstable on the imaginary axis"
    );
    assert_close(get("ab3").real_limit(), ab3_real, 1e-9, "AB3 real limit");
    assert_close(
        get("ab3").imaginary_limit(),
        ab3_imag,
        1e-9,
        "AB3 imaginary limit",
    );
    // Leapfrog: the locus is i sin ω, the segment [−i, i] (Hairer & Wanner, Solving ODEs II).
    let lf_top = locus(&lf.0, &lf.1, FRAC_PI_2);
    assert_close(lf_top.im, 1.0, 4.0 * EPS, "leapfrog locus reaches i");
    assert_close(
        get("leapfrog").imaginary_limit(),
        1.0,
        1e-9,
        "leapfrog imaginary limit",
    );
    assert_eq!(
        get("leapfrog").real_limit(),
        0.0,
        "leapfrog is unstable on the real axis"
    );
}

#[test]
fn a_stable_methods_have_unbounded_intervals_on_both_axes() {
    // Backward Euler, Crank–Nicolson, BDF2 and the θ-method with θ ≥ ½ are
    // A-stable (Hairer & Wanner II).
    let mut methods: Vec<_> = ["backward-euler", "crank-nicolson", "bdf2"]
        .iter()
        .map(|n| time::builtin(n).unwrap())
        .collect();
    for th in [0.5, 0.75, 1.0] {
        methods.push(time::methods::theta(th).unwrap());
    }
    for m in &methods {
        assert_eq!(
            m.imaginary_limit(),
            f64::INFINITY,
            "{} imaginary axis",
            m.name
        );
        assert_eq!(m.real_limit(), f64::INFINITY, "{} real axis", m.name);
    }
}

#[test]
fn multistep_intervals_set_the_limits_of_advection_and_diffusion_cases() {
    // As for Runge–Kutta: C2 advection (a = h = 1) is limited by the imaginary
    // interval, C2 diffusion (D = h = 1) by a quarter of the real one.
    let ab3 = (
        [0.0, 0.0, -1.0, 1.0],
        [5.0 / 12.0, -16.0 / 12.0, 23.0 / 12.0, 0.0],
    );
    let omega = bisect(|w| locus(&ab3.0, &ab3.1, w).re, 1.3, 1.6);
    let ab3_imag = locus(&ab3.0, &ab3.1, omega).im;
    let (_, r) = run(&advection(
        &[1.0],
        &[1.0],
        "central2",
        "ab3",
        "courant = 0.5",
        &[33],
    ));
    assert_close(dt_max(&r), ab3_imag, 1e-9, "AB3 + C2 advection");
    let (_, r) = run(&diffusion(&[1.0], "1.0", "ab3", 0.1, &[33]));
    assert_close(dt_max(&r), 6.0 / 11.0 / 4.0, 1e-9, "AB3 + C2 diffusion");
    let (_, r) = run(&diffusion(&[1.0], "1.0", "ab2", 0.1, &[33]));
    assert_close(dt_max(&r), 0.25, 1e-9, "AB2 + C2 diffusion: 1/4");
    // Leapfrog + C2 advection: ν ≤ 1 (Strikwerda); AB2 on the imaginary axis and
    // leapfrog on the negative real axis amplify for every Δt > 0.
    let (c, r) = run(&advection(
        &[0.5],
        &[2.0],
        "central2",
        "leapfrog",
        "courant = 0.5",
        &[33],
    ));
    assert_close(
        c.problem.courant_of(dt_max(&r)).unwrap(),
        1.0,
        1e-9,
        "leapfrog + C2: ν ≤ 1",
    );
    let (_, r) = run(&advection(
        &[1.0],
        &[1.0],
        "central2",
        "ab2",
        "courant = 0.5",
        &[33],
    ));
    assert_eq!(kind(&r), LimitKind::None, "AB2 + C2 advection");
    let (_, r) = run(&diffusion(&[1.0], "1.0", "leapfrog", 0.1, &[33]));
    assert_eq!(kind(&r), LimitKind::None, "leapfrog + C2 diffusion");
}

#[test]
fn bdf2_is_unconditionally_stable_for_advection_and_diffusion() {
    // BDF2 is A-stable (Hairer & Wanner II).
    let (_, r) = run(&advection(
        &[1.0, 1.0],
        &[0.3, -0.7],
        "central4",
        "bdf2",
        "courant = 5.0",
        &[33, 33],
    ));
    assert_eq!(kind(&r), LimitKind::Unconditional, "BDF2 + C4 advection");
    assert!(r.radius.as_ref().unwrap().stable, "BDF2 stable at ν = 5");
    let (_, r) = run(&diffusion(&[1.0, 0.5], "2.0", "bdf2", 10.0, &[33, 33]));
    assert_eq!(kind(&r), LimitKind::Unconditional, "BDF2 + C2 diffusion");
    assert!(r.radius.as_ref().unwrap().stable, "BDF2 stable at r = 80");
}

#[test]
fn butcher_tableau_of_classical_rk4_reproduces_the_rk4_limit() {
    // Classical RK4 tableau (Hairer & Wanner I); R(z) = Σ_{j≤4} z^j/j!, so with C2
    // advection ν_max = 2√2 (Hairer & Wanner, Solving ODEs II).
    let step = "courant = 1.0\ntableau = { a = [[0.0, 0.0, 0.0, 0.0], [0.5, 0.0, 0.0, 0.0], \
                [0.0, 0.5, 0.0, 0.0], [0.0, 0.0, 1.0, 0.0]], \
                b = [0.16666666666666666, 0.3333333333333333, 0.3333333333333333, 0.16666666666666666] }";
    let (c, r) = run(&advection(
        &[1.0],
        &[1.0],
        "central2",
        "tableau",
        step,
        &[33],
    ));
    assert_close(
        c.problem.courant_of(dt_max(&r)).unwrap(),
        2.0 * SQRT_2,
        1e-9,
        "RK4 tableau + C2",
    );
    assert_eq!(c.problem.method.order, 4);
}

#[test]
fn implicit_midpoint_tableau_is_unconditionally_stable() {
    // The one-stage Gauss method a = [[½]], b = [1] has R(z) = (1 + z/2)/(1 − z/2):
    // A-stable (Hairer & Wanner II).
    let step = "courant = 3.0\ntableau = { a = [[0.5]], b = [1.0] }";
    let (_, r) = run(&advection(
        &[1.0],
        &[1.0],
        "central2",
        "tableau",
        step,
        &[33],
    ));
    assert_eq!(kind(&r), LimitKind::Unconditional);
    let (_, r) = run(&diffusion(&[1.0], "1.0", "crank-nicolson", 7.0, &[33]));
    assert_eq!(kind(&r), LimitKind::Unconditional);
}

#[test]
fn decaying_source_limits_explicit_methods_by_their_real_axis_interval() {
    // u_t = −k u: μ = −k at every θ; Δt_max = (real-axis limit)/k, e.g. 2/k for
    // forward Euler (Hairer & Wanner II, the test equation y' = λy).
    let text = |method: &str| {
        format!(
            r#"
[grid]
spacing = [1.0]
[model]
kind = "linear"
variables = ["u"]
flux = [[[0.0]]]
source = [[-4.0]]
[time]
method = "{method}"
dt = 0.01
[scan]
analyses = ["radius", "limit"]
points = [17]
"#
        )
    };
    let (_, r) = run(&text("euler"));
    assert_close(dt_max(&r), 2.0 / 4.0, 1e-12, "forward Euler: 2/k");
    let rk4_real = bisect(|x| taylor_r(4, -x) - 1.0, 2.0, 3.0);
    let (_, r) = run(&text("rk4"));
    assert_close(dt_max(&r), rk4_real / 4.0, 1e-12, "RK4: 2.7852935/k");
    let (_, r) = run(&text("backward-euler"));
    assert_eq!(kind(&r), LimitKind::Unconditional);
}

#[test]
fn oscillating_complex_source_limits_rk4_by_its_imaginary_interval() {
    // u_t = iω u (complex source entry [re, im]): μ = iω, so RK4 needs ωΔt ≤ 2√2
    // and leapfrog ωΔt ≤ 1 (Hairer & Wanner, Solving ODEs II).
    let text = |method: &str| {
        format!(
            r#"
[grid]
spacing = [1.0]
[model]
kind = "linear"
variables = ["u"]
flux = [[[0.0]]]
source = [[[0.0, 5.0]]]
[time]
method = "{method}"
dt = 0.01
[scan]
analyses = ["radius", "limit"]
points = [17]
"#
        )
    };
    let (_, r) = run(&text("rk4"));
    assert_close(dt_max(&r), 2.0 * SQRT_2 / 5.0, 1e-12, "RK4: 2√2/ω");
    let (_, r) = run(&text("leapfrog"));
    assert_close(dt_max(&r), 1.0 / 5.0, 1e-9, "leapfrog: 1/ω");
}

#[test]
fn real_axis_limit_is_the_first_exit_not_a_later_reentry() {
    // An explicit 3-stage tableau with A = [[0,0,0],[½,0,0],[0,½,0]],
    // b = (0.30, 0.58, 0.12) has R(z) = 1 + z + 0.35z² + 0.03z³ (R = 1 + Σ_k z^k bᵀA^{k−1}1,
    // Hairer & Wanner II). On the negative real axis R(−x) − 1 = −x(1 − 0.35x + 0.03x²)
    // vanishes at x = 5 and x = 20/3: the interval ends at 5, although R(−x) is back
    // inside [−1, 1] on [20/3, 8.7]. With C2 diffusion (D = h = 1) Δt_max = 5/4.
    let text = diffusion(&[1.0], "1.0", "tableau", 0.1, &[33]).replace(
        "method = \"tableau\"",
        "method = \"tableau\"\ntableau = { a = [[0.0, 0.0, 0.0], [0.5, 0.0, 0.0], [0.0, 0.5, 0.0]], b = [0.30, 0.58, 0.12] }",
    );
    let c = case(&text);
    assert_close(
        c.problem.method.real_limit(),
        5.0,
        1e-12,
        "first exit on the real axis",
    );
    let r = analyse(&c);
    assert_close(dt_max(&r), 1.25, 1e-12, "Δt_max = 5/4");
    // Inside the re-entry band the widest eigenvalue is stable again, but the band
    // (5, 20/3) is crossed by other wavevectors: unstable.
    let at = case_with(
        &text,
        &["time.dt=1.875".to_string(), "scan.points=[257]".to_string()],
    );
    assert!(
        !analyse(&at).radius.unwrap().stable,
        "Δt = 7.5/4 is unstable"
    );
}
