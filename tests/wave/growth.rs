//! Growth of second-order-in-time methods in the discrete wave energy: no
//! false "weakly unstable" verdict from the secular mode a + bt at θ = 0, and
//! the central-difference energy bound.

use super::problem;
use kgain::analysis::growth::GrowthClass;
use kgain::analysis::{GrowthParams, Plan};
use kgain::{analyse, NoProgress, Par};

fn growth(method: &str, bg: Option<(f64, f64)>, courant: f64) -> kgain::analysis::GrowthResult {
    let p = problem(&[1.0], &[1.0], method, bg, courant);
    let plan = Plan::new(&[65]).with_growth(GrowthParams {
        steps: 200,
        epsilon: 1e-3,
        weights: None,
    });
    analyse(&p, &plan, Par::Seq, &NoProgress)
        .expect("the analyses run")
        .growth
        .expect("growth computed")
}

#[test]
fn central_difference_growth_stays_under_its_conserved_energy_bound() {
    // Central differences conserve Q = (1 − c²/4)|d|² + c²|s|² exactly (d and s
    // the difference and mean of the two levels, c = Δt·√ρ(−L); derived from
    // u^{n+1} − (2 − c²)u^n + u^{n−1} = 0), and the energy norm is |d|² + c²|s|²,
    // so ‖Gⁿ‖ ≤ 1/√(1 − c²/4) with c ≤ 2ν for C2 (ρ(−L) = 4c_wave²/h²).
    for nu in [0.3, 0.6, 0.9] {
        let g = growth("central-difference", None, nu);
        let bound = 1.0 / (1.0 - nu * nu).sqrt();
        assert!(
            g.peak.0 <= bound * (1.0 + 1e-9),
            "nu {nu}: {} > {bound}",
            g.peak.0
        );
        assert!(g.peak.0 >= 1.0 - 1e-12);
        assert_ne!(
            g.class,
            GrowthClass::WeaklyUnstable,
            "nu {nu}: {:?}",
            g.class
        );
        assert_ne!(g.class, GrowthClass::Unstable);
    }
}

#[test]
fn newmark_average_acceleration_is_not_called_weakly_unstable() {
    // The stacked levels alone would show ‖Gⁿ‖ ~ 1/(ωΔt) at the longest waves
    // and linear growth at θ = 0; in the energy state average acceleration,
    // which conserves energy (Hughes), stays within a few per cent of 1 at
    // Courant 2.5.
    let g = growth("newmark", Some((0.25, 0.5)), 2.5);
    assert!(matches!(
        g.class,
        GrowthClass::StableNormal | GrowthClass::StableTransientGrowth
    ));
    assert!(g.peak.0 < 1.1, "{}", g.peak.0);
    assert_eq!(g.defective_on_circle, 0);
}
