//! Maxwell's equations in normalised form, E_t = c ∇×H, H_t = −c ∇×E: 3-D with
//! variables ex, ey, ez, hx, hy, hz; 2-D in the `te` (ex, ey, hz) or `tm`
//! (hx, hy, ez) polarisation (Taflove & Hagness, Computational Electrodynamics).

use super::params::Reader;
use super::{real, ModelKind, System};
use crate::error::InputError;
use num_complex::Complex64 as C64;

/// (equation, variable, axis, coefficient) of one curl entry.
type CurlEntry = (usize, usize, usize, f64);

/// Maxwell's equations with wave speed c in `dims` (2 or 3) axes.
pub fn maxwell(speed: f64, dims: usize, tm: bool) -> System {
    // (equation, variable, axis, coefficient) of u_t + Σ A_d u_d = 0, i.e. A = −(curl part).
    let (vars, entries): (Vec<&str>, Vec<CurlEntry>) = match (dims, tm) {
        (3, _) => (
            vec!["ex", "ey", "ez", "hx", "hy", "hz"],
            vec![
                // ex_t = c(hz_y − hy_z)
                (0, 5, 1, -1.0),
                (0, 4, 2, 1.0),
                // ey_t = c(hx_z − hz_x)
                (1, 3, 2, -1.0),
                (1, 5, 0, 1.0),
                // ez_t = c(hy_x − hx_y)
                (2, 4, 0, -1.0),
                (2, 3, 1, 1.0),
                // hx_t = −c(ez_y − ey_z)
                (3, 2, 1, 1.0),
                (3, 1, 2, -1.0),
                // hy_t = −c(ex_z − ez_x)
                (4, 0, 2, 1.0),
                (4, 2, 0, -1.0),
                // hz_t = −c(ey_x − ex_y)
                (5, 1, 0, 1.0),
                (5, 0, 1, -1.0),
            ],
        ),
        (_, false) => (
            vec!["ex", "ey", "hz"],
            vec![
                (0, 2, 1, -1.0), // ex_t = c hz_y
                (1, 2, 0, 1.0),  // ey_t = −c hz_x
                (2, 1, 0, 1.0),  // hz_t = −c(ey_x − ex_y)
                (2, 0, 1, -1.0),
            ],
        ),
        (_, true) => (
            vec!["hx", "hy", "ez"],
            vec![
                (0, 2, 1, 1.0),  // hx_t = −c ez_y
                (1, 2, 0, -1.0), // hy_t = c ez_x
                (2, 1, 0, -1.0), // ez_t = c(hy_x − hx_y)
                (2, 0, 1, 1.0),
            ],
        ),
    };
    let m = vars.len();
    let flux = (0..dims)
        .map(|d| {
            let mut a = real(m, |_, _| 0.0);
            for &(i, j, ax, c) in &entries {
                if ax == d {
                    a[(i, j)] = C64::new(c * speed, 0.0);
                }
            }
            a
        })
        .collect();
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts(
        ModelKind::Maxwell,
        vars.iter().map(|s| s.to_string()).collect(),
        flux,
        zero,
        real(m, |_, _| 0.0),
        Some(speed),
    );
    let pairs = m / 3;
    let mut names: Vec<String> = (0..pairs)
        .map(|k| format!("electromagnetic-{}", k + 1))
        .collect();
    names.extend((0..m - 2 * pairs).map(|k| format!("static{}", k + 1)));
    names.extend((0..pairs).map(|k| format!("electromagnetic+{}", k + 1)));
    s.mode_names = names;
    s
}

pub(super) fn maxwell_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    if dims == 1 {
        return Err(InputError::new(
            "grid.spacing",
            "the maxwell model has 2 axes (te or tm) or 3",
        ));
    }
    let c = r.positive("speed")?;
    let tm = match (dims, r.text("polarization")?.as_deref()) {
        (3, Some(_)) => return Err(r.error("polarization", "is only used with two axes")),
        (_, None) | (_, Some("te")) => false,
        (_, Some("tm")) => true,
        (_, Some(other)) => {
            return Err(InputError::unknown(
                "model.polarization",
                "polarization",
                other,
                &["te", "tm"],
            ))
        }
    };
    Ok(maxwell(c, dims, tm))
}
