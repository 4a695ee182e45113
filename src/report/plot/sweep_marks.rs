//! The marks of the sweep charts and their legend: the case's own point (an
//! orange diamond with a white halo, unlike any data marker), the point
//! shapes and colours of the lines, the arrow of a value clipped at an edge of
//! the plot, and legend rows that wrap at the width of the picture.
//!
//! The line colours are the house curve blue and bound purple with four of a
//! colour-blind-safe set (from memory, after M. Okabe and K. Ito's 2008
//! palette); its orange and vermillion are left out because orange belongs to
//! the case's own point. Shapes cycle with a
//! different period than colours, so twelve lines stay distinguishable.

use super::heatmap::{legend_entry, Key};
use super::{style, Area, Res};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// Line colours, in the order lines get them.
const PALETTE: [RGBColor; 6] = [
    style::CURVE,
    RGBColor(0x00, 0x9e, 0x73),
    RGBColor(0xcc, 0x79, 0xa7),
    RGBColor(0x56, 0xb4, 0xe9),
    RGBColor(0x21, 0x25, 0x29),
    style::BOUND,
];

/// The point shape of a line.
#[derive(Debug, Clone, Copy)]
pub enum Shape {
    /// A filled circle.
    Circle,
    /// A filled square.
    Square,
    /// A filled triangle pointing up.
    Triangle,
    /// A filled triangle pointing down.
    Nabla,
}

/// Colour and point shape of line `k`.
pub fn series_style(k: usize) -> (RGBColor, Shape) {
    let shapes = [Shape::Circle, Shape::Square, Shape::Triangle, Shape::Nabla];
    (PALETTE[k % PALETTE.len()], shapes[k % shapes.len()])
}

/// A data point of a line at pixel `p`.
pub fn point(root: &Area, p: (i32, i32), colour: RGBColor, shape: Shape) -> Res {
    let (x, y) = p;
    match shape {
        Shape::Circle => root.draw(&Circle::new(p, 4, colour.filled()))?,
        Shape::Square => root.draw(&Rectangle::new(
            [(x - 4, y - 4), (x + 4, y + 4)],
            colour.filled(),
        ))?,
        Shape::Triangle => root.draw(&Polygon::new(
            vec![(x, y - 6), (x + 5, y + 4), (x - 5, y + 4)],
            colour.filled(),
        ))?,
        Shape::Nabla => root.draw(&Polygon::new(
            vec![(x, y + 6), (x + 5, y - 4), (x - 5, y - 4)],
            colour.filled(),
        ))?,
    }
    Ok(())
}

/// The case's own point: an orange diamond with a white halo and an ink rim.
pub fn case_mark(root: &Area, (x, y): (i32, i32)) -> Res {
    let diamond = |r: i32| vec![(x, y - r), (x + r, y), (x, y + r), (x - r, y)];
    root.draw(&Polygon::new(diamond(12), WHITE.filled()))?;
    root.draw(&Polygon::new(diamond(9), style::CASE.filled()))?;
    let mut rim = diamond(9);
    rim.push((x, y - 9));
    root.draw(&PathElement::new(rim, style::INK.stroke_width(1)))?;
    Ok(())
}

/// A value clipped at the top (`up`) or bottom edge: an open arrow head at
/// pixel `p` pointing off the plot.
pub fn clip_mark(root: &Area, (x, y): (i32, i32), up: bool, colour: RGBColor) -> Res {
    let s = if up { 1 } else { -1 };
    let head = vec![(x - 6, y + 8 * s), (x, y), (x + 6, y + 8 * s)];
    root.draw(&PathElement::new(head.clone(), WHITE.stroke_width(5)))?;
    root.draw(&PathElement::new(head, colour.stroke_width(2)))?;
    Ok(())
}

/// A vertical dashed line from `y.0` to `y.1` at column `x`.
pub fn dashed_column(root: &Area, x: i32, y: (i32, i32), colour: RGBColor) -> Res {
    let mut a = y.0;
    while a < y.1 {
        let b = (a + 9).min(y.1);
        root.draw(&PathElement::new(
            vec![(x, a), (x, b)],
            colour.stroke_width(2),
        ))?;
        a += 15;
    }
    Ok(())
}

/// A horizontal dashed line from `x.0` to `x.1` at row `y`.
pub fn dashed_row(root: &Area, x: (i32, i32), y: i32, colour: RGBColor) -> Res {
    let mut a = x.0;
    while a < x.1 {
        let b = (a + 9).min(x.1);
        root.draw(&PathElement::new(
            vec![(a, y), (b, y)],
            colour.stroke_width(2),
        ))?;
        a += 15;
    }
    Ok(())
}

/// A diagonal hatch over a cell of `c`, drawn into an RGB pixel buffer: the
/// mark of values clipped at an end of the colour scale.
pub fn hatch(c: RGBColor, u: usize, v: usize) -> RGBColor {
    if (u + v) % 9 < 2 {
        RGBColor(255, 255, 255)
    } else {
        c
    }
}

/// The sample in front of a legend text.
pub enum Sample {
    /// One of the house keys.
    Key(Key),
    /// The case's own point.
    Case,
    /// A line of a colour with its point shape.
    Series(RGBColor, Shape),
    /// An arrow clipped at the top (true) or bottom edge.
    Clipped(RGBColor, bool),
    /// A hatched swatch over a colour.
    Hatched(RGBColor),
}

/// Width of the sample in front of the text, in pixels.
const SAMPLE: i32 = 36;
/// Gap between entries of a row.
const GAP: i32 = 26;

/// Draws one entry at `(x, y)` (left end, vertical centre); returns its width.
pub fn entry(root: &Area, (x, y): (i32, i32), sample: &Sample, label: &str) -> Res<i32> {
    let custom = |root: &Area| -> Res {
        match sample {
            Sample::Key(_) => {}
            Sample::Case => case_mark(root, (x + 14, y))?,
            Sample::Series(c, shape) => {
                root.draw(&PathElement::new(
                    vec![(x, y), (x + 28, y)],
                    c.stroke_width(2),
                ))?;
                point(root, (x + 14, y), *c, *shape)?;
            }
            Sample::Clipped(c, up) => {
                let dy = if *up { -4 } else { 4 };
                clip_mark(root, (x + 14, y + dy), *up, *c)?
            }
            Sample::Hatched(c) => {
                for v in 0..16 {
                    for u in 0..16 {
                        let h = hatch(*c, u, v);
                        let p = (x + 6 + u as i32, y - 8 + v as i32);
                        root.draw_pixel(p, &h)?;
                    }
                }
                root.draw(&Rectangle::new(
                    [(x + 6, y - 8), (x + 22, y + 8)],
                    style::INK.stroke_width(1),
                ))?;
            }
        }
        Ok(())
    };
    if let Sample::Key(k) = sample {
        return legend_entry(root, (x, y), k, label);
    }
    custom(root)?;
    let font = style::text(14.0, style::INK).pos(style::anchor(HPos::Left, VPos::Center));
    root.draw(&Text::new(label.to_string(), (x + SAMPLE, y), font))?;
    Ok(SAMPLE + text_width(root, label))
}

/// The width of a legend text, in pixels.
fn text_width(root: &Area, label: &str) -> i32 {
    root.estimate_text_size(label, &style::text(14.0, style::INK))
        .map_or(0, |s| s.0 as i32)
}

/// Entries in rows between `x.0` and `x.1`, the last row centred on `bottom`,
/// wrapped to as many rows as needed (each row 24 px above the next).
pub fn legend(root: &Area, x: (i32, i32), bottom: i32, entries: &[(Sample, String)]) -> Res {
    let labels: Vec<&str> = entries.iter().map(|e| e.1.as_str()).collect();
    let rows = wrap(root, x, &labels);
    let n = rows.len() as i32;
    for (r, row) in rows.iter().enumerate() {
        let y = bottom - 24 * (n - 1 - r as i32);
        let mut at = x.0;
        for k in row {
            let (sample, label) = &entries[*k];
            at += entry(root, (at, y), sample, label)? + GAP;
        }
    }
    Ok(())
}

/// How many rows [`legend`] needs for these labels between `x.0` and `x.1`.
pub fn legend_rows(root: &Area, x: (i32, i32), labels: &[&str]) -> i32 {
    wrap(root, x, labels).len() as i32
}

/// The entries of each legend row: a new row when the next would pass `x.1`.
fn wrap(root: &Area, x: (i32, i32), labels: &[&str]) -> Vec<Vec<usize>> {
    let mut rows: Vec<Vec<usize>> = vec![vec![]];
    let mut at = x.0;
    for (k, label) in labels.iter().enumerate() {
        let w = SAMPLE + text_width(root, label);
        let row = rows.last_mut().expect("non-empty");
        if !row.is_empty() && at + w > x.1 {
            rows.push(vec![k]);
            at = x.0 + w + GAP;
        } else {
            row.push(k);
            at += w + GAP;
        }
    }
    rows
}
