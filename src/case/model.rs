//! Model keys → the continuous system: kind, per-kind keys, user matrices.

use super::raw::{Entry, OneOrMany, RawMatrix, RawModel};
use super::validate::Ctx;
use super::CaseError;
use crate::physics::{self, System};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

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
pub(super) const MODELS_AVAILABLE: [&str; 6] = [
    "advection",
    "acoustics",
    "euler",
    "shallow-water",
    "maxwell",
    "linear",
];

pub(super) fn model(cx: &Ctx, m: &RawModel, dims: usize) -> Result<System, CaseError> {
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
