//! The heat map of a sweep over two numeric keys: the first on x, the second
//! on y, one cell per combination centred on its values (cell edges halfway
//! between neighbouring values, the outer ones half a spacing out, so uneven
//! spacing is drawn as it is), a colour bar and labelled contour lines.
//!
//! The cells are painted pixel by pixel into one bitmap, coloured on the house
//! scale of the finite values; a cell without a value is grey, +∞ (an
//! unbounded limit) and −∞ are hatched over the top and bottom colour of the
//! scale. Contour levels are 4–8 nice numbers inside the scale
//! ([`levels`]); the colour bar is ticked at the same numbers. The case's own
//! point is the orange diamond, or a dashed line when only one of its two
//! values lies on the map.

use super::colormap::{colour_bar, Bar, Scale};
use super::contour::{level_segments, Segment};
use super::heatmap::Key;
use super::sweep_chart::Map;
use super::sweep_lines::x_range;
use super::sweep_marks::{
    case_mark, dashed_column, dashed_row, hatch, legend, legend_rows, Sample,
};
use super::{style, Area, Res, SIZE, TITLE_BAND};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// Cell edges along an axis: halfway between values, half a spacing beyond
/// the outer ones (a single value gets the window of a line chart).
fn edges(c: &[f64]) -> Vec<f64> {
    let n = c.len();
    if n == 1 {
        let (lo, hi) = x_range(c);
        return vec![lo, hi];
    }
    let mut e = Vec::with_capacity(n + 1);
    e.push(c[0] - 0.5 * (c[1] - c[0]));
    e.extend(c.windows(2).map(|w| 0.5 * (w[0] + w[1])));
    e.push(c[n - 1] + 0.5 * (c[n - 1] - c[n - 2]));
    e
}

/// Contour levels: 4–8 evenly spaced nice numbers strictly inside the scale
/// (fewer only when no spacing gives four), and their spacing.
pub(super) fn levels(scale: &Scale) -> (Vec<f64>, f64) {
    let inside = |target: usize| {
        let (t, step) = style::nice_ticks(scale.lo, scale.hi, target);
        let pad = 1e-9 * (scale.hi - scale.lo);
        let t: Vec<f64> = t
            .into_iter()
            .filter(|v| *v > scale.lo + pad && *v < scale.hi - pad)
            .collect();
        (t, step)
    };
    [6, 5, 7, 8, 4, 9, 10, 12]
        .into_iter()
        .map(inside)
        .find(|(t, _)| (4..=8).contains(&t.len()))
        .unwrap_or_else(|| inside(6))
}

/// The one finite value when every finite value is the same.
fn flat(values: &[f64]) -> Option<f64> {
    let mut finite = values.iter().copied().filter(|v| v.is_finite());
    let first = finite.next()?;
    finite.all(|v| v == first).then_some(first)
}

/// Index of the cell of coordinate `t` between `edges`.
fn cell(edges: &[f64], t: f64) -> usize {
    edges.partition_point(|e| *e <= t).clamp(1, edges.len() - 1) - 1
}

/// Draws the map below the title band.
pub fn draw(root: &Area, m: &Map) -> Res {
    let (ex, ey) = (edges(&m.x.coords), edges(&m.y.coords));
    let scale = Scale::of(m.values.iter().copied());
    let shown = scale.unwrap_or(Scale { lo: 0.0, hi: 1.0 });
    let (levels, step) = scale.map(|s| levels(&s)).unwrap_or_default();
    let count = |f: &dyn Fn(f64) -> bool| m.values.iter().filter(|v| f(**v)).count();
    let nan = count(&|v| v.is_nan());
    let up = count(&|v| v == f64::INFINITY);
    let down = count(&|v| v == f64::NEG_INFINITY);

    let mut entries: Vec<(Sample, String)> = Vec::new();
    let marked = m.x.case.zip(m.y.case);
    if marked.is_some() {
        entries.push((Sample::Case, "the case's own point".to_string()));
    } else if let Some((label, v)) =
        m.x.case
            .map(|v| (&m.x.label, v))
            .or(m.y.case.map(|v| (&m.y.label, v)))
    {
        entries.push((
            Sample::Key(Key::Dashed(style::CASE)),
            format!("the case's own value, {label} = {}", style::trimmed(v, 6)),
        ));
    }
    let contours: Vec<(f64, Vec<Segment>)> = levels
        .iter()
        .map(|l| (*l, level_segments(&m.x.coords, &m.y.coords, &m.values, *l)))
        .filter(|(_, segs)| !segs.is_empty())
        .collect();
    if !contours.is_empty() {
        entries.push((
            Sample::Key(Key::Line(style::INK)),
            "contour lines, labelled with their values".to_string(),
        ));
    }
    if let Some(v) = flat(&m.values) {
        entries.push((
            Sample::Key(Key::Swatch(shown.colour(v))),
            format!("{} everywhere: no contour lines", style::trimmed(v, 6)),
        ));
    }
    let cells = |n: usize| match n {
        1 => "1 cell".to_string(),
        n => format!("{n} cells"),
    };
    if up > 0 {
        entries.push((
            Sample::Hatched(shown.colour(f64::INFINITY)),
            format!("unbounded (unconditionally stable): {}", cells(up)),
        ));
    }
    if down > 0 {
        entries.push((
            Sample::Hatched(shown.colour(f64::NEG_INFINITY)),
            format!("−∞, below the scale: {}", cells(down)),
        ));
    }
    if nan > 0 {
        entries.push((
            Sample::Key(Key::Swatch(style::MISSING)),
            format!("no value: {}", cells(nan)),
        ));
    }

    let span = (40, SIZE.0 as i32 - 30);
    let labels: Vec<&str> = entries.iter().map(|e| e.1.as_str()).collect();
    let rows = legend_rows(root, span, &labels);
    let area = root.margin(TITLE_BAND + 24, 28 + 24 * rows as u32, 30, 190);
    let (xlo, xhi) = (ex[0], ex[ex.len() - 1]);
    let (ylo, yhi) = (ey[0], ey[ey.len() - 1]);
    let (xt, xs) = style::nice_ticks(xlo, xhi, 8);
    let (yt, ys) = style::nice_ticks(ylo, yhi, 8);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(58)
        .y_label_area_size(92)
        .build_cartesian_2d(
            style::Ticked::new(xlo..xhi, xt),
            style::Ticked::new(ylo..yhi, yt),
        )?;
    let (xl, yl) = (xlo.abs().max(xhi.abs()), ylo.abs().max(yhi.abs()));
    let fmt_x = |v: &f64| style::tick_label(*v, xs, xl);
    let fmt_y = |v: &f64| style::tick_label(*v, ys, yl);
    style::house_mesh(
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc(m.x.label.clone())
            .y_desc(m.y.label.clone())
            .x_label_formatter(&fmt_x)
            .y_label_formatter(&fmt_y),
    )
    .draw()?;

    // the cells, pixel by pixel
    let (px, py) = chart.plotting_area().get_pixel_range();
    let (w, h) = ((px.end - px.start).max(1), (py.end - py.start).max(1));
    let ny = m.y.coords.len();
    let colours: Vec<RGBColor> = m.values.iter().map(|v| shown.colour(*v)).collect();
    let cols: Vec<usize> = (0..w)
        .map(|u| cell(&ex, xlo + (xhi - xlo) * (u as f64 + 0.5) / w as f64))
        .collect();
    let rows_of: Vec<usize> = (0..h)
        .map(|v| cell(&ey, yhi - (yhi - ylo) * (v as f64 + 0.5) / h as f64))
        .collect();
    let mut buf = Vec::with_capacity((w * h * 3) as usize);
    for (v, j) in rows_of.iter().enumerate() {
        for (u, i) in cols.iter().enumerate() {
            let k = i * ny + j;
            let mut c = colours[k];
            if m.values[k].is_infinite() {
                c = hatch(c, u, v);
            }
            buf.extend_from_slice(&[c.0, c.1, c.2]);
        }
    }
    if let Some(img) = BitMapElement::<_, plotters::backend::RGBPixel>::with_owned_buffer(
        (xlo, yhi),
        (w as u32, h as u32),
        buf,
    ) {
        chart.draw_series(std::iter::once(img))?;
    }

    // contours, each level labelled once where it is farthest from the frame
    // and from the labels before it
    let largest = shown.lo.abs().max(shown.hi.abs());
    let mut taken: Vec<(i32, i32)> = Vec::new();
    if let Some(p) = marked.map(|p| chart.backend_coord(&p)) {
        taken.push(p);
    }
    let mut tags = Vec::new();
    for (level, segs) in &contours {
        let pix: Vec<[(i32, i32); 2]> = segs
            .iter()
            .map(|s| [chart.backend_coord(&s[0]), chart.backend_coord(&s[1])])
            .collect();
        for (colour, width) in [(WHITE, 4), (style::INK, 2)] {
            for s in &pix {
                root.draw(&PathElement::new(s.to_vec(), colour.stroke_width(width)))?;
            }
        }
        let score = |p: (i32, i32)| {
            let edge = (p.0 - px.start - 30)
                .min(px.end - 30 - p.0)
                .min(p.1 - py.start - 14)
                .min(py.end - 14 - p.1);
            let apart = taken
                .iter()
                .map(|q| (p.0 - q.0).abs().max((p.1 - q.1).abs()))
                .min()
                .unwrap_or(i32::MAX);
            edge.min(apart / 2)
        };
        let best = pix
            .iter()
            .map(|s| ((s[0].0 + s[1].0) / 2, (s[0].1 + s[1].1) / 2))
            .fold(None::<((i32, i32), i32)>, |best, p| {
                let sc = score(p);
                match best {
                    Some((_, b)) if b >= sc => best,
                    _ => Some((p, sc)),
                }
            });
        if let Some((p, _)) = best.filter(|b| b.1 >= 0) {
            taken.push(p);
            tags.push((p, style::tick_label(*level, step, largest)));
        }
    }
    let font = style::text(12.0, style::INK);
    for (p, text) in tags {
        let (tw, th) = root.estimate_text_size(&text, &font)?;
        let (hw, hh) = (tw as i32 / 2 + 3, th as i32 / 2 + 1);
        root.draw(&Rectangle::new(
            [(p.0 - hw, p.1 - hh), (p.0 + hw, p.1 + hh)],
            WHITE.mix(0.85).filled(),
        ))?;
        let t = font.pos(style::anchor(HPos::Center, VPos::Center));
        root.draw(&Text::new(text, p, t))?;
    }

    // the case's own point, or the line of its one value on the map
    match (m.x.case, m.y.case) {
        (Some(x), Some(y)) => case_mark(root, chart.backend_coord(&(x, y)))?,
        (Some(x), None) => {
            let cx = chart.backend_coord(&(x, ylo)).0;
            dashed_column(root, cx, (py.start, py.end - 1), style::CASE)?;
        }
        (None, Some(y)) => {
            let cy = chart.backend_coord(&(xlo, y)).1;
            dashed_row(root, (px.start, px.end - 1), cy, style::CASE)?;
        }
        (None, None) => {}
    }
    root.draw(&Rectangle::new(
        [(px.start, py.start), (px.end - 1, py.end - 1)],
        style::INK.stroke_width(1),
    ))?;
    match scale {
        Some(s) => colour_bar(
            root,
            &s,
            &Bar {
                x: px.end + 34,
                y: (py.start, py.end - 1),
                width: 26,
                label: &m.value_label,
                mark: None,
                ticks: (levels.len() >= 2).then(|| levels.clone()),
            },
        )?,
        None => {
            let t = style::text(17.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
            let at = ((px.start + px.end) / 2, (py.start + py.end) / 2);
            root.draw(&Text::new("no finite value", at, t))?;
        }
    }
    legend(root, span, SIZE.1 as i32 - 26, &entries)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn uneven_values_get_cells_centred_on_them() {
        assert_eq!(edges(&[0.0, 1.0, 3.0]), [-0.5, 0.5, 2.0, 4.0]);
        let one = edges(&[2.0]);
        assert!(one[0] < 2.0 && one[1] > 2.0);
    }

    #[test]
    fn four_to_eight_nice_levels_lie_inside_the_scale() {
        for (lo, hi) in [(0.0, 1.0), (0.13, 0.97), (-3.0, 250.0), (1.0, 1.0001)] {
            let (l, step) = levels(&Scale { lo, hi });
            assert!((4..=8).contains(&l.len()), "{lo}..{hi}: {l:?}");
            assert!(l.iter().all(|v| *v > lo && *v < hi), "{l:?}");
            assert!(l
                .windows(2)
                .all(|w| ((w[1] - w[0]) - step).abs() < 1e-9 * step));
        }
    }
}
