//! Raw case → validated case: resolves every name and checks every cross-key rule.

use super::locate::key_position;
use super::model::model;
use super::raw::{OneOrMany, RawCase, RawScan, RawTime};
use super::scheme::{method, space};
use super::{nearest, Analysis, Case, CaseError, Scan, Step};
use crate::physics::System;
use std::path::Path;

const ANALYSES: [&str; 4] = ["radius", "limit", "growth", "dispersion"];
pub(super) struct Ctx<'a> {
    pub(super) file: String,
    pub(super) text: &'a str,
}

impl Ctx<'_> {
    pub(super) fn err(&self, key: &str, message: impl Into<String>) -> CaseError {
        CaseError::Invalid {
            file: self.file.clone(),
            key: key.to_string(),
            line: key_position(self.text, key),
            message: message.into(),
            hint: None,
        }
    }

    pub(super) fn err_hint(
        &self,
        key: &str,
        message: impl Into<String>,
        hint: impl Into<String>,
    ) -> CaseError {
        let mut e = self.err(key, message);
        if let CaseError::Invalid { hint: h, .. } = &mut e {
            *h = Some(hint.into());
        }
        e
    }

    pub(super) fn unknown(&self, key: &str, what: &str, got: &str, valid: &[&str]) -> CaseError {
        let list = valid.join(", ");
        match nearest(got, valid.iter().copied()) {
            Some(n) => self.err_hint(
                key,
                format!("unknown {what} '{got}'"),
                format!("did you mean '{n}'? valid: {list}"),
            ),
            None => self.err_hint(
                key,
                format!("unknown {what} '{got}'"),
                format!("valid: {list}"),
            ),
        }
    }

    pub(super) fn finite(&self, key: &str, x: f64) -> Result<f64, CaseError> {
        if x.is_finite() {
            Ok(x)
        } else {
            Err(self.err(key, format!("must be a finite number, got {x}")))
        }
    }

    pub(super) fn positive(&self, key: &str, x: f64) -> Result<f64, CaseError> {
        self.finite(key, x)?;
        if x > 0.0 {
            Ok(x)
        } else {
            Err(self.err(key, format!("must be positive, got {x}")))
        }
    }

    pub(super) fn per_axis(
        &self,
        key: &str,
        v: &[f64],
        dims: usize,
    ) -> Result<Vec<f64>, CaseError> {
        if v.len() != dims {
            return Err(self.err(
                key,
                format!(
                    "needs one value per axis ({dims}, the length of grid.spacing), got {}",
                    v.len()
                ),
            ));
        }
        for (i, x) in v.iter().enumerate() {
            self.finite(&format!("{key}.{i}"), *x)?;
        }
        Ok(v.to_vec())
    }
}

/// The E-grid (h and u, v alternating at distance d along both axes) is the
/// B-grid on axes turned by 45 degrees with spacing d√2 (Arakawa & Lamb 1977):
/// rotate the mean flow into the diagonal frame and use that spacing.
fn e_grid_as_rotated_b(
    cx: &Ctx,
    raw: &RawCase,
    spacing: Vec<f64>,
    system: System,
) -> Result<(Vec<f64>, System), CaseError> {
    if (spacing[0] - spacing[1]).abs() > 1e-12 * spacing[0] {
        return Err(cx.err(
            "grid.spacing",
            "the E-grid needs equal spacings on both axes",
        ));
    }
    let s2 = std::f64::consts::SQRT_2;
    let u = raw.model.velocity.clone().unwrap_or_else(|| vec![0.0, 0.0]);
    let rotated = [(u[0] + u[1]) / s2, (u[1] - u[0]) / s2];
    let g = raw.model.gravity.unwrap_or(9.81);
    let depth = raw.model.depth.unwrap_or(1.0);
    let f = raw.model.coriolis.unwrap_or(0.0);
    let mut sys = crate::physics::shallow_water(g, depth, &rotated, f);
    sys.variables = vec!["h".into(), "u_diag".into(), "v_diag".into()];
    let _ = system;
    Ok((vec![spacing[0] * s2, spacing[1] * s2], sys))
}

pub(super) fn validate(raw: RawCase, text: &str, path: &Path) -> Result<Case, CaseError> {
    let cx = Ctx {
        file: path.display().to_string(),
        text,
    };
    let dims = raw.grid.spacing.len();
    if !(1..=3).contains(&dims) {
        return Err(cx.err(
            "grid.spacing",
            format!("needs 1, 2 or 3 spacings (one per axis), got {dims}"),
        ));
    }
    for (i, h) in raw.grid.spacing.iter().enumerate() {
        cx.positive(&format!("grid.spacing.{i}"), *h)?;
    }
    let mut spacing = raw.grid.spacing.clone();
    let mut system = model(&cx, &raw.model, dims)?;
    let tm = raw.model.polarization.as_deref() == Some("tm");
    let space = space(&cx, &raw.space, dims, &raw.model.kind, tm)?;
    if space.arrangement == "e" {
        (spacing, system) = e_grid_as_rotated_b(&cx, &raw, spacing, system)?;
    }
    let method = method(&cx, &raw.time, &system, &space)?;
    let step = step(&cx, &raw.time, &system)?;
    let scan = scan(&cx, &raw.scan, dims)?;
    let need = memory_estimate(&scan, system.size(), method.levels(), dims);
    let avail = available_memory();
    if need > avail as u128 * 4 / 5 {
        let nodes: u128 = scan.points.iter().map(|&n| n as u128).product();
        return Err(cx.err_hint(
            "scan.points",
            format!(
                "a scan of {nodes} wavevectors with these analyses needs about {:.1} GiB, more than the {:.1} GiB of memory available",
                need as f64 / (1u64 << 30) as f64,
                avail as f64 / (1u64 << 30) as f64
            ),
            "use fewer points per axis, or fewer analyses (scan.analyses)",
        ));
    }
    if let Some(w) = &scan.weights {
        if w.len() != system.size() {
            return Err(cx.err(
                "scan.weights",
                format!(
                    "needs one weight per variable ({}: {}), got {}",
                    system.size(),
                    system.variables.join(", "),
                    w.len()
                ),
            ));
        }
    }
    let name = raw.name.clone().unwrap_or_else(|| {
        path.file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_else(|| "case".into())
    });
    if name.is_empty() || name.contains(['/', '\\']) || name == "." || name == ".." {
        return Err(cx.err("name", "must be a non-empty name without path separators"));
    }
    Ok(Case {
        name,
        description: raw.description,
        file: path.to_path_buf(),
        spacing,
        system,
        space,
        method,
        step,
        scan,
    })
}

fn step(cx: &Ctx, t: &RawTime, sys: &System) -> Result<Step, CaseError> {
    match (t.dt, t.courant) {
        (Some(_), Some(_)) => Err(cx.err_hint(
            "time.dt",
            "both time.dt and time.courant are given",
            "give exactly one of them",
        )),
        (None, None) => Err(cx.err_hint(
            "time",
            "neither time.dt nor time.courant is given",
            "give exactly one of them, e.g. courant = 0.5",
        )),
        (Some(dt), None) => Ok(Step::Dt(cx.positive("time.dt", dt)?)),
        (None, Some(nu)) => {
            let nu = cx.positive("time.courant", nu)?;
            if sys.reference_speed <= 0.0 {
                return Err(cx.err_hint(
                    "time.courant",
                    "the model has no wave speed, so a Courant number does not define a time step",
                    "give time.dt instead",
                ));
            }
            Ok(Step::Courant(nu))
        }
    }
}

fn scan(cx: &Ctx, s: &RawScan, dims: usize) -> Result<Scan, CaseError> {
    let default_points = if dims == 3 { 33 } else { 129 };
    let points: Vec<i64> = match &s.points {
        None => vec![default_points; dims],
        Some(OneOrMany::One(n)) => vec![*n; dims],
        Some(OneOrMany::Many(v)) if v.len() == dims => v.clone(),
        Some(OneOrMany::Many(v)) => {
            return Err(cx.err(
                "scan.points",
                format!("needs one count per axis ({dims}), got {}", v.len()),
            ))
        }
    };
    for (i, n) in points.iter().enumerate() {
        if *n < 2 {
            return Err(cx.err(
                &format!("scan.points.{i}"),
                format!("must be at least 2, got {n}"),
            ));
        }
    }
    let points: Vec<usize> = points.iter().map(|&n| n as usize).collect();
    let count = |key: &str, v: Option<i64>, default: i64, min: i64| -> Result<usize, CaseError> {
        let v = v.unwrap_or(default);
        if v < min {
            Err(cx.err(key, format!("must be at least {min}, got {v}")))
        } else {
            Ok(v as usize)
        }
    };
    let directions = count(
        "scan.directions",
        s.directions,
        match dims {
            1 => 2,
            2 => 180,
            _ => 400,
        },
        1,
    )?;
    let directions = if dims == 1 { 2 } else { directions };
    let steps = count("scan.steps", s.steps, 100, 0)?;
    let matrices = count("scan.matrices", s.matrices, 0, 0)?;
    let tolerance = cx.finite("scan.tolerance", s.tolerance.unwrap_or(1e-12))?;
    if !(0.0..1e-2).contains(&tolerance) {
        return Err(cx.err("scan.tolerance", "must lie in [0, 0.01)"));
    }
    let analyses = match &s.analyses {
        None => vec![
            Analysis::Radius,
            Analysis::Limit,
            Analysis::Growth,
            Analysis::Dispersion,
        ],
        Some(list) => {
            let mut out = Vec::new();
            for (i, a) in list.iter().enumerate() {
                let key = format!("scan.analyses.{i}");
                let an = match a.as_str() {
                    "radius" => Analysis::Radius,
                    "limit" => Analysis::Limit,
                    "growth" => Analysis::Growth,
                    "dispersion" => Analysis::Dispersion,
                    other => return Err(cx.unknown(&key, "analysis", other, &ANALYSES)),
                };
                if !out.contains(&an) {
                    out.push(an);
                }
            }
            if out.is_empty() {
                return Err(cx.err("scan.analyses", "names no analysis"));
            }
            out
        }
    };
    let epsilon = cx.positive("scan.epsilon", s.epsilon.unwrap_or(1e-3))?;
    if let Some(w) = &s.weights {
        for (i, x) in w.iter().enumerate() {
            cx.positive(&format!("scan.weights.{i}"), *x)?;
        }
    }
    let phase_tolerance = cx.positive("scan.phase_tolerance", s.phase_tolerance.unwrap_or(0.01))?;
    Ok(Scan {
        phase_tolerance,
        weights: s.weights.clone(),
        epsilon,
        points,
        directions,
        steps,
        tolerance,
        analyses,
        matrices,
    })
}

/// Bytes a run needs: per wavevector, the sweep's working values and every output
/// array of the requested analyses (m variables, M = m·levels state size).
pub fn memory_estimate(scan: &Scan, m: usize, levels: usize, dims: usize) -> u128 {
    let nodes: u128 = scan.points.iter().map(|&n| n as u128).product();
    let (m, big_m, d) = (m as u128, (m * levels) as u128, dims as u128);
    let mut per = 0u128;
    if scan
        .analyses
        .iter()
        .any(|a| matches!(a, Analysis::Radius | Analysis::Limit))
    {
        per += 24 + 8;
    }
    if scan.analyses.contains(&Analysis::Growth) {
        per += 48 + 2 * 24;
    }
    if scan.analyses.contains(&Analysis::Dispersion) {
        // matched ω (3 sets), group velocities (2), then the written copies and maps
        let work = 16 * (2 * m + big_m) + 16 * m * d + 3 * 24;
        per += 2 * work + 6 * 8 * m;
    }
    nodes * per
}

/// Memory available to the process, from /proc/meminfo (24 GiB when unknown).
pub fn available_memory() -> u64 {
    std::fs::read_to_string("/proc/meminfo")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("MemAvailable:"))
                .and_then(|l| l.split_whitespace().nth(1))
                .and_then(|kb| kb.parse::<u64>().ok())
        })
        .map(|kb| kb * 1024)
        .unwrap_or(24 << 30)
}
