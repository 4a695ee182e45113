//! The output of a sweep: one NPY array per figure with one axis per varied key,
//! `sweep.csv` with one row per combination, `sweep.json` (the varied keys, the
//! case's own point, the cautions) and a chart per figure. The same function
//! writes an unsharded sweep and a merge of shards, so the two are equal byte
//! for byte.

use super::figures;
use super::plan::SweepSpec;
use crate::report::plot::sweep_chart::{write_chart, ChartAxis, ChartSpec};
use ndarray::{ArrayViewD, IxDyn};
use serde_json::{json, Map, Value};
use std::path::Path;

/// The cautions every sweep carries.
pub const CAUTIONS: [&str; 2] = [
    "Von Neumann analysis of a linear, constant-coefficient problem on a periodic grid: a necessary condition for the stability of a real solver, not a sufficient one.",
    "Use a safety margin on any time step reported here, e.g. 0.8 to 0.9 times dt_max.",
];

/// Everything a sweep's output is made from.
#[derive(Debug, Clone)]
pub struct Dataset<'a> {
    /// The plan.
    pub spec: &'a SweepSpec,
    /// The case's name.
    pub case_name: &'a str,
    /// Where the case came from.
    pub case_source: &'a str,
    /// The sweep's fingerprint.
    pub fingerprint: &'a str,
    /// The case's own value of each varied key, as written, if it sets it.
    pub case_values: &'a [Option<String>],
    /// Method, stencils and grid in words, for the pictures.
    pub subtitle: &'a str,
    /// Per combination (C order), per figure.
    pub values: &'a [Vec<f64>],
}

/// Why the output could not be written.
#[derive(Debug, thiserror::Error)]
#[error("{path}: {message}")]
pub struct WriteError {
    /// The file's name in the output folder.
    pub path: String,
    /// What failed.
    pub message: String,
}

/// The file's name only: the folder is a staging folder the user never sees,
/// and the caller names the user's folder.
fn fail(path: &Path, message: impl ToString) -> WriteError {
    WriteError {
        path: path.file_name().map_or_else(
            || path.display().to_string(),
            |f| f.to_string_lossy().into_owned(),
        ),
        message: message.to_string(),
    }
}

/// A number for CSV and text: shortest round-trip form, exponent when tiny or
/// huge; `inf`, `-inf`, `nan`.
pub fn number_text(x: f64) -> String {
    if !x.is_finite() {
        return if x.is_nan() {
            "nan".into()
        } else if x > 0.0 {
            "inf".into()
        } else {
            "-inf".into()
        };
    }
    if x == 0.0 || (x.abs() >= 1e-4 && x.abs() < 1e15) {
        format!("{x}")
    } else {
        format!("{x:e}")
    }
}

fn coords(spec: &SweepSpec) -> Map<String, Value> {
    spec.axes
        .iter()
        .map(|a| {
            let v: Vec<Value> = a
                .levels
                .iter()
                .map(|l| match l.number() {
                    Some(x) => json!(x),
                    None => json!(l.label()),
                })
                .collect();
            (a.key.clone(), Value::Array(v))
        })
        .collect()
}

/// Writes the sweep's files into `dir` (existing, empty); returns the manifest
/// for the destination to complete.
pub fn write_into(dir: &Path, ds: &Dataset) -> Result<Value, WriteError> {
    let spec = ds.spec;
    let shape = spec.shape();
    let dims: Vec<&str> = spec.axes.iter().map(|a| a.key.as_str()).collect();
    let coords = coords(spec);
    let mut arrays = Map::new();
    let mut pictures = Vec::new();
    for (k, figure) in spec.figures.iter().enumerate() {
        let stem = figures::file_stem(figure);
        let data: Vec<f64> = ds.values.iter().map(|row| row[k]).collect();
        let path = dir.join(format!("{stem}.npy"));
        let view = ArrayViewD::from_shape(IxDyn(&shape), &data).map_err(|e| fail(&path, e))?;
        ndarray_npy::write_npy(&path, &view).map_err(|e| fail(&path, e))?;
        let (long_name, unit) = figures::describe(figure);
        arrays.insert(
            stem.clone(),
            json!({
                "file": format!("{stem}.npy"),
                "shape": shape,
                "dtype": "float64",
                "dims": dims,
                "coords": coords,
                "units": unit,
                "long_name": long_name,
                "figure": figure,
            }),
        );
        let chart = chart_spec(ds, k, &data);
        let png = dir.join(format!("chart_{stem}.png"));
        if write_chart(&png, &chart).map_err(|e| fail(&png, e))? {
            pictures.push(format!("chart_{stem}.png"));
        }
    }
    write_csv(dir, ds)?;
    let summary = json!({
        "case": ds.case_name,
        "case_file": ds.case_source,
        "fingerprint": ds.fingerprint,
        "combinations": spec.len(),
        "varied": spec.axes.iter().zip(ds.case_values).map(|(a, own)| json!({
            "key": a.key,
            "values": coords[&a.key],
            "case_value": own,
        })).collect::<Vec<_>>(),
        "figures": spec.figures,
        "definitions": {
            "order": "arrays are in C order over the varied keys, the last key fastest; sweep.csv has one row per combination in the same order",
            "inf": "+inf is an unbounded limit (unconditionally stable); nan a value the analysis did not produce",
        },
        "cautions": CAUTIONS,
    });
    let p = dir.join("sweep.json");
    let text = serde_json::to_string_pretty(&summary).map_err(|e| fail(&p, e))?;
    std::fs::write(&p, text + "\n").map_err(|e| fail(&p, e))?;
    Ok(json!({
        "format": "kgain sweep",
        "version": 1,
        "case": ds.case_name,
        "fingerprint": ds.fingerprint,
        "dims": dims,
        "arrays": arrays,
        "table": "sweep.csv",
        "pictures": pictures,
    }))
}

/// Six significant digits for the terminal (the CSV and arrays keep every bit).
fn six_digits(x: f64) -> String {
    if !x.is_finite() || x == 0.0 {
        return number_text(x);
    }
    let e = x.abs().log10().floor();
    if (-3.0..6.0).contains(&e) {
        format!("{:.*}", (5.0 - e) as usize, x)
    } else {
        format!("{x:.5e}")
    }
}

/// Lines for the terminal: per figure, its smallest and largest value and the
/// combinations holding them (NaN values skipped), then the cautions.
/// `first` is the index of `values[0]` among all combinations.
pub fn extremes_text(spec: &SweepSpec, first: usize, values: &[Vec<f64>]) -> String {
    let mut out = String::new();
    for (k, figure) in spec.figures.iter().enumerate() {
        let finite: Vec<(usize, f64)> = values
            .iter()
            .enumerate()
            .map(|(i, row)| (first + i, row[k]))
            .filter(|(_, v)| !v.is_nan())
            .collect();
        let lo = finite.iter().min_by(|a, b| a.1.total_cmp(&b.1));
        let hi = finite.iter().max_by(|a, b| a.1.total_cmp(&b.1));
        let line = match (lo, hi) {
            (Some(&(il, vl)), Some(&(ih, vh))) => format!(
                "min {} at ({}), max {} at ({})",
                six_digits(vl),
                spec.describe(il),
                six_digits(vh),
                spec.describe(ih)
            ),
            _ => "no value (NaN in every combination)".to_string(),
        };
        out.push_str(&format!("  {figure:<30}{line}\n"));
    }
    for c in CAUTIONS {
        out.push_str(&format!("  {:<30}{c}\n", "caution"));
    }
    out
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

fn write_csv(dir: &Path, ds: &Dataset) -> Result<(), WriteError> {
    let spec = ds.spec;
    let mut out = String::new();
    let header: Vec<String> = spec
        .axes
        .iter()
        .map(|a| a.key.clone())
        .chain(spec.figures.iter().cloned())
        .map(|h| csv_field(&h))
        .collect();
    out.push_str(&header.join(","));
    out.push('\n');
    for (i, row) in ds.values.iter().enumerate() {
        let mut fields: Vec<String> = spec
            .axes
            .iter()
            .zip(spec.unravel(i))
            .map(|(a, j)| csv_field(&a.levels[j].label()))
            .collect();
        fields.extend(row.iter().map(|x| number_text(*x)));
        out.push_str(&fields.join(","));
        out.push('\n');
    }
    let p = dir.join("sweep.csv");
    std::fs::write(&p, out).map_err(|e| fail(&p, e))
}

/// The unit of a case key where the key itself fixes it (angles in degrees);
/// other keys are in the case's own units, which kgain does not know.
fn key_unit(key: &str) -> &'static str {
    if key.ends_with("_deg") {
        "degree"
    } else {
        ""
    }
}

fn chart_spec(ds: &Dataset, k: usize, data: &[f64]) -> ChartSpec {
    let figure = &ds.spec.figures[k];
    let (long_name, unit) = figures::describe(figure);
    let keys: Vec<&str> = ds.spec.axes.iter().map(|a| a.key.as_str()).collect();
    ChartSpec {
        title: format!(
            "{} — {} over {}",
            ds.case_name,
            long_name,
            keys.join(" and ")
        ),
        subtitle: ds.subtitle.to_string(),
        figure: figure.clone(),
        figure_label: long_name,
        figure_unit: if unit == "1" { String::new() } else { unit },
        axes: ds
            .spec
            .axes
            .iter()
            .zip(ds.case_values)
            .map(|(a, own)| ChartAxis {
                key: a.key.clone(),
                unit: key_unit(&a.key).to_string(),
                labels: a.levels.iter().map(|l| l.label()).collect(),
                numbers: if a.numeric() {
                    a.levels.iter().filter_map(|l| l.number()).collect()
                } else {
                    Vec::new()
                },
                case_value: own.clone(),
            })
            .collect(),
        values: data.to_vec(),
    }
}
