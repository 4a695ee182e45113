//! Named tests for reference errors where the engine reports none and the
//! reference a bounded limit, for Adams–Bashforth 3 (the AB2 and IMEX CNAB2
//! ones are in `ab2_reference_errors`). AB3, unlike AB2, damps on the
//! imaginary axis near 0 (|ζ| − 1 ≈ −(3/8)(Δt Im μ)⁴), so its long waves do
//! not sink it; what does is an eigenvalue of L itself with a positive real
//! part, in a region of θ the reference's samples miss.

use crate::amplification::amplification;
use crate::engine::{engine_limit, EngineKind};
use crate::generate;
use crate::radius::spectral_radius;
use crate::render::case_text;
use crate::symbol::Parts;

/// Seed 9573: AB3 on a 3-D 3×3 system with third-order upwinding
/// (characteristic split) on every axis and a symmetric negative definite
/// source whose weakest eigenvalue is −3.8e-4. The upwinded parts of the three
/// axes do not commute, and near θ = 0 the flux's coupling through the source
/// turns the weakest branch unstable: at θ* = (0.05855, −0.27880, −0.09166)
/// (the engine's witness) the largest real part of an eigenvalue of L is
/// 0.0172014329003 in 40 digits (positive along θ*/|θ*| for s ≈ 0.03 … 0.45,
/// where |θ*| = 0.299), so ρ(G) ≈ 1 + Δt·0.0172 as Δt → 0 (G's principal root
/// is 1 + z + O(z²)): unstable at every small Δt, and in 40 digits ρ(G) − 1 is
/// 1.72e-14, 1.72e-10, 1.72e-6, 1.74e-4, 3.34e-4, 4.91e-4 at Δt = 1e-12,
/// 1e-8, 1e-4, 1.018e-2, 2e-2, 5e-2: none. The region lies between the nodes of
/// the reference's grid (17 points per axis; none of its nodes has Re μ > 0),
/// which reported a bounded limit 1.0179e-2 at a corner-side wavevector.
/// Checked here in f64 from the reference's own L and G, where the growth is
/// far above rounding.
#[test]
fn unstable_operator_between_the_reference_samples_sinks_ab3() {
    let (seed, reference) = (9573, 1.017883039689835e-2);
    let s = generate::scheme(seed);
    let text = case_text(&s);
    assert!(text.contains("method = \"ab3\""), "{text}");
    let theta = [
        0.058554922887572136,
        -0.2788010081982155,
        -0.09165535207616715,
    ];
    let p = Parts::at(&s, &theta);
    let l = p.total();
    let abscissa = nalgebra::linalg::Schur::new(l)
        .eigenvalues()
        .expect("complex Schur form")
        .iter()
        .map(|z| z.re)
        .fold(f64::NEG_INFINITY, f64::max);
    assert!(
        (abscissa - 0.017_201_432_900_3).abs() < 1e-9,
        "Re μ = {abscissa}"
    );
    for dt in [1e-6, 1e-4, 1e-3, reference, 2.0 * reference] {
        let growth = spectral_radius(&amplification(&s, &p, &theta, dt)) - 1.0;
        // ρ − 1 = Δt Re μ + O(Δt²): at least half of it over this range
        assert!(growth > 0.5 * dt * abscissa, "Δt {dt}: ρ − 1 = {growth:e}");
    }
    let e = engine_limit(&text).unwrap();
    assert_eq!(e.kind, EngineKind::None, "{:?}", e.dt_max);
}
