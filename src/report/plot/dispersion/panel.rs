//! One panel of `dispersion.png`: a ratio against the points per wavelength
//! (logarithmic), the band 1 ± tolerance, vertical markers (the required
//! points per wavelength) and the curves, solid or dashed; and the value axis
//! each panel fits to its data.

use super::super::{style, Area, Res};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// The band 1 ± tolerance (a light green).
pub(super) const BAND: RGBColor = RGBColor(0xdc, 0xef, 0xe1);

/// The label of the x axis.
const X_LABEL: &str = "points per wavelength 2π/max|θ_d|";

/// A value axis: bottom, top, ticks and their step.
pub(super) struct YRange {
    pub(super) lo: f64,
    pub(super) hi: f64,
    pub(super) ticks: Vec<f64>,
    pub(super) step: f64,
}

impl YRange {
    /// The data range of `values` padded, snapped to the tick step, always
    /// holding 1 ± tol and never beyond `cap`.
    pub(super) fn new(values: &[f64], cap: (f64, f64), tol: f64) -> YRange {
        let (mn, mx) = values
            .iter()
            .filter(|v| v.is_finite())
            .fold((1.0 - tol, 1.0 + tol), |(a, b), v| (a.min(*v), b.max(*v)));
        let (mut lo, mut hi) = ((mn - 0.04).max(cap.0), (mx + 0.04).min(cap.1));
        if hi - lo < 0.1 {
            lo = 0.95f64.max(cap.0);
            hi = 1.05f64.min(cap.1);
        }
        let (_, step) = style::nice_ticks(lo, hi, 7);
        let lo = ((lo / step + 1e-9).floor() * step).max(cap.0);
        let hi = ((hi / step - 1e-9).ceil() * step).min(cap.1);
        let (ticks, step) = style::nice_ticks(lo, hi, 7);
        YRange {
            lo,
            hi,
            ticks,
            step,
        }
    }

    pub(super) fn contains(&self, v: f64) -> bool {
        (self.lo..=self.hi).contains(&v)
    }
}

/// One curve of a panel: (x = −log₂ ppw, ratio) samples, its colour, dashed
/// or solid, and its width.
pub(super) struct Series {
    pub(super) points: Vec<(f64, f64)>,
    pub(super) colour: RGBColor,
    pub(super) dashed: bool,
    pub(super) width: u32,
}

/// A vertical marker: x (−log₂ ppw), colour, dashed, and a label.
pub(super) struct Marker {
    pub(super) x: f64,
    pub(super) colour: RGBColor,
    pub(super) dashed: bool,
    pub(super) label: Option<String>,
}

/// Placement and content of one panel.
pub(super) struct Panel<'a> {
    pub(super) origin: (i32, i32),
    pub(super) size: (u32, u32),
    pub(super) title: &'a str,
    pub(super) y_label: &'a str,
    pub(super) x_range: (f64, f64),
    pub(super) y: YRange,
    pub(super) tol: f64,
    pub(super) series: Vec<Series>,
    pub(super) markers: &'a [Marker],
}

/// Draws one panel.
pub(super) fn panel(root: &Area, p: &Panel) -> Res {
    let (w, h) = root.dim_in_pixel();
    // margins: top, bottom, left, right
    let area = root.margin(
        p.origin.1 as u32,
        h.saturating_sub(p.origin.1 as u32 + p.size.1),
        p.origin.0 as u32,
        w.saturating_sub(p.origin.0 as u32 + p.size.0),
    );
    let t = style::text(16.0, style::INK).pos(style::anchor(HPos::Left, VPos::Top));
    root.draw(&Text::new(
        p.title.to_string(),
        (p.origin.0 + 74, p.origin.1),
        t,
    ))?;
    let area = area.margin(28, 0, 0, 8);
    let (x0, x1) = p.x_range;
    let xticks: Vec<f64> = (1..=8)
        .map(|k| -(k as f64))
        .filter(|x| (x0 - 1e-9..=x1 + 1e-9).contains(x))
        .collect();
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(52)
        .y_label_area_size(74)
        .build_cartesian_2d(
            style::Ticked::new(x0..x1, xticks),
            style::Ticked::new(p.y.lo..p.y.hi, p.y.ticks.clone()),
        )?;
    let fmt_x = |v: &f64| format!("{}", 2f64.powf(-v).round());
    let (step, largest) = (p.y.step, p.y.lo.abs().max(p.y.hi.abs()));
    let fmt_y = |v: &f64| style::tick_label(*v, step, largest);
    chart
        .configure_mesh()
        .x_desc(X_LABEL)
        .y_desc(p.y_label)
        .x_label_formatter(&fmt_x)
        .y_label_formatter(&fmt_y)
        .label_style(style::text(15.0, style::INK))
        .axis_desc_style(style::text(16.0, style::INK))
        .axis_style(style::INK)
        .bold_line_style(style::RULE.stroke_width(1))
        .light_line_style(TRANSPARENT)
        .draw()?;
    let (px, py) = chart.plotting_area().get_pixel_range();

    // the band 1 ± tolerance and the ratio 1
    let (blo, bhi) = ((1.0 - p.tol).max(p.y.lo), (1.0 + p.tol).min(p.y.hi));
    if bhi > blo {
        let a = chart.backend_coord(&(x0, bhi));
        let b = chart.backend_coord(&(x1, blo));
        // at least 3 px tall, so that a tight tolerance still shows
        let (top, bottom) = if b.1 - a.1 < 3 {
            let mid = (a.1 + b.1) / 2;
            (mid - 1, mid + 2)
        } else {
            (a.1, b.1)
        };
        root.draw(&Rectangle::new(
            [(px.start + 1, top), (px.end - 1, bottom)],
            BAND.filled(),
        ))?;
    }
    if p.y.contains(1.0) {
        let y1 = chart.backend_coord(&(x0, 1.0)).1;
        root.draw(&PathElement::new(
            vec![(px.start + 1, y1), (px.end - 1, y1)],
            style::MUTED.stroke_width(1),
        ))?;
    }

    // the markers of the required resolution, under the curves
    for m in p.markers {
        if !(x0..=x1).contains(&m.x) {
            continue;
        }
        let x = chart.backend_coord(&(m.x, p.y.lo)).0;
        let line = vec![(x, py.start + 1), (x, py.end - 1)];
        if m.dashed {
            dashed(root, &line, 7, 6, m.colour, 2)?;
        } else {
            root.draw(&PathElement::new(line, m.colour.stroke_width(2)))?;
        }
    }

    // the curves: broken at NaN, clamped to the axis
    for s in &p.series {
        let mut runs: Vec<Vec<(i32, i32)>> = vec![vec![]];
        for &(x, v) in &s.points {
            if v.is_nan() {
                if !runs.last().expect("non-empty").is_empty() {
                    runs.push(vec![]);
                }
                continue;
            }
            let c = chart.backend_coord(&(x, v.clamp(p.y.lo, p.y.hi)));
            runs.last_mut().expect("non-empty").push(c);
        }
        for run in runs.into_iter().filter(|r| !r.is_empty()) {
            if run.len() == 1 {
                root.draw(&Circle::new(run[0], 3, s.colour.filled()))?;
            } else if s.dashed {
                dashed(root, &run, 9, 6, s.colour, s.width)?;
            } else {
                root.draw(&PathElement::new(run, s.colour.stroke_width(s.width)))?;
            }
        }
    }

    // the marker labels on a white box near the top of the plot
    let mut row = py.start + 10;
    for m in p.markers {
        let Some(label) = &m.label else { continue };
        if !(x0..=x1).contains(&m.x) {
            continue;
        }
        let x = chart.backend_coord(&(m.x, p.y.lo)).0;
        let t = style::text(14.0, m.colour);
        let (w, h) = root.estimate_text_size(label, &t)?;
        let (w, h) = (w as i32, h as i32);
        // right of the line when it fits, else left
        let left = if x + 8 + w < px.end - 4 {
            x + 8
        } else {
            x - 8 - w
        };
        root.draw(&Rectangle::new(
            [(left - 4, row - 2), (left + w + 4, row + h + 2)],
            WHITE.mix(0.9).filled(),
        ))?;
        let t = t.pos(style::anchor(HPos::Left, VPos::Top));
        root.draw(&Text::new(label.clone(), (left, row), t))?;
        row += h + 8;
    }
    Ok(())
}

/// A dashed polyline through pixel points: `on` pixels drawn, `off` left out,
/// the pattern running on along the whole line.
pub(super) fn dashed(
    root: &Area,
    pts: &[(i32, i32)],
    on: i32,
    off: i32,
    colour: RGBColor,
    width: u32,
) -> Res {
    let period = f64::from(on + off);
    let mut phase = 0.0f64; // distance travelled, modulo the period
    let mut current: Vec<(i32, i32)> = Vec::new();
    let style = colour.stroke_width(width);
    for w in pts.windows(2) {
        let (a, b) = (w[0], w[1]);
        let (dx, dy) = (f64::from(b.0 - a.0), f64::from(b.1 - a.1));
        let len = dx.hypot(dy);
        if len == 0.0 {
            continue;
        }
        let at = |s: f64| {
            (
                a.0 + (dx * s / len).round() as i32,
                a.1 + (dy * s / len).round() as i32,
            )
        };
        let mut s = 0.0;
        while s < len {
            let drawing = phase < f64::from(on);
            let edge = if drawing { f64::from(on) } else { period };
            let step = (edge - phase).min(len - s);
            if drawing {
                if current.is_empty() {
                    current.push(at(s));
                }
                current.push(at(s + step));
            }
            s += step;
            phase += step;
            if phase >= period - 1e-9 {
                phase = 0.0;
            }
            if phase >= f64::from(on) - 1e-9 && !current.is_empty() {
                root.draw(&PathElement::new(std::mem::take(&mut current), style))?;
            }
        }
    }
    if current.len() > 1 {
        root.draw(&PathElement::new(current, style))?;
    }
    Ok(())
}
