//! Named tests for reference errors on systems (seeds 4468 and 3358 of the
//! second long run), each checked by a closed form from the eigenvalues of the
//! system's matrices and confirmed in 45–60-digit arithmetic (mpmath, during
//! triage): the engine is right and the reference's f64 crossings are off.

use crate::scheme::Mat;

/// Seed 4468: AB2 on a 1-D 2×2 system with central differences and
/// fourth-order dissipation −σ s sin⁴(θ/2)/h (s the reference speed). Each
/// eigenvalue λ of A gives a branch μ ≈ −i a θ − b θ⁴ with a = |λ|/h and
/// b = σ s/(16 h); AB2's principal root has |z|² − 1 ≈ 2Δt Re μ + (Δt a θ)⁴/2,
/// so long waves are stable iff Δt³ ≤ 4b/a⁴ (derived here; the form the engine's
/// long-wave closed form takes). In 60-digit arithmetic the first exit over θ
/// rises like (1 + 0.166 θ²) above that value, so the limit is the long-wave one:
/// 0.067267480439184641. The reference reported 0.0672669985, 7.2e-6 low.
#[test]
fn ab2_system_long_wave_limit_is_the_closed_form() {
    let s = crate::generate::scheme(4468);
    let text = crate::render::case_text(&s);
    assert!(
        text.contains("method = \"ab2\"") && text.contains("first = [\"central2\"]"),
        "{text}"
    );
    let dis = s.dissipation.expect("dissipation");
    assert_eq!(dis.order, 4);
    let h = s.spacing[0];
    let b = dis.strength * s.system.reference_speed / (16.0 * h);
    let closed = s.system.flux_speeds[0]
        .iter()
        .map(|l| (4.0 * b / (l.abs() / h).powi(4)).cbrt())
        .fold(f64::INFINITY, f64::min);
    assert!(
        (closed / 0.067_267_480_439_184_6 - 1.0).abs() < 1e-13,
        "{closed}"
    );
    let e = crate::engine::engine_limit(&text).unwrap();
    assert!(
        e.dt_max <= closed * (1.0 + 1e-9) && e.dt_max >= closed * (1.0 - 1e-6),
        "engine {}, closed form {closed}",
        e.dt_max
    );
    if let Some((lo, hi)) = e.certified {
        assert!(lo <= closed * (1.0 + 1e-12) && closed <= hi * (1.0 + 1e-9));
    }
}

/// The largest eigenvalue of the symmetric part of `a`.
fn top_of_symmetric_part(a: &Mat) -> f64 {
    ((a + a.transpose()) * 0.5)
        .symmetric_eigen()
        .eigenvalues
        .iter()
        .fold(f64::NEG_INFINITY, |m, x| m.max(*x))
}

/// Seed 3358: BDF2 on a 3-D 3×3 system with a central stencil (drp7),
/// diffusion, eighth-order dissipation and a source. The flux matrices are
/// symmetric (to 1e-16), so their terms in L(θ) are skew-Hermitian; the
/// diffusion matrices are positive semidefinite and the dissipation is
/// non-positive, so the Hermitian part of L(θ) is at most that of the source,
/// λ_max(S) = −0.0178 < 0, at every θ: every eigenvalue of L has Re μ ≤ −0.0178,
/// and BDF2, A-stable, is stable at every Δt (the 45-digit check finds
/// ρ(G) < 1 − 5e-10 at the reference's witness and over Δt in [1e-12, 1e12]).
/// The reference reported a diagonal direction bounded at 1.27e-8.
#[test]
fn bdf2_with_a_dissipative_operator_is_unconditional() {
    let s = crate::generate::scheme(3358);
    let text = crate::render::case_text(&s);
    assert!(text.contains("method = \"bdf2\""), "{text}");
    let sys = &s.system;
    for d in 0..s.dims() {
        let a = &sys.flux[d];
        assert!(
            (a - a.transpose()).norm() <= 1e-15 * a.norm(),
            "A_{d} symmetric"
        );
        assert!(
            top_of_symmetric_part(&(-&sys.diffusion[d])) <= 1e-15,
            "K_{d} positive semidefinite"
        );
        assert!(s.first[d].is_central() && s.second[d].is_central());
    }
    let top = top_of_symmetric_part(&sys.source);
    assert!(top < -0.017, "λ_max(S) = {top}");
    let e = crate::engine::engine_limit(&text).unwrap();
    assert_eq!(e.kind, crate::engine::EngineKind::Unconditional);
    for (n, dt) in e.directions.iter().zip(&e.dt_by_direction) {
        assert!(dt.is_infinite(), "{n:?}: {dt}");
    }
}
