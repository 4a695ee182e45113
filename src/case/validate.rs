//! Raw case → validated case: resolves every name and checks every cross-key rule.

use super::locate::key_position;
use super::raw::{Entry, OneOrMany, RawCase, RawMatrix, RawModel, RawScan, RawSpace, RawTime};
use super::{nearest, Analysis, Case, CaseError, Scan, Step};
use crate::operator::{Dissipation, Space, Upwind};
use crate::physics::{self, System};
use crate::stencil::{catalogue, Stencil};
use crate::time::composite::{Composite, Imex, Splitting};
use crate::time::{self, Method, Scheme};
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
const MODELS_AVAILABLE: [&str; 6] = [
    "advection",
    "acoustics",
    "euler",
    "shallow-water",
    "maxwell",
    "linear",
];
const ANALYSES: [&str; 4] = ["radius", "limit", "growth", "dispersion"];
const COMPOSITE_METHODS: [&str; 5] = [
    "forward-backward",
    "imex-euler",
    "imex-cnab2",
    "lax-wendroff",
    "lax-friedrichs",
];

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

    fn err_hint(
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

    fn unknown(&self, key: &str, what: &str, got: &str, valid: &[&str]) -> CaseError {
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
    let tm = raw.model.polarization.as_deref() == Some("tm");
    let space = space(&cx, &raw.space, dims, &raw.model.kind, tm)?;
    let method = method(&cx, &raw.time, &system, &space)?;
    let step = step(&cx, &raw.time, &system)?;
    let scan = scan(&cx, &raw.scan, dims)?;
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
        "shallow-water" => &["gravity", "depth", "velocity", "coriolis"],
        "maxwell" => &["speed", "polarization"],
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
        v.ok_or_else(|| {
            cx.err(
                &format!("model.{key}"),
                format!("is required for model kind '{kind}'"),
            )
        })
    };
    let velocity = |required: bool| -> Result<Vec<f64>, CaseError> {
        match &m.velocity {
            Some(v) => cx.per_axis("model.velocity", v, dims),
            None if required => {
                Err(cx.err("model.velocity", "is required for model kind 'advection'"))
            }
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
        "shallow-water" => {
            if dims == 3 {
                return Err(cx.err("grid.spacing", "the shallow-water model has 1 or 2 axes"));
            }
            let g = cx.positive("model.gravity", m.gravity.unwrap_or(9.81))?;
            let depth = cx.positive("model.depth", need("depth", m.depth)?)?;
            let f = cx.finite("model.coriolis", m.coriolis.unwrap_or(0.0))?;
            if dims == 1 && f != 0.0 {
                return Err(cx.err(
                    "model.coriolis",
                    "needs two axes (the rotation couples u and v)",
                ));
            }
            physics::shallow_water(g, depth, &velocity(false)?, f)
        }
        "maxwell" => {
            if dims == 1 {
                return Err(cx.err(
                    "grid.spacing",
                    "the maxwell model has 2 axes (te or tm) or 3",
                ));
            }
            let c = cx.positive("model.speed", need("speed", m.speed)?)?;
            let tm = match (dims, m.polarization.as_deref()) {
                (3, Some(_)) => {
                    return Err(cx.err("model.polarization", "is only used with two axes"))
                }
                (_, None) | (_, Some("te")) => false,
                (_, Some("tm")) => true,
                (_, Some(other)) => {
                    return Err(cx.unknown(
                        "model.polarization",
                        "polarization",
                        other,
                        &["te", "tm"],
                    ))
                }
            };
            physics::maxwell(c, dims, tm)
        }
        _ => linear(cx, m, dims)?,
    })
}

fn matrix(cx: &Ctx, key: &str, raw: &RawMatrix, n: usize) -> Result<DMatrix<C64>, CaseError> {
    if raw.len() != n || raw.iter().any(|r| r.len() != n) {
        return Err(cx.err(
            key,
            format!("must be a {n}×{n} matrix (one row per variable)"),
        ));
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
    let per_axis = |key: &str, list: &Option<Vec<RawMatrix>>, required: bool| match list {
        None if required => Err(cx.err(key, "is required for model kind 'linear'")),
        None => Ok((0..dims).map(|_| DMatrix::zeros(n, n)).collect()),
        Some(l) if l.len() != dims => Err(cx.err(
            key,
            format!(
                "needs one {n}×{n} matrix per axis ({dims}), got {}",
                l.len()
            ),
        )),
        Some(l) => l
            .iter()
            .enumerate()
            .map(|(d, a)| matrix(cx, &format!("{key}.{d}"), a, n))
            .collect(),
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
        let st = Stencil::new(
            name,
            r.derivative as u32,
            r.offsets.clone(),
            r.weights.clone(),
            implicit,
        )
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
                format!(
                    "needs one stencil name or one per axis ({dims}), got {}",
                    v.len()
                ),
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

fn space(
    cx: &Ctx,
    s: &RawSpace,
    dims: usize,
    kind: &str,
    polarization_tm: bool,
) -> Result<Space, CaseError> {
    let user = user_stencils(cx, s)?;
    let first = stencils(cx, "space.first", &s.first, 1, dims, &user)?;
    let second = stencils(cx, "space.second", &s.second, 2, dims, &user)?;
    let upwind = match s.upwind.as_deref().unwrap_or("characteristic") {
        "characteristic" => Upwind::Characteristic,
        "rusanov" => Upwind::Rusanov,
        other => {
            return Err(cx.unknown(
                "space.upwind",
                "upwinding",
                other,
                &["characteristic", "rusanov"],
            ))
        }
    };
    let dissipation = match &s.dissipation {
        None => None,
        Some(d) => {
            if d.order < 2 || d.order % 2 != 0 || d.order > 16 {
                return Err(cx.err(
                    "space.dissipation.order",
                    "must be an even power between 2 and 16",
                ));
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
    let tm = polarization_tm;
    let locations = arrangement_locations(cx, arrangement, kind, dims, tm)?;
    Ok(Space {
        first,
        second,
        upwind,
        dissipation,
        arrangement: arrangement.to_string(),
        locations,
    })
}

/// Cell offsets of each variable for a named arrangement (empty: collocated).
///
/// Shallow water (h, u, v), the lettered grid families: A all together; B h at
/// centres, u and v at corners; C u on x-faces, v on y-faces; D u on y-faces,
/// v on x-faces. Maxwell on the Yee cell: E components on edges, H on faces
/// (2-D: the TE and TM cells of the 3-D Yee cell).
fn arrangement_locations(
    cx: &Ctx,
    arrangement: &str,
    kind: &str,
    dims: usize,
    tm: bool,
) -> Result<Vec<Vec<f64>>, CaseError> {
    let key = "space.arrangement";
    let all = ["collocated", "a", "b", "c", "d", "e", "yee"];
    if !all.contains(&arrangement) {
        return Err(cx.unknown(key, "arrangement", arrangement, &all));
    }
    if arrangement == "collocated" || (arrangement == "a" && kind == "shallow-water") {
        return Ok(Vec::new());
    }
    let h = 0.5;
    let v = |x: &[f64]| x[..dims].to_vec();
    match (kind, arrangement) {
        ("shallow-water", "e") => Err(cx.err_hint(
            key,
            "arrangement 'e' is not available in this version of kgain",
            "the E-grid is the B-grid rotated by 45 degrees: analyse arrangement \"b\" on the rotated grid (spacing d/sqrt(2))",
        )),
        ("shallow-water", "d") if dims == 1 => Err(cx.err(key, "the D-grid needs two axes")),
        ("shallow-water", a) if a != "yee" => {
            let (u, w): ([f64; 2], [f64; 2]) = match a {
                "b" => ([h, h], [h, h]),
                "c" => ([h, 0.0], [0.0, h]),
                _ => ([0.0, h], [h, 0.0]),
            };
            let mut out = vec![v(&[0.0, 0.0]), v(&u)];
            if dims == 2 {
                out.push(v(&w));
            }
            Ok(out)
        }
        ("maxwell", "yee") => Ok(match (dims, tm) {
            (3, _) => vec![
                vec![h, 0.0, 0.0],
                vec![0.0, h, 0.0],
                vec![0.0, 0.0, h],
                vec![0.0, h, h],
                vec![h, 0.0, h],
                vec![h, h, 0.0],
            ],
            (_, false) => vec![vec![h, 0.0], vec![0.0, h], vec![h, h]],
            (_, true) => vec![vec![0.0, h], vec![h, 0.0], vec![0.0, 0.0]],
        }),
        _ => {
            let owner = if arrangement == "yee" { "maxwell" } else { "shallow-water" };
            Err(cx.err_hint(
                key,
                format!("arrangement '{arrangement}' belongs to the {owner} model; model '{kind}' has only \"collocated\""),
                "remove the key or set it to \"collocated\"",
            ))
        }
    }
}

fn method(cx: &Ctx, t: &RawTime, sys: &System, space: &Space) -> Result<Method, CaseError> {
    let name = t.method.as_str();
    let mut valid = time::method_names();
    valid.extend(COMPOSITE_METHODS);
    let uses_order = name == "forward-backward";
    if !uses_order && t.first.is_some() {
        return Err(cx.err(
            "time.first",
            "is only used with method = \"forward-backward\"",
        ));
    }
    if !uses_order && t.sequence.is_some() {
        return Err(cx.err(
            "time.sequence",
            "is only used with method = \"forward-backward\"",
        ));
    }
    if name != "theta" && t.theta.is_some() {
        return Err(cx.err("time.theta", "is only used with method = \"theta\""));
    }
    if name != "tableau" && t.tableau.is_some() {
        return Err(cx.err("time.tableau", "is only used with method = \"tableau\""));
    }
    let splitting = match t.splitting.as_deref().unwrap_or("none") {
        "none" => None,
        "lie" => Some(Splitting::Lie),
        "strang" => Some(Splitting::Strang),
        other => {
            return Err(cx.unknown(
                "time.splitting",
                "splitting",
                other,
                &["none", "lie", "strang"],
            ))
        }
    };
    let composite = |c: Composite, order: u32| Method {
        name: name.to_string(),
        order,
        explicit: !matches!(c, Composite::Imex(_)),
        scheme: Scheme::Composite(c),
    };
    let base = match name {
        "forward-backward" => {
            let rank = update_ranks(cx, t, sys)?;
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::ForwardBackward { rank }, 1));
        }
        "imex-euler" => {
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::Imex(Imex::Euler), 1))
        }
        "imex-cnab2" => {
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::Imex(Imex::Cnab2), 2))
        }
        "lax-wendroff" | "lax-friedrichs" => {
            no_split(cx, splitting, name)?;
            if !space.locations.is_empty() {
                return Err(cx.err_hint(
                    "space.arrangement",
                    format!("method '{name}' defines its own collocated differences"),
                    "remove space.arrangement or set it to \"collocated\"",
                ));
            }
            let (c, order) = if name == "lax-wendroff" {
                (Composite::LaxWendroff, 2)
            } else {
                (Composite::LaxFriedrichs, 1)
            };
            return Ok(composite(c, order));
        }
        "theta" => {
            let th = t
                .theta
                .ok_or_else(|| cx.err("time.theta", "is required for method = \"theta\""))?;
            time::methods::theta(th).map_err(|e| cx.err("time.theta", e.to_string()))?
        }
        "tableau" => {
            let tb = t
                .tableau
                .as_ref()
                .ok_or_else(|| cx.err("time.tableau", "is required for method = \"tableau\""))?;
            if let Some(c) = &tb.c {
                let rows_ok = c.len() == tb.a.len()
                    && c.iter()
                        .zip(&tb.a)
                        .all(|(ci, row)| (ci - row.iter().sum::<f64>()).abs() <= 1e-10);
                if !rows_ok {
                    return Err(cx.err(
                        "time.tableau.c",
                        "must equal the row sums of a (c_i = sum_j a_ij); it may be omitted",
                    ));
                }
            }
            time::methods::tableau(&tb.a, &tb.b)
                .map_err(|e| cx.err("time.tableau", e.to_string()))?
        }
        _ => time::builtin(name)
            .ok_or_else(|| cx.unknown("time.method", "time method", name, &valid))?,
    };
    match splitting {
        None => Ok(base),
        Some(kind) => {
            if base.levels() > 1 {
                return Err(cx.err_hint(
                    "time.splitting",
                    format!(
                        "splitting needs a one-step method, and '{name}' is a multistep method"
                    ),
                    "use a Runge-Kutta or theta method, or splitting = \"none\"",
                ));
            }
            let order = if kind == Splitting::Strang {
                base.order.min(2)
            } else {
                1
            };
            Ok(Method {
                name: format!(
                    "{name}+{}",
                    if kind == Splitting::Lie {
                        "lie"
                    } else {
                        "strang"
                    }
                ),
                order,
                explicit: base.explicit,
                scheme: Scheme::Composite(Composite::Split {
                    kind,
                    inner: Box::new(base),
                }),
            })
        }
    }
}

fn no_split(cx: &Ctx, splitting: Option<Splitting>, name: &str) -> Result<(), CaseError> {
    match splitting {
        None => Ok(()),
        Some(_) => Err(cx.err(
            "time.splitting",
            format!("method '{name}' is already a composite scheme and cannot be split"),
        )),
    }
}

/// Update ranks of forward-backward stepping: `time.first` (updated first, the
/// rest after) or `time.sequence` (every variable, in update order).
fn update_ranks(cx: &Ctx, t: &RawTime, sys: &System) -> Result<Vec<usize>, CaseError> {
    let vars = &sys.variables;
    let lookup = |key: &str, v: &str| {
        vars.iter().position(|x| x == v).ok_or_else(|| {
            let list: Vec<&str> = vars.iter().map(|s| s.as_str()).collect();
            cx.unknown(key, "variable", v, &list)
        })
    };
    match (&t.first, &t.sequence) {
        (Some(_), Some(_)) => Err(cx.err(
            "time.sequence",
            "give time.first or time.sequence, not both",
        )),
        (None, None) => Err(cx.err_hint(
            "time.first",
            "forward-backward needs the variables updated first",
            format!("e.g. first = [\"{}\"]", vars[0]),
        )),
        (Some(first), None) => {
            let mut rank = vec![1; vars.len()];
            for (k, v) in first.iter().enumerate() {
                rank[lookup(&format!("time.first.{k}"), v)?] = 0;
            }
            if rank.iter().all(|r| *r == 0) || first.is_empty() {
                return Err(cx.err(
                    "time.first",
                    "must name some, but not all, of the variables",
                ));
            }
            Ok(rank)
        }
        (None, Some(seq)) => {
            let mut rank = vec![usize::MAX; vars.len()];
            for (k, v) in seq.iter().enumerate() {
                rank[lookup(&format!("time.sequence.{k}"), v)?] = k;
            }
            if rank.contains(&usize::MAX) {
                return Err(cx.err("time.sequence", "must list every variable once"));
            }
            Ok(rank)
        }
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
