//! The largest stable Δt of the central-difference scheme and the Newmark family
//! with C2, against closed forms.

use super::{close, problem, run};
use kgain::analysis::LimitKind;

/// Central difference + C2 on u_tt = c² u_xx. L(θ) = −(4c²/h²) sin²(θ/2), most
/// negative at θ = π: μ = −4c²/h². The recurrence ζ² − (2 + z)ζ + 1 = 0 has
/// both roots on the unit circle exactly for z ∈ [−4, 0] (product 1,
/// discriminant z(z + 4) ≤ 0), so Δt²·4c²/h² ≤ 4: Δt_max = h/c, ν = cΔt/h ≤ 1.
#[test]
fn central_difference_is_stable_up_to_courant_one_in_one_dimension() {
    for (h, c) in [(1.0, 1.0), (0.5, 2.0), (0.013, 340.0)] {
        let r = run(&problem(&[h], &[c], "central-difference", None, 0.5), 17);
        let l = r.limit.expect("the limit ran");
        assert_eq!(l.kind, LimitKind::Bounded);
        close(l.dt_max, h / c, 1e-12);
        close(l.courant_max.expect("a wave speed"), 1.0, 1e-12);
        let (lo, hi) = l.bracket.expect("a bounded limit has a bracket");
        assert!(
            lo <= h / c * (1.0 + 1e-12) && hi >= h / c * (1.0 - 1e-12),
            "{lo} {hi}"
        );
        assert!((l.wavevector[0].abs() - std::f64::consts::PI).abs() < 1e-12);
    }
}

/// In 2-D with one speed c and spacings hx, hy the most negative eigenvalue is
/// at θ = (π, π): μ = −4c²(1/hx² + 1/hy²), so Δt²|μ| ≤ 4 gives
/// c Δt √(1/hx² + 1/hy²) ≤ 1.
#[test]
fn central_difference_in_two_dimensions_meets_the_diagonal_condition() {
    for (hx, hy, c) in [(1.0, 1.0, 1.0), (1.0, 0.5, 1.5), (0.2, 0.7, 3.0)] {
        let r = run(
            &problem(&[hx, hy], &[c, c], "central-difference", None, 0.3),
            9,
        );
        let want = 1.0 / (c * (1.0 / (hx * hx) + 1.0 / (hy * hy)).sqrt());
        close(r.limit.expect("the limit ran").dt_max, want, 1e-12);
    }
}

/// Newmark with γ ≥ 1/2 and β < γ/2 (Hughes, The Finite Element Method, ch. 9,
/// from memory: critical Ω = ωΔt = 1/√(γ/2 − β) without physical damping).
/// Derivation from the recurrence: a root leaves the unit circle through ζ = −1,
/// where ρ(−1) = 1 + 2 + 1 = 4 and σ(−1) = (1/2 + β − γ) − (1/2 − 2β + γ) + β
/// = 4β − 2γ, so z = ρ/σ = −1/(γ/2 − β), i.e. Ω² = Δt²|μ| = 1/(γ/2 − β). With C2
/// the largest ω = √|μ| is 2c/h, so Δt_max = (h/(2c))/√(γ/2 − β); central
/// difference (β = 0, γ = 1/2) gives h/c again.
#[test]
fn newmark_conditional_members_meet_the_critical_frequency() {
    let (h, c) = (0.25, 1.5);
    for (beta, gamma) in [
        (0.0, 0.5),
        (0.1, 0.5),
        (1.0 / 12.0, 0.5),
        (0.0, 0.6),
        (0.2, 0.7),
    ] {
        let p = problem(&[h], &[c], "newmark", Some((beta, gamma)), 0.2);
        let l = run(&p, 17).limit.expect("the limit ran");
        assert_eq!(l.kind, LimitKind::Bounded, "beta {beta}, gamma {gamma}");
        let want = (h / (2.0 * c)) / (gamma / 2.0 - beta).sqrt();
        close(l.dt_max, want, 1e-10);
    }
}

/// Average acceleration (β = 1/4, γ = 1/2) is unconditionally stable (Newmark
/// 1959): its locus z = 4(ζ − 1)²/(ζ + 1)² = −4 tan²(ω/2) covers the whole
/// negative real axis with both roots on the unit circle. So is every member
/// with 2β ≥ γ ≥ 1/2 (Hughes, ch. 9, from memory).
#[test]
fn average_acceleration_and_its_damped_relatives_are_unconditional() {
    for bg in [None, Some((0.25, 0.5)), Some((0.3, 0.6)), Some((0.5, 0.5))] {
        let p = problem(&[0.1, 0.3], &[2.0, 1.0], "newmark", bg, 40.0);
        let l = run(&p, 9).limit.expect("the limit ran");
        assert_eq!(l.kind, LimitKind::Unconditional, "{bg:?}");
        assert!(l.dt_max.is_infinite());
    }
}

/// Per-direction limits are real time steps too: along the θ_x axis the most
/// negative eigenvalue is −4c²/h_x² (at θ = (π, 0)), so Δt = h_x/c, and along
/// θ_y it is h_y/c; the courant numbers are c·Δt/min(h).
#[test]
fn limits_along_the_axes_are_the_one_dimensional_ones() {
    let (hx, hy, c) = (1.0, 0.5, 2.0);
    let r = run(
        &problem(&[hx, hy], &[c, c], "central-difference", None, 0.3),
        9,
    );
    let d = r.limit.expect("the limit ran").by_direction;
    for (n, want) in [
        ([1.0, 0.0], hx / c),
        ([0.0, 1.0], hy / c),
        ([-1.0, 0.0], hx / c),
    ] {
        let k = d
            .directions
            .iter()
            .position(|v| (v[0] - n[0]).abs() < 1e-12 && (v[1] - n[1]).abs() < 1e-12)
            .unwrap_or_else(|| panic!("direction {n:?} among {:?}", d.directions));
        close(d.dt[k], want, 1e-12);
        close(d.courant[k], c * want / hy, 1e-12);
    }
}
