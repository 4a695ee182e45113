//! A quantity sampled on the wavevector grid, drawn for the case's dimension —
//! the shared body of `radius.png`, `departure.png` and `norm.png`.
//!
//! 2-D: a square heat map over (θx, θy) ∈ [−π, π]² with a colour bar, an
//! optional level drawn as a contour, one wavevector marked and annotated.
//! 1-D: the quantity against θ, the level as a dashed line and, where asked,
//! the stretches above it in crimson. 3-D: three heat maps on one colour scale,
//! the planes θz, θy and θx = const through the marked wavevector, with the
//! colour bar and the legend in the fourth quarter.

use super::colormap::{colour_bar, Bar, Scale};
use super::heatmap::{callout, legend_entry, legend_row, panel, target, Field, Frame, Key};
use super::{style, Area, Res, SIZE, TITLE_BAND};
use crate::sample::Grid;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};
use std::f64::consts::PI;

const AXIS: [&str; 3] = ["θx = kx·hx (rad)", "θy = ky·hy (rad)", "θz = kz·hz (rad)"];
const NAME: [&str; 3] = ["θx", "θy", "θz"];
const AXIS_1D: &str = "θ = k·h (rad)";

/// A level of the quantity worth seeing (the stability boundary, ‖G‖ = 1).
pub struct Level {
    /// The value.
    pub value: f64,
    /// Legend text of the contour when the map crosses the level.
    pub crossed: String,
    /// Legend text when it does not and no value is above it.
    pub missed: String,
    /// Legend text when it does not and every value is above it.
    pub everywhere: String,
    /// Legend text of the dashed line of the 1-D curve.
    pub line: String,
    /// 1-D: legend text of the stretches above the level, drawn in crimson
    /// (`None`: no highlight).
    pub above: Option<String>,
}

/// What to draw and how to label it.
pub struct Spec<'a> {
    /// The values, C order over the grid.
    pub values: &'a [f64],
    /// The colour scale (2-D and 3-D).
    pub scale: Scale,
    /// Colour-bar label, and the y-axis label of the 1-D curve.
    pub quantity: &'a str,
    /// Legend text of the 1-D curve.
    pub curve: &'a str,
    /// A level to draw, if any.
    pub level: Option<Level>,
    /// The wavevector to mark and the value there.
    pub marker: (&'a [f64], f64),
    /// Legend text of the marker.
    pub marker_label: &'a str,
    /// Lines of the callout next to the marker.
    pub callout: Vec<String>,
    /// 3-D: the heading of the text column.
    pub slices: &'a str,
    /// 1-D: a fixed y range instead of the range of the values.
    pub y_range: Option<(f64, f64)>,
}

/// Draws the field for the grid's dimension (below the title band).
pub fn draw(root: &Area, grid: &Grid, spec: &Spec) -> Res {
    match grid.points.len() {
        1 => line(root, grid, spec),
        2 => map2(root, grid, spec),
        _ => map3(root, grid, spec),
    }
}

/// A centred note when there is nothing to draw.
pub fn no_data(root: &Area, msg: &str) -> Res {
    let t = style::text(18.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
    root.draw(&Text::new(
        msg.to_string(),
        (SIZE.0 as i32 / 2, SIZE.1 as i32 / 2),
        t,
    ))?;
    Ok(())
}

/// Whether every finite value is the same to 1e-12 (relative to max(1, |max|)):
/// such a map has no worst wavevector, and marking one node would single out
/// whichever rounding happened to be largest.
fn flat(values: &[f64]) -> bool {
    let (lo, hi) = values
        .iter()
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(*v), b.max(*v))
        });
    hi >= lo && hi - lo <= FLAT * hi.abs().max(1.0)
}

/// Relative spread below which a map counts as flat.
const FLAT: f64 = 1e-12;

/// The legend entry of the marker, or the flat map's note.
fn marker_entry(spec: &Spec) -> (Key, String) {
    if flat(spec.values) {
        let v = spec.marker.1;
        (
            Key::Swatch(style::MUTED),
            format!(
                "flat: {} everywhere (to {}), no worst wavevector",
                style::num(v, 8),
                style::num(FLAT, 1)
            ),
        )
    } else {
        (Key::Target, spec.marker_label.to_string())
    }
}

fn level_value(spec: &Spec) -> Option<f64> {
    spec.level.as_ref().map(|l| l.value)
}

/// The contour and marker entries of a map legend (and "no value" when needed).
fn map_legend(spec: &Spec, crossed: bool) -> Vec<(Key, String)> {
    let mut entries = Vec::new();
    if let Some(l) = &spec.level {
        let mut finite = spec.values.iter().filter(|v| v.is_finite()).peekable();
        let all_above = finite.peek().is_some() && finite.all(|v| *v > l.value);
        let text = match (crossed, all_above) {
            (true, _) => &l.crossed,
            (false, true) => &l.everywhere,
            (false, false) => &l.missed,
        };
        entries.push((Key::Contour, text.clone()));
    }
    entries.push(marker_entry(spec));
    let missing = spec.values.iter().filter(|v| v.is_nan()).count();
    if missing > 0 {
        let label = match missing {
            1 => "no value (1 node)".to_string(),
            n => format!("no value ({n} nodes)"),
        };
        entries.push((Key::Swatch(style::MISSING), label));
    }
    entries
}

fn map2(root: &Area, grid: &Grid, spec: &Spec) -> Res {
    let frame = Frame {
        left: 70,
        bottom: 58,
        top: 14,
        font: 15.0,
    };
    let side = 590u32;
    let x0 = 150;
    let y0 = TITLE_BAND as i32 + frame.top as i32 + 8;
    let field = Field {
        xs: &grid.coords[0],
        ys: &grid.coords[1],
        values: spec.values.to_vec(),
        x_desc: AXIS[0].to_string(),
        y_desc: AXIS[1].to_string(),
        caption: None,
        marker: (!flat(spec.values)).then(|| (spec.marker.0[0], spec.marker.0[1])),
    };
    let level = level_value(spec);
    let placed = panel(root, (x0, y0), side, &field, &spec.scale, level, &frame)?;
    let bar = Bar {
        x: placed.x.1 + 44,
        y: placed.y,
        width: 26,
        label: spec.quantity,
        mark: level,
        ticks: None,
    };
    colour_bar(root, &spec.scale, &bar)?;
    if let Some(p) = placed.marker {
        callout(root, p, &spec.callout, (placed.x, placed.y))?;
    }
    let entries = map_legend(spec, placed.contour > 0);
    legend_row(root, (x0 - 6, SIZE.1 as i32 - 24), &entries)
}

fn line(root: &Area, grid: &Grid, spec: &Spec) -> Res {
    let xs = &grid.coords[0];
    let level = level_value(spec);
    let (lo, hi) = match spec.y_range {
        Some(r) => r,
        None => {
            let start = level.unwrap_or(spec.scale.lo);
            let finite = spec.values.iter().copied().filter(|v| v.is_finite());
            let (lo, hi) = finite.fold((start, start), |(a, b), v| (a.min(v), b.max(v)));
            let pad = 0.06 * (hi - lo).max(1e-3);
            (lo - pad, hi + pad)
        }
    };
    let (ticks, step) = style::nice_ticks(lo, hi, 7);
    let largest = lo.abs().max(hi.abs());
    let area = root.margin(TITLE_BAND + 24, 60, 40, 50);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(58)
        .y_label_area_size(86)
        .build_cartesian_2d(style::Ticked::theta(), style::Ticked::new(lo..hi, ticks))?;
    let fmt_y = |v: &f64| style::tick_label(*v, step, largest);
    style::house_mesh(
        chart
            .configure_mesh()
            .x_desc(AXIS_1D)
            .y_desc(spec.quantity)
            .x_label_formatter(&style::theta_label)
            .y_label_formatter(&fmt_y),
    )
    .draw()?;
    if let Some(level) = level.filter(|l| (lo..=hi).contains(l)) {
        for k in 0..60 {
            let a = -PI + 2.0 * PI * k as f64 / 60.0;
            let b = a + PI / 60.0;
            chart.draw_series(std::iter::once(PathElement::new(
                vec![(a, level), (b, level)],
                BLACK.stroke_width(2),
            )))?;
        }
    }
    // runs of finite values picked by a test
    let runs = |pick: &dyn Fn(f64) -> bool| -> Vec<Vec<(f64, f64)>> {
        let mut out: Vec<Vec<(f64, f64)>> = vec![vec![]];
        for (x, v) in xs.iter().zip(spec.values) {
            if v.is_finite() && pick(*v) {
                out.last_mut()
                    .expect("non-empty")
                    .push((*x, v.clamp(lo, hi)));
            } else if !out.last().expect("non-empty").is_empty() {
                out.push(vec![]);
            }
        }
        out
    };
    // every finite value in the curve colour, then (when asked) those above
    // the level again in crimson
    let mut layers = vec![(f64::NEG_INFINITY, style::CURVE)];
    if let Some(l) = spec.level.as_ref().filter(|l| l.above.is_some()) {
        layers.push((l.value, style::WORST));
    }
    for (above, colour) in layers {
        for run in runs(&|v| v > above).into_iter().filter(|r| !r.is_empty()) {
            if run.len() == 1 {
                chart.draw_series(std::iter::once(Circle::new(run[0], 3, colour.filled())))?;
            } else {
                chart.draw_series(std::iter::once(PathElement::new(
                    run,
                    colour.stroke_width(3),
                )))?;
            }
        }
    }
    let (px, py) = chart.plotting_area().get_pixel_range();
    let bounds = ((px.start, px.end - 1), (py.start, py.end - 1));
    let (mx, mv) = (spec.marker.0[0], spec.marker.1);
    if mv.is_finite() && !flat(spec.values) {
        let p = chart.backend_coord(&(mx, mv.clamp(lo, hi)));
        target(root, p)?;
        callout(root, p, &spec.callout, bounds)?;
    }
    let mut entries = vec![(Key::Line(style::CURVE), spec.curve.to_string())];
    if let Some(l) = &spec.level {
        if let Some(above) = &l.above {
            if spec.values.iter().any(|v| v.is_finite() && *v > l.value) {
                entries.push((Key::Line(style::WORST), above.clone()));
            }
        }
        entries.push((Key::Dashed(BLACK), l.line.clone()));
    }
    entries.push(marker_entry(spec));
    legend_row(root, (px.start, SIZE.1 as i32 - 34), &entries)
}

/// Index of the node nearest to `v` on an axis.
fn nearest(coords: &[f64], v: f64) -> usize {
    (0..coords.len())
        .min_by(|a, b| (coords[*a] - v).abs().total_cmp(&(coords[*b] - v).abs()))
        .unwrap_or(0)
}

fn map3(root: &Area, grid: &Grid, spec: &Spec) -> Res {
    let c = &grid.coords;
    let n = &grid.points;
    let w = spec.marker.0;
    let at = |i: usize, j: usize, k: usize| spec.values[(i * n[1] + j) * n[2] + k];
    let fixed: [usize; 3] = std::array::from_fn(|d| nearest(&c[d], w[d]));
    // (horizontal axis, vertical axis, the axis held fixed)
    let planes = [(0usize, 1usize, 2usize), (0, 2, 1), (1, 2, 0)];
    let frame = Frame {
        left: 62,
        bottom: 52,
        top: 30,
        font: 13.0,
    };
    let side = 262u32;
    let level = level_value(spec);
    let cell = (SIZE.0 as i32 / 2, (SIZE.1 - TITLE_BAND) as i32 / 2);
    let mut placed = Vec::new();
    for (p, &(a, b, f)) in planes.iter().enumerate() {
        let values: Vec<f64> = (0..n[a])
            .flat_map(|i| {
                (0..n[b]).map(move |j| {
                    let mut idx = [0usize; 3];
                    idx[a] = i;
                    idx[b] = j;
                    idx[f] = fixed[f];
                    at(idx[0], idx[1], idx[2])
                })
            })
            .collect();
        let field = Field {
            xs: &c[a],
            ys: &c[b],
            values,
            x_desc: AXIS[a].to_string(),
            y_desc: AXIS[b].to_string(),
            caption: Some(format!(
                "plane {} = {}",
                NAME[f],
                style::num_fixed(c[f][fixed[f]], 3)
            )),
            marker: (!flat(spec.values)).then(|| (w[a], w[b])),
        };
        let (cx, cy) = (
            (p % 2) as i32 * cell.0,
            TITLE_BAND as i32 + (p / 2) as i32 * cell.1,
        );
        let origin = (
            cx + (cell.0 - side as i32) / 2 + 24,
            cy + frame.top as i32 + 12,
        );
        placed.push(panel(
            root,
            origin,
            side,
            &field,
            &spec.scale,
            level,
            &frame,
        )?);
    }
    let (bx, by) = (cell.0 + 40, placed[2].y);
    colour_bar(
        root,
        &spec.scale,
        &Bar {
            x: bx,
            y: by,
            width: 24,
            label: spec.quantity,
            mark: level,
            ticks: None,
        },
    )?;
    let tx = bx + 170;
    let mut y = by.0 + 10;
    let note = |root: &Area, y: i32, s: &str, size: f64| -> Res {
        let t = style::text(size, style::INK).pos(style::anchor(HPos::Left, VPos::Center));
        root.draw(&Text::new(s.to_string(), (tx, y), t))?;
        Ok(())
    };
    note(root, y, spec.slices, 15.0)?;
    y += 30;
    for l in &spec.callout {
        note(root, y, l, 14.0)?;
        y += 22;
    }
    y += 18;
    let crossed = placed.iter().any(|p| p.contour > 0);
    // one entry per row, wrapped to the width of the column
    let font = style::text(14.0, style::INK).pos(style::anchor(HPos::Left, VPos::Center));
    for (key, label) in map_legend(spec, crossed) {
        let parts = style::wrap(&label, 32);
        legend_entry(root, (tx - 4, y), &key, &parts[0])?;
        for part in &parts[1..] {
            y += 19;
            root.draw(&Text::new(part.clone(), (tx + 32, y), font.clone()))?;
        }
        y += 28;
    }
    Ok(())
}
