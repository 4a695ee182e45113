//! Pictures of a parameter sweep (`kgain sweep`): a line chart when one numeric
//! key varies (one line per value of a second, text-valued key, if any), a heat
//! map with contour lines when two numeric keys vary; the case's own point
//! marked. Every picture has labelled axes with units and a colour bar (heat
//! map) or legend (lines).

use std::path::Path;

/// One varied key as a chart axis.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartAxis {
    /// The dotted case key, e.g. "model.mach" or "model.velocity[0]".
    pub key: String,
    /// Unit of the key's values ("" when dimensionless or unknown).
    pub unit: String,
    /// The values, numbers (`numeric`) or text (as given).
    pub labels: Vec<String>,
    /// The values as numbers when every value is one, else empty.
    pub numbers: Vec<f64>,
    /// The case's own value of this key, if the case file sets it (number or text).
    pub case_value: Option<String>,
}

/// What to draw: one figure over one or two varied keys.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartSpec {
    /// Title line, e.g. "duct-acoustics — sweep of limit.courant_max".
    pub title: String,
    /// Second title line (method, stencils, grid).
    pub subtitle: String,
    /// The figure's dotted summary key, e.g. "limit.courant_max".
    pub figure: String,
    /// Its long name and unit for the value axis or colour bar.
    pub figure_label: String,
    /// Unit of the figure ("" if none).
    pub figure_unit: String,
    /// The varied keys in the order of the value array's axes (C order: the
    /// last axis varies fastest). Only charts of 1 or 2 axes are drawn.
    pub axes: Vec<ChartAxis>,
    /// The figure per combination, C order over `axes`; NaN where missing,
    /// ±inf where unbounded (drawn as a gap/clipped, with a note).
    pub values: Vec<f64>,
}

/// Draws `spec` into the PNG file `path`. Which picture is drawn:
/// - one axis, numeric: a line chart of the figure against the key;
/// - two axes, one numeric and one text: one line per text value against the
///   numeric key, with a legend;
/// - two numeric axes: a heat map over the two keys (first axis on x) with a
///   colour bar and a few labelled contour lines;
/// - anything else (no numeric axis, more than two axes): Ok(false), nothing
///   written.
///
/// Returns Ok(true) when a picture was written.
pub fn write_chart(path: &Path, spec: &ChartSpec) -> Result<bool, String> {
    let _ = (path, spec);
    Err("sweep charts are not drawn yet".into())
}
