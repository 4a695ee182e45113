//! Named tests for reference errors at the corner θ_d = π of the wavevector
//! box, where a Rusanov split makes the explicit symbol a multiple of the
//! identity and the exact crossing has a closed form; the reference's f64
//! eigenvalues of the (degenerate) amplification matrix land a few ulps the
//! wrong side of 1 there.

use crate::reference_errors::engine_direction;
use crate::scheme::Mat;
use std::f64::consts::PI;

/// Spectral radius of a symmetric (to rounding) matrix, from its symmetric part.
fn symmetric_radius(a: &Mat) -> f64 {
    let sym = (a + a.transpose()) * 0.5;
    sym.symmetric_eigen()
        .eigenvalues
        .iter()
        .map(|x| x.abs())
        .fold(0.0, f64::max)
}

/// Seed 4365 (second long run): IMEX CNAB2 on a 3-D 3×3 system, a biased
/// user x-stencil with the Rusanov split A± = (A ± ρ(A) I)/2, implicit
/// central diffusion. Along +x the reference reported 0.17224126756 at
/// θ_x = π − 9e-9, 5.7e-8 below the engine.
///
/// Closed form (derived here). At θ = (π, 0, 0) the stencil's symbol S(π) =
/// Σ w_j (−1)^{o_j} is real, the mirror stencil's is −conj S(π) = −S(π), so the
/// flux term is −(A⁺ − A⁻) S(π)/h = −a I with a = ρ(A_x) S(π)/h; the other
/// axes' symbols vanish at θ = 0. The implicit part is −4K_x/h², κ ≥ 0 its
/// eigenvalues with the sign changed. CNAB2's characteristic polynomial per κ is
/// (1 + Δt κ/2) z² − (1 − Δt κ/2 − 3Δt a/2) z − Δt a/2, whose value at z = −1 is
/// 2 − 2 Δt a: every branch leaves the unit disc through −1 at Δt = 1/a =
/// h/(ρ(A_x) S(π)), whatever the diffusion (the other root is then
/// 1/(2 + κ/a), inside the disc). In 40-digit arithmetic (mpmath, during
/// triage) the limit is 0.17224127737224972 and ρ(G) − 1 at the engine's Δt is
/// −1.5e-13 at θ_x = π − δ for every δ in [0, 1e-3] probed: the engine is right
/// and the reference's ρ − 1 = 4.4e-14 at its witness is rounding of the
/// triple eigenvalue −1.
#[test]
fn cnab2_rusanov_corner_limit_is_the_closed_form() {
    let s = crate::generate::scheme(4365);
    let text = crate::render::case_text(&s);
    assert!(
        text.contains("method = \"imex-cnab2\"") && text.contains("upwind = \"rusanov\""),
        "{text}"
    );
    let x = &s.first[0];
    assert!(!x.is_central() && x.derivative == 1);
    let corner = x.symbol(PI);
    assert!(corner.im.abs() < 1e-12 * corner.re.abs(), "S(π) = {corner}");
    let rho = symmetric_radius(&s.system.flux[0]);
    let closed = s.spacing[0] / (rho * corner.re);
    assert!((closed - 0.17224127737224972).abs() < 1e-14, "{closed}");
    let e = crate::engine::engine_limit(&text).unwrap();
    for n in [[1.0, 0.0, 0.0], [-1.0, 0.0, 0.0]] {
        let (dt, w) = engine_direction(&e, &n);
        assert!(
            dt <= closed * (1.0 + 1e-9) && dt >= closed * (1.0 - 1e-6),
            "{n:?}: engine {dt}, closed form {closed}"
        );
        assert!(
            (w[0].abs() - PI).abs() < 1e-3,
            "{n:?}: the limit is set at the corner, not at {w:?}"
        );
    }
}
