//! Raw case → validated case: resolves every name and checks every cross-key rule.

use super::locate::key_position;
use super::raw::{Entry, OneOrMany, RawCase, RawMatrix, RawModel, RawScan, RawSpace, RawTime};
use super::{nearest, Analysis, Case, CaseError, Scan, Step};
use crate::operator::{Dissipation, Space, Upwind};
use crate::physics::{self, System};
use crate::stencil::{catalogue, Stencil};
use crate::time::{self, Method};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use std::collections::BTreeMap;
use std::path::Path;

/// Model kinds the case file may name.
pub const MODEL_KINDS: [&str; 6] = [
    "advection",
    "acoustics",
    "euler",
    "shallow-water",
    "maxwell",
    "linear",
];
/// Model kinds this version can analyse.
const MODELS_AVAILABLE: [&str; 4] = ["advection", "acoustics", "euler", "linear"];
const ANALYSES: [&str; 4] = ["radius", "limit", "growth", "dispersion"];
const COMPOSITE_METHODS: [&str; 3] = ["forward-backward", "lax-wendroff", "lax-friedrichs"];

struct Ctx<'a> {
    file: String,
    text: &'a str,
}

impl Ctx<'_> {
    fn err(&self, key: &str, message: impl Into<String>) -> CaseError {
        CaseError::Invalid {
            file: self.file.clone(),
            key: key.to_string(),
            line: key_position(self.text, key),
            message: message.into(),
            hint: None,
        }
    }

    fn err_hint(&self, key: &str, message: impl Into<String>, hint: impl Into<String>) -> CaseError {
        let mut e = self.err(key, message);
        if let CaseError::Invalid { hint: h, .. } = &mut e {
            *h = Some(hint.into());
        }
        e
    }

    fn unknown(&self, key: &str, what: &str, got: &str, valid: &[&str]) -> CaseError {
        let list = valid.join(", ");
        match nearest(got, valid.iter().copied()) {
            Some(n) => self.err_hint(
                key,
                format!("unknown {what} '{got}'"),
                format!("did you mean '{n}'? valid: {list}"),
            ),
            None => self.err_hint(key, format!("unknown {what} '{got}'"), format!("valid: {list}")),
        }
    }

    fn finite(&self, key: &str, x: f64) -> Result<f64, CaseError> {
        if x.is_finite() {
            Ok(x)
        } else {
            Err(self.err(key, format!("must be a finite number, got {x}")))
        }
    }

    fn positive(&self, key: &str, x: f64) -> Result<f64, CaseError> {
        self.finite(key, x)?;
        if x > 0.0 {
            Ok(x)
        } else {
            Err(self.err(key, format!("must be positive, got {x}")))
        }
    }

    fn per_axis(&self, key: &str, v: &[f64], dims: usize) -> Result<Vec<f64>, CaseError> {
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
    let spacing = raw.grid.spacing.clone();
    let system = model(&cx, &raw.model, dims)?;
    let space = space(&cx, &raw.space, dims, &raw.model.kind)?;
    let method = method(&cx, &raw.time)?;
    let step = step(&cx, &raw.time, &system)?;
    let scan = scan(&cx, &raw.scan, dims)?;
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

fn model(cx: &Ctx, m: &RawModel, dims: usize) -> Result<System, CaseError> {
    let kind = m.kind.as_str();
    if !MODEL_KINDS.contains(&kind) {
        return Err(cx.unknown("model.kind", "model kind", kind, &MODEL_KINDS));
    }
    if !MODELS_AVAILABLE.contains(&kind) {
        return Err(cx.err_hint(
            "model.kind",
            format!("model '{kind}' is not available in this version of kgain"),
            format!("available: {}", MODELS_AVAILABLE.join(", ")),
        ));
    }
    let allowed: &[&str] = match kind {
        "advection" => &["velocity", "diffusivity"],
        "acoustics" => &["sound_speed", "density", "velocity"],
        "euler" => &["density", "velocity", "pressure", "gamma"],
        _ => &["variables", "flux", "diffusion", "source"],
    };
    let present = [
        ("velocity", m.velocity.is_some()),
        ("diffusivity", m.diffusivity.is_some()),
        ("sound_speed", m.sound_speed.is_some()),
        ("density", m.density.is_some()),
        ("pressure", m.pressure.is_some()),
        ("gamma", m.gamma.is_some()),
        ("gravity", m.gravity.is_some()),
        ("depth", m.depth.is_some()),
        ("coriolis", m.coriolis.is_some()),
        ("speed", m.speed.is_some()),
        ("polarization", m.polarization.is_some()),
        ("variables", m.variables.is_some()),
        ("flux", m.flux.is_some()),
        ("diffusion", m.diffusion.is_some()),
        ("source", m.source.is_some()),
    ];
    for (key, is) in present {
        if is && !allowed.contains(&key) {
            return Err(cx.err_hint(
                &format!("model.{key}"),
                format!("is not a key of model kind '{kind}'"),
                format!("keys of '{kind}': {}", allowed.join(", ")),
            ));
        }
    }
    let need = |key: &str, v: Option<f64>| {
        v.ok_or_else(|| cx.err(&format!("model.{key}"), format!("is required for model kind '{kind}'")))
    };
    let velocity = |required: bool| -> Result<Vec<f64>, CaseError> {
        match &m.velocity {
            Some(v) => cx.per_axis("model.velocity", v, dims),
            None if required => Err(cx.err("model.velocity", "is required for model kind 'advection'")),
            None => Ok(vec![0.0; dims]),
        }
    };
    Ok(match kind {
        "advection" => {
            let v = velocity(true)?;
            let d = match &m.diffusivity {
                None => vec![0.0; dims],
                Some(OneOrMany::One(x)) => vec![cx.finite("model.diffusivity", *x)?; dims],
                Some(OneOrMany::Many(xs)) => cx.per_axis("model.diffusivity", xs, dims)?,
            };
            for (i, x) in d.iter().enumerate() {
                if *x < 0.0 {
                    return Err(cx.err(&format!("model.diffusivity.{i}"), "must not be negative"));
                }
            }
            physics::advection(&v, &d)
        }
        "acoustics" => {
            let c = cx.positive("model.sound_speed", need("sound_speed", m.sound_speed)?)?;
            let rho = cx.positive("model.density", m.density.unwrap_or(1.0))?;
            physics::acoustics(c, rho, &velocity(false)?)
        }
        "euler" => {
            let rho = cx.positive("model.density", need("density", m.density)?)?;
            let p = cx.positive("model.pressure", need("pressure", m.pressure)?)?;
            let g = cx.positive("model.gamma", m.gamma.unwrap_or(1.4))?;
            physics::euler(rho, &velocity(false)?, p, g)
        }
        _ => linear(cx, m, dims)?,
    })
}

fn matrix(cx: &Ctx, key: &str, raw: &RawMatrix, n: usize) -> Result<DMatrix<C64>, CaseError> {
    if raw.len() != n || raw.iter().any(|r| r.len() != n) {
        return Err(cx.err(key, format!("must be a {n}×{n} matrix (one row per variable)")));
    }
    let mut out = DMatrix::zeros(n, n);
    for (i, row) in raw.iter().enumerate() {
        for (j, e) in row.iter().enumerate() {
            let z = match e {
                Entry::Real(x) => C64::new(*x, 0.0),
                Entry::Complex([re, im]) => C64::new(*re, *im),
            };
            if !z.re.is_finite() || !z.im.is_finite() {
                return Err(cx.err(&format!("{key}.{i}.{j}"), "must be a finite number"));
            }
            out[(i, j)] = z;
        }
    }
    Ok(out)
}

fn linear(cx: &Ctx, m: &RawModel, dims: usize) -> Result<System, CaseError> {
    let vars = m
        .variables
        .clone()
        .ok_or_else(|| cx.err("model.variables", "is required for model kind 'linear'"))?;
    if vars.is_empty() || vars.len() > 16 {
        return Err(cx.err("model.variables", "needs between 1 and 16 variable names"));
    }
    let n = vars.len();
    let per_axis = |key: &str, list: &Option<Vec<RawMatrix>>, required: bool| {
        match list {
            None if required => Err(cx.err(key, "is required for model kind 'linear'")),
            None => Ok((0..dims).map(|_| DMatrix::zeros(n, n)).collect()),
            Some(l) if l.len() != dims => Err(cx.err(
                key,
                format!("needs one {n}×{n} matrix per axis ({dims}), got {}", l.len()),
            )),
            Some(l) => l
                .iter()
                .enumerate()
                .map(|(d, a)| matrix(cx, &format!("{key}.{d}"), a, n))
                .collect(),
        }
    };
    let flux = per_axis("model.flux", &m.flux, true)?;
    let diffusion = per_axis("model.diffusion", &m.diffusion, false)?;
    let source = match &m.source {
        Some(s) => matrix(cx, "model.source", s, n)?,
        None => DMatrix::zeros(n, n),
    };
    Ok(physics::linear(vars, flux, diffusion, source))
}

fn user_stencils(cx: &Ctx, s: &RawSpace) -> Result<BTreeMap<String, Stencil>, CaseError> {
    let mut out = BTreeMap::new();
    for (name, r) in &s.stencils {
        let key = format!("space.stencils.{name}");
        let implicit = match (&r.implicit_offsets, &r.implicit_weights) {
            (Some(o), Some(w)) => Some((o.clone(), w.clone())),
            (None, None) => None,
            _ => {
                return Err(cx.err(
                    &key,
                    "give both implicit_offsets and implicit_weights, or neither",
                ))
            }
        };
        if !(1..=2).contains(&r.derivative) {
            return Err(cx.err(&format!("{key}.derivative"), "must be 1 or 2"));
        }
        let st = Stencil::new(name, r.derivative as u32, r.offsets.clone(), r.weights.clone(), implicit)
            .map_err(|e| cx.err(&key, e.to_string()))?;
        out.insert(name.clone(), st);
    }
    Ok(out)
}

fn stencils(
    cx: &Ctx,
    key: &str,
    spec: &Option<OneOrMany<String>>,
    derivative: u32,
    dims: usize,
    user: &BTreeMap<String, Stencil>,
) -> Result<Vec<Stencil>, CaseError> {
    let names = match spec {
        None => vec!["central2".to_string(); dims],
        Some(OneOrMany::One(n)) => vec![n.clone(); dims],
        Some(OneOrMany::Many(v)) if v.len() == dims => v.clone(),
        Some(OneOrMany::Many(v)) => {
            return Err(cx.err(
                key,
                format!("needs one stencil name or one per axis ({dims}), got {}", v.len()),
            ))
        }
    };
    names
        .iter()
        .enumerate()
        .map(|(d, n)| {
            if let Some(st) = user.get(n) {
                if st.derivative != derivative {
                    return Err(cx.err(
                        key,
                        format!(
                            "stencil '{n}' approximates derivative {}, but this key needs derivative {derivative}",
                            st.derivative
                        ),
                    ));
                }
                return Ok(st.clone());
            }
            catalogue::builtin(n, derivative).ok_or_else(|| {
                let mut valid = catalogue::names(derivative);
                valid.extend(user.keys().map(|s| s.as_str()));
                let k = if dims > 1 && matches!(spec, Some(OneOrMany::Many(_))) {
                    format!("{key}.{d}")
                } else {
                    key.to_string()
                };
                cx.unknown(&k, &format!("stencil for derivative {derivative}"), n, &valid)
            })
        })
        .collect()
}

fn space(cx: &Ctx, s: &RawSpace, dims: usize, kind: &str) -> Result<Space, CaseError> {
    let user = user_stencils(cx, s)?;
    let first = stencils(cx, "space.first", &s.first, 1, dims, &user)?;
    let second = stencils(cx, "space.second", &s.second, 2, dims, &user)?;
    let upwind = match s.upwind.as_deref().unwrap_or("characteristic") {
        "characteristic" => Upwind::Characteristic,
        "rusanov" => Upwind::Rusanov,
        other => {
            return Err(cx.unknown("space.upwind", "upwinding", other, &["characteristic", "rusanov"]))
        }
    };
    let dissipation = match &s.dissipation {
        None => None,
        Some(d) => {
            if d.order < 2 || d.order % 2 != 0 || d.order > 16 {
                return Err(cx.err("space.dissipation.order", "must be an even power between 2 and 16"));
            }
            let strength = cx.finite("space.dissipation.strength", d.strength)?;
            if strength < 0.0 {
                return Err(cx.err("space.dissipation.strength", "must not be negative"));
            }
            Some(Dissipation {
                order: d.order as u32,
                strength,
            })
        }
    };
    let arrangement = s.arrangement.as_deref().unwrap_or("collocated");
    let all = ["collocated", "a", "b", "c", "d", "e", "yee"];
    if !all.contains(&arrangement) {
        return Err(cx.unknown("space.arrangement", "arrangement", arrangement, &all));
    }
    if arrangement != "collocated" && arrangement != "a" {
        let owner = if arrangement == "yee" { "maxwell" } else { "shallow-water" };
        return Err(cx.err_hint(
            "space.arrangement",
            format!("arrangement '{arrangement}' belongs to the {owner} model; model '{kind}' is collocated"),
            "remove the key or set it to \"collocated\"",
        ));
    }
    Ok(Space {
        first,
        second,
        upwind,
        dissipation,
    })
}

fn method(cx: &Ctx, t: &RawTime) -> Result<Method, CaseError> {
    let name = t.method.as_str();
    let mut valid = time::method_names();
    valid.extend(COMPOSITE_METHODS);
    if COMPOSITE_METHODS.contains(&name) {
        return Err(cx.err(
            "time.method",
            format!("method '{name}' (a composite scheme) is not available in this version of kgain"),
        ));
    }
    if let Some(s) = t.splitting.as_deref() {
        match s {
            "none" => {}
            "lie" | "strang" => {
                return Err(cx.err(
                    "time.splitting",
                    format!("dimension splitting '{s}' is not available in this version of kgain"),
                ))
            }
            other => return Err(cx.unknown("time.splitting", "splitting", other, &["none", "lie", "strang"])),
        }
    }
    if t.first.is_some() {
        return Err(cx.err("time.first", "is only used with method = \"forward-backward\""));
    }
    if name != "theta" && t.theta.is_some() {
        return Err(cx.err("time.theta", "is only used with method = \"theta\""));
    }
    if name != "tableau" && t.tableau.is_some() {
        return Err(cx.err("time.tableau", "is only used with method = \"tableau\""));
    }
    match name {
        "theta" => {
            let th = t
                .theta
                .ok_or_else(|| cx.err("time.theta", "is required for method = \"theta\""))?;
            time::methods::theta(th).map_err(|e| cx.err("time.theta", e.to_string()))
        }
        "tableau" => {
            let tb = t
                .tableau
                .as_ref()
                .ok_or_else(|| cx.err("time.tableau", "is required for method = \"tableau\""))?;
            if let Some(c) = &tb.c {
                let rows_ok = c.len() == tb.a.len()
                    && c.iter().zip(&tb.a).all(|(ci, row)| (ci - row.iter().sum::<f64>()).abs() <= 1e-10);
                if !rows_ok {
                    return Err(cx.err(
                        "time.tableau.c",
                        "must equal the row sums of a (c_i = sum_j a_ij); it may be omitted",
                    ));
                }
            }
            time::methods::tableau(&tb.a, &tb.b).map_err(|e| cx.err("time.tableau", e.to_string()))
        }
        _ => time::builtin(name).ok_or_else(|| cx.unknown("time.method", "time method", name, &valid)),
    }
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
            return Err(cx.err(&format!("scan.points.{i}"), format!("must be at least 2, got {n}")));
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
        None => vec![Analysis::Radius, Analysis::Limit],
        Some(list) => {
            let mut out = Vec::new();
            for (i, a) in list.iter().enumerate() {
                let key = format!("scan.analyses.{i}");
                let an = match a.as_str() {
                    "radius" => Analysis::Radius,
                    "limit" => Analysis::Limit,
                    "growth" | "dispersion" => {
                        return Err(cx.err(
                            &key,
                            format!("analysis '{a}' is not available in this version of kgain"),
                        ))
                    }
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
    let nodes: u128 = points.iter().map(|&n| n as u128).product();
    let need = nodes * 32;
    let avail = available_memory();
    if need > avail as u128 / 2 {
        return Err(cx.err_hint(
            "scan.points",
            format!(
                "a scan of {nodes} wavevectors needs about {:.1} GiB for its arrays, more than half of the {:.1} GiB of memory available",
                need as f64 / (1u64 << 30) as f64,
                avail as f64 / (1u64 << 30) as f64
            ),
            "use fewer points per axis",
        ));
    }
    Ok(Scan {
        points,
        directions,
        steps,
        tolerance,
        analyses,
        matrices,
    })
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
