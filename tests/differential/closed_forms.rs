//! Closed-form stability limits of classic schemes, each derived in a comment
//! with its source, checked against the engine (`*_engine`) and against the
//! independent reference (`*_reference`, which validates the yardstick itself).
//! A limit must lie in [want·(1 − 1e-6), want·(1 + 1e-9)]: never above it.

use crate::compare::{ABOVE, BELOW};
use crate::engine::{engine_limit, EngineLimit};
use crate::reference::{along_ray, overall};

mod diffusive;
mod hyperbolic;
use crate::render::case_text;
use crate::scheme::Scheme;
use crate::support::assert_close_to_scale;

/// Asserts want·(1 − BELOW) ≤ got ≤ want·(1 + ABOVE) with the shared comparator.
#[track_caller]
pub fn assert_limit(got: f64, want: f64, what: &str) {
    let centre = want * (1.0 + 0.5 * (ABOVE - BELOW));
    assert_close_to_scale(got, centre, 0.5 * (ABOVE + BELOW), want, what);
}

#[track_caller]
pub fn engine(s: &Scheme) -> EngineLimit {
    engine_limit(&case_text(s)).unwrap_or_else(|e| panic!("{e}\n{}", case_text(s)))
}

/// The engine's limit along the direction closest to `n`.
#[track_caller]
pub fn engine_direction(e: &EngineLimit, n: &[f64]) -> f64 {
    let dot = |v: &[f64]| v.iter().zip(n).map(|(a, b)| a * b).sum::<f64>();
    let (i, _) = e
        .directions
        .iter()
        .enumerate()
        .max_by(|a, b| dot(a.1).total_cmp(&dot(b.1)))
        .expect("the engine reports directions");
    assert!(
        dot(&e.directions[i]) > 1.0 - 1e-12,
        "direction {n:?} is in the engine's list"
    );
    e.dt_by_direction[i]
}

/// The reference along the unit direction `n`.
pub fn reference_direction(s: &Scheme, n: &[f64]) -> f64 {
    along_ray(s, n, &overall(s)).dt
}

pub const D45: [f64; 2] = [
    std::f64::consts::FRAC_1_SQRT_2,
    std::f64::consts::FRAC_1_SQRT_2,
];

/// Prints engine, reference and closed form side by side for every overall
/// case (run with `-- --ignored --nocapture`), checking the reference again.
#[test]
#[ignore = "a helper: prints engine, reference and closed form side by side"]
fn print_closed_form_table() {
    for (name, s, want) in diffusive::cases().into_iter().chain(hyperbolic::cases()) {
        let e = engine(&s);
        let r = overall(&s);
        println!(
            "{name}: engine {:?} {:.12e}; reference {:?} {:.12e} (±{:.1e} relative: {}); closed form {want:.12e}",
            e.kind, e.dt_max, r.kind, r.dt, r.uncertainty, r.note
        );
        if want.is_finite() {
            assert_limit(r.dt, want, name);
        }
    }
}

/// The engine's limit along each of `directions` lies within 1e-6 below
/// `truth` and at most 1e-9 above it.
#[track_caller]
pub fn assert_directions_at(e: &crate::engine::EngineLimit, directions: &[&[f64]], truth: f64) {
    for n in directions {
        let dt = engine_direction(e, n);
        assert!(
            dt <= truth * (1.0 + 1e-9) && dt >= truth * (1.0 - 1e-6),
            "direction {n:?}: engine {dt}, truth {truth}"
        );
    }
}

/// The engine's overall limit lies within 1e-6 below `truth` and at most 1e-9
/// above it.
#[track_caller]
pub fn assert_overall_at(e: &crate::engine::EngineLimit, truth: f64) {
    assert!(
        e.dt_max <= truth * (1.0 + 1e-9) && e.dt_max >= truth * (1.0 - 1e-6),
        "engine {}, truth {truth}",
        e.dt_max
    );
}
