//! `radius.png`: the spectral radius ρ(G(θ)) at the case's Δt.
//!
//! 2-D: a square heat map over (θx, θy) ∈ [−π, π]² with a colour bar, the
//! stability boundary |λ| = 1 + tolerance as a contour and the worst
//! wavevector marked and annotated. 1-D: the radius against θ with the level
//! drawn as a dashed line and the unstable stretches in crimson. 3-D: three
//! heat maps on one colour scale, the planes θz, θy and θx = const through the
//! worst wavevector, with the colour bar and the legend in the fourth quarter.

use super::colormap::{colour_bar, Bar, Scale};
use super::heatmap::{callout, legend_row, panel, target, Field, Frame, Key};
use super::{style, title_band, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::{RadiusResult, Results};
use crate::case::Case;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};
use std::f64::consts::PI;

const BAR_LABEL: &str = "spectral radius |λ|max";
const AXIS: [&str; 3] = ["θx = kx·hx (rad)", "θy = ky·hy (rad)", "θz = kz·hz (rad)"];
const NAME: [&str; 3] = ["θx", "θy", "θz"];
const AXIS_1D: &str = "θ = k·h (rad)";

/// Draws the picture for the case's dimension.
pub fn draw(root: &Area, case: &Case, r: &Results, rad: &RadiusResult) -> Res {
    title_band(
        root,
        case,
        "spectral radius of the amplification matrix",
        r.dt,
    )?;
    let level = 1.0 + case.scan.tolerance;
    let Some(scale) = Scale::of(rad.map.iter().copied()) else {
        return no_data(root);
    };
    match r.grid.points.len() {
        1 => line(root, r, rad, level),
        2 => map2(root, case, r, rad, &scale, level),
        _ => map3(root, case, r, rad, &scale, level),
    }
}

/// A centred note when there is nothing to draw.
fn no_data(root: &Area) -> Res {
    let t = style::text(18.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
    let msg = "no finite spectral radius: the eigenvalue kernel failed at every wavevector";
    root.draw(&Text::new(msg, (SIZE.0 as i32 / 2, SIZE.1 as i32 / 2), t))?;
    Ok(())
}

/// "max |λ| = … (stable)" and "at θ = (…)".
fn worst_lines(rad: &RadiusResult) -> Vec<String> {
    let verdict = if rad.stable { "stable" } else { "unstable" };
    let digits = if (rad.max - 1.0).abs() < 1e-3 { 8 } else { 5 };
    vec![
        format!("max |λ| = {} ({verdict})", style::num(rad.max, digits)),
        format!("at θ = {}", style::theta_tuple(&rad.wavevector)),
    ]
}

fn level_label(case: &Case, drawn: bool) -> String {
    let tol = style::num(case.scan.tolerance, 2);
    if drawn {
        format!("|λ| = 1 + {tol}: stability boundary")
    } else {
        format!("|λ| = 1 + {tol}: not reached on this map")
    }
}

fn map2(
    root: &Area,
    case: &Case,
    r: &Results,
    rad: &RadiusResult,
    scale: &Scale,
    level: f64,
) -> Res {
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
        xs: &r.grid.coords[0],
        ys: &r.grid.coords[1],
        values: rad.map.clone(),
        x_desc: AXIS[0].to_string(),
        y_desc: AXIS[1].to_string(),
        caption: None,
        marker: Some((rad.wavevector[0], rad.wavevector[1])),
    };
    let placed = panel(root, (x0, y0), side, &field, scale, level, &frame)?;
    let bar = Bar {
        x: placed.x.1 + 44,
        y: placed.y,
        width: 26,
        label: BAR_LABEL,
        mark: Some(level),
        ticks: None,
    };
    colour_bar(root, scale, &bar)?;
    if let Some(p) = placed.marker {
        callout(root, p, &worst_lines(rad), (placed.x, placed.y))?;
    }
    let mut entries = vec![
        (Key::Contour, level_label(case, placed.contour > 0)),
        (Key::Target, "largest |λ| on the grid".to_string()),
    ];
    if rad.map.iter().any(|v| v.is_nan()) {
        entries.push((Key::Swatch(style::MISSING), "no value".to_string()));
    }
    legend_row(root, (x0 - 6, SIZE.1 as i32 - 24), &entries)
}

fn line(root: &Area, r: &Results, rad: &RadiusResult, level: f64) -> Res {
    let xs = &r.grid.coords[0];
    let finite = rad.map.iter().copied().filter(|v| v.is_finite());
    let (lo, hi) = finite.fold((1.0f64, 1.0f64), |(a, b), v| (a.min(v), b.max(v)));
    let pad = 0.06 * (hi - lo).max(1e-3);
    let (ticks, step) = style::nice_ticks(lo - pad, hi + pad, 7);
    let largest = lo.abs().max(hi.abs());
    let area = root.margin(TITLE_BAND + 24, 60, 40, 50);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(58)
        .y_label_area_size(86)
        .build_cartesian_2d(
            style::Ticked::theta(),
            style::Ticked::new(lo - pad..hi + pad, ticks),
        )?;
    let fmt_y = |v: &f64| style::tick_label(*v, step, largest);
    chart
        .configure_mesh()
        .x_desc(AXIS_1D)
        .y_desc(BAR_LABEL)
        .x_label_formatter(&style::theta_label)
        .y_label_formatter(&fmt_y)
        .label_style(style::text(15.0, style::INK))
        .axis_desc_style(style::text(17.0, style::INK))
        .axis_style(style::INK)
        .bold_line_style(style::RULE.stroke_width(1))
        .light_line_style(TRANSPARENT)
        .draw()?;
    for k in 0..60 {
        let a = -PI + 2.0 * PI * k as f64 / 60.0;
        let b = a + PI / 60.0;
        chart.draw_series(std::iter::once(PathElement::new(
            vec![(a, level), (b, level)],
            BLACK.stroke_width(2),
        )))?;
    }
    // runs of finite values; the unstable ones again in crimson
    let runs = |pick: &dyn Fn(f64) -> bool| -> Vec<Vec<(f64, f64)>> {
        let mut out: Vec<Vec<(f64, f64)>> = vec![vec![]];
        for (x, v) in xs.iter().zip(&rad.map) {
            if v.is_finite() && pick(*v) {
                out.last_mut().expect("non-empty").push((*x, *v));
            } else if !out.last().expect("non-empty").is_empty() {
                out.push(vec![]);
            }
        }
        out
    };
    for (pick, colour) in [(&|_| true) as &dyn Fn(f64) -> bool, &|v| v > level]
        .into_iter()
        .zip([style::CURVE, style::WORST])
    {
        for run in runs(pick).into_iter().filter(|r| !r.is_empty()) {
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
    let p = chart.backend_coord(&(rad.wavevector[0], rad.max));
    target(root, p)?;
    let lines = vec![
        format!(
            "max |λ| = {} ({})",
            style::num(rad.max, 8),
            if rad.stable { "stable" } else { "unstable" }
        ),
        format!("at θ = {}", style::num_fixed(rad.wavevector[0], 3)),
    ];
    let bounds = ((px.start, px.end - 1), (py.start, py.end - 1));
    callout(root, p, &lines, bounds)?;
    let mut entries = vec![(Key::Line(style::CURVE), "ρ(G(θ))".to_string())];
    if rad.map.iter().any(|v| v.is_finite() && *v > level) {
        entries.push((Key::Line(style::WORST), "above 1 + tolerance".to_string()));
    }
    entries.push((Key::Dashed(BLACK), "|λ| = 1 + tolerance".to_string()));
    entries.push((Key::Target, "largest |λ|".to_string()));
    legend_row(root, (px.start, SIZE.1 as i32 - 34), &entries)
}

/// Index of the node nearest to `v` on an axis.
fn nearest(coords: &[f64], v: f64) -> usize {
    (0..coords.len())
        .min_by(|a, b| (coords[*a] - v).abs().total_cmp(&(coords[*b] - v).abs()))
        .unwrap_or(0)
}

fn map3(
    root: &Area,
    case: &Case,
    r: &Results,
    rad: &RadiusResult,
    scale: &Scale,
    level: f64,
) -> Res {
    let c = &r.grid.coords;
    let n = &r.grid.points;
    let w = &rad.wavevector;
    let at = |i: usize, j: usize, k: usize| rad.map[(i * n[1] + j) * n[2] + k];
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
            marker: Some((w[a], w[b])),
        };
        let (cx, cy) = (
            (p % 2) as i32 * cell.0,
            TITLE_BAND as i32 + (p / 2) as i32 * cell.1,
        );
        let origin = (
            cx + (cell.0 - side as i32) / 2 + 24,
            cy + frame.top as i32 + 12,
        );
        placed.push(panel(root, origin, side, &field, scale, level, &frame)?);
    }
    let (bx, by) = (cell.0 + 40, placed[2].y);
    colour_bar(
        root,
        scale,
        &Bar {
            x: bx,
            y: by,
            width: 24,
            label: BAR_LABEL,
            mark: Some(level),
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
    note(root, y, "slices through the worst wavevector", 15.0)?;
    y += 30;
    for l in worst_lines(rad) {
        note(root, y, &l, 14.0)?;
        y += 22;
    }
    y += 18;
    let drawn = placed.iter().any(|p| p.contour > 0);
    let entries = [
        (Key::Contour, level_label(case, drawn)),
        (Key::Target, "largest |λ| on the grid".to_string()),
        (Key::Swatch(style::MISSING), "no value".to_string()),
    ];
    for (k, e) in entries.iter().enumerate() {
        if k == 2 && !rad.map.iter().any(|v| v.is_nan()) {
            break;
        }
        legend_row(root, (tx - 4, y), std::slice::from_ref(e))?;
        y += 28;
    }
    Ok(())
}
