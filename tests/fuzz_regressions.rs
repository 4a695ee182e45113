//! Regression tests for the findings of the fuzz targets in `fuzz/`: each
//! offending input, saved under `fuzz/findings/`, is run through the same path
//! as the fuzz targets (`fuzz/src/tiny.rs`, included here by path: case text →
//! case → memory estimate → tiny scan → summaries) and must give a clean
//! refusal or a result, never a panic.

#[path = "../fuzz/src/tiny.rs"]
mod tiny;

use kgain::analysis::{analyse, LimitKind, LimitParams, Plan};
use kgain::case::Case;
use kgain::{NoProgress, Par};
use std::path::Path;
use tiny::Outcome;

/// Runs a finding through the fuzz path; its outcome.
fn replay(text: &str, overrides: &[&str]) -> Outcome {
    let overrides: Vec<String> = overrides.iter().map(|s| s.to_string()).collect();
    tiny::run(text, &overrides)
}

/// The JSON summary of a finding that must validate and run.
fn ran(outcome: Outcome) -> serde_json::Value {
    match outcome {
        Outcome::Ran(json) => json,
        Outcome::Refused(m) => panic!("expected a result, got a refusal: {m}"),
    }
}

/// case_text, timeout (> 2 s for one input): the lake case's linear system with
/// the x flux changed to [[5, 40, 0], [9.81, 0, 0], [5, 0, 0]] (complex flux
/// eigenvalues) under leapfrog is unstable for every Δt, and the limit search
/// took 1.7 s on a 9×9 scan and about 50 s on the case's own 130×129 scan with
/// 180 directions (the unmodified case: 0.3 s): every ray ran the full first-exit
/// search. Fixed: a ray that meets a wavevector where L has Re μ > 0 is "none" at
/// once (0.25 s on the case's own scan). The fuzz path still runs the limit only
/// for one-step methods (composite searches take seconds). The limit must come
/// out as "none", on the tiny scan and on the case's own scan well inside the
/// time the unfixed search took.
#[test]
fn leapfrog_system_unstable_for_every_dt_gives_no_stable_dt() {
    let text = include_str!("../fuzz/findings/leapfrog-system-unstable-for-every-dt.toml");
    let json = ran(replay(text, &[]));
    assert_eq!(json["radius"]["stable"], false, "{json:#}");
    let case = Case::from_str_with(text, Path::new(tiny::FILE), &[]).unwrap();
    let plan = Plan::new(&[9, 9]).with_limit(LimitParams { directions: 6 });
    let results = analyse(&case.problem, &plan, Par::Seq, &NoProgress).unwrap();
    let limit = results.limit.unwrap();
    assert_eq!(limit.kind, LimitKind::None);
    assert_eq!(limit.dt_max, 0.0);
    let started = std::time::Instant::now();
    let own = Plan::new(&[130, 129]).with_limit(LimitParams { directions: 180 });
    let results = analyse(&case.problem, &own, Par::Seq, &NoProgress).unwrap();
    assert_eq!(results.limit.unwrap().kind, LimitKind::None);
    let secs = started.elapsed().as_secs_f64();
    assert!(
        secs < 20.0,
        "the case's own scan took {secs:.1} s (50 s before the fix)"
    );
}

/// case_text, timeout: the bundled feedline case (only its comments mutated:
/// compact4 + AB3 on the telegraph system) when the fuzz path still ran every
/// analysis for one input in 32: the limit (0.9 s), growth (0.55 s) and
/// dispersion on a 9-point scan together passed 2 s with debug assertions on.
/// No library fault; the fuzz path now adds at most one analysis to the radius
/// map. The case must run and be stable at its Δt.
#[test]
fn feedline_ab3_case_runs_on_the_fuzz_path() {
    let text = include_str!("../fuzz/findings/feedline-ab3-every-analysis.toml");
    let json = ran(replay(text, &[]));
    assert_eq!(json["radius"]["stable"], true, "{json:#}");
}

/// user_stencils_and_tableaux, timeout: a 12-point first-derivative stencil
/// reaching 228 cells to the left, a one-stage implicit tableau a = [[−228.45]]
/// and Courant number 284 on 2-D acoustics, run with every analysis on the old
/// fuzz path (1.4 s with debug assertions, over 2 s on the loaded machine). No
/// library fault; the case must validate and its radius map must be finite.
#[test]
fn wide_user_stencil_with_implicit_tableau_runs() {
    let text = include_str!("../fuzz/findings/wide-user-stencil-with-tableau.toml");
    let json = ran(replay(text, &[]));
    let max = json["radius"]["max"].as_f64().expect("a radius");
    assert!(max.is_finite() && max > 0.0, "{json:#}");
}

/// user_stencils_and_tableaux, timeout (the 10⁷-execution run, 2 s with the
/// other core building): an 11-point first-derivative stencil reaching 147
/// cells to the left, an eight-stage implicit tableau with entries up to 257 and
/// Courant number 257 on 2-D acoustics, whose extra analysis on the fuzz path is
/// the limit. 1.85 s alone on the instrumented fuzz build, 0.43 s as a release
/// `kgain run` on the same 9-point scan. A second input of the family (only the
/// first row of a nonzero, entries up to 655) took 2.2 s. Cause: the
/// coefficients of R(z) = P(z)/Q(z), interpolated on the unit circle, kept
/// rounding noise (about 1e-13 of the values there, above the old absolute 1e-14
/// cut) as high-degree coefficients, so every exit computation solved a
/// degree-16 polynomial with spurious huge roots. Fixed: coefficients below
/// 1e-13 of the largest value on the circle are zero; Q = 1 − 257z is of degree
/// one, as det(I − zA) is for a matrix with one nonzero row, and the limit takes
/// 0.04 s. Both cases must run on the fuzz path and have low-degree P and Q.
#[test]
fn eight_stage_implicit_tableau_with_wide_stencil_runs() {
    for text in [
        include_str!("../fuzz/findings/eight-stage-implicit-tableau-wide-stencil.toml"),
        include_str!("../fuzz/findings/first-row-tableau-wide-stencil.toml"),
    ] {
        assert_eq!(tiny::extra(text, &[]), Some(tiny::Extra::Limit));
        let json = ran(replay(text, &[]));
        let max = json["radius"]["max"].as_f64().expect("a radius");
        assert!(max.is_finite() && max > 0.0, "{json:#}");
        assert!(json["limit"]["kind"].is_string(), "{json:#}");
        let case = Case::from_str_with(text, Path::new(tiny::FILE), &[]).unwrap();
        let kgain::time::Scheme::OneStep(os) = &case.problem.method.scheme else {
            panic!("a one-step method");
        };
        // det(I − zA) with one nonzero row of A is 1 − a₀₀z
        assert_eq!(os.q.len(), 2, "Q = {:?}", os.q);
        assert!((os.q[1] + 257.0).abs() < 1e-9, "Q = {:?}", os.q);
        assert!(os.p.len() <= 3, "P = {:?}", os.p);
    }
}

/// user_stencils_and_tableaux, timeout (third 10⁷ attempt, after 1,370,890
/// executions, on the code with the coefficient fix above): the same wide
/// stencil with an eight-stage tableau whose a has one nonzero row and whose
/// weights b reach ±1956 (P of degree 2, Q of degree 1): 2.27 s on the
/// instrumented build alone, 0.54 s as a release `kgain run` of the limit on
/// the 9-point scan, about half of it in the long-wave search at θ = 0 (the
/// stencil reaches 147 cells, so the long-wave regime starts only near
/// s = 1/147 and the extrapolation runs many halvings), the rest in the
/// continuous refinement of the screened candidates.
/// Not yet made cheaper: the case must run on the fuzz path with a finite
/// radius map and a limit.
#[test]
fn wide_stencil_with_large_tableau_weights_runs() {
    let text = include_str!("../fuzz/findings/wide-stencil-tableau-large-weights.toml");
    let json = ran(replay(text, &[]));
    let max = json["radius"]["max"].as_f64().expect("a radius");
    assert!(max.is_finite() && max > 0.0, "{json:#}");
    let case = Case::from_str_with(text, Path::new(tiny::FILE), &[]).unwrap();
    let plan = Plan::new(&[9, 9]).with_limit(LimitParams { directions: 6 });
    let results = analyse(&case.problem, &plan, Par::Seq, &NoProgress).unwrap();
    assert!(results.limit.is_some());
}

/// user_stencils_and_tableaux, timeout (CI fuzz smoke): a 12-point stencil
/// whose offsets reach 6.6e95 cells on 2-D acoustics, run with the dispersion
/// analysis on the 9-point scan. Its symbol is nowhere smooth, so every step of
/// the continuation along a ray (the modes' names where eigenvector shapes do
/// not decide) was unclear and halved to the limit: about 560 eigenproblems per
/// ray instead of about 15, 5.2 s on the instrumented build. Fixed: a ray
/// spends at most 256 eigenproblems on halvings (1.2 s; the bound itself is
/// tested in `frequencies`, where the old code took 1,017 on one ray). The case
/// must run on the fuzz path with its dispersion analysis and report the
/// dispersion of every mode.
#[test]
fn stencil_with_huge_offsets_keeps_the_dispersion_rays_short() {
    let text = include_str!("../fuzz/findings/huge-stencil-offsets-dispersion-rays.toml");
    assert_eq!(tiny::extra(text, &[]), Some(tiny::Extra::Dispersion));
    let json = ran(replay(text, &[]));
    let max = json["radius"]["max"].as_f64().expect("a radius");
    assert!(max.is_finite() && max > 0.0, "{json:#}");
    let modes = json["dispersion"]["modes"]
        .as_array()
        .expect("dispersion modes");
    // 2-D acoustics: the two sound waves and the vorticity wave, each named
    assert_eq!(modes.len(), 3, "{json:#}");
    assert!(modes.iter().all(|m| m["name"].is_string()), "{json:#}");
}

/// case_text, timeout (> 2 s for one input; 1.1 s in the fuzzing build on an
/// idle machine): the combustor case with its mean flow commented out (3-D
/// Euler at rest, central2 in every axis, RK4), whose tiny scan runs the
/// limit. Its long-wave search evaluates the first-loss closed form at a few
/// thousand directions, and every evaluation classified the operator's terms
/// again (a stencil's centrality test compares its symbol with its mirror's
/// at 16 points): two thirds of the time. Fixed: the term classes are computed once per operator
/// (`Operator::term_classes`). The limit must still be the closed form: RK4's
/// imaginary-axis limit 2√2 over c·√(Σ 1/h_d²) (the corner θ_d = ±π/2 of
/// central2 in every axis; c² = γp/ρ with γ = 1.4, the model's default).
#[test]
fn euler_at_rest_rk4_limit_is_the_corner_closed_form() {
    let text = include_str!("../fuzz/findings/euler-rk4-limit-long-wave-reclassified.toml");
    assert_eq!(tiny::extra(text, &[]), Some(tiny::Extra::Limit));
    let json = ran(replay(text, &[]));
    let c = (1.4_f64 * 1.1e5 / 0.45).sqrt();
    let root_sum: f64 = [2.0e-3_f64, 2.0e-3, 4.0e-3]
        .iter()
        .map(|h| h.powi(-2))
        .sum::<f64>()
        .sqrt();
    let expected = 2.0 * 2.0_f64.sqrt() / (c * root_sum);
    let got = json["limit"]["dt_max"].as_f64().expect("a bounded limit");
    assert!(
        (got - expected).abs() <= 1e-9 * expected,
        "dt_max {got:e}, closed form {expected:e}"
    );
    assert_eq!(json["limit"]["kind"], "bounded", "{json:#}");
}
