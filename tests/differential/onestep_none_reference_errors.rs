//! Named tests for reference errors where the engine reports none (unstable
//! at every Δt) and the reference a bounded limit or unconditional stability
//! (seeds 7710, 8307, 7950 and 10356 of the third complete long run). Two
//! mechanisms, both checked in 40-digit mpmath arithmetic during triage (L(θ)
//! from the stencil weights and the case's matrices, G from its definition):
//!
//! * Heun at long waves: R(z) = 1 + z + z²/2 has, with p = x(2 + x) for
//!   z = x + iy, |R|² − 1 = p(1 + y²) + (p − y²)²/4 exactly, ≈ 2x + y⁴/4. A
//!   direction damped only at order s^q with q > 4 (Re μ ∝ s^q, Im μ ∝ s)
//!   loses stability at Δt³ = −8 Re μ/(Im μ)⁴ ∝ s^(q−4) → 0: none. The
//!   growth at the reference's values is far beneath its rounding allowance
//!   (1e-13 relative) or lies between its samples.
//! * An eigenvalue μ of L(θ) with Re μ > 0 at finite θ (the sources and
//!   fluxes are not symmetric in the same variables): any consistent method
//!   has ρ(G) − 1 ≈ Δt Re μ as Δt → 0, explicit Runge–Kutta and BDF2 alike.
//!   The reference's overall grid did not sample the window where Re μ > 0.

use crate::closed_forms::{engine, engine_direction};
use crate::engine::EngineKind;
use crate::generate;
use crate::probe::Point;
use crate::radius::ROUNDOFF;
use crate::render::case_text;
use crate::scheme::{CMat, Method, Scheme};
use crate::symbol::Parts;
use num_complex::Complex64 as C64;

/// |R(z)|² − 1 for Heun's R(z) = 1 + z + z²/2, free of cancellation:
/// p(1 + y²) + (p − y²)²/4 with p = x(2 + x).
fn heun_excess(z: C64) -> f64 {
    let p = z.re * (2.0 + z.re);
    let y2 = z.im * z.im;
    p * (1.0 + y2) + (p - y2) * (p - y2) / 4.0
}

fn is_heun(m: &Method) -> bool {
    matches!(m, Method::Polynomial { name: "heun", .. })
}

/// Σ_j w_j o_j^k of a stencil.
fn moment(s: &Scheme, axis: usize, k: i32) -> f64 {
    let st = &s.first[axis];
    st.offsets
        .iter()
        .zip(&st.weights)
        .map(|(o, w)| w * o.powi(k))
        .sum()
}

/// Seed 7710: Heun on a 3-D 2×2 system with characteristic upwinding; the y
/// axis has the user stencil with offsets −3..1 and weights
/// (−1/12, 1/2, −3/2, 5/6, 1/4), whose moments Σ w oᵏ vanish for k = 0, 2, 3,
/// 4 (to rounding), are 1 for k = 1, 6 for k = 5 and −30 for k = 6. Its symbol
/// is i s + … with Re S(s) = s⁶/24 + O(s⁸): along ±y (where the other axes
/// contribute nothing) each characteristic branch is μ = −|λ| s⁶/(24h) ± i|λ|s/h,
/// damped at sixth order only. Heun's first loss Δt³ = −8 Re μ/(Im μ)⁴ ∝ s²
/// falls like s^(2/3): 40-digit first losses 0.044652840 (s = 0.1),
/// 0.028146349 (0.05), 0.017733807 (0.025), 0.0096278097 (0.01),
/// 0.0020738052 (0.001). So ±y is none, and with it the overall limit. The
/// reference's own rays along ±y agreed; its overall search reported bounded
/// 0.07391646959765485 (at the corner θ = (π, −π, −π)), yet at that Δt
/// ρ(G) − 1 = 3.6314527e-8 at θ = (0, 0.1, 0) (40 digits; the reference's
/// own G gives the same), which its grid of 14 points per axis did not sample.
#[test]
fn heun_with_sixth_order_damping_along_an_axis_is_none_overall() {
    let s = generate::scheme(7710);
    let text = case_text(&s);
    assert!(is_heun(&s.method) && s.dims() == 3, "{text}");
    assert!(s.dissipation.is_none() && s.system.source.iter().all(|x| *x == 0.0));
    for k in [0, 2, 3, 4] {
        assert!(moment(&s, 1, k).abs() < 1e-14, "moment {k}");
    }
    assert!((moment(&s, 1, 1) - 1.0).abs() < 1e-14);
    assert!((moment(&s, 1, 6) + 30.0).abs() < 1e-12);
    let h = s.spacing[1];
    let speeds = &s.system.flux_speeds[1];
    // the branch eigenvalues along +y: λ S(s)/h upwind, λ conj(S)/h downwind
    let branches = |sv: f64| -> Vec<C64> {
        let sym = s.first[1].symbol(sv);
        speeds
            .iter()
            .map(|l| {
                if *l > 0.0 {
                    -sym * (*l / h)
                } else {
                    sym.conj() * (*l / h)
                }
            })
            .collect()
    };
    // cross-check of the branches against L(0, s, 0) itself (trace, determinant)
    let l = Parts::at(&s, &[0.0, 0.1, 0.0]).total();
    let b = branches(0.1);
    let det = l[(0, 0)] * l[(1, 1)] - l[(0, 1)] * l[(1, 0)];
    assert!((l.trace() - (b[0] + b[1])).norm() < 1e-12 * l.norm());
    assert!((det - b[0] * b[1]).norm() < 1e-12 * l.norm_squared());
    let first_loss = |sv: f64| {
        branches(sv)
            .iter()
            .map(|m| {
                assert!(m.re < 0.0, "damped at {sv}");
                (-8.0 * m.re / m.im.powi(4)).cbrt()
            })
            .fold(f64::INFINITY, f64::min)
    };
    let levels: Vec<f64> = (0..4).map(|j| first_loss(0.1 * 0.5f64.powi(j))).collect();
    for w in levels.windows(2) {
        let r = w[0] / w[1];
        assert!((r - 2f64.powf(2.0 / 3.0)).abs() < 2e-3, "ratio {r}");
    }
    // the closed form's leading orders match the 40-digit first loss at s = 0.1
    assert!(
        (levels[0] / 0.044_652_84 - 1.0).abs() < 2e-3,
        "{}",
        levels[0]
    );
    // at the reference's overall value, θ = (0, 0.1, 0) grows, in closed form
    // and in the reference's own G
    let reference = 0.073_916_469_597_654_85;
    let growth = branches(0.1)
        .iter()
        .map(|m| heun_excess(m * reference))
        .fold(f64::NEG_INFINITY, f64::max);
    assert!(growth > 7e-8, "|R|² − 1 = {growth}");
    assert!(Point::new(&s, vec![0.0, 0.1, 0.0], ROUNDOFF).excess(reference) > 3e-8);
    let e = engine(&s);
    assert_eq!(e.kind, EngineKind::None);
    for n in [[0.0, 1.0, 0.0], [0.0, -1.0, 0.0]] {
        assert_eq!(engine_direction(&e, &n), 0.0, "{n:?}");
    }
}

/// Seed 8307: Lie-split Heun on a 2-D 3×3 system with central differences
/// (central4 on x, central2 on y) and eighth-order dissipation, no source or
/// diffusion: G = R(ΔtL_y) R(ΔtL_x) with L_d = −iA_d S_d(θ_d)/h_d − c_d I,
/// c_d = σ v sin⁸(θ_d/2)/h_d. A_d has real eigenvalues λ_{d,k}, so det G =
/// Π_{d,k} R(Δt μ_{d,k}) exactly, μ_{d,k} = −iλ_{d,k} S_d/h_d − c_d, and
/// ρ(G)³ ≥ |det G|. Its logarithm is Σ ln(1 + |R|² − 1)/2 with |R|² − 1 ≈
/// (Δtλ s n_d/h_d)⁴/4 − 2Δt c_d: growth ∝ Δt⁴s⁴ against damping ∝ Δt s⁸, so
/// on every direction and at every Δt some s is unstable: none along every
/// direction. 40-digit first losses of G itself fall by 2^(4/3) per halving
/// of s on every direction checked (0°, 22.5°, …, 135°; along x 1.0011e-4,
/// 3.9858e-5, 1.5831e-5, 6.2838e-6 at s = 0.2 … 0.025). The reference reported
/// bounded limits 1.18e-4 … 2.0e-4 on 30 of 32 directions, where the growth
/// (about 1e-17) is beneath its rounding allowance.
#[test]
fn lie_split_heun_with_eighth_order_dissipation_is_none_on_every_direction() {
    let s = generate::scheme(8307);
    let text = case_text(&s);
    let Method::Split {
        strang: false,
        inner,
    } = &s.method
    else {
        panic!("Lie splitting: {text}");
    };
    assert!(is_heun(inner) && s.dims() == 2, "{text}");
    assert!(s.first.iter().all(|st| st.is_central() && !st.is_compact()));
    assert!(s.system.source.iter().all(|x| *x == 0.0));
    assert!(s
        .system
        .diffusion
        .iter()
        .all(|k| k.iter().all(|x| *x == 0.0)));
    let dis = s.dissipation.expect("dissipation");
    assert_eq!(dis.order, 8);
    // ln|det G| in closed form
    let log_det = |theta: &[f64], dt: f64| -> f64 {
        let mut total = 0.0;
        for (d, th) in theta.iter().enumerate() {
            let h = s.spacing[d];
            let flux = s.first[d].symbol(*th).im / h;
            let damping = dis.strength * s.system.reference_speed / h * (0.5 * th).sin().powi(8);
            for l in &s.system.flux_speeds[d] {
                let z = C64::new(-damping, -l * flux) * dt;
                total += 0.5 * heun_excess(z).ln_1p();
            }
        }
        total
    };
    // the closed form against the reference's G where growth is visible in f64
    for n in [[1.0, 0.0], [0.6, 0.8], [-0.8, 0.6]] {
        let theta = [0.5 * n[0], 0.5 * n[1]];
        let dt = 1e-2;
        let g = crate::amplification::amplification(&s, &Parts::at(&s, &theta), &theta, dt);
        let direct = g.determinant().norm().ln();
        let closed = log_det(&theta, dt);
        assert!(closed > 1e-8, "{closed}");
        assert!((direct / closed - 1.0).abs() < 1e-5, "{direct} vs {closed}");
        assert!(crate::radius::spectral_radius(&g) - 1.0 > closed / 3.0 * (1.0 - 1e-5));
    }
    let e = engine(&s);
    assert_eq!(e.kind, EngineKind::None);
    for (n, dt_engine) in e.directions.iter().zip(&e.dt_by_direction) {
        assert_eq!(*dt_engine, 0.0, "{n:?}");
        // at the reference's values and far below, some long wave grows
        for dt in [2.1e-4, 1.2e-4, 1e-5, 1e-6] {
            let found = (0..60)
                .map(|j| 0.5f64.powf(0.25 * j as f64))
                .find(|sv| log_det(&[sv * n[0], sv * n[1]], dt) > 0.0);
            assert!(found.is_some(), "direction {n:?}, Δt {dt}");
        }
    }
}

/// Eigenvalues of a complex matrix (complex Schur form).
fn eigenvalues(l: &CMat) -> Vec<C64> {
    nalgebra::linalg::Schur::new(l.clone())
        .eigenvalues()
        .expect("complex Schur form")
        .iter()
        .copied()
        .collect()
}

/// Seeds 7950 (a random four-stage explicit Runge–Kutta tableau, 3-D 3×3,
/// compact upwind-biased stencil, damping source, fourth-order dissipation)
/// and 10356 (BDF2, 3-D 2×2, damping source): the source is negative
/// definite, but not in the variables that make the fluxes symmetric, and at
/// finite θ L(θ) has an eigenvalue with Re μ > 0: 0.0070300697275 at θ =
/// (−0.0086287, 0.0925298, 0.0873933) (7950) and 0.0077559589686 at θ =
/// (3.1173229, 0.0017801, 1.5697588) (10356), 40 digits. Both methods are
/// consistent, so ρ(G) − 1 ≈ Δt Re μ as Δt → 0 (40 digits: 7.0300695e-11 at
/// Δt = 1e-8 for 7950, 7.755959e-11 for 10356): unstable at every small Δt,
/// none. For 7950 that θ stays unstable up to and beyond the reference's
/// bounded 0.1811509 (ρ − 1 = 4.37e-4 there); for 10356 (BDF2, A-stable) it is
/// unstable below Δt ≈ 0.025 (ρ − 1 = 7.84e-5 at 1.105e-2) and stable above,
/// which both programs classify as none (as seed 1320). The reference's
/// overall grids (17³ and 16³ points) miss the windows where Re μ > 0; for
/// 10356 its ladder started at 1.105e-2 and it reported unconditional.
#[test]
fn positive_real_part_of_l_at_finite_theta_is_none() {
    let cases: [(u64, [f64; 3], f64, f64); 2] = [
        (
            7950,
            [
                -0.008_628_706_300_252_365,
                0.092_529_767_470_506_56,
                0.087_393_315_802_391_85,
            ],
            0.007_030_069_727_527_556,
            0.181_150_903_670_506_6,
        ),
        (
            10356,
            [
                3.117_322_866_061_439,
                0.001_780_081_839_743_985_5,
                1.569_758_792_523_714_4,
            ],
            0.007_755_958_968_618_755,
            1.105e-2,
        ),
    ];
    for (seed, theta, re_mu, reference) in cases {
        let s = generate::scheme(seed);
        let text = case_text(&s);
        assert!(
            matches!(s.method, Method::Tableau { .. })
                || matches!(s.method, Method::Multistep { name: "bdf2", .. }),
            "{text}"
        );
        let src = &s.system.source;
        assert!(src
            .clone()
            .symmetric_eigen()
            .eigenvalues
            .iter()
            .all(|x| *x < 0.0));
        let l = Parts::at(&s, &theta).total();
        let top = eigenvalues(&l)
            .iter()
            .map(|m| m.re)
            .fold(f64::NEG_INFINITY, f64::max);
        assert!((top - re_mu).abs() < 1e-10, "seed {seed}: Re μ {top}");
        let point = Point::new(&s, theta.to_vec(), ROUNDOFF);
        for dt in [1e-6, 1e-5, 1e-4, 1e-3, reference] {
            assert!(point.excess(dt) > 0.0, "seed {seed}: Δt {dt}");
        }
        // the first-order growth of a positive real part, not rounding
        let slope = point.excess(1e-6) / 1e-6;
        assert!(
            (slope / re_mu - 1.0).abs() < 1e-3,
            "seed {seed}: (ρ − 1)/Δt = {slope}"
        );
        assert_eq!(engine(&s).kind, EngineKind::None, "seed {seed}");
    }
}
