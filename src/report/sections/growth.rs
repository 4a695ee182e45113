//! Non-normality and transient growth: the ‖G‖₂, departure and eigenvector
//! condition maps and the envelope, the `growth` key of summary.json and the
//! growth rows.

use super::grid::grid_dims;
use super::Section;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::format::{num, vec_num};
use crate::report::npy::{plain, Array};
use serde_json::{json, Map, Value};

/// Growth.
pub struct Growth;

impl Section for Growth {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        let Some(g) = &r.growth else {
            return;
        };
        let maps: [(&str, &'a [f64], &'static str); 3] = [
            ("norm", &g.norm, "2-norm of the amplification matrix"),
            (
                "departure",
                &g.departure,
                "relative Henrici departure from normality of G",
            ),
            (
                "eigvec_condition",
                &g.condition,
                "2-norm condition number of the eigenvector matrix of G (inf where defective)",
            ),
        ];
        for (name, data, long_name) in maps {
            out.push(Array::real(
                name,
                &r.grid.points,
                data,
                grid_dims(r),
                "1",
                long_name,
            ));
        }
        out.push(Array::real(
            "growth",
            &[g.envelope.len()],
            &g.envelope[..],
            vec![plain("step")],
            "1",
            "max over the wavevector grid of ||G^n||_2, n = 0..steps",
        ));
    }

    fn summary(&self, _p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        let Some(g) = &r.growth else {
            return;
        };
        let (pv, pn, pt) = &g.peak;
        s.insert(
            "growth".into(),
            json!({
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
                        "growth_lower_bound": num(k.lower_bound),
                        "note": "K, sampled and refined over |z| > 1 at the peak wavevector, is a lower bound on the Kreiss constant (K >= 1 for every matrix). By the Kreiss matrix theorem K <= sup_n ||G^n|| <= e m K: the growth of this wavevector over all n is at least K; e m K bounds it from above only with the exact constant, which sampling cannot certify, so no upper bound is reported",
                    }),
                    None => json!({"lower_bound": null, "infinite": true}),
                },
                "pseudospectral_radius": { "epsilon": g.pseudospectral.0, "radius": num(g.pseudospectral.1), "wavevector": vec_num(pt) },
                "norm_matrix": g.norm_matrix,
                "norm": "||W u||_2 with W = norm_matrix (diag(scan.weights), or the model's symmetrising default), repeated over time levels",
                "class": g.class.as_str(),
                "verdict": g.verdict,
            }),
        );
    }

    fn rows(&self, _p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        let Some(g) = &r.growth else {
            return;
        };
        rows.push(("growth".into(), g.verdict.clone()));
        if let Some(k) = &g.kreiss {
            rows.push((
                "kreiss".into(),
                format!(
                    "K >= {:.6} (sampled), eps-pseudospectral radius {:.6} (eps = {:e})",
                    k.lower_bound, g.pseudospectral.1, g.pseudospectral.0
                ),
            ));
        }
    }
}
