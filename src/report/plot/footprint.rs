//! `footprint.png`: the Fourier footprint Δt·eig L(θ) over the time method's
//! stability region in the complex z = Δt μ plane.
//!
//! The stability region {z : every amplification root of z has modulus ≤ 1}
//! (|R(z)| ≤ 1 for one-step methods; the roots of the characteristic
//! polynomial for multistep ones, so the boundary is their boundary locus) is
//! shaded on a fine grid of z and its edge drawn dark. Over it: the footprint
//! at the case's Δt, one dot per eigenvalue and sampled wavevector, coloured by
//! |θ| (colour bar), and the same footprint scaled to the largest stable Δt
//! (grey) when the limit was computed and is bounded: the scaled footprint
//! touches the boundary. Both axes carry the same scale, so the region keeps
//! its shape. The footprint is the same for 1-D, 2-D and 3-D grids.

use super::colormap::{self, Bar, Scale};
use super::heatmap::{legend_entry, Key};
use super::{style, title_band, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::fourier_footprint::FourierFootprint;
use crate::analysis::limit::LimitKind;
use crate::analysis::Results;
use crate::problem::Problem;
use num_complex::Complex64 as C64;
use plotters::prelude::*;

/// Light fill of the stability region.
const REGION: RGBColor = RGBColor(0xdc, 0xef, 0xe1);
/// Its boundary.
const EDGE: RGBColor = RGBColor(0x2b, 0x6e, 0x3f);
/// The footprint at the largest stable Δt.
const AT_LIMIT: RGBColor = RGBColor(0xa0, 0xa4, 0xa8);
/// Cells of the region grid along x (y in proportion).
const CELLS: usize = 420;

/// The dots of `dots` (in drawing order) worth drawing: of the dots whose
/// centres fall on the same pixel (`pixel`) only the last, as its disc covers
/// the earlier ones' discs. The discs' soft edge pixels are blended, so
/// repeated discs used to darken their rims: on the 513² peer case (over
/// 250,000 dots, most on the imaginary axis) 90 rim pixels differ from drawing
/// every dot, by at most 34 of 255 in one channel; the drawing takes half as long.
fn last_per_pixel<T>(
    dots: impl Iterator<Item = (C64, T)>,
    pixel: impl Fn(C64) -> (i32, i32),
) -> Vec<(C64, T)> {
    let dots: Vec<(C64, T)> = dots.collect();
    let mut seen = std::collections::HashSet::with_capacity(dots.len());
    let mut kept: Vec<(C64, T)> = Vec::with_capacity(dots.len());
    for (z, t) in dots.into_iter().rev() {
        if seen.insert(pixel(z)) {
            kept.push((z, t));
        }
    }
    kept.reverse();
    kept
}

/// The largest stable Δt, when bounded.
fn dt_max(r: &Results) -> Option<f64> {
    r.limit
        .as_ref()
        .filter(|l| l.kind == LimitKind::Bounded && l.dt_max.is_finite() && l.dt_max > 0.0)
        .map(|l| l.dt_max)
}

/// The view box [x0, x1] × [y0, y1]: every footprint point (at the case's Δt and
/// at the limit) and the stability region near the origin (out to 1.5 times the
/// footprint's reach along 64 rays, at least to |z| = 1), with a margin.
fn view(f: &FourierFootprint, limit_scale: Option<f64>, problem: &Problem) -> (f64, f64, f64, f64) {
    let (mut x0, mut x1, mut y0, mut y1) = (-0.2f64, 0.2f64, -0.2f64, 0.2f64);
    let mut take = |w: C64| {
        if w.re.is_finite() && w.im.is_finite() {
            x0 = x0.min(w.re);
            x1 = x1.max(w.re);
            y0 = y0.min(w.im);
            y1 = y1.max(w.im);
        }
    };
    let mut reach: f64 = 0.0;
    for s in [Some(1.0), limit_scale].iter().flatten() {
        for z in &f.z {
            let w = z * s;
            take(w);
            if w.norm().is_finite() {
                reach = reach.max(w.norm());
            }
        }
    }
    let cap = (1.5 * reach).max(1.0);
    for k in 0..64 {
        let dir = C64::from_polar(1.0, std::f64::consts::TAU * k as f64 / 64.0);
        let mut last = C64::new(0.0, 0.0);
        for step in 1..=200 {
            let z = dir * (cap * step as f64 / 200.0);
            if problem.method.amplification_radius(z) > 1.0 + 1e-12 {
                break;
            }
            last = z;
        }
        take(last);
    }
    let pad = 0.08 * (x1 - x0).max(y1 - y0);
    (x0 - pad, x1 + pad, y0 - pad, y1 + pad)
}

/// Draws the picture.
pub fn draw(root: &Area, problem: &Problem, r: &Results, f: &FourierFootprint) -> Res {
    // the method's variable z = s(Δt)·μ: Δt·μ, or Δt²·μ for second-order-in-time methods
    let second = problem.method.is_second_order();
    let zname = if second {
        "Δt²·eig L(θ)"
    } else {
        "Δt·eig L(θ)"
    };
    title_band(
        root,
        problem,
        &format!("Fourier footprint: {zname} over the stability region"),
        r.dt,
    )?;
    let method = &problem.method;
    let limit_scale = dt_max(r).map(|d| method.step_variable(d) / method.step_variable(f.dt));
    let (mut x0, mut x1, mut y0, mut y1) = view(f, limit_scale, problem);
    // the plot square: equal scales on both axes
    let (left, top, side_w, side_h) = (110i32, TITLE_BAND as i32 + 40, 640i32, 560i32);
    let per_px = ((x1 - x0) / side_w as f64).max((y1 - y0) / side_h as f64);
    let (cx, cy) = (0.5 * (x0 + x1), 0.5 * (y0 + y1));
    x0 = cx - 0.5 * per_px * side_w as f64;
    x1 = cx + 0.5 * per_px * side_w as f64;
    y0 = cy - 0.5 * per_px * side_h as f64;
    y1 = cy + 0.5 * per_px * side_h as f64;
    let area = root.margin(
        top as u32 - 10,
        SIZE.1 - (top + side_h) as u32 - 60,
        left as u32 - 90,
        SIZE.0 - (left + side_w) as u32,
    );
    let (xt, xs) = style::nice_ticks(x0, x1, 7);
    let (yt, ys) = style::nice_ticks(y0, y1, 7);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(50)
        .y_label_area_size(90)
        .build_cartesian_2d(
            style::Ticked::new(x0..x1, xt),
            style::Ticked::new(y0..y1, yt),
        )?;
    let fx = |v: &f64| style::tick_label(*v, xs, x0.abs().max(x1.abs()));
    let fy = |v: &f64| style::tick_label(*v, ys, y0.abs().max(y1.abs()));
    style::house_mesh(
        chart
            .configure_mesh()
            .x_desc(if second { "Re(Δt² μ)" } else { "Re(Δt μ)" })
            .y_desc(if second { "Im(Δt² μ)" } else { "Im(Δt μ)" })
            .x_label_formatter(&fx)
            .y_label_formatter(&fy),
    )
    .draw()?;

    // the stability region on a grid of cells, and its edge
    let ny = (CELLS as f64 * (y1 - y0) / (x1 - x0)).round().max(2.0) as usize;
    let cell = (x1 - x0) / CELLS as f64;
    let stable = |i: usize, j: usize| {
        let z = C64::new(x0 + (i as f64 + 0.5) * cell, y0 + (j as f64 + 0.5) * cell);
        method.amplification_radius(z) <= 1.0 + 1e-12
    };
    let inside: Vec<bool> = (0..ny)
        .flat_map(|j| (0..CELLS).map(move |i| (i, j)))
        .map(|(i, j)| stable(i, j))
        .collect();
    let at = |i: usize, j: usize| inside[j * CELLS + i];
    let plot = chart.plotting_area();
    for j in 0..ny {
        for i in 0..CELLS {
            let edge = at(i, j)
                && ((i > 0 && !at(i - 1, j))
                    || (i + 1 < CELLS && !at(i + 1, j))
                    || (j > 0 && !at(i, j - 1))
                    || (j + 1 < ny && !at(i, j + 1)));
            if at(i, j) {
                let colour = if edge { EDGE } else { REGION };
                let (a, b) = (x0 + i as f64 * cell, y0 + j as f64 * cell);
                plot.draw(&Rectangle::new(
                    [(a, b), (a + cell, b + cell)],
                    colour.filled(),
                ))?;
            }
        }
    }
    // the axes of the z plane
    for (p, q) in [((x0, 0.0), (x1, 0.0)), ((0.0, y0), (0.0, y1))] {
        plot.draw(&PathElement::new(vec![p, q], style::MUTED.stroke_width(1)))?;
    }
    // a second-order-in-time method's region has no area where the footprint
    // lies (central difference: the segment [−4, 0]); its stable stretch of
    // the negative real axis is drawn as a band on the axis
    if second {
        let reach = method.real_limit().min(-x0);
        plot.draw(&PathElement::new(
            vec![(-reach, 0.0), (0.0, 0.0)],
            EDGE.stroke_width(6),
        ))?;
    }

    // the footprint at the limit (grey), then at the case's Δt (by |θ|)
    let dims = r.grid.points.len() as f64;
    let scale = Scale {
        lo: 0.0,
        hi: std::f64::consts::PI * dims.sqrt(),
    };
    let pixel = |z: C64| plot.map_coordinate(&(z.re, z.im));
    if let Some(s) = limit_scale {
        let dots = f.z.iter().map(|z| (z * s, AT_LIMIT));
        for (w, colour) in last_per_pixel(dots, pixel) {
            plot.draw(&Circle::new((w.re, w.im), 2, colour.filled()))?;
        }
    }
    // long waves last, so the small-|θ| end near the origin stays visible
    let mut order: Vec<usize> = (0..f.theta_norm.len()).collect();
    order.sort_by(|a, b| f.theta_norm[*b].total_cmp(&f.theta_norm[*a]));
    let dots = order.into_iter().flat_map(|k| {
        let colour = scale.colour(f.theta_norm[k]);
        f.z[k * f.m..(k + 1) * f.m]
            .iter()
            .filter(|z| z.re.is_finite() && z.im.is_finite())
            .map(move |z| (*z, colour))
    });
    for (z, colour) in last_per_pixel(dots, pixel) {
        plot.draw(&Circle::new((z.re, z.im), 2, colour.filled()))?;
    }
    let (px, py) = plot.get_pixel_range();
    colormap::colour_bar(
        root,
        &scale,
        &Bar {
            x: px.end + 40,
            y: (py.start, py.end),
            width: 26,
            label: "|θ| (rad), wavevector of each eigenvalue",
            mark: None,
            ticks: None,
        },
    )?;

    // the legend under the plot
    let y = SIZE.1 as i32 - 26;
    let mut x = 40;
    x += legend_entry(
        root,
        (x, y),
        &Key::Swatch(REGION),
        "stability region of the time method",
    )? + 24;
    x += legend_entry(
        root,
        (x, y),
        &Key::Dot(style::INK),
        &format!("{zname} at the case's Δt = {}", style::num(f.dt, 4)),
    )? + 24;
    if let Some(d) = dt_max(r) {
        legend_entry(
            root,
            (x, y),
            &Key::Dot(AT_LIMIT),
            &format!("at dt_max = {}", style::num(d, 6)),
        )?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn only_the_last_dot_on_each_pixel_is_kept_in_drawing_order() {
        // pixels: the integer part of the real part
        let pixel = |z: C64| (z.re.floor() as i32, 0);
        let dots = [0.1, 1.2, 0.7, 2.5, 1.9, 0.3].map(|x| C64::new(x, 0.0));
        let kept = last_per_pixel(dots.iter().enumerate().map(|(i, z)| (*z, i)), pixel);
        let order: Vec<usize> = kept.iter().map(|(_, i)| *i).collect();
        // pixel 2 last drawn by dot 3, pixel 1 by dot 4, pixel 0 by dot 5
        assert_eq!(order, vec![3, 4, 5]);
    }
}
