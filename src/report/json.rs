//! The JSON exporter: summary.json — the problem's identity and definitions,
//! then each section's headline results, then the cautions. Strict JSON: a
//! non-finite number becomes null, and the surrounding keys say why.

use super::format::num;
use super::sections::ALL;
use crate::analysis::Results;
use crate::problem::{Problem, Step};
use serde_json::{json, Value};

/// Worker threads the memory estimate assumes: one per core, as a run without
/// `--threads` uses.
fn estimate_threads() -> usize {
    std::thread::available_parallelism().map_or(1, |n| n.get())
}

/// The content of summary.json.
pub fn summary_json(problem: &Problem, r: &Results) -> Value {
    let mut s = json!({
        "name": problem.name,
        "description": problem.description,
        "case_file": super::case_identity(problem),
        "dims": problem.dims(),
        "variables": problem.system.variables,
        "model": problem.system.kind.name(),
        "method": problem.method.name,
        "spatial_filter": problem.method.spatial_filter().map(|f| f.label()),
        "stencils": {
            "first": problem.space.first.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
            "second": problem.space.second.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
        },
        "spacing": problem.spacing,
        "points": r.grid.points,
        "dt": num(r.dt),
        "dt_given_as": match problem.step { Step::Dt(_) => "dt", Step::Courant(_) => "courant" },
        "courant": r.courant.map(num).unwrap_or(Value::Null),
        "diffusion_number": r.diffusion_number.map(num).unwrap_or(Value::Null),
        "reference_speed": num(problem.system.reference_speed),
        "reference_spacing": num(problem.reference_spacing()),
        "tolerance": r.plan.tolerance,
        "resources": {
            "memory_estimate_bytes": r.plan.memory_estimate(problem, estimate_threads()).min(u64::MAX as u128) as u64,
            "memory_estimate_threads": estimate_threads(),
        },
        "definitions": {
            "theta": "wavevector coordinates theta_d = k_d h_d, radians, over [-pi, pi]",
            "reference_speed": "s = largest characteristic speed of the continuous system over all directions",
            "reference_spacing": "h = min_d h_d",
            "courant": "nu = s dt / h",
            "diffusion_number": "r = dt D_max / h^2, D_max the largest diffusivity",
            "stable": "every eigenvalue of G satisfies |lambda| <= 1 + tolerance",
            "dt_max": "largest dt such that every dt in (0, dt_max] is stable at every wavevector, from the first exit of each eigenvalue of the spatial operator from the method's stability region",
        },
        "failures": r.failures,
    });
    if let Value::Object(map) = &mut s {
        for section in ALL {
            section.summary(problem, r, map);
        }
    }
    s["cautions"] = json!(r.cautions);
    s
}
