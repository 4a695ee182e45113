//! Sampled symbols and amplification matrices (`scan.matrices`): the
//! `sample_*.npy` arrays for external cross-checks.

use super::Section;
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::npy::{plain, Array};

/// The samples.
pub struct Samples;

impl Section for Samples {
    fn arrays<'a>(&self, p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        let Some(s) = &r.samples else {
            return;
        };
        let k = s.index.len();
        let m = p.system.size();
        let dims = r.grid.points.len();
        out.push(Array::real(
            "sample_index",
            &[k],
            s.index.iter().map(|&i| i as f64).collect::<Vec<_>>(),
            vec![plain("matrix_sample")],
            "1",
            "flat C-order grid index of each sampled wavevector",
        ));
        out.push(Array::real(
            "sample_theta",
            &[k, dims],
            s.theta.iter().flatten().copied().collect::<Vec<_>>(),
            vec![plain("matrix_sample"), plain("axis")],
            "radian",
            "sampled wavevectors",
        ));
        out.push(Array::complex(
            "sample_symbol",
            &[k, m, m],
            s.symbol.iter().flatten().copied().collect::<Vec<_>>(),
            vec![plain("matrix_sample"), plain("row"), plain("col")],
            "s-1",
            "spatial symbol L at the sampled wavevectors",
        ));
        out.push(Array::complex(
            "sample_amplification",
            &[k, s.size, s.size],
            s.amplification
                .iter()
                .flatten()
                .copied()
                .collect::<Vec<_>>(),
            if s.size == m {
                vec![plain("matrix_sample"), plain("row"), plain("col")]
            } else {
                // the stacked amplification matrix of a multistep method is larger than L
                vec![plain("matrix_sample"), plain("g_row"), plain("g_col")]
            },
            "1",
            "amplification matrix G at the sampled wavevectors and the case time step",
        ));
    }
}
