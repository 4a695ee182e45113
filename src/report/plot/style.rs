//! The look shared by every picture: the palette, text styles, number
//! formatting, "nice" tick positions and the θ axes in multiples of π/2.
//!
//! Tick positions follow the usual 1–2–2.5–5 × 10^k rule for a target count,
//! computed from integer multiples of the step so that no rounding accumulates.

use super::FONT;
use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};
use plotters::prelude::*;
use plotters::style::text_anchor::Pos;
use plotters::style::text_anchor::{HPos, VPos};
use std::f64::consts::PI;
use std::ops::Range;

/// Text, axes and tick marks.
pub const INK: RGBColor = RGBColor(0x21, 0x25, 0x29);
/// Secondary text (subtitles, notes).
pub const MUTED: RGBColor = RGBColor(0x57, 0x5f, 0x68);
/// Tertiary text (the version tag).
pub const FAINT: RGBColor = RGBColor(0x9a, 0xa0, 0xa6);
/// Rules and light grid lines.
pub const RULE: RGBColor = RGBColor(0xd5, 0xd9, 0xde);
/// Cells without a value (the eigenvalue kernel failed there).
pub const MISSING: RGBColor = RGBColor(0xbf, 0xbf, 0xbf);
/// The data curve of line and polar plots.
pub const CURVE: RGBColor = RGBColor(0x1f, 0x4e, 0x8c);
/// The shaded stable region of the polar plot (the curve colour at 10 % on white).
pub const CURVE_FILL: RGBColor = RGBColor(0xe9, 0xed, 0xf4);
/// The case's own value (its Δt or Courant number).
pub const CASE: RGBColor = RGBColor(0xe0, 0x74, 0x0b);
/// The worst wavevector or most restrictive direction.
pub const WORST: RGBColor = RGBColor(0xc2, 0x1f, 0x3a);
/// A bound drawn for comparison (the Kreiss lower bound of the growth curve).
pub const BOUND: RGBColor = RGBColor(0x6a, 0x3d, 0x9a);

/// A linear axis over `[lo, hi]` whose tick marks are exactly `ticks` (no
/// light grid lines).
#[derive(Debug, Clone)]
pub struct Ticked {
    lo: f64,
    hi: f64,
    ticks: Vec<f64>,
}

impl Ticked {
    /// An axis over `range` with these ticks.
    pub fn new(range: Range<f64>, ticks: Vec<f64>) -> Ticked {
        Ticked {
            lo: range.start,
            hi: range.end,
            ticks,
        }
    }

    /// A θ axis over [−π, π] ticked at the multiples of π/2.
    pub fn theta() -> Ticked {
        Ticked::new(-PI..PI, theta_ticks())
    }
}

impl Ranged for Ticked {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;

    fn map(&self, v: &f64, limit: (i32, i32)) -> i32 {
        let f = (v - self.lo) / (self.hi - self.lo);
        limit.0 + (f * (limit.1 - limit.0) as f64).round() as i32
    }

    fn key_points<H: KeyPointHint>(&self, hint: H) -> Vec<f64> {
        if hint.weight().allow_light_points() {
            Vec::new()
        } else {
            self.ticks.clone()
        }
    }

    fn range(&self) -> Range<f64> {
        self.lo..self.hi
    }
}

/// The embedded font at a pixel size and colour.
pub fn text(size: f64, color: RGBColor) -> TextStyle<'static> {
    (FONT, size).into_font().color(&color)
}

/// A text anchor.
pub fn anchor(h: HPos, v: VPos) -> Pos {
    Pos::new(h, v)
}

/// `x` with `sig` significant digits: fixed notation for moderate magnitudes,
/// scientific otherwise; a true minus sign; "∞" and "—" for non-finite values.
pub fn num(x: f64, sig: usize) -> String {
    if x.is_nan() {
        return "—".to_string();
    }
    if x.is_infinite() {
        return if x > 0.0 { "∞" } else { "−∞" }.to_string();
    }
    if x == 0.0 {
        return "0".to_string();
    }
    let mag = x.abs().log10().floor() as i32;
    let s = if (-3..5).contains(&mag) {
        let decimals = (sig as i32 - 1 - mag).max(0) as usize;
        format!("{x:.decimals$}")
    } else {
        let e = format!("{:.*e}", sig.saturating_sub(1), x);
        match e.split_once('e') {
            Some((m, p)) => return format!("{}×10{}", m.replace('-', "−"), superscript(p)),
            None => e,
        }
    };
    s.replace('-', "−")
}

/// [`num`] without trailing zeros after the decimal point ("0.0010" → "0.001").
pub fn trimmed(x: f64, sig: usize) -> String {
    let s = num(x, sig);
    match s.split_once('×') {
        Some((m, e)) if m.contains('.') => {
            format!("{}×{e}", m.trim_end_matches('0').trim_end_matches('.'))
        }
        None if s.contains('.') => s.trim_end_matches('0').trim_end_matches('.').to_string(),
        _ => s,
    }
}

/// 10ᵏ in superscript digits ("10⁻⁵").
pub fn power_of_ten(k: i32) -> String {
    format!("10{}", superscript(&k.to_string()))
}

/// An integer exponent in superscript digits ("−5" → "⁻⁵").
fn superscript(p: &str) -> String {
    let digits = p
        .trim_start_matches('+')
        .parse::<i64>()
        .unwrap_or(0)
        .to_string();
    digits
        .chars()
        .map(|c| match c {
            '-' => '⁻',
            '0' => '⁰',
            '1' => '¹',
            '2' => '²',
            '3' => '³',
            '4' => '⁴',
            '5' => '⁵',
            '6' => '⁶',
            '7' => '⁷',
            '8' => '⁸',
            _ => '⁹',
        })
        .collect()
}

/// Evenly spaced "nice" ticks covering `[lo, hi]`, about `target` of them, and
/// their step.
pub fn nice_ticks(lo: f64, hi: f64, target: usize) -> (Vec<f64>, f64) {
    let span = (hi - lo).abs().max(f64::MIN_POSITIVE);
    let target = target.max(2) as f64;
    let mag = 10f64.powf((span / target).log10().floor());
    let count = |step: f64| ((hi / step + 1e-9).floor() - (lo / step - 1e-9).ceil() + 1.0).max(0.0);
    // the candidate step whose tick count is closest to the target (the larger on a tie)
    let step = [10.0, 5.0, 2.5, 2.0, 1.0]
        .iter()
        .map(|m| m * mag)
        .min_by(|a, b| {
            (count(*a) - target)
                .abs()
                .total_cmp(&(count(*b) - target).abs())
        })
        .unwrap_or(mag);
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    let ticks = (first..=last).map(|k| k as f64 * step).collect();
    (ticks, step)
}

/// A tick label for ticks `step` apart: as many decimals as the step needs,
/// scientific notation for very large or small magnitudes.
pub fn tick_label(v: f64, step: f64, largest: f64) -> String {
    if v.abs() < step * 1e-6 {
        return "0".to_string();
    }
    if !(1e-3..1e5).contains(&largest) {
        return num(v, 3);
    }
    let decimals = (0..10)
        .find(|&d| {
            let scaled = step * 10f64.powi(d);
            (scaled - scaled.round()).abs() < 1e-6 * scaled.max(1.0)
        })
        .unwrap_or(10) as usize;
    format!("{v:.decimals$}").replace('-', "−")
}

/// Tick positions of a θ axis over [−π, π]: the multiples of π/2.
pub fn theta_ticks() -> Vec<f64> {
    vec![-PI, -PI / 2.0, 0.0, PI / 2.0, PI]
}

/// The label of a θ tick.
pub fn theta_label(v: &f64) -> String {
    let q = (v / (PI / 2.0)).round() as i64;
    match q {
        0 => "0".to_string(),
        2 => "π".to_string(),
        -2 => "−π".to_string(),
        1 => "π/2".to_string(),
        -1 => "−π/2".to_string(),
        _ => num(*v, 3),
    }
}

/// A wavevector as "(θ1, θ2, …)" with three decimals (a 1-D one without
/// parentheses).
pub fn theta_tuple(theta: &[f64]) -> String {
    let parts: Vec<String> = theta.iter().map(|t| num_fixed(*t, 3)).collect();
    match parts.len() {
        1 => parts[0].clone(),
        _ => format!("({})", parts.join(", ")),
    }
}

/// Fixed notation with `decimals` decimals and a true minus sign.
pub fn num_fixed(x: f64, decimals: usize) -> String {
    format!("{x:.decimals$}").replace('-', "−")
}

/// Greedy word wrap at `width` characters.
pub fn wrap(s: &str, width: usize) -> Vec<String> {
    let mut lines: Vec<String> = vec![String::new()];
    for w in s.split_whitespace() {
        let cur = lines.last_mut().expect("non-empty");
        if !cur.is_empty() && cur.chars().count() + 1 + w.chars().count() > width {
            lines.push(w.to_string());
        } else {
            if !cur.is_empty() {
                cur.push(' ');
            }
            cur.push_str(w);
        }
    }
    lines
}

/// The house mesh: tick labels, axis titles and axis lines in ink, bold grid
/// lines as light rules, no minor grid lines.
pub fn house_mesh<'m, 'a, 'b, X, Y, DB>(
    mesh: &'m mut plotters::chart::MeshStyle<'a, 'b, X, Y, DB>,
) -> &'m mut plotters::chart::MeshStyle<'a, 'b, X, Y, DB>
where
    X: Ranged<ValueType: std::fmt::Debug>,
    Y: Ranged<ValueType: std::fmt::Debug>,
    DB: DrawingBackend,
{
    mesh.label_style(text(15.0, INK))
        .axis_desc_style(text(17.0, INK))
        .axis_style(INK)
        .bold_line_style(RULE.stroke_width(1))
        .light_line_style(TRANSPARENT)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nice_ticks_cover_the_range_with_round_steps() {
        let (t, step) = nice_ticks(0.31, 1.02, 6);
        assert_eq!(step, 0.1);
        assert!((t[0] - 0.4).abs() < 1e-12 && (t.last().unwrap() - 1.0).abs() < 1e-12);
        let (_, step) = nice_ticks(0.0, 7.0, 4);
        assert_eq!(step, 2.0);
    }

    #[test]
    fn tick_labels_carry_the_decimals_of_the_step() {
        assert_eq!(tick_label(0.25, 0.25, 1.0), "0.25");
        assert_eq!(tick_label(0.5, 0.25, 1.0), "0.50");
        assert_eq!(tick_label(-2.0, 1.0, 3.0), "−2");
        assert_eq!(tick_label(1e-12, 0.1, 1.0), "0");
    }

    #[test]
    fn numbers_use_scientific_notation_only_for_extreme_magnitudes() {
        assert_eq!(num(0.123456789, 4), "0.1235");
        assert_eq!(num(451.5, 4), "451.5");
        assert_eq!(num(1.5e-5, 3), "1.50×10⁻⁵");
        assert_eq!(num(-2.0e7, 2), "−2.0×10⁷");
        assert_eq!(num(f64::INFINITY, 3), "∞");
        assert_eq!(theta_label(&-PI), "−π");
        assert_eq!(trimmed(1e-3, 3), "0.001");
        assert_eq!(trimmed(1.0010004, 6), "1.001");
        assert_eq!(trimmed(2.0e-7, 3), "2×10⁻⁷");
        assert_eq!(trimmed(450.0, 3), "450");
    }
}
