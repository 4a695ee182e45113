//! One heat-map panel over a (θa, θb) plane and the pieces shared with the other
//! pictures: the stability-level contour, the worst-wavevector marker, callout
//! boxes and legend rows.
//!
//! A panel is square (both axes span [−π, π]); each grid node is drawn as the
//! cell around it, clipped to the box, coloured by a common [`Scale`], with
//! nodes that have no value in grey. The level curve comes from
//! [`contour::level_segments`] and is drawn black under white, so that it shows
//! on every colour of the map.

use super::colormap::Scale;
use super::contour;
use super::{style, Area, Res};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};
use rayon::prelude::*;
use std::f64::consts::PI;

/// A field on a θ plane, row-major: `values[i * ys.len() + j]` at `(xs[i], ys[j])`.
pub struct Field<'a> {
    /// Coordinates along the horizontal axis.
    pub xs: &'a [f64],
    /// Coordinates along the vertical axis.
    pub ys: &'a [f64],
    /// The values.
    pub values: Vec<f64>,
    /// Horizontal axis label.
    pub x_desc: String,
    /// Vertical axis label.
    pub y_desc: String,
    /// A line above the panel, if any.
    pub caption: Option<String>,
    /// The point to mark, in field coordinates.
    pub marker: Option<(f64, f64)>,
}

/// Label-area sizes of a panel, in pixels.
pub struct Frame {
    /// Left (y tick labels and axis label).
    pub left: u32,
    /// Below (x tick labels and axis label).
    pub bottom: u32,
    /// Above (the caption, if any).
    pub top: u32,
    /// Text size of tick labels; axis labels are 2 px larger.
    pub font: f64,
}

/// Where a panel's plot landed, in image pixels.
pub struct Placed {
    /// Horizontal pixel range of the plotting area.
    pub x: (i32, i32),
    /// Vertical pixel range of the plotting area.
    pub y: (i32, i32),
    /// The marker's pixel, if one was drawn.
    pub marker: Option<(i32, i32)>,
    /// How many contour segments were drawn.
    pub contour: usize,
}

/// Cell edges along an axis: midpoints between nodes, clipped to the box.
fn edges(c: &[f64]) -> Vec<f64> {
    let n = c.len();
    let mut e = Vec::with_capacity(n + 1);
    e.push(c[0].max(-PI));
    for w in c.windows(2) {
        e.push(0.5 * (w[0] + w[1]));
    }
    e.push(c[n - 1].min(PI));
    e
}

/// Draws a field panel whose square plot of `side` pixels has its top-left
/// corner at `origin` (image pixels) on `root`, with the contour of `level`
/// when one is given.
pub fn panel(
    root: &Area,
    origin: (i32, i32),
    side: u32,
    field: &Field,
    scale: &Scale,
    level: Option<f64>,
    frame: &Frame,
) -> Res<Placed> {
    let (ox, oy) = origin;
    let area = root.clone().shrink(
        (ox - frame.left as i32, oy - frame.top as i32),
        (frame.left + side + 14, frame.top + side + frame.bottom),
    );
    let mut chart = ChartBuilder::on(&area)
        .margin_top(frame.top)
        .margin_right(14)
        .x_label_area_size(frame.bottom)
        .y_label_area_size(frame.left)
        .build_cartesian_2d(style::Ticked::theta(), style::Ticked::theta())?;
    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(field.x_desc.clone())
        .y_desc(field.y_desc.clone())
        .x_label_formatter(&style::theta_label)
        .y_label_formatter(&style::theta_label)
        .label_style(style::text(frame.font, style::INK))
        .axis_desc_style(style::text(frame.font + 2.0, style::INK))
        .axis_style(style::INK)
        .draw()?;
    let (ex, ey) = (edges(field.xs), edges(field.ys));
    let ny = field.ys.len();
    // One pixel per screen pixel, each coloured by the cell it falls in: as fast for
    // 513² cells as for 33², where a rectangle per cell would not be.
    let (px, py) = chart.plotting_area().get_pixel_range();
    let (w, h) = (
        (px.end - px.start).max(1) as u32,
        (py.end - py.start).max(1) as u32,
    );
    let cell = |e: &[f64], t: f64| e.partition_point(|x| *x <= t).clamp(1, e.len() - 1) - 1;
    // cell index of every pixel column and row, and a colour table over the scale
    let cols: Vec<usize> = (0..w)
        .map(|u| cell(&ex, -PI + 2.0 * PI * (u as f64 + 0.5) / w as f64))
        .collect();
    let rows: Vec<usize> = (0..h)
        .map(|v| cell(&ey, PI - 2.0 * PI * (v as f64 + 0.5) / h as f64))
        .collect();
    const LUT: usize = 1024;
    let lut: Vec<RGBColor> = (0..LUT)
        .map(|k| scale.colour(scale.lo + (scale.hi - scale.lo) * k as f64 / (LUT - 1) as f64))
        .collect();
    let missing = scale.colour(f64::NAN);
    let span = scale.hi - scale.lo;
    let mut buf = vec![0u8; (w * h * 3) as usize];
    // pixel rows filled by the caller's workers
    buf.par_chunks_mut(w as usize * 3)
        .zip(&rows)
        .for_each(|(line, &j)| {
            for (pixel, &i) in line.chunks_exact_mut(3).zip(&cols) {
                let x = field.values[i * ny + j];
                let c = if x.is_nan() {
                    missing
                } else {
                    let t = if span > 0.0 {
                        (x - scale.lo) / span
                    } else {
                        0.5
                    };
                    lut[((t * (LUT - 1) as f64).round().clamp(0.0, (LUT - 1) as f64)) as usize]
                };
                pixel.copy_from_slice(&[c.0, c.1, c.2]);
            }
        });
    if let Some(img) =
        BitMapElement::<_, plotters::backend::RGBPixel>::with_owned_buffer((-PI, PI), (w, h), buf)
    {
        chart.draw_series(std::iter::once(img))?;
    }
    let segs = level
        .map(|l| contour::level_segments(field.xs, field.ys, &field.values, l))
        .unwrap_or_default();
    for (style, width) in [(BLACK, 4), (WHITE, 2)] {
        chart.draw_series(
            segs.iter()
                .map(|s| PathElement::new(s.to_vec(), style.stroke_width(width))),
        )?;
    }
    let (px, py) = chart.plotting_area().get_pixel_range();
    let (x, y) = ((px.start, px.end - 1), (py.start, py.end - 1));
    root.draw(&Rectangle::new(
        [(x.0, y.0), (x.1, y.1)],
        style::INK.stroke_width(1),
    ))?;
    if let Some(c) = &field.caption {
        let t = style::text(frame.font + 2.0, style::INK)
            .pos(style::anchor(HPos::Center, VPos::Bottom));
        root.draw(&Text::new(c.clone(), ((x.0 + x.1) / 2, y.0 - 8), t))?;
    }
    let marker = field.marker.map(|m| chart.backend_coord(&m));
    if let Some(p) = marker {
        target(root, p)?;
    }
    Ok(Placed {
        x,
        y,
        marker,
        contour: segs.len(),
    })
}

/// The worst-wavevector marker: a crimson ring with a white halo and a dot.
pub fn target(root: &Area, p: (i32, i32)) -> Res {
    root.draw(&Circle::new(p, 9, WHITE.stroke_width(5)))?;
    root.draw(&Circle::new(p, 9, style::WORST.stroke_width(3)))?;
    root.draw(&Circle::new(p, 3, style::WORST.filled()))?;
    Ok(())
}

/// Height of one callout line, in pixels.
const CALLOUT_LINE: i32 = 19;

/// The width and height of the callout box of `lines`.
pub fn callout_size(root: &Area, lines: &[String]) -> (i32, i32) {
    let font = style::text(14.0, style::INK);
    let widest = lines
        .iter()
        .map(|l| root.estimate_text_size(l, &font).map_or(0, |s| s.0))
        .max()
        .unwrap_or(0);
    (widest as i32 + 16, CALLOUT_LINE * lines.len() as i32 + 8)
}

/// A boxed note of a few lines next to the pixel `at`, kept inside `bounds`
/// (x and y pixel ranges): up and right of the point when there is room,
/// flipped left or down otherwise.
pub fn callout(
    root: &Area,
    at: (i32, i32),
    lines: &[String],
    bounds: ((i32, i32), (i32, i32)),
) -> Res {
    let (w, h) = callout_size(root, lines);
    let ((bx0, bx1), (by0, by1)) = bounds;
    let mut x = at.0 + 16;
    if x + w > bx1 - 4 {
        x = at.0 - 16 - w;
    }
    let mut y = at.1 - 16 - h;
    if y < by0 + 4 {
        y = at.1 + 16;
    }
    let x = x.clamp(bx0 + 4, (bx1 - 4 - w).max(bx0 + 4));
    let y = y.clamp(by0 + 4, (by1 - 4 - h).max(by0 + 4));
    callout_box(root, (x, y), lines)
}

/// The callout box of `lines` with its top-left corner at `(x, y)`.
pub fn callout_box(root: &Area, (x, y): (i32, i32), lines: &[String]) -> Res {
    let (w, h) = callout_size(root, lines);
    let font = style::text(14.0, style::INK);
    root.draw(&Rectangle::new(
        [(x, y), (x + w, y + h)],
        WHITE.mix(0.92).filled(),
    ))?;
    root.draw(&Rectangle::new(
        [(x, y), (x + w, y + h)],
        style::WORST.stroke_width(1),
    ))?;
    for (k, l) in lines.iter().enumerate() {
        let t = font.pos(style::anchor(HPos::Left, VPos::Center));
        root.draw(&Text::new(
            l.clone(),
            (x + 8, y + 4 + CALLOUT_LINE * k as i32 + CALLOUT_LINE / 2),
            t,
        ))?;
    }
    Ok(())
}

/// The sample drawn in front of a legend entry.
pub enum Key {
    /// The stability-level contour (black under white).
    Contour,
    /// The worst-wavevector marker.
    Target,
    /// A solid line of a colour.
    Line(RGBColor),
    /// A dashed line of a colour.
    Dashed(RGBColor),
    /// A dotted line of a colour.
    Dotted(RGBColor),
    /// A filled square of a colour.
    Swatch(RGBColor),
    /// A dot of a colour.
    Dot(RGBColor),
}

/// One legend entry at `(x, y)` (left end, vertical centre); returns its width.
pub fn legend_entry(root: &Area, (x, y): (i32, i32), key: &Key, label: &str) -> Res<i32> {
    match key {
        Key::Contour => {
            root.draw(&PathElement::new(
                vec![(x, y), (x + 28, y)],
                BLACK.stroke_width(4),
            ))?;
            root.draw(&PathElement::new(
                vec![(x, y), (x + 28, y)],
                WHITE.stroke_width(2),
            ))?;
        }
        Key::Target => target(root, (x + 14, y))?,
        Key::Line(c) => root.draw(&PathElement::new(
            vec![(x, y), (x + 28, y)],
            c.stroke_width(3),
        ))?,
        Key::Dashed(c) => {
            for k in 0..3 {
                let a = x + 11 * k;
                root.draw(&PathElement::new(
                    vec![(a, y), (a + 6, y)],
                    c.stroke_width(3),
                ))?;
            }
        }
        Key::Dotted(c) => {
            for k in 0..5 {
                let a = x + 1 + 6 * k;
                root.draw(&Rectangle::new([(a, y - 1), (a + 2, y + 1)], c.filled()))?;
            }
        }
        Key::Dot(c) => root.draw(&Circle::new((x + 14, y), 5, c.filled()))?,
        Key::Swatch(c) => {
            root.draw(&Rectangle::new(
                [(x + 6, y - 8), (x + 22, y + 8)],
                c.filled(),
            ))?;
            root.draw(&Rectangle::new(
                [(x + 6, y - 8), (x + 22, y + 8)],
                style::INK.stroke_width(1),
            ))?;
        }
    }
    let font = style::text(14.0, style::INK).pos(style::anchor(HPos::Left, VPos::Center));
    root.draw(&Text::new(label.to_string(), (x + 36, y), font.clone()))?;
    let w = root
        .estimate_text_size(label, &font)
        .map(|s| s.0)
        .unwrap_or(0) as i32;
    Ok(36 + w)
}

/// A row of legend entries starting at `(x, y)`, 28 px apart.
pub fn legend_row(root: &Area, (x, y): (i32, i32), entries: &[(Key, String)]) -> Res {
    let mut at = x;
    for (key, label) in entries {
        at += legend_entry(root, (at, y), key, label)? + 28;
    }
    Ok(())
}
