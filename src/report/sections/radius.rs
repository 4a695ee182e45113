//! The spectral-radius map at the problem's Δt: `radius.npy`, the `radius` key
//! of summary.json and the verdict row.

use super::grid::grid_dims;
use super::Section;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::format::{direction_deg, num, theta, vec_num};
use crate::report::npy::Array;
use serde_json::{json, Map, Value};

/// The radius map.
pub struct Radius;

impl Section for Radius {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        if let Some(rad) = &r.radius {
            out.push(Array::real(
                "radius",
                &r.grid.points,
                &rad.map[..],
                grid_dims(r),
                "1",
                "spectral radius of the amplification matrix at the case time step",
            ));
        }
    }

    fn summary(&self, _p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        if let Some(rad) = &r.radius {
            let (deg, el) = direction_deg(&rad.wavevector);
            s.insert(
                "radius".into(),
                json!({
                    "max": num(rad.max),
                    "wavevector": vec_num(&rad.wavevector),
                    "direction_deg": deg,
                    "elevation_deg": el,
                    "stable": rad.stable,
                }),
            );
        }
    }

    fn rows(&self, _p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        if let Some(rad) = &r.radius {
            let verdict = if rad.stable { "STABLE" } else { "UNSTABLE" };
            rows.push((
                "at this dt".into(),
                format!(
                    "{verdict}: max |lambda| = {:.12} at theta = {}",
                    rad.max,
                    theta(&rad.wavevector)
                ),
            ));
        }
    }
}
