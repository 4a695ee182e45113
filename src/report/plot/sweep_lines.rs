//! The line chart of a sweep: the figure against one numeric key, one line per
//! value of a text key if there is one (legend in a column on the right).
//!
//! The y axis is logarithmic when every finite value is positive and they span
//! more than a factor ten, linear otherwise ([`YAxis`]). Each value is a point
//! joined to its finite neighbours; NaN leaves a gap, +∞ (an unbounded limit)
//! is an arrow at the top edge and −∞ one at the bottom, not joined to the
//! line, each with a note under the plot. The case's own value of the numeric key is a dashed orange line
//! across the plot; where it meets the case's own line (the only line, or the
//! one its text value names) it is marked with the case's diamond, at the
//! height of the drawn line there.

use super::axis::YAxis;
use super::heatmap::Key;
use super::sweep_chart::{Lines, Series};
use super::sweep_marks::{
    case_mark, clip_mark, dashed_column, legend, legend_rows, point, series_style, Sample,
};
use super::{style, Area, Res, SIZE, TITLE_BAND};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// Width of the legend column of several lines, in pixels.
const COLUMN: u32 = 230;
/// Longest line name shown in that column, in characters.
const NAME: usize = 22;

/// The plotted x range: the values with 4 % to spare, or a window around a
/// single value.
pub(super) fn x_range(coords: &[f64]) -> (f64, f64) {
    let (lo, hi) = (coords[0], coords[coords.len() - 1]);
    let m = lo.abs().max(hi.abs());
    let w = hi - lo;
    if w <= 1e-9 * m || w == 0.0 {
        let half = if m > 0.0 { 0.1 * m } else { 0.5 };
        (lo - half, hi + half)
    } else {
        (lo - 0.04 * w, hi + 0.04 * w)
    }
}

/// The y axis for every value of every line.
fn y_axis(series: &[Series]) -> YAxis {
    let finite: Vec<f64> = series
        .iter()
        .flat_map(|s| s.ys.iter().copied())
        .filter(|v| v.is_finite())
        .collect();
    if finite.iter().all(|v| *v > 0.0) {
        YAxis::for_values(&finite)
    } else {
        YAxis::linear(&finite)
    }
}

/// `name` cut to `n` characters with an ellipsis in the middle, so that names
/// with a common prefix stay apart.
fn shorten(name: &str, n: usize) -> String {
    let chars: Vec<char> = name.chars().collect();
    if chars.len() <= n {
        return name.to_string();
    }
    let head = (n - 1) / 2;
    let tail = n - 1 - head;
    let (a, b) = (&chars[..head], &chars[chars.len() - tail..]);
    format!(
        "{}…{}",
        a.iter().collect::<String>(),
        b.iter().collect::<String>()
    )
}

/// The plotted height of line `s` at `x`, interpolated along the drawn line;
/// None in a gap, at or next to a clipped ±∞, or outside the values.
fn height_at(coords: &[f64], s: &Series, axis: &YAxis, x: f64) -> Option<f64> {
    let at = |k: usize| axis.place(s.ys[k]).filter(|_| s.ys[k].is_finite());
    let k = coords.partition_point(|c| *c < x);
    if k < coords.len() && coords[k] == x {
        return at(k);
    }
    if k == 0 || k == coords.len() {
        return None;
    }
    let (a, b) = (at(k - 1)?, at(k)?);
    let f = (x - coords[k - 1]) / (coords[k] - coords[k - 1]);
    Some(a + f * (b - a))
}

/// Draws the chart below the title band.
pub fn draw(root: &Area, l: &Lines) -> Res {
    let many = l.legend_title.is_some();
    let axis = y_axis(&l.series);
    let all = || l.series.iter().flat_map(|s| s.ys.iter());
    let nan = all().filter(|v| v.is_nan()).count();
    let up = all().any(|v| *v == f64::INFINITY);
    let down = all().any(|v| *v == f64::NEG_INFINITY);
    let own = l.series.iter().position(|s| s.own || !many);

    // the notes under the plot
    let mut entries: Vec<(Sample, String)> = Vec::new();
    if !many {
        let (c, shape) = series_style(0);
        entries.push((Sample::Series(c, shape), l.series[0].name.clone()));
    }
    let (xlo, xhi) = x_range(&l.x.coords);
    let case_y =
        l.x.case
            .zip(own)
            .and_then(|(x, k)| height_at(&l.x.coords, &l.series[k], &axis, x));
    match (l.x.case, case_y) {
        (Some(_), Some(_)) => entries.push((Sample::Case, "the case's own point".to_string())),
        (Some(x), None) => entries.push((
            Sample::Key(Key::Dashed(style::CASE)),
            format!(
                "the case's own value, {} = {}",
                l.x.label,
                style::trimmed(x, 6)
            ),
        )),
        _ => {}
    }
    // the arrows' legend sample in the line's colour, or neutral for several
    let arrow = if many { style::INK } else { series_style(0).0 };
    if up {
        let c = arrow;
        entries.push((
            Sample::Clipped(c, true),
            "unbounded (unconditionally stable)".to_string(),
        ));
    }
    if down {
        entries.push((
            Sample::Clipped(arrow, false),
            "−∞: clipped at the bottom".to_string(),
        ));
    }
    if nan > 0 {
        let text = if nan == 1 {
            "no value (1 point): a gap".to_string()
        } else {
            format!("no value ({nan} points): gaps")
        };
        entries.push((Sample::Key(Key::Swatch(style::MISSING)), text));
    }

    let right = if many { COLUMN + 20 } else { 40 };
    let span = (40, SIZE.0 as i32 - 30);
    let labels: Vec<&str> = entries.iter().map(|e| e.1.as_str()).collect();
    let rows = legend_rows(root, span, &labels);
    let area = root.margin(TITLE_BAND + 24, 28 + 24 * rows as u32, 30, right);
    let (lo, hi, ticks) = axis.range();
    let (xticks, xstep) = style::nice_ticks(xlo, xhi, 8);
    let mut chart = ChartBuilder::on(&area)
        .x_label_area_size(58)
        .y_label_area_size(92)
        .build_cartesian_2d(
            style::Ticked::new(xlo..xhi, xticks),
            style::Ticked::new(lo..hi, ticks),
        )?;
    let xlargest = xlo.abs().max(xhi.abs());
    let fmt_x = |v: &f64| style::tick_label(*v, xstep, xlargest);
    let fmt_y = |v: &f64| axis.label(*v);
    style::house_mesh(
        chart
            .configure_mesh()
            .x_desc(l.x.label.clone())
            .y_desc(l.value_label.clone())
            .x_label_formatter(&fmt_x)
            .y_label_formatter(&fmt_y),
    )
    .draw()?;
    let (px, py) = chart.plotting_area().get_pixel_range();
    if let Some(x) = l.x.case {
        let cx = chart.backend_coord(&(x, lo)).0;
        dashed_column(root, cx, (py.start, py.end - 1), style::CASE)?;
    }

    // the lines: the case's own last, on top
    let mut order: Vec<usize> = (0..l.series.len()).collect();
    if let Some(k) = own.filter(|_| many) {
        order.retain(|j| *j != k);
        order.push(k);
    }
    for k in order {
        let s = &l.series[k];
        let (colour, shape) = series_style(k);
        let width = if many && s.own { 4 } else { 2 };
        let placed: Vec<Option<(i32, i32)>> =
            l.x.coords
                .iter()
                .zip(&s.ys)
                .map(|(x, v)| axis.place(*v).map(|y| chart.backend_coord(&(*x, y))))
                .collect();
        // no line to a clipped ±∞: it has no height to join
        let joined: Vec<Option<(i32, i32)>> = placed
            .iter()
            .zip(&s.ys)
            .map(|(p, v)| p.filter(|_| v.is_finite()))
            .collect();
        for w in joined.windows(2) {
            if let (Some(a), Some(b)) = (w[0], w[1]) {
                root.draw(&PathElement::new(vec![a, b], colour.stroke_width(width)))?;
            }
        }
        for (p, v) in placed.iter().zip(&s.ys) {
            match p {
                Some(p) if *v == f64::INFINITY => clip_mark(root, (p.0, p.1 + 3), true, colour)?,
                Some(p) if *v == f64::NEG_INFINITY => {
                    clip_mark(root, (p.0, p.1 - 3), false, colour)?
                }
                Some(p) => point(root, *p, colour, shape)?,
                None => {}
            }
        }
    }
    if let (Some(x), Some(y)) = (l.x.case, case_y) {
        case_mark(root, chart.backend_coord(&(x, y)))?;
    }
    if !all().any(|v| v.is_finite()) {
        let t = style::text(17.0, style::MUTED).pos(style::anchor(HPos::Center, VPos::Center));
        let at = ((px.start + px.end) / 2, (py.start + py.end) / 2);
        root.draw(&Text::new("no finite value", at, t))?;
    }
    if let Some(title) = &l.legend_title {
        column(root, (px.end + 24, py.start), title, l)?;
    }
    legend(root, span, SIZE.1 as i32 - 26, &entries)
}

/// The legend of several lines: the text key, then one row per line, as many
/// as fit above the notes.
fn column(root: &Area, (x, y): (i32, i32), title: &str, l: &Lines) -> Res {
    let head = style::text(15.0, style::INK).pos(style::anchor(HPos::Left, VPos::Top));
    root.draw(&Text::new(shorten(title, NAME + 4), (x, y), head))?;
    let room = ((SIZE.1 as i32 - 110 - y - 30) / 24).max(1) as usize;
    // the case's own line takes a second row
    let room = room
        .saturating_sub(usize::from(l.series.iter().any(|s| s.own)))
        .max(1);
    let shown = if l.series.len() > room {
        (room - 1).max(1)
    } else {
        l.series.len()
    };
    let mut at = y + 40;
    let muted = style::text(13.0, style::MUTED).pos(style::anchor(HPos::Left, VPos::Center));
    for (k, s) in l.series.iter().enumerate().take(shown) {
        let (colour, shape) = series_style(k);
        let name = shorten(&s.name, NAME);
        super::sweep_marks::entry(root, (x, at), &Sample::Series(colour, shape), &name)?;
        if s.own {
            at += 18;
            root.draw(&Text::new("the case's own", (x + 36, at), muted.clone()))?;
        }
        at += 24;
    }
    if shown < l.series.len() {
        let t = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Left, VPos::Center));
        let more = format!("… and {} more", l.series.len() - shown);
        root.draw(&Text::new(more, (x + 36, at), t))?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn long_names_keep_their_ends() {
        assert_eq!(shorten("rk4", 22), "rk4");
        let s = shorten("a-rather-long-method-name-number-13", 12);
        assert_eq!(s, "a-rat…ber-13");
        assert_eq!(s.chars().count(), 12);
    }

    #[test]
    fn a_single_value_gets_a_window_around_it() {
        assert_eq!(x_range(&[0.0]), (-0.5, 0.5));
        let (lo, hi) = x_range(&[2.0, 2.0]);
        assert!(lo < 2.0 && hi > 2.0);
        let (lo, hi) = x_range(&[0.0, 1.0]);
        assert!((lo + 0.04).abs() < 1e-12 && (hi - 1.04).abs() < 1e-12);
    }
}
