//! The spectral-radius map of second-order-in-time methods: neutral (≤ 1 to
//! rounding) wherever the scheme is stable, also for the longest waves, where
//! the characteristic polynomial has a double root at ζ = 1.

use super::{problem, run};
use kgain::analysis::Verdict;

/// ρ(G) at θ on the first axis from the method's own radius kernel, at z = Δt²μ.
fn radius_at(p: &kgain::Problem, theta: f64) -> f64 {
    let mut th = vec![0.0; p.dims()];
    th[0] = theta;
    let mu = p.operator().symbol_matrix(&th)[(0, 0)];
    p.method
        .amplification_radius(mu * p.method.step_variable(p.dt()))
}

#[test]
fn central_difference_at_courant_0_9_is_neutral_everywhere_including_long_waves() {
    let p = problem(&[1.0], &[1.0], "central-difference", None, 0.9);
    let r = run(&p, 65);
    let rad = r.radius.expect("the radius map ran");
    assert!(rad.max <= 1.0 + 1e-12, "{}", rad.max);
    assert!(
        rad.map.iter().all(|v| (v - 1.0).abs() <= 1e-12),
        "not neutral"
    );
    assert_eq!(r.verdict, Verdict::Stable);
    // long waves: z = −ν²θ² down to 1e-24, where raw roots sit next to a
    // double root at ζ = 1
    for theta in [1e-3, 1e-6, 1e-9, 1e-12] {
        let rho = radius_at(&p, theta);
        assert!((rho - 1.0).abs() <= 1e-12, "theta {theta}: {rho}");
    }
}

#[test]
fn central_difference_above_courant_one_is_unstable() {
    let p = problem(&[1.0], &[1.0], "central-difference", None, 1.05);
    let r = run(&p, 65);
    let rad = r.radius.expect("the radius map ran");
    // at θ = π, z = −4ν²: ζ² − (2 − 4ν²)ζ + 1 has the root 2ν² − 1 − 2ν√(ν² − 1)
    let nu: f64 = 1.05;
    let want = 2.0 * nu * nu - 1.0 + 2.0 * nu * (nu * nu - 1.0).sqrt();
    assert!((rad.max - want).abs() < 1e-12, "{} vs {want}", rad.max);
    assert_eq!(r.verdict, Verdict::Unstable);
}

#[test]
fn average_acceleration_is_neutral_at_any_courant_number() {
    for nu in [0.5, 3.0, 100.0] {
        let p = problem(&[1.0, 2.0], &[1.0, 0.5], "newmark", None, nu);
        let rad = run(&p, 17).radius.expect("the radius map ran");
        assert!(rad.max <= 1.0 + 1e-12, "nu {nu}: {}", rad.max);
        assert!(rad.map.iter().all(|v| *v >= 1.0 - 1e-12), "nu {nu}: damped");
        for theta in [1e-6, 1e-9, 3.0] {
            let rho = radius_at(&p, theta);
            assert!((rho - 1.0).abs() <= 1e-12, "nu {nu}, theta {theta}: {rho}");
        }
    }
}

#[test]
fn gamma_above_one_half_damps_the_short_waves() {
    // numerical damping: |ζ| < 1 at θ = π for γ = 0.6, β = 0.3 (unconditional)
    let p = problem(&[1.0], &[1.0], "newmark", Some((0.3, 0.6)), 2.0);
    let rho = radius_at(&p, std::f64::consts::PI);
    assert!(rho < 0.99, "{rho}");
}
