//! `limit_polar.png`: the largest stable Courant number ν = sΔt/h (or Δt when
//! the reference speed is zero) along each wave direction in θ-space.
//!
//! 2-D: a polar plot ([`polar`]). 1-D, where the directions are ±x: two bars.
//! 3-D: one point per direction on the sphere, ν against azimuth, coloured by
//! elevation with its own colour bar. Every variant draws the case's own value
//! (dashed orange) and marks the most restrictive direction; non-finite limits
//! (unconditional directions, failed kernels) are left out and counted.

use super::colormap::{colour_bar, Bar, Scale};
use super::heatmap::{callout, legend_row, target, Key};
use super::polar::{self, Series};
use super::{style, title_band, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::{DirectionalLimit, Results};
use crate::problem::Problem;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

impl Series {
    fn new(problem: &Problem, r: &Results, dl: &DirectionalLimit) -> Series {
        let courant = problem.system.reference_speed > 0.0;
        let unit = |dt: f64| {
            if courant {
                problem.courant_of(dt).unwrap_or(f64::NAN)
            } else {
                dt
            }
        };
        let overall = r
            .limit
            .as_ref()
            .map(|l| unit(l.dt_max))
            .filter(|v| v.is_finite());
        Series {
            values: dl.dt.iter().map(|dt| unit(*dt)).collect(),
            case_value: unit(r.dt),
            overall,
            quantity: if courant {
                "largest stable Courant number ν"
            } else {
                "largest stable Δt (s)"
            },
            symbol: if courant { "ν" } else { "Δt" },
        }
    }

    /// Index and value of the smallest finite value.
    pub fn worst(&self) -> Option<(usize, f64)> {
        self.values
            .iter()
            .enumerate()
            .filter(|(_, v)| v.is_finite())
            .min_by(|a, b| a.1.total_cmp(b.1))
            .map(|(i, v)| (i, *v))
    }

    /// The largest value to show: every finite limit and the case's value.
    pub fn top(&self) -> f64 {
        let m = self
            .values
            .iter()
            .copied()
            .filter(|v| v.is_finite())
            .fold(self.case_value, f64::max);
        if m > 0.0 && m.is_finite() {
            m
        } else {
            1.0
        }
    }

    /// How many directions have no finite limit.
    pub fn skipped(&self) -> usize {
        self.values.iter().filter(|v| !v.is_finite()).count()
    }

    /// The legend entries every variant shares.
    pub fn legend(&self) -> Vec<(Key, String)> {
        vec![
            (
                Key::Line(style::CURVE),
                format!("{} per direction", self.quantity),
            ),
            (
                Key::Dashed(style::CASE),
                format!(
                    "the case: {} = {}",
                    self.symbol,
                    style::num(self.case_value, 4)
                ),
            ),
            (Key::Target, "most restrictive direction".to_string()),
        ]
    }

    /// Notes under the legend: the overall limit and the skipped directions.
    pub fn notes(&self) -> Vec<String> {
        let mut n = Vec::new();
        if let Some(o) = self.overall {
            n.push(format!(
                "overall limit: {} = {}",
                self.symbol,
                style::num(o, 6)
            ));
        }
        let above = self
            .values
            .iter()
            .filter(|v| v.is_finite() && **v < self.case_value)
            .count();
        if above > 0 {
            n.push(format!(
                "the case's {} exceeds the limit in {above} of {} directions",
                self.symbol,
                self.values.len()
            ));
        }
        if self.skipped() > 0 {
            n.push(format!(
                "{} of {} directions without a finite limit (not drawn)",
                self.skipped(),
                self.values.len()
            ));
        }
        n
    }
}

/// Draws the picture for the case's dimension.
pub fn draw(root: &Area, problem: &Problem, r: &Results, dl: &DirectionalLimit) -> Res {
    title_band(
        root,
        problem,
        "largest stable time step by wave direction",
        r.dt,
    )?;
    let s = Series::new(problem, r, dl);
    match r.grid.points.len() {
        1 => bars(root, dl, &s),
        2 => polar::draw(root, dl, &s),
        _ => scatter(root, dl, &s),
    }
}

/// A dashed horizontal line at pixel row `y` across `x` (image pixels), if inside `rows`.
fn dashed_h(root: &Area, x: std::ops::Range<i32>, rows: &std::ops::Range<i32>, y: i32) -> Res {
    if !rows.contains(&y) {
        return Ok(());
    }
    let mut a = x.start;
    while a < x.end {
        let b = (a + 10).min(x.end - 1);
        root.draw(&PathElement::new(
            vec![(a, y), (b, y)],
            style::CASE.stroke_width(3),
        ))?;
        a += 18;
    }
    Ok(())
}

/// The notes, right-aligned at `right` under the title band.
fn notes(root: &Area, right: i32, s: &Series) -> Res {
    let t = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Right, VPos::Top));
    for (k, n) in s.notes().iter().enumerate() {
        root.draw(&Text::new(
            n.clone(),
            (right, TITLE_BAND as i32 + 14 + 20 * k as i32),
            t.clone(),
        ))?;
    }
    Ok(())
}

fn bars(root: &Area, dl: &DirectionalLimit, s: &Series) -> Res {
    let top = s.top() * 1.18;
    let (ticks, step) = style::nice_ticks(0.0, top, 6);
    let area = root.margin(TITLE_BAND + 60, 60, 60, 60);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(50)
        .y_label_area_size(90)
        .build_cartesian_2d(
            style::Ticked::new(0.0..2.0, vec![0.5, 1.5]),
            style::Ticked::new(0.0..top, ticks),
        )?;
    let name = |i: usize| {
        if dl.directions[i][0] >= 0.0 {
            "+x  (θ > 0)"
        } else {
            "−x  (θ < 0)"
        }
    };
    let fmt_x = |v: &f64| {
        if (*v - 0.5).abs() < 1e-9 {
            name(0).to_string()
        } else {
            name(1).to_string()
        }
    };
    let fmt_y = |v: &f64| style::tick_label(*v, step, top);
    style::house_mesh(
        chart
            .configure_mesh()
            .disable_x_mesh()
            .x_label_formatter(&fmt_x)
            .y_label_formatter(&fmt_y)
            .y_desc(s.quantity)
            .x_desc("wave direction"),
    )
    .draw()?;
    for (i, v) in s.values.iter().enumerate().take(2) {
        let c = 0.5 + i as f64;
        if v.is_finite() {
            chart.draw_series(std::iter::once(Rectangle::new(
                [(c - 0.22, 0.0), (c + 0.22, *v)],
                style::CURVE.mix(0.85).filled(),
            )))?;
        } else {
            let t = style::text(15.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Bottom));
            chart.draw_series(std::iter::once(Text::new(
                "no finite limit",
                (c, 0.05 * top),
                t,
            )))?;
        }
    }
    let (px, py) = chart.plotting_area().get_pixel_range();
    dashed_h(
        root,
        px.clone(),
        &py,
        chart.backend_coord(&(0.0, s.case_value)).1,
    )?;
    for (i, v) in s
        .values
        .iter()
        .enumerate()
        .take(2)
        .filter(|(_, v)| v.is_finite())
    {
        let (x, y) = chart.backend_coord(&(0.5 + i as f64, *v));
        let t = style::text(15.0, style::INK).pos(style::anchor(HPos::Center, VPos::Bottom));
        let label = format!("{} = {}", s.symbol, style::num(*v, 6));
        root.draw(&Text::new(label, (x, y - 16), t))?;
    }
    if let Some((i, v)) = s.worst() {
        target(root, chart.backend_coord(&(0.5 + i as f64, v)))?;
    }
    let mut legend = s.legend();
    legend[0].0 = Key::Swatch(style::CURVE);
    legend_row(root, (px.start - 60, SIZE.1 as i32 - 34), &legend)?;
    notes(root, SIZE.0 as i32 - 50, s)
}

fn scatter(root: &Area, dl: &DirectionalLimit, s: &Series) -> Res {
    let az: Vec<f64> = dl
        .directions
        .iter()
        .map(|d| d[1].atan2(d[0]).to_degrees().rem_euclid(360.0))
        .collect();
    let el: Vec<f64> = dl
        .directions
        .iter()
        .map(|d| d[2].clamp(-1.0, 1.0).asin().to_degrees())
        .collect();
    let top = s.top() * 1.12;
    let (ticks, step) = style::nice_ticks(0.0, top, 6);
    let area = root.margin(TITLE_BAND + 60, 60, 40, 190);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(50)
        .y_label_area_size(90)
        .build_cartesian_2d(
            style::Ticked::new(0.0..360.0, (0..=12).map(|k| 30.0 * k as f64).collect()),
            style::Ticked::new(0.0..top, ticks),
        )?;
    let fmt_x = |v: &f64| format!("{v:.0}°");
    let fmt_y = |v: &f64| style::tick_label(*v, step, top);
    style::house_mesh(
        chart
            .configure_mesh()
            .x_label_formatter(&fmt_x)
            .y_label_formatter(&fmt_y)
            .y_desc(s.quantity)
            .x_desc("azimuth of the wave direction, atan2(θy, θx)"),
    )
    .draw()?;
    let elevation = Scale {
        lo: -90.0,
        hi: 90.0,
    };
    chart.draw_series(
        s.values
            .iter()
            .zip(az.iter().zip(&el))
            .filter(|(v, _)| v.is_finite())
            .map(|(v, (a, e))| Circle::new((*a, *v), 4, elevation.colour(*e).filled())),
    )?;
    let (px, py) = chart.plotting_area().get_pixel_range();
    dashed_h(
        root,
        px.clone(),
        &py,
        chart.backend_coord(&(0.0, s.case_value)).1,
    )?;
    if let Some((i, v)) = s.worst() {
        let p = chart.backend_coord(&(az[i], v));
        target(root, p)?;
        let lines = vec![
            format!("min {} = {}", s.symbol, style::num(v, 6)),
            format!("azimuth {:.1}°, elevation {:.1}°", az[i], el[i]).replace('-', "−"),
        ];
        callout(
            root,
            p,
            &lines,
            ((px.start, px.end - 1), (py.start, py.end - 1)),
        )?;
    }
    let bar = Bar {
        x: px.end + 40,
        y: (py.start, py.end - 1),
        width: 24,
        label: "elevation of the wave direction (°)",
        mark: None,
        ticks: Some((0..=6).map(|k| -90.0 + 30.0 * k as f64).collect()),
    };
    colour_bar(root, &elevation, &bar)?;
    let mut legend = s.legend();
    legend[0] = (
        Key::Dot(elevation.colour(0.0)),
        format!("{} per direction (colour: elevation)", s.symbol),
    );
    legend_row(root, (px.start - 60, SIZE.1 as i32 - 34), &legend)?;
    notes(root, px.end - 4, s)
}
