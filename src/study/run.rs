//! Running the combinations of a sweep: every combination's case is built and
//! checked first (a bad one stops the sweep before anything is computed), then
//! the analyses the figures need run in parallel over combinations or over
//! wavevectors, whichever has more work, never both (no oversubscription).

use super::figures::{self, FigureError};
use super::plan::SweepSpec;
use crate::analysis::analyse;
use crate::case::{Case, CaseError};
use crate::report::summary_json;
use crate::sample::{NoProgress, Par};
use rayon::prelude::*;
use std::ops::Range;
use std::path::Path;

/// Why a sweep could not be run.
#[derive(Debug, thiserror::Error)]
pub enum SweepError {
    /// A combination's case is invalid (exit 2).
    #[error("combination {index} ({what}): {source}")]
    Case {
        /// 0-based combination index.
        index: usize,
        /// Its key=value list.
        what: String,
        /// The case error (file, line, key).
        source: Box<CaseError>,
    },
    /// A figure is not a number in the summary (exit 2).
    #[error("combination {index} ({what}): {source}")]
    Figure {
        /// 0-based combination index.
        index: usize,
        /// Its key=value list.
        what: String,
        /// Why.
        source: FigureError,
    },
    /// An analysis failed (exit 1).
    #[error("combination {index} ({what}): {message}")]
    Analysis {
        /// 0-based combination index.
        index: usize,
        /// Its key=value list.
        what: String,
        /// What failed.
        message: String,
    },
}

impl SweepError {
    /// Whether the user's input is at fault (exit 2) rather than the computation.
    pub fn is_input(&self) -> bool {
        !matches!(self, SweepError::Analysis { .. })
    }
}

/// The inputs of a sweep run besides the plan.
pub struct SweepInput<'a> {
    /// The case text as read.
    pub text: &'a str,
    /// The path the case is validated under (relative names resolve from it).
    pub path: &'a Path,
    /// The user's own `--set` overrides, applied before the varied keys.
    pub overrides: &'a [String],
    /// Worker threads (0: one per core).
    pub threads: usize,
}

/// The validated case of combination `i`, restricted to the analyses the
/// figures need.
pub fn combination_case(
    input: &SweepInput,
    spec: &SweepSpec,
    i: usize,
) -> Result<Case, SweepError> {
    let mut overrides = input.overrides.to_vec();
    overrides.extend(spec.overrides(i));
    let analyses: Vec<String> = figures::analyses_for(&spec.figures)
        .iter()
        .map(|a| format!("\"{a}\""))
        .collect();
    overrides.push(format!("scan.analyses=[{}]", analyses.join(", ")));
    Case::from_str_with(input.text, input.path, &overrides).map_err(|source| SweepError::Case {
        index: i,
        what: spec.describe(i),
        source: Box::new(source),
    })
}

/// Builds and checks every case of `range` (no analysis yet).
pub fn prepare(
    input: &SweepInput,
    spec: &SweepSpec,
    range: Range<usize>,
) -> Result<Vec<Case>, SweepError> {
    range.map(|i| combination_case(input, spec, i)).collect()
}

/// The figures of each prepared case (in `range` order), calling `done` after
/// each combination.
pub fn run(
    input: &SweepInput,
    spec: &SweepSpec,
    range: Range<usize>,
    cases: &[Case],
    done: &(dyn Fn() + Sync),
) -> Result<Vec<Vec<f64>>, SweepError> {
    let threads = if input.threads == 0 {
        std::thread::available_parallelism().map_or(1, |n| n.get())
    } else {
        input.threads
    };
    let one = |(k, case): (usize, &Case), par: Par| -> Result<Vec<f64>, SweepError> {
        let index = range.start + k;
        let what = || spec.describe(index);
        let r = analyse(&case.problem, &case.plan, par, &NoProgress).map_err(|e| {
            SweepError::Analysis {
                index,
                what: what(),
                message: e.to_string(),
            }
        })?;
        if let Some(bad) = r.non_finite.first() {
            return Err(SweepError::Analysis {
                index,
                what: what(),
                message: format!(
                    "the {} could not be computed at {} wavevector(s)",
                    bad.quantity, bad.count
                ),
            });
        }
        let summary = summary_json(&case.problem, &r);
        let values = spec
            .figures
            .iter()
            .map(|f| figures::extract(&summary, f))
            .collect::<Result<Vec<f64>, _>>()
            .map_err(|source| SweepError::Figure {
                index,
                what: what(),
                source,
            })?;
        done();
        Ok(values)
    };
    if cases.len() >= threads && threads > 1 {
        // more combinations than threads: one combination per thread at a time
        Par::Threads(threads).run(|| {
            cases
                .par_iter()
                .enumerate()
                .map(|c| one(c, Par::Seq))
                .collect()
        })
    } else {
        cases
            .iter()
            .enumerate()
            .map(|c| one(c, Par::Threads(threads)))
            .collect()
    }
}
