//! The 2-D variant of `limit_polar.png`: a polar plot of the largest stable
//! Courant number (or Δt) against the wave direction φ = atan2(θy, θx).
//!
//! Drawn directly in pixels: rings at "nice" values with their labels, spokes
//! every 30°, the region inside the curve shaded as the stable set of
//! (direction, step) pairs when every direction has a finite limit, the curve
//! itself (broken where a limit is not finite), the case's value as a dashed
//! circle, and the most restrictive direction as a crimson spoke with a marker
//! and a callout.

use super::heatmap::{callout, legend_entry, target, Key};
use super::{style, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::DirectionalLimit;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// The plotted quantity per direction, in the picture's unit.
pub struct Series {
    /// One value per direction (Courant number or Δt); may be non-finite.
    pub values: Vec<f64>,
    /// The case's own value in the same unit.
    pub case_value: f64,
    /// The overall limit in the same unit, when bounded.
    pub overall: Option<f64>,
    /// Axis label.
    pub quantity: &'static str,
    /// Short symbol for notes.
    pub symbol: &'static str,
}

/// Radius of the outer ring, in pixels.
const RADIUS: f64 = 285.0;

/// Draws the polar plot and its legend column.
pub fn draw(root: &Area, dl: &DirectionalLimit, s: &Series) -> Res {
    let centre = (400.0, TITLE_BAND as f64 + 36.0 + RADIUS);
    let (_, step) = style::nice_ticks(0.0, s.top(), 4);
    let rings = (s.top() / step - 1e-9).ceil().max(1.0) as usize;
    let ticks: Vec<f64> = (1..=rings).map(|k| k as f64 * step).collect();
    let outer = ticks[rings - 1];
    let px = |r: f64, phi: f64| -> (i32, i32) {
        let q = r / outer * RADIUS;
        (
            (centre.0 + q * phi.cos()).round() as i32,
            (centre.1 - q * phi.sin()).round() as i32,
        )
    };
    let circle =
        |r: f64| -> Vec<(i32, i32)> { (0..=360).map(|k| px(r, (k as f64).to_radians())).collect() };
    let phi: Vec<f64> = dl.directions.iter().map(|d| d[1].atan2(d[0])).collect();
    let n = s.values.len();

    if s.skipped() == 0 && n > 2 {
        let poly: Vec<(i32, i32)> = (0..n).map(|i| px(s.values[i], phi[i])).collect();
        root.draw(&Polygon::new(poly, style::CURVE_FILL.filled()))?;
    }
    for k in 0..12 {
        let a = (30.0 * k as f64).to_radians();
        root.draw(&PathElement::new(
            vec![px(0.0, a), px(outer, a)],
            style::RULE.stroke_width(1),
        ))?;
        let label = format!("{}°", 30 * k);
        let t = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
        root.draw(&Text::new(label, px(outer * (1.0 + 24.0 / RADIUS), a), t))?;
    }
    let largest = outer;
    for t in ticks.iter().filter(|t| **t > 0.0) {
        let colour = if (*t - outer).abs() < 1e-12 * outer {
            style::MUTED
        } else {
            style::RULE
        };
        root.draw(&PathElement::new(circle(*t), colour.stroke_width(1)))?;
    }

    // the curve, in runs of finite values, closed when the first and last are
    let mut runs: Vec<Vec<(i32, i32)>> = vec![vec![]];
    for (v, a) in s.values.iter().zip(&phi) {
        if v.is_finite() {
            runs.last_mut().expect("non-empty").push(px(*v, *a));
        } else if !runs.last().expect("non-empty").is_empty() {
            runs.push(vec![]);
        }
    }
    if n > 2 && s.values[0].is_finite() && s.values[n - 1].is_finite() {
        let first = px(s.values[0], phi[0]);
        runs.last_mut().expect("non-empty").push(first);
    }
    for run in runs.into_iter().filter(|r| !r.is_empty()) {
        if run.len() == 1 {
            root.draw(&Circle::new(run[0], 3, style::CURVE.filled()))?;
        } else {
            root.draw(&PathElement::new(run, style::CURVE.stroke_width(3)))?;
        }
    }

    // ring labels on small white plates, over the curve
    let ring_angle = 75.0f64.to_radians();
    for t in &ticks {
        let l = style::tick_label(*t, step, largest);
        let f = style::text(13.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
        let (x, y) = px(*t, ring_angle);
        let (w, _) = root.estimate_text_size(&l, &f)?;
        let half = w as i32 / 2 + 3;
        root.draw(&Rectangle::new(
            [(x - half, y - 9), (x + half, y + 8)],
            WHITE.mix(0.85).filled(),
        ))?;
        root.draw(&Text::new(l, (x, y), f))?;
    }

    if s.case_value.is_finite() && s.case_value > 0.0 {
        for k in (0..360).step_by(6) {
            let arc: Vec<(i32, i32)> = (0..=3)
                .map(|j| px(s.case_value, ((k + j) as f64).to_radians()))
                .collect();
            root.draw(&PathElement::new(arc, style::CASE.stroke_width(3)))?;
        }
    }

    let bounds = ((20, 760), (TITLE_BAND as i32 + 10, SIZE.1 as i32 - 60));
    if let Some((i, v)) = s.worst() {
        root.draw(&PathElement::new(
            vec![px(0.0, phi[i]), px(v, phi[i])],
            style::WORST.stroke_width(2),
        ))?;
        let p = px(v, phi[i]);
        target(root, p)?;
        let deg = phi[i].to_degrees().rem_euclid(360.0);
        let lines = vec![
            format!("min {} = {}", s.symbol, style::num(v, 6)),
            format!("at φ = {deg:.1}°"),
        ];
        callout(root, p, &lines, bounds)?;
    } else {
        let t = style::text(17.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
        let (cx, cy) = (centre.0 as i32, centre.1 as i32 - 40);
        let msg = "no direction has a finite limit";
        let (w, _) = root.estimate_text_size(msg, &t)?;
        let half = w as i32 / 2 + 8;
        root.draw(&Rectangle::new(
            [(cx - half, cy - 14), (cx + half, cy + 13)],
            WHITE.filled(),
        ))?;
        root.draw(&Text::new(msg, (cx, cy), t))?;
    }
    root.draw(&Circle::new(px(0.0, 0.0), 2, style::INK.filled()))?;

    let t = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Top));
    let cap = "wave direction φ = atan2(θy, θx) in θ-space; distance from the centre: the limit";
    root.draw(&Text::new(
        cap,
        (centre.0 as i32, (centre.1 + RADIUS) as i32 + 48),
        t,
    ))?;
    column(root, (740, TITLE_BAND as i32 + 60), s, dl.directions.len())
}

/// The legend and notes, stacked, at the right of the plot.
fn column(root: &Area, (x, mut y): (i32, i32), s: &Series, count: usize) -> Res {
    let head = style::text(15.0, style::INK).pos(style::anchor(HPos::Left, VPos::Center));
    root.draw(&Text::new(format!("{count} wave directions"), (x, y), head))?;
    y += 34;
    let mut legend = s.legend();
    legend[0].1 = format!("largest stable {}", s.symbol);
    if s.skipped() == 0 {
        legend.push((Key::Swatch(style::CURVE_FILL), "stable steps".to_string()));
    }
    for (key, label) in &legend {
        legend_entry(root, (x, y), key, label)?;
        y += 30;
    }
    y += 12;
    let note = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Left, VPos::Center));
    for n in s.notes() {
        for part in style::wrap(&n, 30) {
            root.draw(&Text::new(part, (x, y), note.clone()))?;
            y += 20;
        }
        y += 6;
    }
    Ok(())
}
