//! Probe case files: a `[probe]` table in place of `[model]`, `[space]` and
//! `[time]` — the user's program, its variables and grid, the time step, the
//! base state and perturbation — with an optional `[grid]` (spacing, for the
//! Courant number and the model), an optional `[model]` (a built-in model
//! whose exact frequencies the dispersion is compared with, and whose wave
//! speed a Courant number may use) and `[scan]` (which analyses; the growth
//! horizon and weights). Errors name the file, the key and its line.

use super::convert::model_params;
use super::{locate, located, structure_error, CaseError};
use crate::error::InputError;
use crate::physics::catalogue;
use crate::probe::spec::variable_order;
use crate::probe::{ProbeLimitParams, ProbePlan, ProbeSpec};
use serde::Deserialize;
use std::path::{Path, PathBuf};
use std::time::Duration;

/// The analyses a probe case may ask for.
pub const PROBE_ANALYSES: [&str; 4] = ["radius", "limit", "growth", "dispersion"];

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawProbeCase {
    name: Option<String>,
    description: Option<String>,
    grid: Option<RawProbeGrid>,
    model: Option<super::raw::RawModel>,
    probe: RawProbe,
    #[serde(default)]
    scan: RawProbeScan,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawProbeGrid {
    spacing: Vec<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawProbe {
    command: Vec<String>,
    variables: Vec<String>,
    cells: Vec<i64>,
    dt: Option<f64>,
    courant: Option<f64>,
    reference_speed: Option<f64>,
    base: Option<Vec<f64>>,
    amplitude: Option<f64>,
    locations: Option<Vec<Vec<f64>>>,
    timeout: Option<f64>,
    check_tolerance: Option<f64>,
    limit_tolerance: Option<f64>,
    radius_tolerance: Option<f64>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawProbeScan {
    analyses: Option<Vec<String>>,
    steps: Option<i64>,
    weights: Option<Vec<f64>>,
}

/// A validated probe case.
#[derive(Debug, Clone)]
pub struct ProbeCase {
    /// Its name (the `name` key or the file stem).
    pub name: String,
    /// Its description.
    pub description: Option<String>,
    /// The program's argument list, with placeholders.
    pub command: Vec<String>,
    /// The folder the program runs in (the case file's).
    pub folder: PathBuf,
    /// Longest one run may take.
    pub timeout: Duration,
    /// Variables, grid, base state, perturbation and locations.
    pub spec: ProbeSpec,
    /// Spacing per axis (1 when no `[grid]`).
    pub spacing: Vec<f64>,
    /// The Courant number of the probe's Δt, with the speed it uses.
    pub courant: Option<(f64, f64)>,
    /// The built-in model named, if any (kind).
    pub model: Option<String>,
    /// What to compute.
    pub plan: ProbePlan,
    /// The case file.
    pub file: PathBuf,
    /// Its text after overrides.
    pub text: String,
}

/// Whether a case text is a probe case (has a `[probe]` table).
pub fn is_probe(text: &str) -> bool {
    text.parse::<toml::Table>()
        .map(|t| t.contains_key("probe"))
        .unwrap_or(false)
}

impl ProbeCase {
    /// Reads, overrides and validates a probe case file.
    pub fn load(path: &Path, overrides: &[String]) -> Result<ProbeCase, CaseError> {
        let file = path.display().to_string();
        let text = super::read::case_text(path, &file)?;
        Self::from_str_with(&text, path, overrides)
    }

    /// Validates probe case text as if read from `path`.
    pub fn from_str_with(
        text: &str,
        path: &Path,
        overrides: &[String],
    ) -> Result<ProbeCase, CaseError> {
        let file = path.display().to_string();
        let text = locate::apply_overrides(text, &file, overrides)?;
        let raw: RawProbeCase =
            toml::from_str(&text).map_err(|e| structure_error(&e, &file, &text))?;
        let folder = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."))
            .to_path_buf();
        convert(raw, path, folder, &text).map_err(|e| located(e, &file, &text))
    }

    /// An error about one key of this case, with its line.
    pub fn error_at(&self, e: InputError) -> CaseError {
        located(e, &self.file.display().to_string(), &self.text)
    }

    /// The program to probe.
    pub fn program(&self) -> crate::probe::Program {
        crate::probe::Program::new(self.command.clone(), &self.folder, self.timeout)
    }
}

fn in_range(key: &str, v: f64, lo: f64, hi: f64) -> Result<f64, InputError> {
    if v.is_finite() && v > lo && v <= hi {
        Ok(v)
    } else {
        Err(InputError::new(
            key,
            format!("{v} is outside ({lo:e}, {hi:e}]"),
        ))
    }
}

fn convert(
    raw: RawProbeCase,
    path: &Path,
    folder: PathBuf,
    text: &str,
) -> Result<ProbeCase, InputError> {
    let p = &raw.probe;
    if p.command.is_empty() || p.command[0].trim().is_empty() {
        return Err(InputError::new(
            "probe.command",
            "give the program and its arguments, e.g. [\"python3\", \"step.py\", \"{input}\", \"{output}\", \"{dt}\"]",
        ));
    }
    for placeholder in ["{input}", "{output}"] {
        if !p.command.iter().any(|a| a.contains(placeholder)) {
            return Err(InputError::new(
                "probe.command",
                format!("no argument holds {placeholder}: the program would not know where to read and write the state"),
            ));
        }
    }
    let dims = p.cells.len();
    let mut cells = Vec::with_capacity(dims);
    for (i, &n) in p.cells.iter().enumerate() {
        if !(2..=1 << 22).contains(&n) {
            return Err(InputError::new(
                format!("probe.cells.{i}"),
                format!("{n} cells: give 2 to {} per axis", 1 << 22),
            ));
        }
        cells.push(n as usize);
    }
    let names: Vec<&str> = p.variables.iter().map(String::as_str).collect();
    let mut spec = ProbeSpec::new(&names, &cells);
    if let Some(b) = &p.base {
        spec.base = b.clone();
    }
    if let Some(a) = p.amplitude {
        spec.amplitude = a;
    }
    if let Some(l) = &p.locations {
        spec.locations = l.clone();
    }
    spec.check()?;
    let spacing = match &raw.grid {
        Some(g) => {
            if g.spacing.len() != dims {
                return Err(InputError::new(
                    "grid.spacing",
                    format!(
                        "needs one spacing per axis of probe.cells ({dims}), got {}",
                        g.spacing.len()
                    ),
                ));
            }
            for (i, h) in g.spacing.iter().enumerate() {
                in_range(&format!("grid.spacing.{i}"), *h, 0.0, 1e150)?;
            }
            g.spacing.clone()
        }
        None => vec![1.0; dims],
    };
    let (model, model_name) = match &raw.model {
        Some(m) => {
            let kind = catalogue::ModelKind::from_name(&m.kind)?;
            let system = catalogue::build(kind, &model_params(&m.rest)?, dims)?;
            (Some(system), Some(m.kind.clone()))
        }
        None => (None, None),
    };
    let order = match &model {
        Some(s) => Some(variable_order(
            &s.variables,
            &spec.variables,
            "the [model]",
        )?),
        None => None,
    };
    let h_min = spacing.iter().cloned().fold(f64::INFINITY, f64::min);
    let speed = match p.reference_speed {
        Some(c) => Some(in_range("probe.reference_speed", c, 0.0, 1e150)?),
        None => model
            .as_ref()
            .map(|s| s.reference_speed)
            .filter(|c| *c > 0.0),
    };
    let (dt, courant) = match (p.dt, p.courant) {
        (Some(dt), None) => {
            let dt = in_range("probe.dt", dt, 0.0, 1e150)?;
            (dt, speed.map(|c| (c * dt / h_min, c)))
        }
        (None, Some(nu)) => {
            let nu = in_range("probe.courant", nu, 0.0, 1e6)?;
            let c = speed.ok_or_else(|| {
                InputError::new(
                    "probe.courant",
                    "needs a wave speed: give probe.reference_speed or a [model]",
                )
            })?;
            let dt = nu * h_min / c;
            if !dt.is_finite() || dt <= 0.0 {
                return Err(InputError::new(
                    "probe.courant",
                    format!("gives a time step {dt} that is not a positive number"),
                ));
            }
            (dt, Some((nu, c)))
        }
        (Some(_), Some(_)) => {
            return Err(InputError::new(
                "probe.courant",
                "give probe.dt or probe.courant, not both",
            ))
        }
        (None, None) => {
            return Err(InputError::new(
                "probe.dt",
                "is required (or probe.courant with a wave speed)",
            ))
        }
    };
    let timeout = in_range("probe.timeout", p.timeout.unwrap_or(60.0), 0.0, 86_400.0)?;
    let mut plan = ProbePlan::new(dt);
    plan.check_tolerance = in_range(
        "probe.check_tolerance",
        p.check_tolerance.unwrap_or(1e-6),
        0.0,
        1.0,
    )?;
    let limit = ProbeLimitParams {
        tolerance: in_range(
            "probe.limit_tolerance",
            p.limit_tolerance.unwrap_or(1e-4),
            1e-12,
            0.5,
        )?,
        radius_tolerance: in_range(
            "probe.radius_tolerance",
            p.radius_tolerance.unwrap_or(1e-9),
            0.0,
            1e-2,
        )?,
    };
    let s = &raw.scan;
    let analyses: Vec<String> = match &s.analyses {
        None => PROBE_ANALYSES.iter().map(|a| a.to_string()).collect(),
        Some(list) => {
            for (i, a) in list.iter().enumerate() {
                if !PROBE_ANALYSES.contains(&a.as_str()) {
                    return Err(InputError::unknown(
                        &format!("scan.analyses.{i}"),
                        "analysis",
                        a,
                        &PROBE_ANALYSES,
                    ));
                }
            }
            if list.is_empty() {
                return Err(InputError::new("scan.analyses", "names no analysis"));
            }
            list.clone()
        }
    };
    let has = |a: &str| analyses.iter().any(|x| x == a);
    plan.radius = has("radius");
    plan.limit = has("limit").then_some(limit);
    let steps = s.steps.unwrap_or(100);
    if !(0..=1 << 16).contains(&steps) {
        return Err(InputError::new(
            "scan.steps",
            format!("{steps}: give 0 to {} steps", 1 << 16),
        ));
    }
    plan.growth_steps = has("growth").then_some(steps as usize);
    if let Some(w) = &s.weights {
        if w.len() != spec.m() {
            return Err(InputError::new(
                "scan.weights",
                format!("give one weight per variable ({})", spec.m()),
            ));
        }
        for (i, x) in w.iter().enumerate() {
            in_range(&format!("scan.weights.{i}"), *x, 0.0, 1e150)?;
        }
        plan.weights = w.clone();
    }
    plan.dispersion = has("dispersion");
    plan.exact = match (model, order) {
        (Some(system), Some(order)) => Some((system, spacing.clone(), order)),
        _ => None,
    };
    let name = raw.name.clone().unwrap_or_else(|| {
        path.file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_else(|| "probe".into())
    });
    Ok(ProbeCase {
        name,
        description: raw.description.clone(),
        command: p.command.clone(),
        folder,
        timeout: Duration::from_secs_f64(timeout),
        spec,
        spacing,
        courant,
        model: model_name,
        plan,
        file: path.to_path_buf(),
        text: text.to_string(),
    })
}
