//! The gate of `kgain run` for a solver's CI: `--require-stable` and
//! `--require-margin F`, and the one-line machine-readable verdict printed on
//! stderr whenever the gate fails (exit code 3), even with `--quiet`.

use kgain::analysis::modes::Measure;
use kgain::analysis::{LimitKind, Results, Verdict};
use serde_json::json;

/// What the run was asked to require.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Gate {
    /// Exit 3 when the scheme is unstable at the case's Δt.
    pub stable: bool,
    /// Exit 3 unless Δt ≤ F·dt_max (F in (0, 1]).
    pub margin: Option<f64>,
}

impl Gate {
    /// Whether anything is required.
    pub fn active(&self) -> bool {
        self.stable || self.margin.is_some()
    }
}

/// Checks `--require-margin`'s value: a number in (0, 1].
pub fn parse_margin(text: &str) -> Result<f64, String> {
    let f: f64 = text
        .trim()
        .parse()
        .map_err(|_| format!("'{text}' is not a number"))?;
    if f > 0.0 && f <= 1.0 {
        Ok(f)
    } else {
        Err(format!(
            "{f} is outside (0, 1]: the margin is the fraction of dt_max that dt may reach"
        ))
    }
}

/// The failed requirement as one line of JSON (None when the gate passes).
pub fn failure(gate: Gate, results: &Results) -> Option<String> {
    let limit = results.limit.as_ref();
    let dt = results.dt;
    let dt_max = limit.map(|l| l.dt_max);
    let unstable = results.verdict == Verdict::Unstable;
    let (status, reason) = match (gate.margin, limit) {
        (Some(f), Some(l)) if l.kind == LimitKind::None => (
            false,
            format!("no time step is stable (margin {f} required)"),
        ),
        (Some(f), Some(l)) if l.kind == LimitKind::Bounded && dt > f * l.dt_max => {
            (false, format!("dt exceeds {f} x dt_max"))
        }
        _ if gate.stable && unstable => (false, "unstable at the case's dt".to_string()),
        _ => (true, String::new()),
    };
    if status {
        return None;
    }
    let worst = limit
        .map(|l| l.wavevector.clone())
        .or_else(|| results.radius.as_ref().map(|r| r.wavevector.clone()));
    let mode = results
        .modes
        .iter()
        .find(|m| m.kind == Measure::Limit)
        .or_else(|| results.modes.iter().find(|m| m.kind == Measure::Radius))
        .map(|m| m.description.clone());
    let finite = |x: f64| x.is_finite().then_some(x);
    let line = json!({
        "verdict": "fail",
        "reason": reason,
        "dt": dt,
        "dt_max": dt_max.and_then(finite),
        "limit_kind": limit.map(|l| l.kind.as_str()),
        "ratio": dt_max.and_then(|m| finite(dt / m)),
        "margin": gate.margin,
        "radius_max": results.radius.as_ref().map(|r| r.max),
        "worst_wavevector": worst,
        "mode": mode,
    });
    Some(format!("kgain-verdict: {line}"))
}
