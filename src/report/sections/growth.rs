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

    fn summary(&self, p: &Problem, r: &Results, s: &mut Map<String, Value>) {
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
                "norm": "||W u||_2 with W = norm_matrix (diag(scan.weights), or the model's symmetrising default, or for a user system the automatic diagonal symmetriser of its flux matrices where one exists), repeated over time levels",
                "norm_origin": norm_origin(p, r),
                "state": state_note(p),
                "class": g.class.as_str(),
                "verdict": g.verdict,
            }),
        );
    }

    fn rows(&self, p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        let Some(g) = &r.growth else {
            return;
        };
        rows.push(("growth".into(), g.verdict.clone()));
        if let Some(c) = norm_caution(p, r) {
            rows.push(("caution".into(), c));
        }
        if p.method.levels() > 1 {
            rows.push(("norm".into(), state_note(p)));
        }
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

/// Whether growth was measured in a norm the user chose (scan.weights).
fn user_weights(r: &Results) -> bool {
    r.plan.growth.as_ref().is_some_and(|g| g.weights.is_some())
}

/// Where the norm of the growth measures comes from, for summary.json.
fn norm_origin(p: &Problem, r: &Results) -> Value {
    use crate::physics::symmetriser::NormOrigin;
    if user_weights(r) {
        return json!({"kind": "scan.weights"});
    }
    match &p.system.norm_origin {
        NormOrigin::Model => json!({"kind": "model symmetriser"}),
        NormOrigin::AutomaticDiagonal => json!({
            "kind": "automatic diagonal symmetriser",
            "meaning": "W = diag(w) with W^2 A_d symmetric for every flux matrix A_d: an energy norm of the hyperbolic part",
        }),
        NormOrigin::Identity { flux_condition } => json!({
            "kind": "identity",
            "flux_eigenvector_condition": num(*flux_condition),
            "caution": norm_caution(p, r),
        }),
    }
}

/// The caution of a user system measured in the identity norm although its
/// waves are not orthogonal in it.
fn norm_caution(p: &Problem, r: &Results) -> Option<String> {
    use crate::physics::symmetriser::NormOrigin;
    if user_weights(r) {
        return None;
    }
    let NormOrigin::Identity { flux_condition } = p.system.norm_origin else {
        return None;
    };
    (flux_condition > 1.0 + 1e-9).then(|| {
        let k = if flux_condition.is_finite() {
            format!("{flux_condition:.3e}")
        } else {
            "infinite (a flux matrix is not diagonalisable with real speeds)".to_string()
        };
        format!(
            "growth is measured in the identity norm of the variables as given: the flux matrices have no diagonal symmetriser, and the condition number of their eigenvectors is {k}, so growth in a characteristic (energy) norm can differ from these figures by up to that factor; set scan.weights to per-variable energy weights to measure growth in your own physical norm"
        )
    })
}

/// What the state of the growth measures is: one time level, or all of a
/// multistep method's levels stacked.
fn state_note(p: &Problem) -> String {
    if p.method.is_second_order() {
        return "discrete wave energy of the two-step recurrence for u_tt = L u: the state (u^n - u^(n-1), c (u^n + u^(n-1))/2) with c = dt sqrt(rho(-L(theta))), dt times (velocity, omega x displacement); central differences conserve (1 - c^2/4)|d|^2 + c^2|s|^2 exactly, so ||G^n|| <= 1/sqrt(1 - c^2/4) for them".to_string();
    }
    match p.method.levels() {
        1 => "one time level: ||G^n|| is the growth of the solution over n steps".to_string(),
        k => format!(
            "stacked state of all {k} time levels of the method: ||G^n|| measures the whole stacked state, so it can exceed 1 at n = 1 by the stacking alone (e.g. sqrt(2) for leapfrog with independent starting levels), not by growth of the solution"
        ),
    }
}
