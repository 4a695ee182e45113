//! Pictures of a parameter sweep (`kgain sweep`): a line chart when one numeric
//! key varies (one line per value of a second, text-valued key, if any), a heat
//! map with contour lines when two numeric keys vary; the case's own point
//! marked. Every picture has labelled axes with units and a colour bar (heat
//! map) or legend (lines).
//!
//! This file checks the spec and brings its values into drawing order (numeric
//! axes sorted ascending, values permuted with them); `super::sweep_lines`
//! and `super::sweep_map` draw. Numbers on a numeric axis must be finite and,
//! when not zero, of magnitude 10⁻¹⁰⁰..10¹⁰⁰ (beyond that no tick spacing is
//! representable); an axis that is not is treated as text. Figure values
//! beyond ±10¹⁰⁰ are drawn, and counted in the notes, as ±∞.

use super::{sweep_lines, sweep_map};
use std::path::Path;

/// One varied key as a chart axis.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartAxis {
    /// The dotted case key, e.g. "model.mach" or "model.velocity\[0\]".
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
///
/// An axis without values gives Ok(false) too. A spec whose value count is not
/// the product of its axes' lengths, or whose axis has a number count other
/// than its label count, is an error of the caller: Err, nothing written.
pub fn write_chart(path: &Path, spec: &ChartSpec) -> Result<bool, String> {
    check(spec)?;
    let Some(chart) = arrange(spec) else {
        return Ok(false);
    };
    let font = super::font()?;
    super::render(path, font, |root| {
        super::band(root, &spec.title, &spec.subtitle)?;
        match &chart {
            Chart::Lines(lines) => sweep_lines::draw(root, lines),
            Chart::Map(map) => sweep_map::draw(root, map),
        }
    })
    .map_err(|e| {
        format!(
            "{}: the sweep chart could not be drawn: {e}",
            path.display()
        )
    })?;
    Ok(true)
}

/// Values beyond this magnitude are drawn clipped; axis numbers must lie
/// within it (and above its reciprocal, when not zero).
pub(super) const HUGE: f64 = 1e100;

/// A numeric axis in drawing order.
pub(super) struct Numeric {
    /// "key (unit)", or the key alone.
    pub label: String,
    /// The values, ascending.
    pub coords: Vec<f64>,
    /// The case's own value, when it is a number within the axis' range.
    pub case: Option<f64>,
}

/// One line of a line chart.
pub(super) struct Series {
    /// Legend text (the text value; the figure's name for a single line).
    pub name: String,
    /// One value per coordinate of the x axis, in its (ascending) order.
    pub ys: Vec<f64>,
    /// Whether the case's own text value names this line.
    pub own: bool,
}

/// A line chart: one or more lines over a numeric axis.
pub(super) struct Lines {
    /// The x axis.
    pub x: Numeric,
    /// The lines.
    pub series: Vec<Series>,
    /// The figure's label with its unit (the y axis).
    pub value_label: String,
    /// The text key and its unit over the legend of several lines; None for one line.
    pub legend_title: Option<String>,
}

/// A heat map over two numeric axes.
pub(super) struct Map {
    /// Horizontal axis (the spec's first).
    pub x: Numeric,
    /// Vertical axis (the spec's second).
    pub y: Numeric,
    /// `values[i * y.coords.len() + j]` at `(x.coords[i], y.coords[j])`.
    pub values: Vec<f64>,
    /// The figure's label with its unit (the colour bar).
    pub value_label: String,
}

enum Chart {
    Lines(Lines),
    Map(Map),
}

/// Errors of the caller: counts that do not fit together.
fn check(spec: &ChartSpec) -> Result<(), String> {
    for a in &spec.axes {
        if !a.numbers.is_empty() && a.numbers.len() != a.labels.len() {
            return Err(format!(
                "sweep chart of {}: axis {} has {} numbers for {} values",
                spec.figure,
                a.key,
                a.numbers.len(),
                a.labels.len()
            ));
        }
    }
    let combinations = spec
        .axes
        .iter()
        .try_fold(1usize, |n, a| n.checked_mul(a.labels.len()));
    if (1..=2).contains(&spec.axes.len()) && combinations != Some(spec.values.len()) {
        let lens: Vec<String> = spec
            .axes
            .iter()
            .map(|a| a.labels.len().to_string())
            .collect();
        return Err(format!(
            "sweep chart of {}: {} values for axes of {} values",
            spec.figure,
            spec.values.len(),
            lens.join(" × ")
        ));
    }
    Ok(())
}

/// "key (unit)", or the key alone without a unit.
pub(super) fn with_unit(name: &str, unit: &str) -> String {
    let unit = unit.trim();
    if unit.is_empty() || name.ends_with(&format!("({unit})")) {
        name.to_string()
    } else {
        format!("{name} ({unit})")
    }
}

/// The figure's name and unit: its long name, else its key.
fn value_label(spec: &ChartSpec) -> String {
    let name = if spec.figure_label.trim().is_empty() {
        &spec.figure
    } else {
        &spec.figure_label
    };
    with_unit(name, &spec.figure_unit)
}

/// Whether an axis can be drawn as numbers (see the module notes).
fn is_numeric(a: &ChartAxis) -> bool {
    !a.numbers.is_empty()
        && a.numbers
            .iter()
            .all(|x| x.is_finite() && (*x == 0.0 || (1.0 / HUGE..=HUGE).contains(&x.abs())))
}

/// The axis sorted ascending, and the original index of each sorted value.
fn numeric(a: &ChartAxis) -> (Numeric, Vec<usize>) {
    let mut order: Vec<usize> = (0..a.numbers.len()).collect();
    order.sort_by(|p, q| a.numbers[*p].total_cmp(&a.numbers[*q]));
    let coords: Vec<f64> = order.iter().map(|k| a.numbers[*k]).collect();
    let (lo, hi) = (coords[0], coords[coords.len() - 1]);
    let slack = 1e-9 * (hi - lo);
    let case = a
        .case_value
        .as_deref()
        .and_then(|s| s.trim().parse::<f64>().ok())
        .filter(|v| v.is_finite() && *v >= lo - slack && *v <= hi + slack)
        .map(|v| v.clamp(lo, hi));
    let axis = Numeric {
        label: with_unit(&a.key, &a.unit),
        coords,
        case,
    };
    (axis, order)
}

/// The chart to draw, in drawing order; None when the spec has no drawable shape.
fn arrange(spec: &ChartSpec) -> Option<Chart> {
    if spec.values.is_empty() {
        return None;
    }
    let values: Vec<f64> = spec
        .values
        .iter()
        .map(|v| {
            if v.abs() > HUGE {
                v.signum() * f64::INFINITY
            } else {
                *v
            }
        })
        .collect();
    let value_label = value_label(spec);
    match spec.axes.as_slice() {
        [a] if is_numeric(a) => {
            let (x, order) = numeric(a);
            let ys = order.iter().map(|k| values[*k]).collect();
            let series = vec![Series {
                name: value_label.clone(),
                ys,
                own: false,
            }];
            Some(Chart::Lines(Lines {
                x,
                series,
                value_label,
                legend_title: None,
            }))
        }
        [a, b] if is_numeric(a) && is_numeric(b) => {
            let (x, ox) = numeric(a);
            let (y, oy) = numeric(b);
            let n1 = b.numbers.len();
            let values = ox
                .iter()
                .flat_map(|i| oy.iter().map(move |j| (*i, *j)))
                .map(|(i, j)| values[i * n1 + j])
                .collect();
            Some(Chart::Map(Map {
                x,
                y,
                values,
                value_label,
            }))
        }
        [a, b] if is_numeric(a) || is_numeric(b) => {
            let numeric_first = is_numeric(a);
            let (num, text) = if numeric_first { (a, b) } else { (b, a) };
            let (x, order) = numeric(num);
            let (nx, nt) = (num.numbers.len(), text.labels.len());
            let own = text.case_value.as_deref().map(str::trim);
            let series: Vec<Series> = (0..nt)
                .map(|t| Series {
                    name: text.labels[t].clone(),
                    ys: order
                        .iter()
                        .map(|i| {
                            if numeric_first {
                                values[i * nt + t]
                            } else {
                                values[t * nx + i]
                            }
                        })
                        .collect(),
                    own: own == Some(text.labels[t].trim()),
                })
                .collect();
            Some(Chart::Lines(Lines {
                x,
                series,
                value_label,
                legend_title: Some(with_unit(&text.key, &text.unit)),
            }))
        }
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn axis(key: &str, numbers: &[f64], case: Option<&str>) -> ChartAxis {
        ChartAxis {
            key: key.to_string(),
            unit: String::new(),
            labels: numbers.iter().map(|x| x.to_string()).collect(),
            numbers: numbers.to_vec(),
            case_value: case.map(str::to_string),
        }
    }

    #[test]
    fn a_map_sorts_both_axes_and_permutes_the_values_with_them() {
        let spec = ChartSpec {
            title: String::new(),
            subtitle: String::new(),
            figure: "f".into(),
            figure_label: "f".into(),
            figure_unit: String::new(),
            axes: vec![
                axis("a", &[2.0, 1.0], Some("1.5")),
                axis("b", &[30.0, 10.0, 20.0], Some("5")),
            ],
            // value = 100 a + b
            values: vec![230.0, 210.0, 220.0, 130.0, 110.0, 120.0],
        };
        let Some(Chart::Map(m)) = arrange(&spec) else {
            panic!("a heat map")
        };
        assert_eq!(m.x.coords, [1.0, 2.0]);
        assert_eq!(m.y.coords, [10.0, 20.0, 30.0]);
        assert_eq!(m.values, [110.0, 120.0, 130.0, 210.0, 220.0, 230.0]);
        assert_eq!(m.x.case, Some(1.5));
        assert_eq!(m.y.case, None, "5 lies outside 10..30");
    }

    #[test]
    fn units_are_appended_once() {
        assert_eq!(
            with_unit("model.velocity[0]", "m/s"),
            "model.velocity[0] (m/s)"
        );
        assert_eq!(with_unit("speed (m/s)", "m/s"), "speed (m/s)");
        assert_eq!(with_unit("model.mach", ""), "model.mach");
    }
}
