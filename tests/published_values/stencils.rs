//! Modified wavenumbers of the built-in stencils (h = 1, θ = kh): closed forms,
//! maxima and orders (common practice; Lele, J. Comput. Phys. 103, 1992; Tam &
//! Webb, J. Comput. Phys. 107, 1993), and the RK4 limits they imply.

use super::*;
use crate::support::*;
use kgain::stencil::catalogue;
use std::f64::consts::{FRAC_PI_2, PI, SQRT_2};

#[test]
fn central2_modified_wavenumber_is_sin_theta_peaking_at_one_at_half_pi() {
    // common practice: the symbol of (f_{j+1} − f_{j−1})/2 is i sin θ.
    let st = catalogue::builtin("central2", 1).unwrap();
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, t.sin(), 4.0 * EPS, 1.0, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, 0.0, 4.0 * EPS, 1.0, &format!("Im m(θ={t})"));
    }
    let (max, at) = st.max_modified_wavenumber();
    assert_close(max, 1.0, 8.0 * EPS, "max of sin θ is 1");
    assert_close(at, FRAC_PI_2, extremum_position_tol(), "sin θ peaks at π/2");
    assert_eq!(st.order, 2);
}

#[test]
fn central4_modified_wavenumber_matches_closed_form_and_published_maximum() {
    // common practice: (8 sin θ − sin 2θ)/6, max 1.3722219798 at θ = 1.7974775
    // (computed from the stencil's modified wavenumber).
    let st = catalogue::builtin("central4", 1).unwrap();
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, c4(t), 8.0 * EPS, 1.5, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, 0.0, 8.0 * EPS, 1.5, &format!("Im m(θ={t})"));
    }
    let (want, want_at) = c4_max();
    assert_close(
        want,
        1.3722219798,
        quoted(1.3722219798, 10),
        "closed-form C4 max vs published",
    );
    assert_close(
        want_at,
        1.7974775,
        quoted(1.7974775, 7),
        "closed-form C4 argmax vs published",
    );
    let (max, at) = st.max_modified_wavenumber();
    assert_close(max, want, 8.0 * EPS, "engine C4 max");
    assert_close(at, want_at, extremum_position_tol(), "engine C4 argmax");
    assert_eq!(st.order, 4);
}

#[test]
fn compact4_pade_modified_wavenumber_peaks_at_root_three_at_two_thirds_pi() {
    // Lele (1992), α = 1/4: (3/2 sin θ)/(1 + ½ cos θ); the derivative vanishes where
    // cos θ = −½, i.e. θ = 2π/3, with value √3.
    let st = catalogue::builtin("compact4", 1).unwrap();
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let want = 1.5 * t.sin() / (1.0 + 0.5 * t.cos());
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, want, 16.0 * EPS, 2.0, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, 0.0, 16.0 * EPS, 2.0, &format!("Im m(θ={t})"));
    }
    let (max, at) = st.max_modified_wavenumber();
    assert_close(max, 3f64.sqrt(), 8.0 * EPS, "compact4 max is √3");
    assert_close(
        at,
        2.0 * PI / 3.0,
        extremum_position_tol(),
        "compact4 peaks at 2π/3",
    );
    assert_eq!(st.order, 4);
}

#[test]
fn compact6_modified_wavenumber_peaks_at_published_value() {
    // Lele (1992), α = 1/3, a = 14/9, b = 1/9: (a sin θ + (b/2) sin 2θ)/(1 + 2α cos θ);
    // max 1.98944148 at θ ≈ 2.2671 (computed from the stencil's modified wavenumber).
    let (alpha, a, b) = (1.0 / 3.0, 14.0 / 9.0, 1.0 / 9.0);
    let f = |t: f64| (a * t.sin() + 0.5 * b * (2.0 * t).sin()) / (1.0 + 2.0 * alpha * t.cos());
    let st = catalogue::builtin("compact6", 1).unwrap();
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, f(t), 16.0 * EPS, 6.0, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, 0.0, 16.0 * EPS, 6.0, &format!("Im m(θ={t})"));
    }
    let (want_at, want) = scan_max(f, 0.0, PI, 4096);
    assert_close(
        want,
        1.98944148,
        quoted(1.98944148, 8),
        "independent search vs published max",
    );
    assert_close(
        want_at,
        2.2671,
        quoted(2.2671, 4),
        "independent search vs published argmax",
    );
    let (max, at) = st.max_modified_wavenumber();
    assert_close(max, want, 8.0 * EPS, "engine compact6 max");
    assert_close(
        at,
        want_at,
        extremum_position_tol(),
        "engine compact6 argmax",
    );
    assert_eq!(st.order, 6);
}

#[test]
fn drp7_coefficients_satisfy_the_fourth_order_moment_conditions() {
    // Tam & Webb (1993): a consistent antisymmetric 7-point stencil needs
    // Σ j a_j = ½; fourth order needs Σ j³ a_j = 0. The quoted digits carry a
    // rounding of ½·10⁻⁸ each, so the sums hold to Σ j^p · ½·10⁻⁸.
    let a = DRP_QUOTED;
    let rounding = |p: i32| (1..=3).map(|j| (j as f64).powi(p)).sum::<f64>() * 0.5e-8;
    let m1: f64 = (1..=3).map(|j| j as f64 * a[j - 1]).sum();
    let m3: f64 = (1..=3).map(|j| (j as f64).powi(3) * a[j - 1]).sum();
    assert_close_to_scale(m1, 0.5, 1.0, rounding(1), "Σ j a_j = ½");
    assert_close_to_scale(m3, 0.0, 1.0, rounding(3), "Σ j³ a_j = 0");
    // The engine's stencil uses these coefficients: antisymmetric, order 4.
    let st = catalogue::builtin("drp7", 1).unwrap();
    assert_eq!(st.order, 4, "DRP 7-point is fourth order");
    assert!(st.is_central());
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, drp(t, &a), 8.0 * EPS, 2.0, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, 0.0, 8.0 * EPS, 2.0, &format!("Im m(θ={t})"));
    }
}

#[test]
fn drp7_coefficients_minimise_the_wavenumber_error_over_half_the_band() {
    // Tam & Webb (1993), re-derived: with the two moment conditions, a₁ = 2/3 + 5a₃
    // and a₂ = −1/12 − 4a₃; a₃ minimises E = ∫_{−π/2}^{π/2} (θ − 2Σ a_j sin jθ)² dθ.
    // With θ − 2Σ a_j sin jθ = g₀(θ) − a₃ g₁(θ): a₃ = ∫ g₀g₁ / ∫ g₁².
    let g0 = |t: f64| t - 4.0 / 3.0 * t.sin() + (2.0 * t).sin() / 6.0;
    let g1 = |t: f64| 2.0 * (5.0 * t.sin() - 4.0 * (2.0 * t).sin() + (3.0 * t).sin());
    let simpson = |f: &dyn Fn(f64) -> f64| {
        let (a, b, n) = (-FRAC_PI_2, FRAC_PI_2, 4096);
        let h = (b - a) / n as f64;
        let inner: f64 = (1..n)
            .map(|i| f(a + h * i as f64) * if i % 2 == 1 { 4.0 } else { 2.0 })
            .sum();
        (f(a) + f(b) + inner) * h / 3.0
    };
    let a3 = simpson(&|t| g0(t) * g1(t)) / simpson(&|t| g1(t) * g1(t));
    let derived = [2.0 / 3.0 + 5.0 * a3, -1.0 / 12.0 - 4.0 * a3, a3];
    for (j, (d, q)) in derived.iter().zip(DRP_QUOTED).enumerate() {
        assert_close(
            *d,
            q,
            quoted(q, 8),
            &format!("a_{} re-derived vs quoted", j + 1),
        );
    }
}

#[test]
fn upwind1_symbol_is_one_minus_the_shifted_exponential() {
    // common practice: (f_j − f_{j−1}) has symbol 1 − e^{−iθ}; times −i it is the
    // modified wavenumber −i(1 − e^{−iθ}) = sin θ − i(1 − cos θ).
    let st = catalogue::builtin("upwind1", 1).unwrap();
    for k in 0..=64 {
        let t = -PI + 2.0 * PI * k as f64 / 64.0;
        let want = C64::new(0.0, -1.0) * (1.0 - C64::from_polar(1.0, -t));
        let m = st.modified_wavenumber(t);
        assert_close_to_scale(m.re, want.re, 8.0 * EPS, 2.0, &format!("Re m(θ={t})"));
        assert_close_to_scale(m.im, want.im, 8.0 * EPS, 2.0, &format!("Im m(θ={t})"));
    }
    assert_eq!(st.order, 1);
}

#[test]
fn rk4_limit_with_each_central_stencil_is_two_root_two_over_its_maximum() {
    // RK4 is stable on the imaginary axis up to 2√2 (Hairer & Wanner II); a central
    // stencil gives μ = −i a m(θ)/h, so ν_max = 2√2 / max m (Hairer & Wanner, Solving ODEs II).
    let c2_max = 1.0; // sin θ, common practice
    let compact4_max = 3f64.sqrt(); // Lele (1992)
    let (a, b) = (14.0 / 9.0, 1.0 / 9.0); // Lele (1992), sixth-order compact
    let (_, compact6_max) = scan_max(
        |t| (a * t.sin() + 0.5 * b * (2.0 * t).sin()) / (1.0 + 2.0 / 3.0 * t.cos()),
        0.0,
        PI,
        4096,
    );
    let (_, drp_max) = scan_max(|t| drp(t, &DRP_QUOTED), 0.0, PI, 4096); // Tam & Webb (1993)
    for (name, max) in [
        ("central2", c2_max),
        ("central4", c4_max().0),
        ("compact4", compact4_max),
        ("compact6", compact6_max),
        ("drp7", drp_max),
    ] {
        let (c, r) = run(&advection(
            &[1.0],
            &[1.0],
            name,
            "rk4",
            "courant = 1.0",
            &[65],
        ));
        let nu = c.problem.courant_of(dt_max(&r)).unwrap();
        assert_close(
            nu,
            2.0 * SQRT_2 / max,
            1e-9,
            &format!("RK4 + {name}: ν_max"),
        );
    }
}
