//! The path every fuzz target runs a case through, and the one
//! `tests/fuzz_regressions.rs` replays findings on: case text (and `--set`
//! overrides) → [`Case`] → the memory estimate of the case's own plan → the
//! plan shrunk to a tiny scan → [`analyse`] on the calling thread → the JSON
//! summary and the terminal table, built in memory. Refusals are the expected
//! outcome for most fuzzed input; a panic, an abort or a hang anywhere on this
//! path is a finding.
//!
//! Only the radius map is cheap on a tiny grid. Growth and dispersion cost a
//! fixed 0.05–0.7 s each whatever the grid, and so does the limit of a
//! one-step method; the limit of a multistep method took up to 1.7 s and that
//! of a composite scheme 1–23 s (all measured with `kgain run` on the bundled
//! cases and the findings, 9 points per axis, one thread). So every valid case
//! gets the radius map, and one input in [`EXTRA_EVERY`] (picked by a hash of
//! the input, so a finding replays the same way) also gets one more of the
//! analyses its case asks for, also picked by the hash: growth, dispersion, or
//! the limit of a one-step method.

use kgain::analysis::{analyse, Plan, RadiusParams};
use kgain::case::Case;
use kgain::report::{human_summary, summary_json};
use kgain::time::Scheme;
use kgain::{NoProgress, Par, Problem};
use std::path::Path;

/// The name the case text is validated under (never read from disk).
pub const FILE: &str = "fuzzed-case.toml";
/// Points per axis of the shrunken scan (1-D and 2-D).
pub const POINTS: usize = 9;
/// Points per axis of the shrunken scan in 3-D.
pub const POINTS_3D: usize = 5;
/// Wave directions of the limit and dispersion analyses.
pub const DIRECTIONS: usize = 6;
/// Horizon of the growth envelope.
pub const STEPS: usize = 6;
/// Sampled matrices kept.
pub const MATRICES: usize = 2;
/// One input in this many runs one more analysis than the radius map.
pub const EXTRA_EVERY: u64 = 32;

/// What became of one input.
#[derive(Debug)]
pub enum Outcome {
    /// The case (or an override) was refused, with this message.
    Refused(String),
    /// The case was valid and the tiny scan ran; its JSON summary.
    Ran(serde_json::Value),
}

/// The analyses besides the radius map, in the order [`extra`] picks them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Extra {
    /// The limit (one-step methods only).
    Limit,
    /// Non-normality and transient growth.
    Growth,
    /// Dispersion and dissipation.
    Dispersion,
}

/// Which analysis this input runs besides the radius map, if any: by an
/// FNV-1a hash of the text and the overrides.
pub fn extra(text: &str, overrides: &[String]) -> Option<Extra> {
    let bytes = std::iter::once(text)
        .chain(overrides.iter().map(String::as_str))
        .flat_map(str::bytes);
    let h = bytes.fold(0xcbf2_9ce4_8422_2325_u64, |h, b| {
        (h ^ u64::from(b)).wrapping_mul(0x0100_0000_01b3)
    });
    let pick = [Extra::Limit, Extra::Growth, Extra::Dispersion];
    (h % EXTRA_EVERY == 0).then(|| pick[(h / EXTRA_EVERY % 3) as usize])
}

/// The case's plan cut down to a tiny scan: every size capped, the radius map,
/// and the `extra` analysis when the case asks for it (the limit only for a
/// one-step method).
pub fn shrink(plan: &Plan, problem: &Problem, extra: Option<Extra>) -> Plan {
    let mut p = plan.clone();
    let one_step = matches!(problem.method.scheme, Scheme::OneStep(_));
    if extra != Some(Extra::Limit) || !one_step {
        p.limit = None;
    }
    if extra != Some(Extra::Growth) {
        p.growth = None;
    }
    if extra != Some(Extra::Dispersion) {
        p.dispersion = None;
    }
    p.radius = Some(RadiusParams);
    let cap = if p.points.len() == 3 {
        POINTS_3D
    } else {
        POINTS
    };
    for n in &mut p.points {
        *n = (*n).min(cap);
    }
    if let Some(l) = &mut p.limit {
        l.directions = l.directions.min(DIRECTIONS);
    }
    if let Some(g) = &mut p.growth {
        g.steps = g.steps.min(STEPS);
    }
    if let Some(d) = &mut p.dispersion {
        d.directions = d.directions.min(DIRECTIONS);
    }
    p.matrices = p.matrices.min(MATRICES);
    p
}

/// Validates `text` with `overrides` and, when valid, runs the tiny scan.
///
/// Panics (a finding) when a validated case's shrunken plan is refused by the
/// analysis: shrinking only lowers sizes the plan check caps from above.
pub fn run(text: &str, overrides: &[String]) -> Outcome {
    let case = match Case::from_str_with(text, Path::new(FILE), overrides) {
        Ok(c) => c,
        Err(e) => return Outcome::Refused(e.to_string()),
    };
    // The pre-flight of `kgain run` sizes the case's own (unshrunken) plan.
    let _ = case.plan.memory_estimate(&case.problem, 1);
    let plan = shrink(&case.plan, &case.problem, extra(text, overrides));
    let results = match analyse(&case.problem, &plan, Par::Seq, &NoProgress) {
        Ok(r) => r,
        Err(e) => panic!("a validated case's tiny plan was refused: {e}"),
    };
    let table = human_summary(&case.problem, &results, None);
    assert!(!table.is_empty(), "empty terminal summary");
    Outcome::Ran(summary_json(&case.problem, &results))
}
