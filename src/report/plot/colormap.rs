//! The perceptually uniform colour map of every picture and its colour bar.
//!
//! The map is the "viridis" map of matplotlib (S. van der Walt, N. Smith and
//! E. Firing, 2015; released under CC0), reduced here to 17 anchors — entries
//! 0, 16, 32, …, 240 and 255 of its published 256-entry sRGB table — and
//! interpolated linearly in sRGB between them. Lightness rises monotonically
//! from dark blue-violet to yellow, so the map reads correctly in grey scale
//! and for the common colour-vision deficiencies.

use super::{style, Area, Res};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// (position in [0, 1], r, g, b) with r, g, b in [0, 1].
const ANCHORS: [(f64, f64, f64, f64); 17] = [
    (0.0 / 255.0, 0.267004, 0.004874, 0.329415),
    (16.0 / 255.0, 0.282327, 0.094955, 0.417331),
    (32.0 / 255.0, 0.278826, 0.175490, 0.483397),
    (48.0 / 255.0, 0.258965, 0.251537, 0.524736),
    (64.0 / 255.0, 0.229739, 0.322361, 0.545706),
    (80.0 / 255.0, 0.199430, 0.387607, 0.554642),
    (96.0 / 255.0, 0.172719, 0.448791, 0.557885),
    (112.0 / 255.0, 0.149039, 0.508051, 0.557250),
    (128.0 / 255.0, 0.127568, 0.566949, 0.550556),
    (144.0 / 255.0, 0.120638, 0.625828, 0.533488),
    (160.0 / 255.0, 0.157851, 0.683765, 0.501686),
    (176.0 / 255.0, 0.246070, 0.738910, 0.452024),
    (192.0 / 255.0, 0.369214, 0.788888, 0.382914),
    (208.0 / 255.0, 0.515992, 0.831158, 0.294279),
    (224.0 / 255.0, 0.678489, 0.863742, 0.189503),
    (240.0 / 255.0, 0.845561, 0.887322, 0.099702),
    (1.0, 0.993248, 0.906157, 0.143936),
];

/// The colour at `t` ∈ [0, 1] (clamped; NaN gives the "missing" grey).
pub fn colour(t: f64) -> RGBColor {
    if t.is_nan() {
        return style::MISSING;
    }
    let t = t.clamp(0.0, 1.0);
    let k = ANCHORS
        .iter()
        .position(|a| a.0 >= t)
        .unwrap_or(ANCHORS.len() - 1)
        .max(1);
    let (t0, r0, g0, b0) = ANCHORS[k - 1];
    let (t1, r1, g1, b1) = ANCHORS[k];
    let f = ((t - t0) / (t1 - t0)).clamp(0.0, 1.0);
    let mix = |a: f64, b: f64| ((a + f * (b - a)) * 255.0).round().clamp(0.0, 255.0) as u8;
    RGBColor(mix(r0, r1), mix(g0, g1), mix(b0, b1))
}

/// A value range mapped onto the colour map.
#[derive(Debug, Clone, Copy)]
pub struct Scale {
    /// Value at the dark end.
    pub lo: f64,
    /// Value at the light end.
    pub hi: f64,
}

impl Scale {
    /// The range of the finite values, widened when (nearly) constant so that a
    /// flat map still gets a readable bar; `None` without any finite value.
    pub fn of(values: impl IntoIterator<Item = f64>) -> Option<Scale> {
        let (lo, hi) = values
            .into_iter()
            .filter(|v| v.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
                (a.min(v), b.max(v))
            });
        if lo > hi {
            return None;
        }
        let pad = 1e-3 * lo.abs().max(hi.abs()).max(1e-300);
        if hi - lo < pad {
            let mid = 0.5 * (lo + hi);
            return Some(Scale {
                lo: mid - 5.0 * pad,
                hi: mid + 5.0 * pad,
            });
        }
        Some(Scale { lo, hi })
    }

    /// The colour of a value (NaN and ±∞ handled: grey, clamped ends).
    pub fn colour(&self, v: f64) -> RGBColor {
        if v.is_nan() {
            return style::MISSING;
        }
        colour((v - self.lo) / (self.hi - self.lo))
    }
}

/// Where the bar goes and what it says.
pub struct Bar<'a> {
    /// Left edge of the bar, in image pixels.
    pub x: i32,
    /// Top and bottom of the bar, in image pixels.
    pub y: (i32, i32),
    /// Width of the coloured strip.
    pub width: u32,
    /// Label along the bar.
    pub label: &'a str,
    /// A value to mark across the bar (the stability level), if any.
    pub mark: Option<f64>,
    /// Tick values to use instead of automatic ones, if any.
    pub ticks: Option<Vec<f64>>,
}

/// A vertical colour bar with numeric ticks on its right and a rotated label.
pub fn colour_bar(root: &Area, scale: &Scale, bar: &Bar) -> Res {
    let (y0, y1) = bar.y;
    let (ticks, step) = match &bar.ticks {
        Some(t) if t.len() > 1 => (t.clone(), t[1] - t[0]),
        _ => style::nice_ticks(scale.lo, scale.hi, 6),
    };
    let largest = scale.lo.abs().max(scale.hi.abs());
    let labels: Vec<String> = ticks
        .iter()
        .map(|t| style::tick_label(*t, step, largest))
        .collect();
    let tick_font = style::text(14.0, style::INK);
    let widest = labels
        .iter()
        .map(|l| {
            root.estimate_text_size(l, &tick_font)
                .map(|s| s.0)
                .unwrap_or(0)
        })
        .max()
        .unwrap_or(0) as i32;
    let (x0, x1) = (bar.x, bar.x + bar.width as i32);
    let strips = (y1 - y0).max(1);
    for p in 0..strips {
        let v = scale.hi - (scale.hi - scale.lo) * (p as f64 + 0.5) / strips as f64;
        root.draw(&Rectangle::new(
            [(x0, y0 + p), (x1, y0 + p + 1)],
            scale.colour(v).filled(),
        ))?;
    }
    let to_y =
        |v: f64| y1 - ((v - scale.lo) / (scale.hi - scale.lo) * (y1 - y0) as f64).round() as i32;
    for (t, l) in ticks.iter().zip(&labels) {
        let y = to_y(*t);
        root.draw(&PathElement::new(
            vec![(x1, y), (x1 + 6, y)],
            style::INK.stroke_width(1),
        ))?;
        let pos = tick_font.pos(style::anchor(HPos::Left, VPos::Center));
        root.draw(&Text::new(l.clone(), (x1 + 10, y), pos))?;
    }
    if let Some(m) = bar.mark.filter(|m| *m >= scale.lo && *m <= scale.hi) {
        let y = to_y(m);
        root.draw(&PathElement::new(
            vec![(x0 - 4, y), (x1 + 4, y)],
            BLACK.stroke_width(4),
        ))?;
        root.draw(&PathElement::new(
            vec![(x0 - 3, y), (x1 + 3, y)],
            WHITE.stroke_width(2),
        ))?;
    }
    root.draw(&Rectangle::new(
        [(x0, y0), (x1, y1)],
        style::INK.stroke_width(1),
    ))?;
    let label_font = style::text(16.0, style::INK)
        .transform(FontTransform::Rotate270)
        .pos(style::anchor(HPos::Center, VPos::Center));
    let lx = x1 + 10 + widest + 22;
    root.draw(&Text::new(
        bar.label.to_string(),
        (lx, (y0 + y1) / 2),
        label_font,
    ))?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lightness(c: RGBColor) -> f64 {
        0.2126 * c.0 as f64 + 0.7152 * c.1 as f64 + 0.0722 * c.2 as f64
    }

    #[test]
    fn colour_map_ends_at_its_published_anchors() {
        assert_eq!(colour(0.0), RGBColor(68, 1, 84));
        assert_eq!(colour(1.0), RGBColor(253, 231, 37));
        assert_eq!(colour(f64::NAN), style::MISSING);
    }

    #[test]
    fn colour_map_lightness_rises_monotonically() {
        let l: Vec<f64> = (0..=200)
            .map(|i| lightness(colour(i as f64 / 200.0)))
            .collect();
        assert!(l.windows(2).all(|w| w[1] >= w[0] - 0.5), "{l:?}");
    }

    #[test]
    fn constant_values_get_a_widened_scale() {
        let s = Scale::of([1.0, 1.0, f64::NAN]).unwrap();
        assert!(s.lo < 1.0 && s.hi > 1.0);
        assert!(Scale::of([f64::NAN, f64::INFINITY]).is_none());
    }
}
