//! PNG pictures of the results, drawn with plotters' bitmap backend.
//!
//! The pictures only consume what the analyses produced (the same numbers that
//! go into the NPY files): `radius.png` shows the spectral-radius map with its
//! |λ| = 1 + tolerance contour and the worst wavevector ([`radius`]),
//! `footprint.png` the Fourier footprint Δt·eig L(θ) over the time method's
//! stability region (one-step and multistep methods, with the radius map;
//! `footprint`),
//! `limit_polar.png` the largest stable Courant number (or Δt) per wave
//! direction (`limit`), `growth.png` the transient-growth envelope
//! max_θ ‖Gⁿ‖₂ against n (`growth`), `departure.png` and `norm.png` the
//! departure from normality and ‖G‖₂ over the grid (`nonnormal`),
//! `dispersion.png` the phase- and group-speed ratios of the mode that needs
//! the finest resolution against points per wavelength (`dispersion`). The maps
//! share one layout per dimension (`field`). A picture whose data the case
//! did not ask for is skipped. A parameter sweep's figure over one or two
//! varied keys is drawn by [`sweep_chart::write_chart`] (a line chart or a
//! heat map).
//!
//! Text uses DejaVu Sans, embedded in the binary (`assets/fonts/`, licence in
//! `assets/fonts/LICENSE-DejaVu.txt`) and registered with plotters' ab_glyph
//! font table, so no system font library or font file is needed at run time.
//! All pictures share one layout (a title band naming the case, method and
//! stencil over the plot), one palette (`style`) and one colour map
//! (`colormap`).

mod axis;
mod canvas;
mod colormap;
mod contour;
mod dispersion;
mod field;
mod footprint;
mod growth;
mod heatmap;
mod limit;
mod nonnormal;
mod polar;
pub mod radius;
mod style;
pub mod sweep_chart;
mod sweep_lines;
mod sweep_map;
mod sweep_marks;

use super::ReportError;
use crate::analysis::Results;
use crate::problem::Problem;
use ab_glyph::FontRef;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

/// Width and height of every picture, in pixels.
pub const SIZE: (u32, u32) = (1000, 800);

/// Height of the title band at the top of every picture, in pixels.
pub const TITLE_BAND: u32 = 78;

/// The family name the embedded font is registered under.
const FONT: &str = "kgain-sans";

/// DejaVu Sans (Bitstream Vera licence with public-domain DejaVu changes).
static FONT_BYTES: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

type Area<'a> = DrawingArea<canvas::Canvas<'a>, Shift>;
type Res<T = ()> = Result<T, Box<dyn std::error::Error>>;

/// The embedded font, parsed once, and also registered in plotters' font table
/// under [`FONT`] so that every `TextStyle` the charts build resolves to it.
/// (Both are process-wide and immutable after the first call.)
fn font() -> Result<&'static FontRef<'static>, String> {
    static FONT_REF: OnceLock<Result<FontRef<'static>, String>> = OnceLock::new();
    FONT_REF
        .get_or_init(|| {
            let bad = || "the embedded DejaVu Sans font could not be parsed".to_string();
            plotters::style::register_font(FONT, FontStyle::Normal, FONT_BYTES)
                .map_err(|_| bad())?;
            FontRef::try_from_slice(FONT_BYTES).map_err(|_| bad())
        })
        .as_ref()
        .map_err(Clone::clone)
}

/// Draws every picture the results have data for into `dir`; returns the files
/// written, in a fixed order.
pub fn write_pictures(
    dir: &Path,
    problem: &Problem,
    results: &Results,
) -> Result<Vec<PathBuf>, ReportError> {
    let fail = |path: &Path, message: String| ReportError::Plot {
        path: path.display().to_string(),
        message,
    };
    let font = font().map_err(|m| fail(dir, m))?;
    type Job<'r> = Box<dyn Fn(&Area) -> Res + Sync + 'r>;
    let mut jobs: Vec<(&str, Job)> = Vec::new();
    if let Some(rad) = &results.radius {
        jobs.push((
            "radius.png",
            Box::new(move |root| radius::draw(root, problem, results, rad)),
        ));
    }
    if let Some(fp) = &results.footprint {
        jobs.push((
            "footprint.png",
            Box::new(move |root| footprint::draw(root, problem, results, fp)),
        ));
    }
    if let Some(dl) = results.limit.as_ref().map(|l| &l.by_direction) {
        jobs.push((
            "limit_polar.png",
            Box::new(move |root| limit::draw(root, problem, results, dl)),
        ));
    }
    if let Some(g) = &results.growth {
        type Draw = fn(&Area, &Problem, &Results, &crate::analysis::growth::GrowthResult) -> Res;
        let pictures: [(&str, Draw); 3] = [
            ("growth.png", growth::draw),
            ("departure.png", nonnormal::departure),
            ("norm.png", nonnormal::norm),
        ];
        for (name, draw) in pictures {
            jobs.push((name, Box::new(move |root| draw(root, problem, results, g))));
        }
    }
    if let Some(d) = &results.dispersion {
        jobs.push((
            "dispersion.png",
            Box::new(move |root| dispersion::draw(root, problem, results, d)),
        ));
    }
    // each picture draws into its own buffer and encodes on its own: in parallel
    // with each other (and, through the caller, with the NPY files)
    use rayon::prelude::*;
    jobs.par_iter()
        .map(|(name, draw)| {
            let path = dir.join(name);
            render(&path, font, |root| draw(root))
                .map_err(|e| fail(&path, e.to_string()))
                .map(|_| path)
        })
        .collect()
}

/// One picture: a white canvas of [`SIZE`], drawn by `f` into an RGB buffer and
/// encoded as PNG with fast compression (the pictures are flat colour fields, so
/// heavier compression buys little and costs more than the drawing).
fn render(path: &Path, font: &'static FontRef<'static>, f: impl FnOnce(&Area) -> Res) -> Res {
    let mut buf = vec![0u8; (SIZE.0 * SIZE.1 * 3) as usize];
    {
        let root = canvas::Canvas::with_buffer(&mut buf, SIZE, font).into_drawing_area();
        root.fill(&WHITE)?;
        f(&root)?;
        root.present()?;
    }
    let file = std::fs::File::create(path)?;
    let mut enc = png::Encoder::new(std::io::BufWriter::new(file), SIZE.0, SIZE.1);
    enc.set_color(png::ColorType::Rgb);
    enc.set_depth(png::BitDepth::Eight);
    enc.set_compression(png::Compression::Fast);
    let mut writer = enc.write_header()?;
    writer.write_image_data(&buf)?;
    writer.finish()?;
    Ok(())
}

/// The scheme in words without the time step (model, method, stencils,
/// filter, dissipation): the subtitle of sweep charts, whose Δt varies.
pub fn scheme_subtitle(problem: &Problem) -> String {
    scheme_parts(problem).join("  ·  ")
}

/// The scheme in words, for the second title line.
fn scheme_line(problem: &Problem, dt: f64) -> String {
    let mut parts = scheme_parts(problem);
    let mut step = format!("Δt = {}", style::num(dt, 4));
    if let Some(nu) = problem.courant_of(dt) {
        step.push_str(&format!(", ν = {}", style::num(nu, 4)));
    }
    if let Some(r) = problem.diffusion_number_of(dt) {
        step.push_str(&format!(", r = {}", style::num(r, 4)));
    }
    parts.push(step);
    parts.join("  ·  ")
}

fn scheme_parts(problem: &Problem) -> Vec<String> {
    let mut names: Vec<&str> = problem
        .space
        .first
        .iter()
        .map(|s| s.name.as_str())
        .collect();
    names.dedup();
    let mut parts = vec![
        format!("{}-D {}", problem.dims(), problem.system.kind.name()),
        format!("{} in time", problem.method.name),
        format!("{} in space", names.join(" / ")),
    ];
    if let Some(f) = problem.method.spatial_filter() {
        parts.push(f.label());
    }
    if let Some(d) = &problem.space.dissipation {
        parts.push(format!(
            "dissipation p = {}, σ = {}",
            d.order,
            style::num(d.strength, 3)
        ));
    }
    parts
}

/// The title band: the case name and what the picture shows, then the scheme.
fn title_band(root: &Area, problem: &Problem, what: &str, dt: f64) -> Res {
    band(
        root,
        &format!("{} — {what}", problem.name),
        &scheme_line(problem, dt),
    )
}

/// The title band of any picture: a title line, a muted second line, a rule
/// under both and the version tag in the bottom right corner.
fn band(root: &Area, title: &str, subtitle: &str) -> Res {
    let (w, _) = root.dim_in_pixel();
    root.draw(&Text::new(
        title.to_string(),
        (26, 16),
        style::text(23.0, style::INK),
    ))?;
    root.draw(&Text::new(
        subtitle.to_string(),
        (26, 48),
        style::text(15.0, style::MUTED),
    ))?;
    let y = TITLE_BAND as i32 - 1;
    root.draw(&PathElement::new(
        vec![(20, y), (w as i32 - 20, y)],
        style::RULE.stroke_width(1),
    ))?;
    let tag = concat!("kgain ", env!("CARGO_PKG_VERSION"));
    let t = style::text(11.0, style::FAINT).pos(style::anchor(HPos::Right, VPos::Bottom));
    root.draw(&Text::new(tag, (SIZE.0 as i32 - 10, SIZE.1 as i32 - 8), t))?;
    Ok(())
}
