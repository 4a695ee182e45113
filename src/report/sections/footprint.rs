//! The Fourier footprint: `footprint.npy` (Δt·eig L(θ) at the sampled
//! wavevectors), their grid indices and |θ|, and the `footprint` key of
//! summary.json.

use super::Section;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::npy::{plain, Array};
use serde_json::{json, Map, Value};

/// The footprint.
pub struct Footprint;

impl Section for Footprint {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        let Some(f) = &r.footprint else {
            return;
        };
        let k = f.theta_norm.len();
        out.push(Array::complex(
            "footprint",
            &[k, f.m],
            &f.z[..],
            vec![plain("footprint_node"), plain("eigenvalue")],
            "1",
            "dt times the eigenvalues of L at the sampled wavevectors (the Fourier footprint, unordered per node)",
        ));
        out.push(Array::real(
            "footprint_theta_norm",
            &[k],
            &f.theta_norm[..],
            vec![plain("footprint_node")],
            "radian",
            "|theta| of each sampled wavevector",
        ));
        out.push(Array::real(
            "footprint_index",
            &[k],
            f.index.iter().map(|&i| i as f64).collect::<Vec<f64>>(),
            vec![plain("footprint_node")],
            "1",
            "flat C-order grid index of each sampled wavevector",
        ));
    }

    fn summary(&self, p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        let Some(f) = &r.footprint else {
            return;
        };
        let meaning = if p.method.is_second_order() {
            "z = dt^2 * mu for every eigenvalue mu of L(theta) at evenly strided grid wavevectors (all of them up to 8192): the variable of a second-order-in-time method (u_tt = L u); the scheme is stable at dt when every z lies in the time method's stability region, drawn with them in footprint.png"
        } else {
            "z = dt * mu for every eigenvalue mu of L(theta) at evenly strided grid wavevectors (all of them up to 8192); the scheme is stable at dt when every z lies in the time method's stability region, drawn with them in footprint.png"
        };
        s.insert(
            "footprint".into(),
            json!({
                "wavevectors": f.theta_norm.len(),
                "eigenvalues_per_wavevector": f.m,
                "dt": f.dt,
                "meaning": meaning,
            }),
        );
    }
}
