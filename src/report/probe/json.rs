//! summary.json of a probe.

use crate::case::probe::ProbeCase;
use crate::probe::cautions::{cautions, stable};
use crate::probe::{ProbeLimitKind, ProbeResults};
use crate::report::format::{num, vec_num};
use serde_json::{json, Value};

/// The JSON summary of a probe's results.
pub fn probe_summary_json(case: &ProbeCase, r: &ProbeResults) -> Value {
    let spec = &case.spec;
    let plan = &case.plan;
    let ch = &r.checks;
    let check =
        |c: &crate::probe::checks::Check| json!({"figure": num(c.figure), "passed": c.passed});
    let mut s = json!({
        "kind": "probe",
        "case": case.name,
        "description": case.description,
        "file": case.file.display().to_string(),
        "command": case.command,
        "variables": spec.variables,
        "cells": spec.cells,
        "spacing": vec_num(&case.spacing),
        "dt": num(plan.dt),
        "courant": case.courant.map(|(nu, _)| num(nu)),
        "reference_speed": case.courant.map(|(_, c)| num(c)),
        "base": vec_num(&spec.base),
        "amplitude": num(spec.amplitude),
        "locations": spec.locations,
        "model": case.model,
        "runs": r.runs,
        "checks": {
            "linearity": check(&ch.linearity),
            "translation": check(&ch.translation),
            "translation_cell": ch.second_cell,
            "steady": check(&ch.steady),
            "tolerance": num(ch.tolerance),
            "noise": num(ch.noise),
            "valid": ch.valid(),
        },
    });
    if let Some(rad) = &r.radius {
        s["radius"] = json!({
            "max": num(rad.max),
            "worst_theta": vec_num(&r.field.theta(rad.worst)),
            "stable": stable(plan, r),
        });
    }
    if let Some(l) = &r.limit {
        let h_min = case.spacing.iter().cloned().fold(f64::INFINITY, f64::min);
        let dt_max = (l.kind == ProbeLimitKind::Bounded || l.kind == ProbeLimitKind::NotFound)
            .then_some(l.dt_lo)
            .flatten();
        let params = plan.limit.expect("a limit was searched");
        s["limit"] = json!({
            "kind": l.kind.name(),
            "dt_max": dt_max.map(num),
            "bracket": [l.dt_lo.map(num), l.dt_hi.map(num)],
            "courant_max": dt_max.and_then(|dt| case.courant.map(|(_, c)| num(c * dt / h_min))),
            "worst_theta": l.worst_theta.as_deref().map(vec_num),
            "evaluations": l.evaluations.len(),
            "runs": l.runs,
            "tolerance": num(params.tolerance),
            "radius_tolerance": num(params.radius_tolerance),
        });
    }
    if let Some(g) = &r.growth {
        s["growth"] = json!({
            "steps": g.envelope.len() - 1,
            "max_norm": num(g.max),
            "at_step": g.at_step,
            "worst_theta": vec_num(&r.field.theta(g.worst)),
            "norm": plan.norm_origin(),
            "weights": vec_num(&plan.weights),
        });
    }
    if let Some(d) = &r.dispersion {
        let modes: Vec<Value> = d
            .worst_phase_error
            .as_ref()
            .map(|w| {
                w.iter()
                    .enumerate()
                    .map(|(i, (ten, five))| {
                        json!({"mode": i, "phase_error_10_cells": num(*ten), "phase_error_5_cells": num(*five)})
                    })
                    .collect()
            })
            .unwrap_or_default();
        s["dispersion"] = json!({
            "compared_with": case.model,
            "modes": modes,
            "mode_order": if case.model.is_some() { "exact modes by ascending Re omega" } else { "ascending Re omega" },
        });
    }
    s["verdict"] = json!({
        "stable": stable(plan, r),
        "checks_passed": ch.valid(),
    });
    s["cautions"] = json!(cautions(spec, plan, r));
    s
}
