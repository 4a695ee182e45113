//! The arrays of a probe: the grid's wavevectors, the measured G(θ), and the
//! maps and curves of each analysis, each described in the manifest.

use super::npy::{axis, plain, Array};
use crate::case::probe::ProbeCase;
use crate::probe::field::theta_axis;
use crate::probe::ProbeResults;
use serde_json::json;

const AXES: [&str; 3] = ["theta_x", "theta_y", "theta_z"];

/// Every array of the probe's results.
pub fn arrays<'a>(case: &'a ProbeCase, r: &'a ProbeResults) -> Vec<Array<'a>> {
    let cells = &case.spec.cells;
    let m = case.spec.m();
    let dims = cells.len();
    let grid_dims = || -> Vec<(&'static str, Option<String>)> {
        (0..dims)
            .map(|d| axis(AXES[d], &format!("{}.npy", AXES[d])))
            .collect()
    };
    let variables = json!(case.spec.variables);
    let mut out = Vec::new();
    for (d, n) in cells.iter().enumerate() {
        out.push(Array::real(
            AXES[d],
            &[*n],
            theta_axis(*n),
            vec![axis(AXES[d], &format!("{}.npy", AXES[d]))],
            "rad",
            "grid wavevector theta = 2 pi j / N along the axis, ascending (the FFT order shifted)",
        ));
    }
    let mut shape = cells.clone();
    shape.extend([m, m]);
    let mut g_dims = grid_dims();
    g_dims.extend([plain("row"), plain("column")]);
    out.push(
        Array::complex(
            "amplification",
            &shape,
            r.field.g.as_slice(),
            g_dims,
            "1",
            "measured amplification matrix G(theta) of one step, each variable's phase at its own location",
        )
        .with("variables", variables.clone()),
    );
    if let Some(rad) = &r.radius {
        out.push(Array::real(
            "radius",
            cells,
            rad.map.as_slice(),
            grid_dims(),
            "1",
            "spectral radius of the measured G(theta)",
        ));
    }
    if let Some(g) = &r.growth {
        out.push(Array::real(
            "growth_envelope",
            &[g.envelope.len()],
            g.envelope.as_slice(),
            vec![plain("step")],
            "1",
            "max over the grid of ||W G^n W^-1||_2 against the step n",
        ));
        out.push(Array::real(
            "growth_map",
            cells,
            g.map.as_slice(),
            grid_dims(),
            "1",
            "max over n of ||W G^n W^-1||_2 at each wavevector",
        ));
    }
    if let Some(d) = &r.dispersion {
        let mut mode_shape = cells.clone();
        mode_shape.push(m);
        let mode_dims = || {
            let mut v = grid_dims();
            v.push(plain("mode"));
            v
        };
        out.push(Array::complex(
            "omega",
            &mode_shape,
            d.omega.as_slice(),
            mode_dims(),
            "rad/s",
            "fully discrete frequency i ln(lambda)/dt per mode (mode e^{i(k.x - omega t)}; imaginary part the growth rate)",
        ));
        if let Some(e) = &d.exact {
            out.push(Array::complex(
                "omega_exact",
                &mode_shape,
                e.as_slice(),
                mode_dims(),
                "rad/s",
                "exact frequency of the named model per mode, ascending real part",
            ));
        }
        if let Some(p) = &d.phase_ratio {
            out.push(Array::real(
                "phase_speed_ratio",
                &mode_shape,
                p.as_slice(),
                mode_dims(),
                "1",
                "Re omega / Re omega_exact per mode (NaN where the exact mode does not move)",
            ));
        }
    }
    if let Some(l) = &r.limit {
        let flat: Vec<f64> = l
            .evaluations
            .iter()
            .flat_map(|&(t, rho)| [t, rho])
            .collect();
        out.push(
            Array::real(
                "limit_search",
                &[l.evaluations.len(), 2],
                flat,
                vec![plain("evaluation"), plain("quantity")],
                "1",
                "the limit search in order: (dt, max spectral radius over the grid) per probe",
            )
            .with("quantities", json!(["dt", "max_radius"])),
        );
    }
    out
}
