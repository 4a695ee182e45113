//! `growth.png`: the transient-growth envelope max_θ ‖Gⁿ‖₂ against the step n.
//!
//! The envelope (in the case's weighted norm) is drawn against n = 0..steps,
//! on a logarithmic axis when its values, 1 and the Kreiss lower bound span
//! more than a factor [`LOG_RANGE`](super::axis::LOG_RANGE), on a linear one
//! otherwise ([`YAxis`]). ‖Gⁿ‖ = 1 is a dashed line, the Kreiss lower bound K (when finite) a dotted one: by the
//! Kreiss matrix theorem sup_n ‖Gⁿ‖ ≥ K, so a curve that stays far below K has
//! not yet reached its peak within the horizon. The peak of the envelope is
//! marked and annotated with its value, step and wavevector; the verdict of
//! the growth analysis stands in a band above the plot. Non-finite values are
//! clipped to the edge of the plot (±∞) or left as gaps (NaN), and counted in
//! a note.

use super::axis::YAxis;
use super::heatmap::{callout, callout_box, callout_size, legend_row, target, Key};
use super::{style, title_band, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::growth::GrowthResult;
use crate::analysis::Results;
use crate::problem::Problem;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// Growth counts as growth above 1 + this (the analysis' own threshold).
const GROWTH: f64 = 1e-6;

const Y_LABEL: &str = "max over wavevectors of ||G^n||_2 (weighted norm)";
/// The y label of a second-order-in-time method, measured in the discrete
/// wave energy of (u^n, u^{n−1}).
const Y_LABEL_SECOND: &str = "max over wavevectors of ||G^n||_2 in the discrete wave energy";
/// The y label of a multistep method, whose state stacks its time levels.
const Y_LABEL_STACKED: &str = "max over wavevectors of ||G^n||_2 (weighted, stacked time levels)";

/// How many values are NaN, clipped at the top, clipped at the bottom.
fn clipped_counts(values: &[f64], axis: &YAxis) -> (usize, usize, usize) {
    values.iter().fold((0, 0, 0), |(nan, top, bottom), v| {
        if v.is_nan() {
            (nan + 1, top, bottom)
        } else if *v == f64::INFINITY {
            (nan, top + 1, bottom)
        } else if !axis.contains(*v) {
            (nan, top, bottom + 1)
        } else {
            (nan, top, bottom)
        }
    })
}

/// What the band above the plot says, and the notes on clipped values.
fn band_lines(g: &GrowthResult, axis: &YAxis) -> Vec<(String, bool)> {
    let mut lines: Vec<(String, bool)> = style::wrap(&g.verdict, 100)
        .into_iter()
        .map(|l| (l, true))
        .collect();
    let (eps, pseudo) = g.pseudospectral;
    let mut facts = vec![format!("class {}", g.class.as_str())];
    if pseudo.is_finite() {
        facts.push(format!(
            "ε-pseudospectral radius at the peak wavevector {} (ε = {})",
            style::trimmed(pseudo, 6),
            style::trimmed(eps, 3)
        ));
    }
    if g.kreiss.is_none() {
        facts.push("Kreiss lower bound infinite (ρ(G) > 1 at the peak)".to_string());
    }
    lines.push((facts.join("  ·  "), false));
    let (nan, top, bottom) = clipped_counts(&g.envelope, axis);
    let steps = |n: usize| {
        if n == 1 {
            "1 step".to_string()
        } else {
            format!("{n} steps")
        }
    };
    let mut clipped = Vec::new();
    if top > 0 {
        clipped.push(format!(
            "{} overflow (∞): drawn at the top edge in crimson",
            steps(top)
        ));
    }
    if bottom > 0 {
        let what = match axis {
            YAxis::Log { .. } => "at or below 0",
            YAxis::Linear { .. } => "at −∞",
        };
        clipped.push(format!(
            "{} {what}: drawn at the bottom edge in crimson",
            steps(bottom)
        ));
    }
    if nan > 0 {
        clipped.push(format!(
            "{} without a value (NaN): left as gaps",
            steps(nan)
        ));
    }
    if !clipped.is_empty() {
        lines.push((clipped.join("  ·  "), false));
    }
    lines
}

/// Draws the picture.
pub fn draw(root: &Area, problem: &Problem, r: &Results, g: &GrowthResult) -> Res {
    title_band(
        root,
        problem,
        "transient growth of ||G^n||_2 over the steps",
        r.dt,
    )?;
    let steps = g.envelope.len().saturating_sub(1);
    let (pv, pn, ptheta) = (&g.peak.0, g.peak.1, &g.peak.2);
    let kreiss = g
        .kreiss
        .as_ref()
        .map(|k| k.lower_bound)
        .filter(|k| k.is_finite());
    let mut spanned: Vec<f64> = g.envelope.clone();
    spanned.push(1.0);
    spanned.extend(kreiss);
    spanned.extend(Some(*pv).filter(|v| v.is_finite()));
    let axis = YAxis::for_values(&spanned);

    let lines = band_lines(g, &axis);
    let mut y = TITLE_BAND as i32 + 16;
    for (text, strong) in &lines {
        let (size, colour) = if *strong {
            (16.0, style::INK)
        } else {
            (14.0, style::MUTED)
        };
        let t = style::text(size, colour).pos(style::anchor(HPos::Left, VPos::Top));
        root.draw(&Text::new(text.clone(), (26, y), t))?;
        y += if *strong { 22 } else { 20 };
    }
    let top = (y + 6 - TITLE_BAND as i32) as u32;

    let (lo, hi, ticks) = axis.range();
    let xmax = steps.max(1) as f64;
    // whole steps only
    let (xticks, xstep) = match style::nice_ticks(0.0, xmax, 8) {
        (_, step) if step < 1.0 => ((0..=xmax as usize).map(|n| n as f64).collect(), 1.0),
        ticks => ticks,
    };
    let area = root.margin(TITLE_BAND + top, 60, 40, 50);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(58)
        .y_label_area_size(92)
        .build_cartesian_2d(
            style::Ticked::new(0.0..xmax, xticks),
            style::Ticked::new(lo..hi, ticks),
        )?;
    let fmt_x = |v: &f64| style::tick_label(*v, xstep, xmax);
    let fmt_y = |v: &f64| axis.label(*v);
    style::house_mesh(
        chart
            .configure_mesh()
            .x_desc("time step n")
            .y_desc(if problem.method.is_second_order() {
                Y_LABEL_SECOND
            } else if problem.method.levels() > 1 {
                Y_LABEL_STACKED
            } else {
                Y_LABEL
            })
            .x_label_formatter(&fmt_x)
            .y_label_formatter(&fmt_y),
    )
    .draw()?;
    let (px, py) = chart.plotting_area().get_pixel_range();

    // ||G^n|| = 1, dashed
    let one_row = axis
        .place(1.0)
        .filter(|_| axis.contains(1.0))
        .map(|one| chart.backend_coord(&(0.0, one)).1);
    if let Some(y1) = one_row {
        dash(root, px.start..px.end, y1, 12, 8, BLACK, 2)?;
    }
    // the Kreiss lower bound, dotted
    let kreiss_row = kreiss
        .filter(|k| axis.contains(*k))
        .map(|k| chart.backend_coord(&(0.0, axis.place(k).unwrap_or(lo))).1);
    if let Some(yk) = kreiss_row {
        dash(root, px.start..px.end, yk, 3, 5, style::BOUND, 3)?;
    }

    // the envelope, broken at NaN, clipped at the edges
    let mut runs: Vec<Vec<(f64, f64)>> = vec![vec![]];
    for (n, v) in g.envelope.iter().enumerate() {
        match axis.place(*v) {
            Some(yv) => runs.last_mut().expect("non-empty").push((n as f64, yv)),
            None if !runs.last().expect("non-empty").is_empty() => runs.push(vec![]),
            None => {}
        }
    }
    for run in runs.into_iter().filter(|r| !r.is_empty()) {
        if run.len() == 1 {
            chart.draw_series(std::iter::once(Circle::new(
                run[0],
                3,
                style::CURVE.filled(),
            )))?;
        } else {
            chart.draw_series(std::iter::once(PathElement::new(
                run,
                style::CURVE.stroke_width(3),
            )))?;
        }
    }

    // clipped values again in crimson: runs of them, joined to their neighbours
    let clipped: Vec<bool> = g
        .envelope
        .iter()
        .map(|v| !v.is_nan() && !axis.contains(*v))
        .collect();
    let mut n = 0;
    while n < clipped.len() {
        if !clipped[n] {
            n += 1;
            continue;
        }
        let start = n;
        while n < clipped.len() && clipped[n] {
            n += 1;
        }
        let (a, b) = (start.saturating_sub(1), n.min(clipped.len() - 1));
        let run: Vec<(f64, f64)> = (a..=b)
            .filter_map(|k| axis.place(g.envelope[k]).map(|y| (k as f64, y)))
            .collect();
        if run.len() == 1 {
            chart.draw_series(std::iter::once(Circle::new(
                run[0],
                4,
                style::WORST.filled(),
            )))?;
        } else {
            chart.draw_series(std::iter::once(PathElement::new(
                run,
                style::WORST.stroke_width(3),
            )))?;
        }
    }

    // obstacles for the notes: the curve (with points between the steps) and
    // the line ||G^n|| = 1
    let curve: Vec<(i32, i32)> = g
        .envelope
        .iter()
        .enumerate()
        .filter_map(|(n, v)| axis.place(*v).map(|y| chart.backend_coord(&(n as f64, y))))
        .collect();
    let mut obstacles: Vec<(i32, i32)> = curve
        .windows(2)
        .flat_map(|w| {
            (0..4).map(move |q| {
                (
                    w[0].0 + (w[1].0 - w[0].0) * q / 4,
                    w[0].1 + (w[1].1 - w[0].1) * q / 4,
                )
            })
        })
        .chain(curve.last().copied())
        .collect();
    if let Some(y1) = one_row {
        obstacles.extend((px.start..px.end).step_by(6).map(|x| (x, y1)));
    }
    let inside = |(x0, y0): (i32, i32), (w, h): (i32, i32)| {
        x0 > px.start && x0 + w < px.end && y0 > py.start && y0 + h < py.end
    };

    // the peak, its callout where the curve does not run
    if let Some(yp) = axis.place(*pv) {
        let p = chart.backend_coord(&(pn as f64, yp));
        target(root, p)?;
        let lines = if *pv > 1.0 + GROWTH {
            vec![
                format!("peak max ||G^n||_2 = {}", style::num(*pv, 6)),
                format!("at step n = {pn}"),
                format!("θ = {}", style::theta_tuple(ptheta)),
            ]
        } else {
            vec![
                format!("max ||G^n||_2 = {} at n = {pn}", style::num(*pv, 6)),
                "no transient growth".to_string(),
            ]
        };
        let size = callout_size(root, &lines);
        let (w, h) = size;
        let spot = [16, 60, 120, 200]
            .iter()
            .flat_map(|d| {
                [
                    (p.0 + d, p.1 - 16 - h),
                    (p.0 - d - w, p.1 - 16 - h),
                    (p.0 + d, p.1 + 16),
                    (p.0 - d - w, p.1 + 16),
                    (p.0 - d - w, p.1 + 16 + d),
                    (p.0 + d, p.1 + 16 + d),
                ]
            })
            .find(|c| inside(*c, size) && free(&obstacles, *c, size));
        match spot {
            Some(c) => {
                // a leader from the marker's ring to the nearest point of the box
                let near = (p.0.clamp(c.0, c.0 + w), p.1.clamp(c.1, c.1 + h));
                let (dx, dy) = ((near.0 - p.0) as f64, (near.1 - p.1) as f64);
                let len = dx.hypot(dy);
                if len > 24.0 {
                    let from = (
                        p.0 + (11.0 * dx / len).round() as i32,
                        p.1 + (11.0 * dy / len).round() as i32,
                    );
                    root.draw(&PathElement::new(
                        vec![from, near],
                        style::WORST.stroke_width(1),
                    ))?;
                }
                callout_box(root, c, &lines)?;
                obstacles.extend(rectangle_points(c, size));
            }
            None => callout(
                root,
                p,
                &lines,
                ((px.start, px.end - 1), (py.start, py.end - 1)),
            )?,
        }
    }

    // the Kreiss bound's label, clear of the curve, the line 1 and the callout
    if let (Some(k), Some(yk)) = (kreiss, kreiss_row) {
        let label = format!("Kreiss lower bound K = {}", style::num(k, 5));
        let t = style::text(14.0, style::BOUND);
        let (w, th) = root.estimate_text_size(&label, &t)?;
        let size = (w as i32, th as i32);
        let away_from_peak = (pn as f64) < 0.5 * steps as f64;
        let boxes: Vec<(i32, i32)> = [away_from_peak, !away_from_peak]
            .iter()
            .flat_map(|right| {
                let x0 = if *right {
                    px.end - 14 - size.0
                } else {
                    px.start + 10
                };
                [(x0, yk - 6 - size.1), (x0, yk + 7)]
            })
            .filter(|b| inside(*b, size))
            .collect();
        if let Some(&(x0, y0)) = boxes
            .iter()
            .find(|b| free(&obstacles, **b, size))
            .or(boxes.first())
        {
            root.draw(&Rectangle::new(
                [(x0 - 4, y0), (x0 + size.0 + 4, y0 + size.1)],
                WHITE.mix(0.85).filled(),
            ))?;
            let t = t.pos(style::anchor(HPos::Left, VPos::Top));
            root.draw(&Text::new(label, (x0, y0), t))?;
        }
    }

    let mut entries = vec![
        (
            Key::Line(style::CURVE),
            "max over θ of ||G^n||_2".to_string(),
        ),
        (Key::Dashed(BLACK), "||G^n||_2 = 1".to_string()),
    ];
    if kreiss.is_some_and(|k| axis.contains(k)) {
        entries.push((Key::Dotted(style::BOUND), "Kreiss lower bound".to_string()));
    }
    if clipped.iter().any(|c| *c) {
        entries.push((Key::Line(style::WORST), "clipped".to_string()));
    }
    if axis.place(*pv).is_some() {
        entries.push((Key::Target, "peak of the envelope".to_string()));
    }
    if !g.envelope.iter().any(|v| v.is_finite()) {
        let t = style::text(17.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
        let at = ((px.start + px.end) / 2, (py.start + py.end) / 2 - 60);
        root.draw(&Text::new("no finite value of the envelope", at, t))?;
    }
    legend_row(root, (px.start, SIZE.1 as i32 - 34), &entries)
}

/// Whether a box (top-left corner, size) keeps 5 px clear of every obstacle.
fn free(obstacles: &[(i32, i32)], (x0, y0): (i32, i32), (w, h): (i32, i32)) -> bool {
    !obstacles
        .iter()
        .any(|(x, y)| (x0 - 5..=x0 + w + 5).contains(x) && (y0 - 5..=y0 + h + 5).contains(y))
}

/// Points across a box, 6 px apart, as obstacles.
fn rectangle_points((x0, y0): (i32, i32), (w, h): (i32, i32)) -> Vec<(i32, i32)> {
    (y0..=y0 + h + 6)
        .step_by(6)
        .flat_map(|y| (x0..=x0 + w + 6).step_by(6).map(move |x| (x, y)))
        .collect()
}

/// A horizontal dashed line at row `y`: `on` pixels drawn, `off` left out.
fn dash(
    root: &Area,
    x: std::ops::Range<i32>,
    y: i32,
    on: i32,
    off: i32,
    colour: RGBColor,
    width: u32,
) -> Res {
    let mut a = x.start;
    while a < x.end {
        let b = (a + on).min(x.end - 1);
        root.draw(&PathElement::new(
            vec![(a, y), (b, y)],
            colour.stroke_width(width),
        ))?;
        a += on + off;
    }
    Ok(())
}
