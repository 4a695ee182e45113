//! The worst-case modes: `mode_<measure>.npy` with their labels, the `modes`
//! key of summary.json and one row per mode.

use super::Section;
use crate::analysis::modes::Measure;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::format::{num, vec_num};
use crate::report::npy::{plain, Array};
use serde_json::{json, Map, Value};

/// The worst modes.
pub struct Modes;

impl Section for Modes {
    fn arrays<'a>(&self, p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        for mode in &r.modes {
            // the stacked state of a multistep method has more components than variables
            let dim = if mode.vector.len() == p.system.size() {
                "component"
            } else {
                "stacked_component"
            };
            let long_name = match mode.kind {
                Measure::Radius => {
                    "eigenvector of G for the largest |lambda| at the worst wavevector"
                }
                Measure::Growth => "initial perturbation with the largest growth at the peak step",
                Measure::Limit => {
                    "eigenvector of the first mode to go unstable at the limit wavevector"
                }
            };
            out.push(
                Array::complex(
                    &format!("mode_{}", mode.kind.as_str()),
                    &[mode.vector.len()],
                    &mode.vector[..],
                    vec![plain(dim)],
                    "1",
                    long_name,
                )
                .with("labels", json!(mode.labels))
                .with("wavevector", json!(mode.wavevector)),
            );
        }
    }

    fn summary(&self, _p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        if r.modes.is_empty() {
            return;
        }
        let modes: Vec<Value> = r
            .modes
            .iter()
            .map(|m| {
                let comp: Map<String, Value> = m
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
        s.insert("modes".into(), Value::Array(modes));
    }

    fn rows(&self, _p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        for m in &r.modes {
            rows.push((format!("{} mode", m.kind.as_str()), m.description.clone()));
        }
    }
}
