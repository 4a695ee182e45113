//! The wavevector axes: θ_d = −π + 2π i/(N_d − 1) per axis, the coordinates of
//! every grid-shaped array.

use super::Section;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::npy::{axis, Array};

const AXES: [&str; 3] = ["theta_x", "theta_y", "theta_z"];
const LONG: [&str; 3] = [
    "wavevector k_x h_x",
    "wavevector k_y h_y",
    "wavevector k_z h_z",
];

/// The axes of a grid-shaped array, each with its coordinate file.
pub fn grid_dims(r: &Results) -> Vec<(&'static str, Option<String>)> {
    AXES[..r.grid.points.len()]
        .iter()
        .map(|a| axis(a, &format!("{a}.npy")))
        .collect()
}

/// The θ axes.
pub struct Grid;

impl Section for Grid {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        for d in 0..r.grid.points.len() {
            out.push(Array::real(
                AXES[d],
                &[r.grid.points[d]],
                &r.grid.coords[d][..],
                vec![axis(AXES[d], &format!("{}.npy", AXES[d]))],
                "radian",
                LONG[d],
            ));
        }
    }
}
