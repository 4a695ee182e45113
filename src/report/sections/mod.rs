//! One section per analysis: what each contributes to every output format —
//! its arrays (for the NPY exporter), its part of summary.json and its rows of
//! the terminal table. The exporters go over [`ALL`] in order; a section whose
//! analysis did not run contributes nothing.
//!
//! Adding an analysis's outputs: one file here implementing [`Section`] and one
//! entry in [`ALL`].

mod dispersion;
mod footprint;
mod grid;
mod growth;
mod limit;
mod modes;
mod radius;
mod samples;

use super::npy::Array;
use crate::analysis::Results;
use crate::problem::Problem;
use serde_json::{Map, Value};

/// What one analysis contributes to the outputs.
pub trait Section: Sync {
    /// Its arrays.
    fn arrays<'a>(&self, _p: &Problem, _r: &'a Results, _out: &mut Vec<Array<'a>>) {}
    /// Its keys of summary.json.
    fn summary(&self, _p: &Problem, _r: &Results, _s: &mut Map<String, Value>) {}
    /// Its rows of the terminal table (label, text).
    fn rows(&self, _p: &Problem, _r: &Results, _rows: &mut Vec<(String, String)>) {}
}

/// Every section, in output order.
pub const ALL: &[&dyn Section] = &[
    &grid::Grid,
    &radius::Radius,
    &footprint::Footprint,
    &limit::Limit,
    &growth::Growth,
    &dispersion::Dispersion,
    &modes::Modes,
    &samples::Samples,
];

/// Every array of the results.
pub fn arrays<'a>(p: &Problem, r: &'a Results) -> Vec<Array<'a>> {
    let mut out = Vec::new();
    for s in ALL {
        s.arrays(p, r, &mut out);
    }
    out
}
