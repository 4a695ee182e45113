//! The one place that touches the engine: case text in, the engine's limit out.
//! When the engine's API changes, only [`engine_limit`] needs adapting.

use kgain::analysis::{self, LimitKind};
use kgain::case::Case;
use kgain::sample::{NoProgress, Par};
use std::path::Path;

/// Kind of limit, as the engine reports it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EngineKind {
    /// A finite largest stable Δt.
    Bounded,
    /// Stable for every Δt.
    Unconditional,
    /// Unstable for every Δt.
    None,
}

/// The engine's answer for one case.
#[derive(Debug, Clone)]
pub struct EngineLimit {
    /// Kind.
    pub kind: EngineKind,
    /// Largest stable Δt.
    pub dt_max: f64,
    /// Wave directions (unit vectors in θ-space).
    pub directions: Vec<Vec<f64>>,
    /// Largest stable Δt along each direction.
    pub dt_by_direction: Vec<f64>,
    /// The wavevector that sets the overall limit.
    pub wavevector: Vec<f64>,
    /// The wavevector that sets each directional limit.
    pub wavevector_by_direction: Vec<Vec<f64>>,
    /// A certified bracket [lower, upper] of the true limit, when the engine
    /// provides one (today's engine does not).
    pub certified: Option<(f64, f64)>,
}

/// Why the engine gave no answer.
#[derive(Debug, thiserror::Error)]
pub enum EngineError {
    /// The case text was refused.
    #[error("the engine refused the case: {0}")]
    Case(String),
    /// The analysis failed.
    #[error("the engine's analysis failed: {0}")]
    Analysis(String),
    /// The limit analysis produced nothing.
    #[error("the engine returned no limit")]
    Missing,
}

/// Runs the engine's limit analysis on case text.
pub fn engine_limit(case_text: &str) -> Result<EngineLimit, EngineError> {
    let case = Case::from_str_with(case_text, Path::new("x.toml"), &[])
        .map_err(|e| EngineError::Case(e.to_string()))?;
    let results = analysis::analyse(&case.problem, &case.plan, Par::Seq, &NoProgress)
        .map_err(|e| EngineError::Analysis(e.to_string()))?;
    let limit = results.limit.as_ref().ok_or(EngineError::Missing)?;
    let kind = match limit.kind {
        LimitKind::Bounded => EngineKind::Bounded,
        LimitKind::Unconditional => EngineKind::Unconditional,
        LimitKind::None => EngineKind::None,
    };
    let d = &limit.by_direction;
    let (directions, dt_by_direction, wavevector_by_direction) =
        (d.directions.clone(), d.dt.clone(), d.wavevector.clone());
    Ok(EngineLimit {
        kind,
        dt_max: limit.dt_max,
        directions,
        dt_by_direction,
        wavevector: limit.wavevector.clone(),
        wavevector_by_direction,
        certified: limit.bracket,
    })
}
