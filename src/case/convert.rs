//! The raw case (the serde mirror) → a [`ProblemBuilder`] and a [`Plan`]. Every
//! value check is the builder's and the plan's; this only maps case-file tables
//! to their calls and turns TOML values into model parameters.

use super::rational::values;
use super::raw::{OneOrMany, RawCase, RawScan};
use crate::analysis::{DispersionParams, GrowthParams, LimitParams, Plan};
use crate::error::{positive, InputError};
use crate::physics::params::{Params, Value};
use crate::problem::{
    FilterSpec, ProblemBuilder, StencilChoice, TableauSpec, TimeFilterSpec, UserStencil,
};
use std::path::Path;

const ANALYSES: [&str; 4] = ["radius", "limit", "growth", "dispersion"];

/// The builder of a raw case read from `path`.
pub(super) fn builder(raw: &RawCase, path: &Path) -> Result<ProblemBuilder, InputError> {
    let name = raw.name.clone().unwrap_or_else(|| {
        path.file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_else(|| "case".into())
    });
    let source = std::fs::canonicalize(path)
        .unwrap_or_else(|_| path.to_path_buf())
        .display()
        .to_string();
    let mut b = ProblemBuilder::default()
        .name(&name)
        .source(&source)
        .spacing(&raw.grid.spacing)
        .model(&raw.model.kind, model_params(&raw.model.rest)?);
    if let Some(d) = &raw.description {
        b = b.description(d);
    }
    let sp = &raw.space;
    b = b
        .first_stencils(choice(&sp.first))
        .second_stencils(choice(&sp.second));
    for (name, r) in &sp.stencils {
        let implicit = match (&r.implicit_offsets, &r.implicit_weights) {
            (Some(o), Some(w)) => Some((o.clone(), w.clone())),
            (None, None) => None,
            _ => {
                return Err(InputError::new(
                    format!("space.stencils.{name}"),
                    "give both implicit_offsets and implicit_weights, or neither",
                ))
            }
        };
        b = b.stencil(
            name,
            UserStencil {
                derivative: r.derivative,
                offsets: r.offsets.clone(),
                weights: r.weights.clone(),
                implicit,
            },
        );
    }
    if let Some(u) = &sp.upwind {
        b = b.upwind(u);
    }
    if let Some(d) = &sp.dissipation {
        b = b.dissipation(d.order, d.strength);
    }
    if let Some(a) = &sp.arrangement {
        b = b.arrangement(a);
    }
    if let Some(f) = &sp.filter {
        b = b.spatial_filter(FilterSpec {
            kind: f.kind.clone(),
            order: f.order,
            strength: f.strength,
            alpha: f.alpha,
        });
    }
    let t = &raw.time;
    b = b.method(&t.method);
    if let Some(th) = t.theta {
        b = b.theta(th);
    }
    if let Some(tb) = &t.tableau {
        b = b.tableau(TableauSpec {
            a: tb.a.iter().map(|row| values(row)).collect(),
            b: values(&tb.b),
            c: tb.c.as_deref().map(values),
        });
    }
    if let Some(spec) = super::lowstorage::tableau(t)? {
        b = b.method("tableau").tableau(spec);
    }
    fn names(v: &[String]) -> Vec<&str> {
        v.iter().map(String::as_str).collect()
    }
    if let Some(f) = &t.first {
        b = b.updated_first(&names(f));
    }
    if let Some(s) = &t.sequence {
        b = b.update_sequence(&names(s));
    }
    if let Some(s) = &t.splitting {
        b = b.splitting(s);
    }
    if t.filter.is_some() || t.filter_strength.is_some() || t.filter_alpha.is_some() {
        b = b.time_filter(TimeFilterSpec {
            kind: t.filter.clone(),
            strength: t.filter_strength,
            alpha: t.filter_alpha,
        });
    }
    if let Some(beta) = t.beta {
        b = b.newmark_beta(beta);
    }
    if let Some(gamma) = t.gamma {
        b = b.newmark_gamma(gamma);
    }
    if let Some(dt) = t.dt {
        b = b.dt(dt);
    }
    if let Some(nu) = t.courant {
        b = b.courant(nu);
    }
    Ok(b)
}

fn choice(spec: &Option<OneOrMany<String>>) -> StencilChoice {
    match spec {
        None => StencilChoice::Default,
        Some(OneOrMany::One(n)) => StencilChoice::One(n.clone()),
        Some(OneOrMany::Many(v)) => StencilChoice::PerAxis(v.clone()),
    }
}

/// The keys of `[model]` other than `kind`, as model parameters.
pub(super) fn model_params(table: &toml::Table) -> Result<Params, InputError> {
    let mut p = Params::new();
    for (key, v) in table {
        p = p.with(key, value(&format!("model.{key}"), v)?);
    }
    Ok(p)
}

fn value(key: &str, v: &toml::Value) -> Result<Value, InputError> {
    match v {
        toml::Value::Integer(i) => Ok(Value::Number(*i as f64)),
        toml::Value::Float(x) => Ok(Value::Number(*x)),
        toml::Value::String(s) => Ok(Value::Text(s.clone())),
        toml::Value::Array(items) => items
            .iter()
            .enumerate()
            .map(|(i, x)| value(&format!("{key}.{i}"), x))
            .collect::<Result<Vec<_>, _>>()
            .map(Value::List),
        other => Err(InputError::new(
            key,
            format!(
                "must be a number, a text or a list, not a {}",
                other.type_str()
            ),
        )),
    }
}

/// The plan of the `[scan]` table for `dims` axes.
pub(super) fn plan(s: &RawScan, dims: usize) -> Result<Plan, InputError> {
    let default_points = if dims == 3 { 33 } else { 129 };
    let points: Vec<i64> = match &s.points {
        None => vec![default_points; dims],
        Some(OneOrMany::One(n)) => vec![*n; dims],
        Some(OneOrMany::Many(v)) if v.len() == dims => v.clone(),
        Some(OneOrMany::Many(v)) => {
            return Err(InputError::new(
                "scan.points",
                format!("needs one count per axis ({dims}), got {}", v.len()),
            ))
        }
    };
    for (i, n) in points.iter().enumerate() {
        if *n < 2 {
            return Err(InputError::new(
                format!("scan.points.{i}"),
                format!("must be at least 2, got {n}"),
            ));
        }
    }
    let count = |key: &str, v: Option<i64>, default: i64, min: i64| -> Result<usize, InputError> {
        let v = v.unwrap_or(default);
        if v < min {
            Err(InputError::new(
                key,
                format!("must be at least {min}, got {v}"),
            ))
        } else {
            Ok(v as usize)
        }
    };
    let default_directions = match dims {
        1 => 2,
        2 => 180,
        _ => 400,
    };
    let directions = count("scan.directions", s.directions, default_directions, 1)?;
    let directions = if dims == 1 { 2 } else { directions };
    let steps = count("scan.steps", s.steps, 100, 0)?;
    let matrices = count("scan.matrices", s.matrices, 0, 0)?;
    let tolerance = crate::error::finite("scan.tolerance", s.tolerance.unwrap_or(1e-12))?;
    if !(0.0..1e-2).contains(&tolerance) {
        return Err(InputError::new("scan.tolerance", "must lie in [0, 0.01)"));
    }
    let analyses: Vec<&str> = match &s.analyses {
        None => ANALYSES.to_vec(),
        Some(list) => {
            let mut out = Vec::new();
            for (i, a) in list.iter().enumerate() {
                let name = ANALYSES.iter().find(|n| **n == a.as_str()).ok_or_else(|| {
                    InputError::unknown(&format!("scan.analyses.{i}"), "analysis", a, &ANALYSES)
                })?;
                if !out.contains(name) {
                    out.push(*name);
                }
            }
            if out.is_empty() {
                return Err(InputError::new("scan.analyses", "names no analysis"));
            }
            out
        }
    };
    let epsilon = positive("scan.epsilon", s.epsilon.unwrap_or(1e-3))?;
    if let Some(w) = &s.weights {
        for (i, x) in w.iter().enumerate() {
            positive(&format!("scan.weights.{i}"), *x)?;
        }
    }
    let phase_tolerance = positive("scan.phase_tolerance", s.phase_tolerance.unwrap_or(0.01))?;
    let curve_directions = count(
        "scan.dispersion_directions",
        s.dispersion_directions,
        DispersionParams::default_directions(dims, directions) as i64,
        1,
    )?;
    let points: Vec<usize> = points.iter().map(|&n| n as usize).collect();
    let mut plan = Plan::new(&points).with_tolerance(tolerance);
    plan.matrices = matrices;
    for a in analyses {
        plan = match a {
            "radius" => plan.with_radius(),
            "limit" => plan.with_limit(LimitParams { directions }),
            "growth" => plan.with_growth(GrowthParams {
                steps,
                epsilon,
                weights: s.weights.clone(),
            }),
            _ => plan.with_dispersion(DispersionParams {
                phase_tolerance,
                directions: curve_directions,
            }),
        };
    }
    Ok(plan)
}
