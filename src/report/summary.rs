//! summary.json: the headline results with their definitions and cautions.
//! Strict JSON: a non-finite number becomes null, and the surrounding keys say why.

use crate::analysis::{LimitKind, Results};
use crate::problem::{Problem, Step};
use serde_json::{json, Value};

/// A finite number, or null.
pub fn num(x: f64) -> Value {
    if x.is_finite() {
        json!(x)
    } else {
        Value::Null
    }
}

fn vec_num(v: &[f64]) -> Value {
    Value::Array(v.iter().map(|x| num(*x)).collect())
}

/// Direction of a wavevector in degrees: the angle in 1D/2D, (azimuth, elevation) in 3D.
pub fn direction_deg(theta: &[f64]) -> (f64, Option<f64>) {
    match theta.len() {
        1 => (if theta[0] < 0.0 { 180.0 } else { 0.0 }, None),
        2 => (
            theta[1].atan2(theta[0]).to_degrees().rem_euclid(360.0),
            None,
        ),
        _ => {
            let r = theta.iter().map(|x| x * x).sum::<f64>().sqrt();
            let az = theta[1].atan2(theta[0]).to_degrees().rem_euclid(360.0);
            let el = if r > 0.0 {
                (theta[2] / r).asin().to_degrees()
            } else {
                0.0
            };
            (az, Some(el))
        }
    }
}

/// The content of summary.json.
pub fn summary_json(problem: &Problem, r: &Results) -> Value {
    let dt = r.dt;
    let mut s = json!({
        "name": problem.name,
        "description": problem.description,
        "case_file": super::case_identity(problem),
        "dims": problem.dims(),
        "variables": problem.system.variables,
        "model": problem.system.kind.name(),
        "method": problem.method.name,
        "stencils": {
            "first": problem.space.first.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
            "second": problem.space.second.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
        },
        "spacing": problem.spacing,
        "points": r.grid.points,
        "dt": num(dt),
        "dt_given_as": match problem.step { Step::Dt(_) => "dt", Step::Courant(_) => "courant" },
        "courant": r.courant.map(num).unwrap_or(Value::Null),
        "diffusion_number": r.diffusion_number.map(num).unwrap_or(Value::Null),
        "reference_speed": num(problem.system.reference_speed),
        "reference_spacing": num(problem.reference_spacing()),
        "tolerance": r.plan.tolerance,
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
    if let Some(rad) = &r.radius {
        let (deg, el) = direction_deg(&rad.wavevector);
        s["radius"] = json!({
            "max": num(rad.max),
            "wavevector": vec_num(&rad.wavevector),
            "direction_deg": deg,
            "elevation_deg": el,
            "stable": rad.stable,
        });
    }
    if let Some(l) = &r.limit {
        let (deg, el) = direction_deg(&l.wavevector);
        let dt_max = match l.kind {
            LimitKind::Unconditional => Value::Null,
            LimitKind::None => json!(0.0),
            LimitKind::Bounded => num(l.dt_max),
        };
        s["limit"] = json!({
            "kind": l.kind.as_str(),
            "dt_max": dt_max,
            "courant_max": l.courant_max.map(num),
            "diffusion_number_max": l.diffusion_number_max.map(num),
            "wavevector": vec_num(&l.wavevector),
            "direction_deg": deg,
            "elevation_deg": el,
            "stable_at_case_dt": l.stable_at_dt,
            "found_by": l.found_by.describe(),
        });
        if let Some(v) = l.verification {
            s["limit"]["verified_below"] = json!({
                "dt_steps_scanned": v.steps_scanned,
                "stable_everywhere_below": v.stable_below,
                "moved_down_by_scan": v.moved_down,
            });
        }
        let d = &l.by_direction;
        let vmin = d.dt.get(d.worst).copied().unwrap_or(f64::INFINITY);
        let (deg, el) = direction_deg(&d.directions[d.worst]);
        s["limit_by_direction"] = json!({
            "count": d.directions.len(),
            "dt_min": num(vmin),
            "worst_direction_deg": deg,
            "worst_elevation_deg": el,
            "dt_max": num(d.dt.iter().copied().fold(0.0, f64::max)),
        });
    }
    if let Some(g) = &r.growth {
        let (pv, pn, pt) = &g.peak;
        s["growth"] = json!({
            "max_norm": num(*pv),
            "step": pn,
            "wavevector": vec_num(pt),
            "steps": g.steps,
            "final_norm": num(g.envelope.last().copied().unwrap_or(f64::NAN)),
            "max_norm_one_step": num(g.max_norm_one_step),
            "max_departure": num(g.max_departure),
            "defective_on_unit_circle": g.defective_on_circle,
            "kreiss": match &g.kreiss {
                Some(k) => json!({
                    "lower_bound": num(k.lower_bound),
                    "wavevector": vec_num(&k.wavevector),
                    "upper_bound_on_growth_from_sampled_constant": num(k.growth_bound),
                    "note": "K sampled over |z| > 1 at the peak wavevector is a lower bound on the Kreiss constant; by the Kreiss matrix theorem K <= sup ||G^n|| <= e m K",
                }),
                None => json!({"lower_bound": null, "infinite": true}),
            },
            "pseudospectral_radius": { "epsilon": g.pseudospectral.0, "radius": num(g.pseudospectral.1), "wavevector": vec_num(pt) },
            "norm_matrix": g.norm_matrix,
            "norm": "||W u||_2 with W = norm_matrix (diag(scan.weights), or the model's symmetrising default), repeated over time levels",
            "class": g.class.as_str(),
            "verdict": g.verdict,
        });
    }
    if let Some(d) = &r.dispersion {
        let modes: Vec<Value> = d
            .names
            .iter()
            .zip(&d.resolution)
            .zip(&d.parasitic_fraction)
            .map(|((name, (semi, disc, k)), parasitic)| {
                let (deg, el) = direction_deg(&d.directions[*k]);
                json!({
                    "name": name,
                    "ppw_required": semi.map(num),
                    "ppw_required_discrete": disc.map(num),
                    "worst_direction_deg": semi.map(|_| deg),
                    "worst_elevation_deg": semi.and(el),
                    "parasitic_fraction": parasitic,
                })
            })
            .collect();
        s["dispersion"] = json!({
            "phase_tolerance": d.tolerance,
            "modes": modes,
            "computational_modes": d.computational,
            "definitions": {
                "ppw_required": "points per wavelength 2 pi/(|k| h_min) above which |c_num/c_exact - 1| <= phase_tolerance in every direction",
                "parasitic_fraction": "share of grid wavevectors where the numerical group velocity opposes the exact one",
                "computational_modes": "fully discrete eigenvalues with no semi-discrete partner (extra roots of multistep methods)",
            },
        });
    }
    if !r.modes.is_empty() {
        let modes: Vec<Value> = r
            .modes
            .iter()
            .map(|m| {
                let comp: serde_json::Map<String, Value> = m
                    .composition
                    .iter()
                    .map(|(k, v)| (k.clone(), num(*v)))
                    .collect();
                json!({
                    "measure": m.kind.as_str(),
                    "wavevector": vec_num(&m.wavevector),
                    "value": [num(m.value.re), num(m.value.im)],
                    "frequency": m.frequency.map(num),
                    "composition": comp,
                    "file": format!("mode_{}.npy", m.kind.as_str()),
                    "description": m.description,
                })
            })
            .collect();
        s["modes"] = Value::Array(modes);
    }
    s["cautions"] = json!(r.cautions);
    s
}
