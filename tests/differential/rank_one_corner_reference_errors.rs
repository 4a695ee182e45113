//! Named tests for reference errors at corners and faces θ_d = π of the box
//! where the generated diffusion matrices are rank-deficient (K = λ w wᵀ up to
//! rounding, a smallest eigenvalue of order 1e-18 of either sign): with
//! central fluxes, whose symbols vanish at θ_d = π, L has a (near-)null
//! eigenvalue there and the first loss tends to its limit as the corner is
//! approached (like L + C s², s the distance), attained at no wavevector. The
//! reference approaches only θ = 0; near a corner it refines at finite θ and
//! stops where the crossings sink below its roundoff (s ≈ 3e-3 in 1-D, where
//! the first loss is still a few 1e-6 above its limit), or evaluates the
//! engine's smallest approach sample, which lies above the limit by
//! construction. Each limit was checked in 40-digit arithmetic (mpmath, during
//! triage) with K projected onto its nonzero eigenvalues, first losses by
//! regula falsi on ρ(G) − 1 along the limiting direction at s = 1e-3 … 6e-5,
//! then Richardson in s².

use crate::reference_errors::engine_direction;
use crate::scheme::{Method, Scheme};

/// Asserts the engine's overall limit is within (1e-6 below, 1e-9 above) of
/// `truth`, and its certified bracket (when given) does not exclude it from
/// below.
#[track_caller]
fn assert_engine_near(s: &Scheme, truth: f64) -> crate::engine::EngineLimit {
    let text = crate::render::case_text(s);
    let e = crate::engine::engine_limit(&text).unwrap();
    assert!(
        e.dt_max <= truth * (1.0 + 1e-9) && e.dt_max >= truth * (1.0 - 1e-6),
        "engine {}, truth {truth}",
        e.dt_max
    );
    if let Some((lo, _)) = e.certified {
        assert!(lo <= truth * (1.0 + 1e-9), "bracket {:?}", e.certified);
    }
    e
}

/// Seed 2680: an explicit two-stage Runge–Kutta method from a Butcher tableau
/// (first order: R(z) = 1 + z + β z², β = b₂a₂₁ = 0.3408) on a 1-D 2×2 system,
/// central differences, rank-one diffusion K = λ w wᵀ. The reference reported
/// 0.14680769 at θ = 3.13872, the engine 4.1e-6 lower.
///
/// Closed form (derived here). At θ = π − s the symbol is
/// L = −i A sin s/h − K (2 + 2 cos s)/h²; on the null vector v of K the branch
/// is μ ≈ −i a s − b s² with a = vᵀAv/h and, by second-order perturbation
/// through the eigenvalue −4λ/h² of w, b = (vᵀAw)²/(4λ). With
/// |R(iy)|² − 1 = (1 − 2β) y² + … the corner approach is stable iff
/// Δt ≤ 2b/((1 − 2β) a²) (the long-wave balance of Hirsch, Numerical
/// Computation of Internal and External Flows, for forward Euler, at the
/// corner): 0.14680709006756858, which the 40-digit first losses at
/// s = 1e-3 … 6.25e-5 approach as s² (Richardson to 18 digits). With the f64 K
/// as given (λ_min = +1.2e-18) the first loss has a minimum 0.1468070945 at
/// s = 2.4e-4, 3e-8 above: the same limit to rounding.
#[test]
fn rank_one_diffusion_corner_limit_is_the_closed_form() {
    let s = crate::generate::scheme(2680);
    let Method::Tableau { a: ta, b: tb } = &s.method else {
        panic!("a tableau method")
    };
    assert!(s.first[0].is_central() && s.dims() == 1);
    let k = s.system.diffusion[0].clone().symmetric_eigen();
    let (iw, iv) = match k.eigenvalues[0].abs() > k.eigenvalues[1].abs() {
        true => (0, 1),
        false => (1, 0),
    };
    let lambda = k.eigenvalues[iw];
    assert!(
        k.eigenvalues[iv].abs() < 1e-15 * lambda,
        "{:?}",
        k.eigenvalues
    );
    let (w, v) = (k.eigenvectors.column(iw), k.eigenvectors.column(iv));
    let a_mat = &s.system.flux[0];
    let h = s.spacing[0];
    let a = (v.transpose() * a_mat * v)[(0, 0)] / h;
    let b = (v.transpose() * a_mat * w)[(0, 0)].powi(2) / (4.0 * lambda);
    // β = Σ b_i c_i with c_i the row sums of the tableau
    let beta: f64 = ta
        .iter()
        .zip(tb)
        .map(|(row, bi)| bi * row.iter().sum::<f64>())
        .sum();
    let closed = 2.0 * b / ((1.0 - 2.0 * beta) * a * a);
    assert!(
        (closed / 0.146_807_090_067_568_6 - 1.0).abs() < 1e-12,
        "{closed}"
    );
    let e = assert_engine_near(&s, closed);
    for n in [[1.0], [-1.0]] {
        let (dt, _) = engine_direction(&e, &n);
        assert!(
            dt <= closed * (1.0 + 1e-9) && dt >= closed * (1.0 - 1e-6),
            "{n:?}: engine {dt}, closed form {closed}"
        );
    }
}

/// Seed 5346: AB2 on a 1-D 2×2 system with central differences and
/// fourth-order dissipation, as seed 4468
/// (`ab2_system_long_wave_limit_is_the_closed_form`): the limit is the
/// long-wave one Δt³ = 4b/a⁴, a = max|λ(A)|/h, b = σ s/(16 h):
/// 0.22538483003696376. In 50-digit arithmetic the first exit at
/// θ = 1e-2, 1e-3, 1e-4 is 0.2253885158, 0.2253848669, 0.2253848304, falling
/// as θ² onto it. The reference reported 0.22538510658, 1.2e-6 above and
/// outside the engine's certified bracket [0.22538483003674, 0.22538483003719],
/// which contains the closed form: the bracket is right.
#[test]
fn ab2_system_long_wave_limit_is_the_closed_form_5346() {
    let s = crate::generate::scheme(5346);
    let text = crate::render::case_text(&s);
    assert!(text.contains("method = \"ab2\""), "{text}");
    let dis = s.dissipation.expect("dissipation");
    assert_eq!(dis.order, 4);
    let h = s.spacing[0];
    let b = dis.strength * s.system.reference_speed / (16.0 * h);
    let closed = s.system.flux_speeds[0]
        .iter()
        .map(|l| (4.0 * b / (l.abs() / h).powi(4)).cbrt())
        .fold(f64::INFINITY, f64::min);
    assert!(
        (closed / 0.225_384_830_036_963_76 - 1.0).abs() < 1e-13,
        "{closed}"
    );
    let e = assert_engine_near(&s, closed);
    if let Some((lo, hi)) = e.certified {
        assert!(lo <= closed * (1.0 + 1e-12) && closed <= hi * (1.0 + 1e-9));
    }
}

/// Seeds 3090 (forward–backward, 1-D, central6/central4), 4423 (3-stage
/// tableau, 2-D, Lie splitting, upwind1 along y) and 5131 (SSPRK3, 3-D, Lie
/// splitting), each with rank-deficient diffusion: the limit is approached at
/// the corner (π) or the face centre (π, 0), (π, 0, 0). 40-digit first losses
/// (see the module comment; 2-D and 3-D: minimised over the direction at each
/// s, a single narrow valley at 2.3166e-3 rad from the x axis in 2-D and along
/// (−1, −0.0844, −0.0114) in 3-D) extrapolate to 8.1340116702143296e-3,
/// 3.19281849382e-2 and 0.66170019246. The reference reported
/// 8.134032530e-3 (2.7e-6 above, at s = 2.7e-3), 3.192830249e-2 and
/// 0.6617097368 (at the engine's smallest approach sample, where the 40-digit
/// first losses are 3.19282205e-2 and 0.6617093267: above the limit).
#[test]
fn rank_one_diffusion_face_limits_from_extended_precision() {
    for (seed, truth) in [
        (3090, 8.134_011_670_214_33e-3),
        (4423, 3.192_818_493_82e-2),
        (5131, 0.661_700_192_46),
    ] {
        let s = crate::generate::scheme(seed);
        let k = s.system.diffusion[0].clone().symmetric_eigen();
        let top = k.eigenvalues.iter().fold(0.0f64, |m, x| m.max(x.abs()));
        assert!(
            k.eigenvalues.iter().any(|x| x.abs() < 1e-15 * top),
            "seed {seed}: K_x is rank-deficient"
        );
        assert_engine_near(&s, truth);
    }
}
