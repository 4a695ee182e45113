//! Named regression tests: one seed each, one per failure class found by the
//! sweep. `assert_seed_agrees` runs one seed through the whole comparison.

use crate::compare::{check_seed, Verdict};

/// Seeds of the CI sweep (1..=200) on which today's engine fails, with the
/// method, dimension and what fails ("bounded for none": the engine reports a
/// limit where the reference finds instability at every Δt; "tolerance band":
/// at the engine's Δt, ρ − 1 lies between roundoff and the engine's own
/// `scan.tolerance` of 1e-12). The sweep tolerates these; each class has a
/// named test below, ignored until the engine is fixed. Remove a seed once it
/// passes.
pub const KNOWN_ENGINE_FAILURES: &[(u64, &str)] = &[
    (1, "forward-backward 2-D: too large (tolerance band)"),
    (
        4,
        "lax-friedrichs 2-D: bounded for none; too large (tolerance band) long-wave",
    ),
    (11, "heun 3-D: too large"),
    (20, "imex-cnab2 1-D: bounded for none"),
    (23, "imex-euler 2-D: bounded for none"),
    (26, "ab2 2-D: unconditional for none"),
    (31, "imex-euler 1-D: too large (tolerance band) long-wave"),
    (34, "theta 2-D: bounded for none"),
    (
        35,
        "lax-friedrichs 2-D: bounded for none; unconditional for bounded",
    ),
    (
        40,
        "lax-wendroff 2-D: too large (tolerance band) long-wave; too large long-wave",
    ),
    (41, "lax-friedrichs 1-D: bounded for none"),
    (43, "imex-cnab2 2-D: bounded for none"),
    (44, "lax-wendroff 2-D: too large long-wave"),
    (49, "euler 3-D: bounded for none"),
    (52, "imex-cnab2 1-D: bounded for none"),
    (55, "heun 1-D: too large"),
    (
        56,
        "imex-euler 2-D: too large (tolerance band); too large long-wave",
    ),
    (58, "imex-euler 3-D: bounded for none"),
    (64, "imex-euler 1-D: bounded for none"),
    (
        68,
        "lax-friedrichs 3-D: too large (tolerance band) long-wave; too large long-wave",
    ),
    (71, "imex-euler 1-D: too large (tolerance band) long-wave"),
    (75, "lax-friedrichs 3-D: bounded for none"),
    (76, "forward-backward 3-D: bounded for none"),
    (78, "imex-euler 1-D: bounded for none"),
    (80, "imex-cnab2 2-D: bounded for none"),
    (
        91,
        "lax-friedrichs 2-D: too large (tolerance band) long-wave; too large long-wave",
    ),
    (
        92,
        "imex-euler 3-D: bounded for none; too large (tolerance band) long-wave",
    ),
    (96, "lax-friedrichs 1-D: bounded for none"),
    (100, "lax-wendroff 2-D: too large long-wave"),
    (104, "euler 2-D: too large (tolerance band) long-wave"),
    (107, "backward-euler 1-D: bounded for none"),
    (108, "tableau 1-D: bounded for none"),
    (118, "theta 2-D: too large (tolerance band) long-wave"),
    (
        121,
        "lax-friedrichs 3-D: bounded for none; unconditional for bounded",
    ),
    (122, "ab2 1-D: none for bounded; too large"),
    (124, "imex-euler 2-D: bounded for none"),
    (126, "lax-friedrichs 2-D: bounded for none; too large"),
    (128, "ab2 3-D: too large"),
    (129, "heun 2-D: bounded for none"),
    (131, "lax-wendroff 2-D: too large long-wave"),
    (132, "imex-euler 2-D: too large"),
    (
        133,
        "lax-friedrichs 2-D: bounded for none; unconditional for bounded",
    ),
    (136, "imex-euler 1-D: bounded for none"),
    (140, "lax-wendroff 2-D: bounded for none"),
    (142, "imex-euler 2-D: bounded for none"),
    (143, "imex-cnab2 3-D: bounded for none"),
    (146, "imex-euler 2-D: too large (tolerance band)"),
    (150, "imex-euler 2-D: bounded for none; too large"),
    (152, "lax-wendroff 2-D: too large long-wave"),
    (154, "lax-friedrichs 1-D: bounded for none"),
    (155, "imex-cnab2 1-D: too large (tolerance band) long-wave"),
    (156, "ab3 3-D: too large (tolerance band)"),
    (159, "imex-cnab2 3-D: bounded for none"),
    (160, "imex-cnab2 1-D: too large"),
    (
        164,
        "imex-euler 3-D: too large (tolerance band); too large long-wave",
    ),
    (168, "theta 1-D: bounded for none"),
    (169, "imex-euler 1-D: too large (tolerance band) long-wave"),
    (175, "imex-euler 2-D: bounded for none"),
    (177, "imex-cnab2 3-D: too large"),
    (180, "imex-euler 3-D: bounded for none"),
    (181, "forward-backward 1-D: too large (tolerance band)"),
    (185, "tableau 3-D: bounded for none"),
    (
        187,
        "imex-euler 2-D: too large (tolerance band) long-wave; too large long-wave",
    ),
    (
        190,
        "imex-euler 2-D: too large (tolerance band) long-wave; too large long-wave",
    ),
    (192, "lax-friedrichs 2-D: bounded for none"),
    (195, "lax-friedrichs 1-D: bounded for none"),
    (
        198,
        "imex-cnab2 2-D: too large (tolerance band); too large (tolerance band) long-wave",
    ),
    (199, "euler 2-D: too small"),
];

/// Runs one seed (all directions) and asserts that the engine agrees with the
/// reference; an inconclusive reference fails too, so a regression seed must
/// be decidable.
#[track_caller]
pub fn assert_seed_agrees(seed: u64) {
    let o = check_seed(seed, usize::MAX);
    if let Some(report) = o.failures() {
        panic!("{report}");
    }
    assert_eq!(o.overall, Verdict::Pass, "seed {seed}: {:?}", o.overall);
}

const ENGINE_FAILS: &str = "fails on today's engine; see KNOWN_ENGINE_FAILURES";

/// IMEX CNAB2 on a 1-D system unstable at every Δt (ρ − 1 ∝ Δt): the engine's
/// composite search counts |λ| ≤ 1 + 1e-12 as stable and reports a tiny limit.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn composite_scheme_unstable_at_every_dt_is_reported_none() {
    assert_seed_agrees(20);
}

/// A θ-method (2-D) unstable at every Δt reported with a finite limit.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn one_step_scheme_unstable_at_every_dt_is_reported_none() {
    assert_seed_agrees(34);
}

/// IMEX Euler (2-D) whose limit is set as θ → 0: the engine's limit is above
/// the long-wave limit.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn long_wave_limit_is_not_overestimated() {
    assert_seed_agrees(56);
}

/// Unsplit Lax–Wendroff (2-D) with a long-wave limit overestimated by ~1e-3.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn lax_wendroff_long_wave_limit_is_not_overestimated() {
    assert_seed_agrees(40);
}

/// Heun in 3-D: a per-direction limit 2.8e-4 above the minimum on its ray.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn direction_limit_finds_the_minimum_on_its_ray() {
    assert_seed_agrees(11);
}

/// Forward–backward (2-D): the limit lies where ρ − 1 reaches the engine's
/// tolerance 1e-12, 1.6e-9 relative above the strict limit.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn tolerance_band_does_not_raise_the_limit() {
    assert_seed_agrees(1);
}

/// AB2 in 2-D: overall none, yet a direction along which the central stencil
/// gives imaginary eigenvalues (AB2 is unstable there at every Δt) is reported
/// unconditional.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn direction_with_an_unstable_ray_is_not_unconditional() {
    assert_seed_agrees(26);
}

/// Heun with a rotation source (1-D): every ray starts in the instability at
/// θ → 0, yet the directions are reported bounded far above the reference.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn direction_through_an_unstable_long_wave_is_not_reported_stable() {
    assert_seed_agrees(55);
}

/// AB2 + upwind3 (1-D): stable for small Δt, reported none overall, while its
/// directions are reported bounded above the reference.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn scheme_stable_for_small_dt_is_not_reported_none() {
    assert_seed_agrees(122);
}

/// Lax–Friedrichs (2-D) with a rotation source: none overall, and a direction
/// reported unconditional.
#[test]
#[ignore = "fails on today's engine; see KNOWN_ENGINE_FAILURES"]
fn lax_friedrichs_with_rotation_is_reported_none() {
    assert_seed_agrees(35);
}

/// A seed the engine passes today (keeps the helper itself tested).
#[test]
fn passing_seed_agrees_with_the_reference() {
    assert_seed_agrees(2);
}

/// Every known failure names its class, and the list has no duplicates.
#[test]
fn known_failures_are_listed_once_with_a_class() {
    let mut seeds: Vec<u64> = KNOWN_ENGINE_FAILURES.iter().map(|(s, _)| *s).collect();
    seeds.sort_unstable();
    seeds.dedup();
    assert_eq!(
        seeds.len(),
        KNOWN_ENGINE_FAILURES.len(),
        "{ENGINE_FAILS}: duplicates"
    );
    assert!(KNOWN_ENGINE_FAILURES.iter().all(|(_, c)| c.contains(':')));
}
