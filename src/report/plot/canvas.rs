//! The drawing surface: plotters' bitmap backend with its own text renderer.
//!
//! Shapes go straight to [`BitMapBackend`]. Text is laid out and rasterised
//! here with ab_glyph from the embedded font: each glyph's outline is placed at
//! the pen position plus its left side bearing, on a common baseline, with
//! pair kerning, and its coverage is blended into the bitmap. (plotters'
//! generic glyph path drops the side bearings and puts the baseline half an em
//! below the anchor, which misplaces narrow glyphs such as "." and "-".)
//!
//! Anchors follow plotters' convention for the box of the text: `Top` is the
//! ascender line, `Bottom` the descender line, and `Center` centres the
//! capital height on the anchor, which is what a tick label beside a tick
//! needs. Rotations by quarter turns turn the finished layout about the anchor.

use ab_glyph::{point, Font, FontRef, PxScale, ScaleFont};
use plotters::prelude::*;
use plotters_backend::text_anchor::{HPos, VPos};
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingErrorKind,
};
use plotters_bitmap::BitMapBackendError;

/// A PNG file being drawn.
pub struct Canvas<'a> {
    inner: BitMapBackend<'a>,
    font: &'static FontRef<'static>,
}

impl<'a> Canvas<'a> {
    /// A canvas drawing into an RGB buffer of `size` pixels.
    pub fn with_buffer(
        buf: &'a mut [u8],
        size: (u32, u32),
        font: &'static FontRef<'static>,
    ) -> Self {
        Canvas {
            inner: BitMapBackend::with_buffer(buf, size),
            font,
        }
    }
}

/// The laid-out glyph coverage of a text: pixels relative to the start of the
/// baseline, and the metrics needed to anchor it.
struct Layout {
    pixels: Vec<(i32, i32, f32)>,
    width: f32,
    ascent: f32,
    descent: f32,
    cap: f32,
}

fn layout(font: &FontRef<'static>, size: f64, text: &str, raster: bool) -> Layout {
    let scaled = font.as_scaled(PxScale::from(size as f32));
    let mut pen = 0.0f32;
    let mut prev = None;
    let mut pixels = Vec::new();
    for c in text.chars() {
        let id = scaled.glyph_id(c);
        if let Some(p) = prev {
            pen += scaled.kern(p, id);
        }
        if raster {
            let glyph = id.with_scale_and_position(scaled.scale(), point(pen, 0.0));
            if let Some(outline) = font.outline_glyph(glyph) {
                let b = outline.px_bounds();
                outline.draw(|x, y, cov| {
                    pixels.push((b.min.x as i32 + x as i32, b.min.y as i32 + y as i32, cov));
                });
            }
        }
        pen += scaled.h_advance(id);
        prev = Some(id);
    }
    let cap = font
        .outline_glyph(scaled.scaled_glyph('H'))
        .map(|o| -o.px_bounds().min.y)
        .unwrap_or(0.7 * size as f32);
    Layout {
        pixels,
        width: pen,
        ascent: scaled.ascent(),
        descent: scaled.descent(),
        cap,
    }
}

impl DrawingBackend for Canvas<'_> {
    type ErrorType = BitMapBackendError;

    fn get_size(&self) -> (u32, u32) {
        self.inner.get_size()
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.ensure_prepared()
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.present()
    }

    fn draw_pixel(
        &mut self,
        p: BackendCoord,
        c: BackendColor,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_pixel(p, c)
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_line(from, to, style)
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        ul: BackendCoord,
        br: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_rect(ul, br, style, fill)
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_path(path, style)
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        c: BackendCoord,
        r: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.draw_circle(c, r, style, fill)
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.fill_polygon(vert, style)
    }

    fn blit_bitmap(
        &mut self,
        pos: BackendCoord,
        size: (u32, u32),
        src: &[u8],
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.blit_bitmap(pos, size, src)
    }

    fn draw_text<T: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &T,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        let color = style.color();
        if color.alpha == 0.0 || text.is_empty() {
            return Ok(());
        }
        let l = layout(self.font, style.size(), text, true);
        let anchor = style.anchor();
        let dx = match anchor.h_pos {
            HPos::Left => 0.0,
            HPos::Center => -0.5 * l.width,
            HPos::Right => -l.width,
        };
        let dy = match anchor.v_pos {
            VPos::Top => l.ascent,
            VPos::Center => 0.5 * l.cap,
            VPos::Bottom => l.descent,
        };
        let (dx, dy) = (dx.round() as i32, dy.round() as i32);
        let turn = style.transform();
        for (x, y, cov) in l.pixels {
            if cov <= 0.0 {
                continue;
            }
            let (tx, ty) = turn.transform(x + dx, y + dy);
            let c = BackendColor {
                alpha: color.alpha * cov.min(1.0) as f64,
                rgb: color.rgb,
            };
            self.inner.draw_pixel((pos.0 + tx, pos.1 + ty), c)?;
        }
        Ok(())
    }

    fn estimate_text_size<T: BackendTextStyle>(
        &self,
        text: &str,
        style: &T,
    ) -> Result<(u32, u32), DrawingErrorKind<Self::ErrorType>> {
        let l = layout(self.font, style.size(), text, false);
        Ok((l.width.ceil() as u32, (l.ascent - l.descent).ceil() as u32))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::plot::style;

    const W: u32 = 240;
    const H: u32 = 60;

    /// Draws `text` anchored at `at` and returns the dark pixels.
    fn ink(text: &str, at: (i32, i32), anchor: (HPos, VPos)) -> Vec<(i32, i32)> {
        let font = super::super::font().expect("embedded font");
        let mut buf = vec![255u8; (W * H * 3) as usize];
        {
            let root = Canvas::with_buffer(&mut buf, (W, H), font).into_drawing_area();
            let t = style::text(20.0, style::INK).pos(style::anchor(anchor.0, anchor.1));
            root.draw(&Text::new(text, at, t)).expect("text drawn");
            root.present().expect("presented");
        }
        (0..H as i32)
            .flat_map(|y| (0..W as i32).map(move |x| (x, y)))
            .filter(|&(x, y)| buf[((y as u32 * W + x as u32) * 3) as usize] < 128)
            .collect()
    }

    #[test]
    fn centred_capitals_sit_on_the_anchor() {
        let px = ink("HH", (120, 30), (HPos::Center, VPos::Center));
        let (x0, x1) = (
            px.iter().map(|p| p.0).min().unwrap(),
            px.iter().map(|p| p.0).max().unwrap(),
        );
        let (y0, y1) = (
            px.iter().map(|p| p.1).min().unwrap(),
            px.iter().map(|p| p.1).max().unwrap(),
        );
        assert!(((x0 + x1) - 240).abs() <= 3, "columns {x0}..{x1}");
        assert!(((y0 + y1) - 60).abs() <= 2, "rows {y0}..{y1}");
    }

    #[test]
    fn narrow_glyphs_keep_their_side_bearings() {
        // "1.5": the point must stand apart from both digits, on their baseline
        let px = ink("1.5", (20, 30), (HPos::Left, VPos::Center));
        let mut cols: Vec<i32> = px.iter().map(|p| p.0).collect();
        cols.sort_unstable();
        cols.dedup();
        let clusters = 1 + cols.windows(2).filter(|w| w[1] > w[0] + 1).count();
        assert_eq!(clusters, 3, "columns {cols:?}");
        let bottom = px.iter().map(|p| p.1).max().unwrap();
        let gap = cols.windows(2).position(|w| w[1] > w[0] + 1).unwrap();
        let dot_col = cols[gap + 1];
        let dot_bottom = px
            .iter()
            .filter(|p| p.0 == dot_col)
            .map(|p| p.1)
            .max()
            .unwrap();
        assert!(
            (dot_bottom - bottom).abs() <= 1,
            "dot ends at {dot_bottom}, digits at {bottom}"
        );
    }

    #[test]
    fn estimated_width_matches_the_drawn_width() {
        let font = super::super::font().expect("embedded font");
        let text = "spectral radius |λ|max";
        let l = layout(font, 20.0, text, false);
        let px = ink(text, (10, 30), (HPos::Left, VPos::Center));
        let drawn = px.iter().map(|p| p.0).max().unwrap() - px.iter().map(|p| p.0).min().unwrap();
        assert!(
            (l.width - drawn as f32).abs() < 4.0,
            "{} vs {drawn}",
            l.width
        );
    }
}
