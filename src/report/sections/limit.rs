//! The largest stable Δt: the by-direction arrays, the `limit` and
//! `limit_by_direction` keys of summary.json and the limit rows.

use super::Section;
use crate::analysis::{LimitKind, Results};
use crate::problem::Problem;
use crate::report::format::{dir, direction_deg, num, physical, theta, vec_num};
use crate::report::npy::{axis, plain, Array};
use serde_json::{json, Map, Value};

/// The limit.
pub struct Limit;

/// The direction dimension: its coordinate is the angle (directions.npy) in
/// 1-D and 2-D, the index in 3-D (where directions.npy holds unit vectors, not a
/// 1-D coordinate).
fn direction_in(dims: usize) -> (&'static str, Option<String>) {
    match dims {
        3 => plain("direction"),
        _ => axis("direction", "directions.npy"),
    }
}

impl Section for Limit {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        let Some(dl) = r.limit.as_ref().map(|l| &l.by_direction) else {
            return;
        };
        let n = dl.directions.len();
        let dims = r.grid.points.len();
        let direction = || direction_in(dims);
        if dims == 3 {
            let flat: Vec<f64> = dl.directions.iter().flatten().copied().collect();
            out.push(Array::real(
                "directions",
                &[n, 3],
                flat,
                vec![direction(), plain("axis")],
                "1",
                "wave direction unit vectors in wavevector space",
            ));
        } else {
            out.push(Array::real(
                "directions",
                &[n],
                dl.angles(),
                vec![direction()],
                "radian",
                "wave direction angle in wavevector space",
            ));
        }
        out.push(Array::real(
            "limit_by_direction",
            &[n],
            &dl.dt[..],
            vec![direction()],
            "s",
            "largest stable time step along the wave direction (inf: unconditional)",
        ));
        let flat: Vec<f64> = dl.wavevector.iter().flatten().copied().collect();
        out.push(Array::real(
            "limit_wavevector_by_direction",
            &[n, dims],
            flat,
            vec![direction(), plain("axis")],
            "radian",
            "wavevector that sets the limit along each direction",
        ));
        if !dl.courant.is_empty() {
            out.push(Array::real(
                "courant_by_direction",
                &[n],
                &dl.courant[..],
                vec![direction()],
                "1",
                "largest stable Courant number along the wave direction",
            ));
        }
    }

    fn summary(&self, p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        let Some(l) = &r.limit else {
            return;
        };
        let (deg, el) = direction_deg(&l.wavevector);
        let (pdeg, pel) = direction_deg(&physical(&l.wavevector, &p.spacing));
        let dt_max = match l.kind {
            LimitKind::Unconditional => Value::Null,
            LimitKind::None => json!(0.0),
            LimitKind::Bounded => num(l.dt_max),
        };
        let mut limit = json!({
            "kind": l.kind.as_str(),
            "dt_max": dt_max,
            "courant_max": l.courant_max.map(num),
            "diffusion_number_max": l.diffusion_number_max.map(num),
            "wavevector": vec_num(&l.wavevector),
            "physical_direction_deg": pdeg,
            "physical_elevation_deg": pel,
            "direction_deg": deg,
            "elevation_deg": el,
            "directions": "physical_direction_deg is the direction of k (k_d = theta_d / h_d); direction_deg and elevation_deg, here and in limit_by_direction, are directions in theta-space (theta_d = k_d h_d), the same on a grid with equal spacings",
            "stable_at_case_dt": l.stable_at_dt,
            "found_by": l.found_by.describe(),
        });
        if let Some((lo, hi)) = l.bracket {
            limit["bracket"] = json!({
                "dt_lo": num(lo),
                "dt_hi": num(hi),
                "relative_width": num((hi - lo) / hi),
                "meaning": "stable for every dt in (0, dt_lo] at every wavevector examined (grid, continuous refinement, long waves and the corners of the box); unstable just above dt_hi; dt_max = dt_lo",
            });
        }
        if let Some((found, resolved)) = l.below_resolution {
            limit["below_resolution"] = json!({
                "dt_found": num(found),
                "dt_resolved": num(resolved),
                "meaning": "a first loss of stability was found at dt_found, below dt_resolved = 1e-7 times the time scale 1/||L|| of the fastest wave, where growth of the amplification factor is beneath its rounding and stability cannot be verified; the limit is reported as none (no usable stable dt)",
            });
        }
        if let Some(v) = l.verification {
            limit["verified_below"] = json!({
                "dt_steps_scanned": v.steps_scanned,
                "stable_everywhere_below": v.stable_below,
                "moved_down_by_scan": v.moved_down,
            });
        }
        s.insert("limit".into(), limit);
        let d = &l.by_direction;
        let (deg, el) = direction_deg(&d.directions[d.worst]);
        let (pdeg, pel) = direction_deg(&physical(&d.directions[d.worst], &p.spacing));
        s.insert(
            "limit_by_direction".into(),
            json!({
                "count": d.directions.len(),
                "worst_physical_direction_deg": pdeg,
                "worst_physical_elevation_deg": pel,
                "dt_min": num(d.smallest()),
                "worst_direction_deg": deg,
                "worst_elevation_deg": el,
                "dt_max": num(d.largest()),
            }),
        );
    }

    fn rows(&self, p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        let Some(l) = &r.limit else {
            return;
        };
        let v = match l.kind {
            LimitKind::Unconditional => "unconditional: stable for every dt > 0".to_string(),
            LimitKind::None => match l.below_resolution {
                Some((found, resolved)) => format!(
                    "none: no stable dt above {resolved:.3e} (1e-7 of the time scale 1/||L||); stability is lost at {found:.3e} at theta = {}",
                    theta(&l.wavevector)
                ),
                None => format!(
                    "none: unstable for every dt > 0 (e.g. at theta = {})",
                    theta(&l.wavevector)
                ),
            },
            LimitKind::Bounded => {
                let c = l
                    .courant_max
                    .map(|c| format!(", Courant {c:.10}"))
                    .unwrap_or_default();
                let d = l
                    .diffusion_number_max
                    .map(|d| format!(", diffusion number {d:.10}"))
                    .unwrap_or_default();
                format!("dt_max = {:.10e}{c}{d}", l.dt_max)
            }
        };
        rows.push(("largest dt".into(), v));
        if l.kind == LimitKind::Bounded {
            rows.push((
                "set by".into(),
                format!(
                    "theta = {}, physical direction {} (theta-space {})",
                    theta(&l.wavevector),
                    dir(&physical(&l.wavevector, &p.spacing)),
                    dir(&l.wavevector)
                ),
            ));
        }
        if let Some((lo, hi)) = l.bracket {
            rows.push((
                "bracket".into(),
                format!(
                    "stable up to {lo:.10e}, unstable just above {hi:.10e} (relative width {:.1e})",
                    (hi - lo) / hi
                ),
            ));
        }
        let d = &l.by_direction;
        let (vmin, vmax) = (d.smallest(), d.largest());
        if vmin.is_finite() {
            rows.push((
                "by direction".into(),
                format!(
                    "{} theta-space directions: dt from {vmin:.6e} (physical direction {}, theta-space {}) to {vmax:.6e}",
                    d.directions.len(),
                    dir(&physical(&d.directions[d.worst], &p.spacing)),
                    dir(&d.directions[d.worst])
                ),
            ));
        }
    }
}
