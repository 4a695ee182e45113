//! `dispersion.png`: phase- and group-speed ratios of one physical mode
//! against the points per wavelength, for a few wave directions.
//!
//! The mode shown is the one that needs the most points per wavelength for
//! its phase error to stay within the tolerance (the largest finite
//! semi-discrete requirement, else the largest fully discrete one): the mode
//! that sets the resolution of the grid. Left panel: c_num/c_exact, the
//! semi-discrete ratio solid and the fully discrete one dashed in the same
//! colour; right panel: the semi-discrete group-speed ratio along the exact
//! group velocity. Both share a logarithmic axis of 2π/max_d |θ_d|, fine
//! resolution on the left, the grid limit on the right. The ratio 1 is a thin
//! line inside the lightly shaded band 1 ± tolerance, and the required points
//! per wavelength (worst direction) a vertical crimson line.
//!
//! Directions: ±x in 1-D; in 2-D the stored directions (10° apart) nearest
//! 0°, 15°, 30° and 45°; in 3-D those nearest the x axis, the face diagonal
//! and the body diagonal; in every case also the worst direction of the mode,
//! always crimson and drawn first and widest, so that a direction whose curve
//! coincides with it still shows on top. NaN (the mode does not propagate there) leaves gaps;
//! ratios beyond the axis (phase outside [0, 1.5], group outside [−1, 1.5])
//! are drawn at its edge and counted in a note. A case without a propagating
//! mode but with a damped one (pure diffusion) gets one wide panel of the
//! decay-rate ratio Im ω_num / Im ω_exact instead, headed "diffusion"; a case
//! with neither gets a note.

mod panel;

use super::heatmap::{legend_entry, Key};
use super::{style, title_band, Area, Res, SIZE, TITLE_BAND};
use crate::analysis::dispersion::resolution::Resolution;
use crate::analysis::dispersion::DispersionResult;
use crate::analysis::Results;
use crate::problem::Problem;
use panel::{panel, Marker, Panel, Series, YRange, BAND};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

/// Colours of the directions other than the worst one (which is crimson).
const PALETTE: [RGBColor; 4] = [
    style::CURVE,
    RGBColor(0x1b, 0x8a, 0x5a),
    style::CASE,
    style::BOUND,
];

/// Axis limits of the phase-speed ratio.
const PHASE_CAP: (f64, f64) = (0.0, 1.5);
/// Axis limits of the group-speed ratio.
const GROUP_CAP: (f64, f64) = (-1.0, 1.5);

/// The mode the picture shows: the largest finite semi-discrete resolution
/// requirement, or, when no mode has one, the largest fully discrete one.
pub fn shown_mode(d: &DispersionResult) -> Option<usize> {
    largest_need(d, Resolution::semi_ppw, Resolution::discrete_ppw)
}

/// The mode with the largest finite `semi` requirement, else the largest
/// finite `discrete` one.
fn largest_need(
    d: &DispersionResult,
    semi: fn(&Resolution) -> Option<f64>,
    discrete: fn(&Resolution) -> Option<f64>,
) -> Option<usize> {
    let best = |need: fn(&Resolution) -> Option<f64>| {
        d.resolution
            .iter()
            .enumerate()
            .filter_map(|(j, r)| need(r).filter(|v| v.is_finite()).map(|v| (j, v)))
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(j, _)| j)
    };
    best(semi).or_else(|| best(discrete))
}

/// One direction drawn: its index, legend label and colour.
struct Pick {
    index: usize,
    label: String,
    colour: RGBColor,
}

/// The angle of a 2-D direction in whole degrees, 0..360.
fn degrees(n: &[f64]) -> f64 {
    let a = n[1].atan2(n[0]).to_degrees().rem_euclid(360.0);
    let a = a.round();
    if a >= 360.0 {
        0.0
    } else {
        a
    }
}

/// The label of a direction.
fn direction_label(n: &[f64]) -> String {
    match n.len() {
        1 if n[0] >= 0.0 => "+x".to_string(),
        1 => "−x".to_string(),
        2 => format!("{}°", degrees(n)),
        _ => {
            let parts: Vec<String> = n.iter().map(|c| style::num_fixed(*c, 2)).collect();
            format!("n = ({})", parts.join(", "))
        }
    }
}

/// The directions drawn: a few fixed ones (see the module notes) and the
/// worst one last, in crimson.
fn picks(d: &DispersionResult, worst: usize) -> Vec<Pick> {
    let dims = d.directions.first().map_or(1, Vec::len);
    let nearest = |target: &[f64]| -> Option<usize> {
        let norm = target.iter().map(|x| x * x).sum::<f64>().sqrt();
        d.directions
            .iter()
            .enumerate()
            .map(|(k, n)| {
                let dot: f64 = n.iter().zip(target).map(|(a, b)| a * b).sum::<f64>() / norm;
                (k, dot)
            })
            // the first of equally near directions (the smaller angle)
            .fold(None, |best: Option<(usize, f64)>, (k, dot)| match best {
                Some((_, b)) if dot <= b + 1e-9 => best,
                _ => Some((k, dot)),
            })
            .map(|(k, _)| k)
    };
    let targets: Vec<Vec<f64>> = match dims {
        1 => vec![vec![1.0], vec![-1.0]],
        2 => [0.0f64, 15.0, 30.0, 45.0]
            .iter()
            .map(|a| vec![a.to_radians().cos(), a.to_radians().sin()])
            .collect(),
        _ => vec![
            vec![1.0, 0.0, 0.0],
            vec![1.0, 1.0, 0.0],
            vec![1.0, 1.0, 1.0],
        ],
    };
    let mut chosen: Vec<usize> = Vec::new();
    for k in targets.iter().filter_map(|t| nearest(t)) {
        if k != worst && !chosen.contains(&k) {
            chosen.push(k);
        }
    }
    let mut out: Vec<Pick> = chosen
        .into_iter()
        .enumerate()
        .map(|(i, k)| Pick {
            index: k,
            label: direction_label(&d.directions[k]),
            colour: PALETTE[i % PALETTE.len()],
        })
        .collect();
    if worst < d.directions.len() {
        // a drawn direction whose curves coincide with the worst one's (a
        // symmetry of the grid) hides it: say so in the legend
        let same = out
            .iter()
            .find(|p| coincide(d, p.index, worst))
            .map(|p| format!(", as {}", p.label))
            .unwrap_or_default();
        out.push(Pick {
            index: worst,
            label: format!("{} (worst{same})", direction_label(&d.directions[worst])),
            colour: style::WORST,
        });
    }
    out
}

/// Whether two directions have the same phase and group curves (to 10⁻⁹).
fn coincide(d: &DispersionResult, a: usize, b: usize) -> bool {
    let same = |x: &[Vec<f64>], y: &[Vec<f64>]| {
        x.len() == y.len()
            && x.iter().zip(y).all(|(r, s)| {
                r.len() == s.len()
                    && r.iter().zip(s).all(|(u, v)| {
                        (u.is_nan() && v.is_nan()) || (u - v).abs() <= 1e-9 * u.abs().max(1.0)
                    })
            })
    };
    [&d.phase_curves, &d.phase_curves_discrete, &d.group_curves]
        .iter()
        .all(|c| same(&c[a], &c[b]))
}

/// "1%" for a tolerance of 0.01.
fn percent(tol: f64) -> String {
    format!("{}%", style::trimmed(100.0 * tol, 3))
}

/// A points-per-wavelength value for the notes.
fn ppw_text(v: Option<f64>) -> String {
    match v {
        Some(v) if v.is_finite() => style::trimmed(v, 3),
        _ => "—".to_string(),
    }
}

/// Draws lines of text from `y` down; returns the row below them.
fn note_lines(root: &Area, lines: &[(String, bool)], mut y: i32) -> Res<i32> {
    for (text, strong) in lines {
        let (size, colour) = if *strong {
            (16.0, style::INK)
        } else {
            (14.0, style::MUTED)
        };
        let t = style::text(size, colour).pos(style::anchor(HPos::Left, VPos::Top));
        root.draw(&Text::new(text.clone(), (26, y), t))?;
        y += if *strong { 22 } else { 19 };
    }
    Ok(y)
}

/// Widest line of the notes, in pixels.
const NOTE_WIDTH: u32 = 950;

/// Pieces of text joined by `sep` into lines no wider than [`NOTE_WIDTH`] at
/// this font size; a piece wider than a line is broken at its spaces.
fn flow(root: &Area, pieces: &[String], sep: &str, size: f64) -> Res<Vec<String>> {
    let font = style::text(size, style::INK);
    let fits = |s: &str| -> Res<bool> { Ok(root.estimate_text_size(s, &font)?.0 <= NOTE_WIDTH) };
    // tokens with the joint that goes before them on a line
    let mut tokens: Vec<(&str, String)> = Vec::new();
    for p in pieces {
        if fits(p)? {
            tokens.push((sep, p.clone()));
        } else {
            for (i, w) in p.split(' ').enumerate() {
                tokens.push((if i == 0 { sep } else { " " }, w.to_string()));
            }
        }
    }
    let mut lines: Vec<String> = Vec::new();
    let mut current = String::new();
    for (joint, w) in tokens {
        let joined = format!("{current}{joint}{w}");
        if current.is_empty() {
            current = w;
        } else if fits(&joined)? {
            current = joined;
        } else {
            lines.push(std::mem::replace(&mut current, w));
        }
    }
    if !current.is_empty() {
        lines.push(current);
    }
    Ok(lines)
}

/// The requirement of every mode, for the note: a heading and one piece per
/// mode (the decay-rate requirements when `decay`).
fn requirements(d: &DispersionResult, decay: bool) -> Vec<String> {
    let quantity = if decay { "decay-rate" } else { "phase" };
    let mut parts = vec![format!(
        "points per wavelength for {} {quantity} error, semi-discrete / fully discrete, worst direction:",
        percent(d.tolerance)
    )];
    parts.extend(d.names.iter().zip(&d.resolution).map(|(name, res)| {
        let (semi, disc) = if decay {
            (res.decay_ppw(), res.decay_discrete_ppw())
        } else {
            (res.semi_ppw(), res.discrete_ppw())
        };
        match (semi, disc) {
            (None, None) if decay => format!("{name} is not damped"),
            (None, None) => format!("{name} does not propagate"),
            (semi, disc) => format!("{name} {} / {}", ppw_text(semi), ppw_text(disc)),
        }
    }));
    parts
}

/// The requirement note as lines.
fn requirement_lines(root: &Area, d: &DispersionResult, decay: bool) -> Res<Vec<(String, bool)>> {
    let heading_and_modes = requirements(d, decay);
    let mut pieces = vec![format!(
        "{} {}",
        heading_and_modes[0],
        heading_and_modes.get(1).cloned().unwrap_or_default()
    )];
    pieces.extend(heading_and_modes.iter().skip(2).cloned());
    Ok(flow(root, &pieces, "  ·  ", 14.0)?
        .into_iter()
        .map(|l| (l, false))
        .collect())
}

/// Draws the picture.
/// What the panels show: phase and group speed of the mode that sets the
/// resolution, or, when no mode propagates, the decay rate of the damped mode
/// that needs the most points per wavelength (diffusion accuracy).
struct View<'d> {
    mode: usize,
    semi_need: Option<f64>,
    disc_need: Option<f64>,
    worst: usize,
    curves: &'d [Vec<Vec<f64>>],
    curves_discrete: &'d [Vec<Vec<f64>>],
    /// The group-speed curves of the right panel (None: one wide panel).
    group: Option<&'d [Vec<Vec<f64>>]>,
    /// "phase" or "decay-rate".
    quantity: &'static str,
    title: &'static str,
    y_label: &'static str,
}

fn view(d: &DispersionResult) -> Option<View<'_>> {
    if let Some(mode) = shown_mode(d) {
        let res = &d.resolution[mode];
        return Some(View {
            mode,
            semi_need: res.semi_ppw(),
            disc_need: res.discrete_ppw(),
            worst: res.worst_direction(),
            curves: &d.phase_curves,
            curves_discrete: &d.phase_curves_discrete,
            group: Some(&d.group_curves),
            quantity: "phase",
            title: "phase speed, c_num / c_exact",
            y_label: "phase-speed ratio",
        });
    }
    // the damped mode that needs the most points per wavelength
    let mode = largest_need(d, Resolution::decay_ppw, Resolution::decay_discrete_ppw)?;
    let res = &d.resolution[mode];
    Some(View {
        mode,
        semi_need: res.decay_ppw(),
        disc_need: res.decay_discrete_ppw(),
        worst: res
            .decay
            .as_ref()
            .or(res.decay_discrete.as_ref())
            .map_or(0, |q| q.worst.direction),
        curves: &d.decay_curves,
        curves_discrete: &d.decay_curves_discrete,
        group: None,
        quantity: "decay-rate",
        title: "decay rate, numerical / exact (Im ω_num / Im ω_exact)",
        y_label: "decay-rate ratio",
    })
}

/// Draws the picture.
pub fn draw(root: &Area, problem: &Problem, r: &Results, d: &DispersionResult) -> Res {
    let Some(v) = view(d) else {
        title_band(root, problem, "dispersion: phase and group speed", r.dt)?;
        let mut lines = vec![(
            "no propagating mode: the exact phase speed is zero for every mode and direction,"
                .to_string(),
            true,
        )];
        lines.push((
            "and no mode is damped: there is no phase, group speed or decay-rate ratio to draw (a static system)"
                .to_string(),
            true,
        ));
        lines.extend(requirement_lines(root, d, false)?);
        note_lines(root, &lines, SIZE.1 as i32 / 2 - 50)?;
        return Ok(());
    };
    let heading = match v.group {
        Some(_) => "dispersion: phase and group speed",
        None => "diffusion: decay rate (no propagating mode)",
    };
    title_band(root, problem, heading, r.dt)?;
    let (mode, semi_need, disc_need, worst) = (v.mode, v.semi_need, v.disc_need, v.worst);
    let name = &d.names[mode];
    let picks = picks(d, worst);
    let pct = percent(d.tolerance);

    // samples of the shown mode per drawn direction, x = −log₂ ppw
    let ppw_of = |_: usize| d.ppw.clone();
    let column = |rows: &[Vec<f64>], ppw: &[f64]| -> Vec<(f64, f64)> {
        rows.iter()
            .zip(ppw)
            .map(|(row, p)| (-p.log2(), row.get(mode).copied().unwrap_or(f64::NAN)))
            .collect()
    };
    let mut phase = Vec::new();
    let mut group = Vec::new();
    let mut x_min = -8.0f64;
    let mut x_max = -8.0f64;
    // the worst direction first, so that curves it coincides with stay visible on it
    for pick in picks.iter().rev() {
        let ppw = ppw_of(pick.index);
        for p in &ppw {
            x_min = x_min.min(-p.log2());
            x_max = x_max.max(-p.log2());
        }
        let width = if pick.colour == style::WORST { 4 } else { 2 };
        phase.push(Series {
            points: column(&v.curves[pick.index], &ppw),
            colour: pick.colour,
            dashed: false,
            width,
        });
        phase.push(Series {
            points: column(&v.curves_discrete[pick.index], &ppw),
            colour: pick.colour,
            dashed: true,
            width,
        });
        if let Some(g) = v.group {
            group.push(Series {
                points: column(&g[pick.index], &ppw),
                colour: pick.colour,
                dashed: false,
                width,
            });
        }
    }
    // the fine end at 256 points per wavelength, the coarse end at the grid
    // limit of the drawn directions (at least 2 points per wavelength)
    let x_range = (x_min.min(-8.0), x_max.max(-1.0));
    let values = |s: &[Series]| -> Vec<f64> {
        s.iter()
            .flat_map(|s| s.points.iter().map(|p| p.1))
            .collect()
    };
    let y_phase = YRange::new(&values(&phase), PHASE_CAP, d.tolerance);
    let y_group = YRange::new(&values(&group), GROUP_CAP, d.tolerance);

    // the notes above the panels
    let worst_label = direction_label(&d.directions[worst]);
    let headline = format!(
        "mode shown: {name} — {} points per wavelength for {pct} {} error ({} fully discrete), worst direction {worst_label}",
        ppw_text(semi_need),
        v.quantity,
        ppw_text(disc_need)
    );
    let mut lines: Vec<(String, bool)> = flow(root, &[headline], " ", 16.0)?
        .into_iter()
        .map(|l| (l, true))
        .collect();
    lines.extend(requirement_lines(root, d, v.group.is_none())?);
    let outside = |s: &[Series], y: &YRange| -> usize {
        s.iter()
            .flat_map(|s| s.points.iter())
            .filter(|p| !p.1.is_nan() && !y.contains(p.1))
            .count()
    };
    let mut clip = Vec::new();
    let (cp, cg) = (outside(&phase, &y_phase), outside(&group, &y_group));
    let samples = |n: usize| if n == 1 { "sample" } else { "samples" };
    if cp > 0 {
        clip.push(format!(
            "{cp} {} {} outside [0, 1.5]",
            v.quantity,
            samples(cp)
        ));
    }
    if cg > 0 {
        clip.push(format!("{cg} group {} outside [−1, 1.5]", samples(cg)));
    }
    if !clip.is_empty() {
        lines.push((
            format!("{}: drawn at the edge of the axis", clip.join(", ")),
            false,
        ));
    }
    let top = note_lines(root, &lines, TITLE_BAND as i32 + 12)?;

    let mut markers = Vec::new();
    if let Some(n) = semi_need.filter(|v| v.is_finite() && *v > 0.0) {
        markers.push(Marker {
            x: -n.log2(),
            colour: style::WORST,
            dashed: false,
            label: Some(format!(
                "{} ppw for {pct} {} error",
                style::trimmed(n, 3),
                v.quantity
            )),
        });
    }
    if let Some(n) = disc_need.filter(|v| v.is_finite() && *v > 0.0) {
        let close = semi_need.is_some_and(|s| (s / n - 1.0).abs() < 0.02);
        if !close {
            markers.push(Marker {
                x: -n.log2(),
                colour: style::WORST,
                dashed: true,
                label: Some(format!("{} ppw fully discrete", style::trimmed(n, 3))),
            });
        }
    }
    let group_markers: Vec<Marker> = markers
        .iter()
        .map(|m| Marker {
            x: m.x,
            colour: m.colour,
            dashed: m.dashed,
            label: None,
        })
        .collect();

    let legend_top = SIZE.1 as i32 - 70;
    let panel_top = top + 14;
    let height = (legend_top - 10 - panel_top).max(200) as u32;
    let half = match v.group {
        Some(_) => (SIZE.0 - 40) / 2,
        None => SIZE.0 - 40,
    };
    panel(
        root,
        &Panel {
            origin: (14, panel_top),
            size: (half - 10, height),
            title: v.title,
            y_label: v.y_label,
            x_range,
            y: y_phase,
            tol: d.tolerance,
            series: phase,
            markers: &markers,
        },
    )?;
    if v.group.is_some() {
        panel(
            root,
            &Panel {
                origin: (14 + half as i32 + 10, panel_top),
                size: (half - 10, height),
                title: "group speed, semi-discrete / exact",
                y_label: "group-speed ratio",
                x_range,
                y: y_group,
                tol: d.tolerance,
                series: group,
                markers: &group_markers,
            },
        )?;
    }

    // the legend: directions, then the line styles
    let mut x = 30;
    let t = style::text(14.0, style::MUTED).pos(style::anchor(HPos::Left, VPos::Center));
    root.draw(&Text::new("physical direction:", (x, legend_top + 12), t))?;
    x += 140;
    for pick in &picks {
        x += legend_entry(
            root,
            (x, legend_top + 12),
            &Key::Line(pick.colour),
            &pick.label,
        )? + 22;
    }
    let entries = [
        (Key::Line(style::INK), "semi-discrete".to_string()),
        (Key::Dashed(style::INK), "fully discrete".to_string()),
        (Key::Swatch(BAND), format!("1 ± {pct}")),
        (
            Key::Line(style::WORST),
            "required ppw, worst direction".to_string(),
        ),
    ];
    let mut x = 30;
    for (key, label) in &entries {
        x += legend_entry(root, (x, legend_top + 40), key, label)? + 26;
    }
    Ok(())
}
