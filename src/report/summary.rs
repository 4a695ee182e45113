//! summary.json: the headline results with their definitions and cautions.
//! Strict JSON: a non-finite number becomes null, and the surrounding keys say why.

use crate::analysis::{LimitKind, Results};
use crate::case::{Case, Step};
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

/// The cautions every summary carries, plus case-specific ones.
pub fn cautions(case: &Case, r: &Results) -> Vec<String> {
    let mut c = vec![
        "Von Neumann analysis of a linear, constant-coefficient problem on a periodic grid: a necessary condition for the stability of a real solver, not a sufficient one (boundaries, variable coefficients, nonlinearity and filters can each destabilise a scheme that passes here).".to_string(),
        "Use a safety margin on any time step reported here, e.g. 0.8 to 0.9 times dt_max.".to_string(),
    ];
    if r.failures > 0 {
        c.push(format!(
            "the eigenvalue kernel did not converge at {} wavevector(s); their values are NaN and they were skipped",
            r.failures
        ));
    }
    if let Some(l) = &r.limit {
        if l.kind == LimitKind::None {
            c.push(format!(
                "no time step is stable: the {} method amplifies some wavevector for every dt > 0",
                case.method.name
            ));
        }
    }
    if let Some(rad) = &r.radius {
        if !rad.stable {
            c.push(format!(
                "unstable at the case time step: max |lambda| = {:.6} exceeds 1 + tolerance",
                rad.max
            ));
        }
    }
    c
}

/// The content of summary.json.
pub fn summary_json(case: &Case, r: &Results) -> Value {
    let dt = r.dt;
    let mut s = json!({
        "name": case.name,
        "description": case.description,
        "case_file": super::case_identity(case),
        "dims": case.dims(),
        "variables": case.system.variables,
        "model": case.system.kind,
        "method": case.method.name,
        "stencils": {
            "first": case.space.first.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
            "second": case.space.second.iter().map(|s| s.name.clone()).collect::<Vec<_>>(),
        },
        "spacing": case.spacing,
        "points": r.grid.points,
        "dt": num(dt),
        "dt_given_as": match case.step { Step::Dt(_) => "dt", Step::Courant(_) => "courant" },
        "courant": case.courant_of(dt).map(num).unwrap_or(Value::Null),
        "diffusion_number": case.diffusion_number_of(dt).map(num).unwrap_or(Value::Null),
        "reference_speed": num(case.system.reference_speed),
        "reference_spacing": num(case.reference_spacing()),
        "tolerance": case.scan.tolerance,
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
        let scaled = |f: Option<f64>| match (l.kind, f) {
            (LimitKind::Bounded, Some(x)) => num(x),
            (LimitKind::None, Some(_)) => json!(0.0),
            _ => Value::Null,
        };
        s["limit"] = json!({
            "kind": l.kind.as_str(),
            "dt_max": dt_max,
            "courant_max": scaled(case.courant_of(l.dt_max)),
            "diffusion_number_max": scaled(case.diffusion_number_of(l.dt_max)),
            "wavevector": vec_num(&l.wavevector),
            "direction_deg": deg,
            "elevation_deg": el,
            "stable_at_case_dt": match l.kind {
                LimitKind::Bounded => dt <= l.dt_max,
                LimitKind::Unconditional => true,
                LimitKind::None => false,
            },
            "found_by": r.limit_found_by,
        });
        if let Some((verified, corrected)) = r.limit_verified {
            s["limit"]["verified_below"] = json!({
                "dt_steps_scanned": crate::analysis::composite::VERIFY_STEPS,
                "stable_everywhere_below": verified,
                "moved_down_by_scan": corrected,
            });
        }
    }
    if let Some(d) = &r.directional {
        let (imin, vmin) =
            d.dt.iter().enumerate().fold(
                (0, f64::INFINITY),
                |b, (i, v)| if *v < b.1 { (i, *v) } else { b },
            );
        let (deg, el) = direction_deg(&d.directions[imin]);
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
        let w = crate::analysis::norm_matrix(case);
        let m = case.system.size();
        let norm_rows: Vec<Vec<f64>> = (0..m)
            .map(|i| (0..m).map(|j| w[(i, j)]).collect())
            .collect();
        s["growth"] = json!({
            "max_norm": num(*pv),
            "step": pn,
            "wavevector": vec_num(pt),
            "steps": case.scan.steps,
            "final_norm": num(g.envelope.last().copied().unwrap_or(f64::NAN)),
            "max_norm_one_step": num(g.norm.iter().copied().filter(|v| !v.is_nan()).fold(0.0, f64::max)),
            "max_departure": num(g.departure.iter().copied().filter(|v| !v.is_nan()).fold(0.0, f64::max)),
            "defective_on_unit_circle": g.defective_on_circle,
            "kreiss": match &g.kreiss {
                Some((k, th)) => json!({
                    "lower_bound": num(*k),
                    "wavevector": vec_num(th),
                    "upper_bound_on_growth_from_sampled_constant": num(std::f64::consts::E * (case.system.size() * case.method.levels()) as f64 * k),
                    "note": "K sampled over |z| > 1 at the peak wavevector is a lower bound on the Kreiss constant; by the Kreiss matrix theorem K <= sup ||G^n|| <= e m K",
                }),
                None => json!({"lower_bound": null, "infinite": true}),
            },
            "pseudospectral_radius": { "epsilon": g.pseudospectral.0, "radius": num(g.pseudospectral.1), "wavevector": vec_num(pt) },
            "norm_matrix": norm_rows,
            "norm": "||W u||_2 with W = norm_matrix (diag(scan.weights), or the model's symmetrising default), repeated over time levels",
            "class": g.class,
            "verdict": g.verdict,
        });
    }
    if let Some(d) = &r.dispersion {
        let modes: Vec<Value> = d
            .names
            .iter()
            .zip(&d.resolution)
            .enumerate()
            .map(|(j, (name, (semi, disc, k)))| {
                let parasitic = d
                    .group
                    .iter()
                    .zip(&d.group_exact)
                    .filter(|(gn, ge)| {
                        let dot: f64 = gn[j].iter().zip(&ge[j]).map(|(a, b)| a * b).sum();
                        dot < 0.0
                    })
                    .count();
                let (deg, el) = direction_deg(&d.directions[*k]);
                json!({
                    "name": name,
                    "ppw_required": semi.map(num),
                    "ppw_required_discrete": disc.map(num),
                    "worst_direction_deg": semi.map(|_| deg),
                    "worst_elevation_deg": semi.and(el),
                    "parasitic_fraction": parasitic as f64 / d.group.len().max(1) as f64,
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
                    "measure": m.kind,
                    "wavevector": vec_num(&m.wavevector),
                    "value": [num(m.value.re), num(m.value.im)],
                    "frequency": m.frequency.map(num),
                    "composition": comp,
                    "file": format!("mode_{}.npy", m.kind),
                    "description": m.description,
                })
            })
            .collect();
        s["modes"] = Value::Array(modes);
    }
    s["cautions"] = json!(cautions(case, r));
    s
}
