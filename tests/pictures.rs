//! The PNG pictures: each case dimension gets its pictures (radius, limit by
//! direction, growth envelope, departure from normality, ‖G‖₂, dispersion
//! curves), every picture
//! decodes at the stated size, is not blank, carries text drawn with the
//! embedded font, and is listed in manifest.json; missing or non-finite data
//! (an overflowing growth envelope included) leaves gaps or clipped curves
//! rather than failing.

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::growth::Kreiss;
use kgain::analysis::Results;
use kgain::case::Case;
use kgain::report::plot::{write_pictures, SIZE, TITLE_BAND};
use std::collections::HashSet;
use std::path::{Path, PathBuf};

const ADVECTION_1D: &str = r#"
name = "pic-1d"
[grid]
spacing = [1.0]
[model]
kind = "advection"
velocity = [1.0]
[space]
first = "upwind1"
[time]
method = "ssprk3"
courant = 0.9
[scan]
points = [65]
"#;

const ADVECTION_2D: &str = r#"
name = "pic-2d"
[grid]
spacing = [1.0, 1.0]
[model]
kind = "advection"
velocity = [1.0, 0.5]
[space]
first = "upwind1"
[time]
method = "ssprk3"
courant = 1.3
[scan]
points = [33, 33]
directions = 48
"#;

/// Heun with central differences for advection: unstable for every Δt, so the
/// growth envelope rises geometrically (log axis, no finite Kreiss bound).
const UNSTABLE_2D: &str = r#"
name = "pic-unstable"
[grid]
spacing = [1.0, 1.0]
[model]
kind = "advection"
velocity = [1.0, 0.5]
[space]
first = "central2"
[time]
method = "heun"
courant = 0.9
[scan]
points = [17, 17]
steps = 60
analyses = ["radius", "growth"]
"#;

/// Forward–backward shallow water on the C-grid: stable with transient growth
/// (a non-normal G, a finite Kreiss bound).
const TRANSIENT_2D: &str = r#"
name = "pic-transient"
[grid]
spacing = [5000.0, 5000.0]
[model]
kind = "shallow-water"
depth = 60.0
coriolis = 1.19e-4
[space]
arrangement = "c"
[time]
method = "forward-backward"
sequence = ["h", "u", "v"]
dt = 120.0
[scan]
points = [17, 17]
steps = 40
analyses = ["growth"]
"#;

const ADVECTION_3D: &str = r#"
name = "pic-3d"
[grid]
spacing = [1.0, 1.0, 1.0]
[model]
kind = "advection"
velocity = [1.0, 0.6, 0.3]
[space]
first = "upwind1"
[time]
method = "heun"
courant = 0.7
[scan]
points = [9, 9, 9]
directions = 60
"#;

fn case(text: &str) -> Case {
    support::case(text)
}

fn results(case: &Case) -> Results {
    support::analyse(case)
}

/// Runs a case through the library into a temporary output folder.
fn run(text: &str) -> (tempfile::TempDir, PathBuf) {
    let c = case(text);
    let r = results(&c);
    let tmp = tempfile::tempdir().expect("temp dir");
    let out = kgain::report::write(&tmp.path().join("out"), &c.problem, &r, false)
        .expect("report written");
    (tmp, out)
}

struct Picture {
    width: u32,
    height: u32,
    rgb: Vec<[u8; 3]>,
}

fn decode(path: &Path) -> Picture {
    let file = std::fs::File::open(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let mut reader = png::Decoder::new(std::io::BufReader::new(file))
        .read_info()
        .expect("PNG header");
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).expect("PNG data");
    let channels = match info.color_type {
        png::ColorType::Rgb => 3,
        png::ColorType::Rgba => 4,
        other => panic!("unexpected colour type {other:?}"),
    };
    assert_eq!(info.bit_depth, png::BitDepth::Eight);
    let rgb = buf[..info.buffer_size()]
        .chunks(channels)
        .map(|p| [p[0], p[1], p[2]])
        .collect();
    Picture {
        width: info.width,
        height: info.height,
        rgb,
    }
}

/// Pixels in the rectangle `[x0, x1) × [y0, y1)` darker than mid-grey.
fn dark_pixels(p: &Picture, (x0, x1): (u32, u32), (y0, y1): (u32, u32)) -> usize {
    (y0..y1)
        .flat_map(|y| (x0..x1).map(move |x| (x, y)))
        .filter(|&(x, y)| {
            let [r, g, b] = p.rgb[(y * p.width + x) as usize];
            0.299 * f64::from(r) + 0.587 * f64::from(g) + 0.114 * f64::from(b) < 100.0
        })
        .count()
}

fn assert_looks_like_a_picture(path: &Path) {
    let p = decode(path);
    assert_eq!((p.width, p.height), SIZE, "{}", path.display());
    assert!(p.width >= 800 && p.height >= 600);
    let colours: HashSet<[u8; 3]> = p.rgb.iter().copied().collect();
    assert!(
        colours.len() > 64,
        "{}: only {} colours",
        path.display(),
        colours.len()
    );
    // the title line: anti-aliased glyphs in the band above the plot
    let title = dark_pixels(&p, (0, p.width / 2), (0, TITLE_BAND / 2));
    assert!(
        title > 300,
        "{}: {title} dark pixels in the title band",
        path.display()
    );
    // tick labels and axis labels below and left of the plots
    let below = dark_pixels(&p, (0, p.width), (p.height - 120, p.height));
    assert!(
        below > 100,
        "{}: {below} dark pixels in the bottom band",
        path.display()
    );
}

fn manifest_pictures(out: &Path) -> Vec<String> {
    let text = std::fs::read_to_string(out.join("manifest.json")).expect("manifest");
    let v: serde_json::Value = serde_json::from_str(&text).expect("strict JSON");
    v["pictures"]
        .as_array()
        .expect("a pictures list")
        .iter()
        .map(|s| s.as_str().expect("file name").to_string())
        .collect()
}

/// Every picture of a case that runs all analyses, in the order written.
const ALL: [&str; 7] = [
    "radius.png",
    "footprint.png",
    "limit_polar.png",
    "growth.png",
    "departure.png",
    "norm.png",
    "dispersion.png",
];

fn check_case(text: &str) {
    let (_tmp, out) = run(text);
    let listed = manifest_pictures(&out);
    assert_eq!(listed, ALL);
    for name in &listed {
        assert_looks_like_a_picture(&out.join(name));
    }
}

#[test]
fn one_dimensional_case_gets_curves_and_limit_bars() {
    check_case(ADVECTION_1D);
}

#[test]
fn two_dimensional_case_gets_maps_a_polar_limit_and_a_growth_curve() {
    check_case(ADVECTION_2D);
}

#[test]
fn three_dimensional_case_gets_slices_a_direction_scatter_and_a_growth_curve() {
    check_case(ADVECTION_3D);
}

#[test]
fn unstable_map_draws_the_stability_contour_in_black_and_white() {
    let (_tmp, out) = run(ADVECTION_2D);
    let p = decode(&out.join("radius.png"));
    // the contour is drawn black under white: both appear inside the plot,
    // where the colour map itself has neither
    let plot = |x: u32, y: u32| p.rgb[(y * p.width + x) as usize];
    let (mut black, mut white) = (0, 0);
    for y in TITLE_BAND + 40..p.height - 120 {
        for x in 160..700 {
            match plot(x, y) {
                [0, 0, 0] => black += 1,
                [255, 255, 255] => white += 1,
                _ => {}
            }
        }
    }
    assert!(black > 200 && white > 200, "black {black}, white {white}");
}

#[test]
fn pictures_without_data_are_skipped() {
    let text = format!("{ADVECTION_2D}analyses = [\"radius\"]\n");
    let (_tmp, out) = run(&text);
    assert_eq!(manifest_pictures(&out), ["radius.png", "footprint.png"]);
    assert!(!out.join("limit_polar.png").exists());
}

#[test]
fn non_finite_values_leave_gaps_instead_of_failing() {
    for text in [ADVECTION_1D, ADVECTION_2D, ADVECTION_3D] {
        let c = case(text);
        let mut r = results(&c);
        let rad = r.radius.as_mut().expect("radius");
        for (i, v) in rad.map.iter_mut().enumerate() {
            match i % 7 {
                0 => *v = f64::NAN,
                3 => *v = f64::INFINITY,
                _ => {}
            }
        }
        let dl = &mut r.limit.as_mut().expect("limit").by_direction;
        for (i, v) in dl.dt.iter_mut().enumerate() {
            match i % 5 {
                0 => *v = f64::INFINITY,
                2 => *v = f64::NAN,
                _ => {}
            }
        }
        let g = r.growth.as_mut().expect("growth");
        for map in [&mut g.norm, &mut g.departure] {
            for (i, v) in map.iter_mut().enumerate() {
                match i % 6 {
                    0 => *v = f64::NAN,
                    4 => *v = f64::INFINITY,
                    _ => {}
                }
            }
        }
        let tmp = tempfile::tempdir().expect("temp dir");
        let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
        assert_eq!(files.len(), ALL.len());
        for f in &files {
            assert_looks_like_a_picture(f);
        }
        // nothing finite at all: still a picture, with a note
        let rad = r.radius.as_mut().expect("radius");
        rad.map.iter_mut().for_each(|v| *v = f64::NAN);
        let dl = &mut r.limit.as_mut().expect("limit").by_direction;
        dl.dt.iter_mut().for_each(|v| *v = f64::INFINITY);
        let g = r.growth.as_mut().expect("growth");
        for map in [&mut g.norm, &mut g.departure, &mut g.envelope] {
            map.iter_mut().for_each(|v| *v = f64::NAN);
        }
        g.peak.0 = f64::NAN;
        let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
        for f in &files {
            let p = decode(f);
            assert_eq!((p.width, p.height), SIZE);
            assert!(dark_pixels(&p, (0, p.width / 2), (0, TITLE_BAND / 2)) > 300);
        }
    }
}

#[test]
fn unstable_scheme_gets_a_growth_curve_and_non_normality_maps() {
    let (_tmp, out) = run(UNSTABLE_2D);
    let listed = manifest_pictures(&out);
    assert_eq!(
        listed,
        [
            "radius.png",
            "footprint.png",
            "growth.png",
            "departure.png",
            "norm.png"
        ]
    );
    for name in &listed {
        assert_looks_like_a_picture(&out.join(name));
    }
    let summary: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("summary.json")).expect("summary"))
            .expect("strict JSON");
    assert_eq!(summary["growth"]["class"], "unstable");
}

/// The growth picture's plot area (below the verdict band, inside the margins).
fn growth_plot_ink(p: &Picture) -> usize {
    dark_pixels(p, (150, p.width - 60), (TITLE_BAND + 80, p.height - 140))
}

#[test]
fn growth_picture_draws_the_curve_verdict_and_notes() {
    for text in [UNSTABLE_2D, TRANSIENT_2D] {
        let (_tmp, out) = run(text);
        let p = decode(&out.join("growth.png"));
        assert_eq!((p.width, p.height), SIZE);
        // the verdict band right under the title band holds text
        let band = dark_pixels(&p, (0, p.width), (TITLE_BAND + 4, TITLE_BAND + 40));
        assert!(band > 200, "{band} dark pixels in the verdict band");
        // the envelope curve is drawn in the curve colour inside the plot
        let curve = p.rgb.iter().filter(|c| **c == [0x1f, 0x4e, 0x8c]).count();
        assert!(curve > 400, "{curve} pixels of the curve colour");
        assert!(growth_plot_ink(&p) > 300);
    }
    // the transient case has a finite Kreiss bound, drawn dotted in its colour
    let (_tmp, out) = run(TRANSIENT_2D);
    let p = decode(&out.join("growth.png"));
    let bound = p.rgb.iter().filter(|c| **c == [0x6a, 0x3d, 0x9a]).count();
    assert!(bound > 200, "{bound} pixels of the bound colour");
}

#[test]
fn growth_picture_clips_infinite_and_nan_envelope_values() {
    let c = case(UNSTABLE_2D);
    let base = results(&c);
    let tmp = tempfile::tempdir().expect("temp dir");
    let variants: [fn(&mut Results); 4] = [
        // overflow after step 20, a gap at step 5
        |r: &mut Results| {
            let g = r.growth.as_mut().expect("growth");
            for (n, v) in g.envelope.iter_mut().enumerate() {
                if n > 20 {
                    *v = f64::INFINITY;
                } else if n == 5 {
                    *v = f64::NAN;
                }
            }
            g.peak.0 = f64::INFINITY;
        },
        // negative, zero and NaN values on a log axis
        |r: &mut Results| {
            let g = r.growth.as_mut().expect("growth");
            g.envelope[1] = 0.0;
            g.envelope[2] = -1.0;
            g.envelope[3] = f64::NEG_INFINITY;
            g.kreiss = Some(Kreiss {
                lower_bound: f64::INFINITY,
                wavevector: vec![0.0, 0.0],
            });
        },
        // a single step, and nothing finite at all
        |r: &mut Results| {
            let g = r.growth.as_mut().expect("growth");
            g.envelope = vec![1.0];
            g.peak = (1.0, 0, vec![0.0, 0.0]);
        },
        |r: &mut Results| {
            let g = r.growth.as_mut().expect("growth");
            g.envelope.iter_mut().for_each(|v| *v = f64::NAN);
            g.peak = (f64::NAN, 0, vec![f64::NAN, f64::NAN]);
            g.pseudospectral.1 = f64::NAN;
        },
    ];
    for (k, change) in variants.iter().enumerate() {
        let mut r = base.clone();
        change(&mut r);
        let files = write_pictures(tmp.path(), &c.problem, &r)
            .unwrap_or_else(|e| panic!("variant {k}: {e}"));
        let growth = files
            .iter()
            .find(|f| f.ends_with("growth.png"))
            .expect("growth.png written");
        assert_looks_like_a_picture(growth);
    }
}

#[test]
fn departure_map_spans_zero_to_one_for_a_strongly_non_normal_scheme() {
    let (_tmp, out) = run(TRANSIENT_2D);
    assert_eq!(
        manifest_pictures(&out),
        ["growth.png", "departure.png", "norm.png"]
    );
    let p = decode(&out.join("departure.png"));
    // the map shows both ends of the colour map: dark violet near θ = 0 and
    // light green-yellow near the corners
    let (mut dark, mut light) = (0, 0);
    for y in TITLE_BAND + 40..p.height - 140 {
        for x in 160..720 {
            let [r, g, b] = p.rgb[(y * p.width + x) as usize];
            if r < 90 && g < 60 && b > 80 {
                dark += 1;
            }
            if g > 180 && b < 120 {
                light += 1;
            }
        }
    }
    assert!(dark > 100 && light > 1000, "dark {dark}, light {light}");
}

#[test]
fn one_and_three_dimensional_departure_pictures_are_drawn() {
    for text in [ADVECTION_1D, ADVECTION_3D] {
        let (_tmp, out) = run(text);
        for name in ["departure.png", "norm.png"] {
            assert_looks_like_a_picture(&out.join(name));
        }
    }
}

/// Dispersion only, small scans.
const DISPERSION_1D: &str = r#"
name = "pic-dispersion-1d"
[grid]
spacing = [1.0]
[model]
kind = "advection"
velocity = [1.0]
[space]
first = "central4"
[time]
method = "rk4"
courant = 0.8
[scan]
points = [17]
analyses = ["dispersion"]
"#;

const DISPERSION_2D: &str = r#"
name = "pic-dispersion-2d"
[grid]
spacing = [1.0, 2.0]
[model]
kind = "acoustics"
sound_speed = 1.0
density = 1.0
velocity = [0.2, 0.0]
[space]
first = "central4"
[time]
method = "rk4"
courant = 1.0
[scan]
points = [17, 17]
analyses = ["dispersion"]
"#;

const DISPERSION_3D: &str = r#"
name = "pic-dispersion-3d"
[grid]
spacing = [1.0, 1.0, 1.0]
[model]
kind = "advection"
velocity = [1.0, 0.6, 0.3]
[space]
first = "central2"
[time]
method = "rk4"
courant = 0.7
[scan]
points = [9, 9, 9]
directions = 24
analyses = ["dispersion"]
"#;

/// Diffusion without advection: no mode propagates.
const DIFFUSION_2D: &str = r#"
name = "pic-diffusion"
[grid]
spacing = [1.0, 1.0]
[model]
kind = "advection"
velocity = [0.0, 0.0]
diffusivity = 0.1
[space]
first = "central2"
[time]
method = "rk4"
dt = 0.5
[scan]
points = [17, 17]
analyses = ["dispersion"]
"#;

/// Pixels of exactly this colour.
fn count_colour(p: &Picture, c: [u8; 3]) -> usize {
    p.rgb.iter().filter(|x| **x == c).count()
}

/// The crimson of the worst direction and the required-ppw line.
const CRIMSON: [u8; 3] = [0xc2, 0x1f, 0x3a];

#[test]
fn dispersion_picture_is_drawn_in_one_two_and_three_dimensions() {
    for text in [DISPERSION_1D, DISPERSION_2D, DISPERSION_3D] {
        let (_tmp, out) = run(text);
        assert_eq!(manifest_pictures(&out), ["dispersion.png"]);
        let path = out.join("dispersion.png");
        assert_looks_like_a_picture(&path);
        let p = decode(&path);
        // the note naming the mode, right under the title band
        let note = dark_pixels(&p, (0, p.width), (TITLE_BAND + 4, TITLE_BAND + 40));
        assert!(
            note > 300,
            "{}: {note} dark pixels in the note",
            path.display()
        );
        // both panels carry tick labels and curves
        for (x0, x1) in [(0, p.width / 2), (p.width / 2, p.width)] {
            let ink = dark_pixels(&p, (x0, x1), (TITLE_BAND + 60, p.height - 80));
            assert!(
                ink > 400,
                "{}: {ink} dark pixels in a panel",
                path.display()
            );
        }
        // the worst direction and the required-ppw line in crimson
        let crimson = count_colour(&p, CRIMSON);
        assert!(
            crimson > 600,
            "{}: {crimson} crimson pixels",
            path.display()
        );
        // the band 1 ± tolerance
        let band = count_colour(&p, [0xdc, 0xef, 0xe1]);
        assert!(band > 300, "{}: {band} pixels of the band", path.display());
    }
}

const STATIC_2D: &str = "name = \"pic-static\"\n[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [0.0, 0.0]\n[time]\nmethod = \"rk4\"\ndt = 0.1\n[scan]\npoints = [9, 9]\nanalyses = [\"dispersion\"]\n";

#[test]
fn dispersion_picture_of_a_static_system_shows_a_note() {
    // neither moving nor damped: nothing to draw but a note
    let c = case(STATIC_2D);
    let r = results(&c);
    let d = r.dispersion.as_ref().expect("dispersion");
    assert!(d
        .resolution
        .iter()
        .all(|x| x.semi.is_none() && x.discrete.is_none() && x.decay.is_none()));
    let tmp = tempfile::tempdir().expect("temp dir");
    let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
    let p = decode(&files[0]);
    assert_eq!((p.width, p.height), SIZE);
    assert!(dark_pixels(&p, (0, p.width / 2), (0, TITLE_BAND / 2)) > 300);
    let note = dark_pixels(&p, (0, p.width), (p.height / 2 - 60, p.height / 2 + 60));
    assert!(note > 500, "{note} dark pixels in the note");
    assert_eq!(count_colour(&p, CRIMSON), 0);
}

#[test]
fn dispersion_picture_of_pure_diffusion_draws_the_decay_rate() {
    // no propagating mode, but a damped one: one wide panel of decay-rate
    // ratios with the crimson requirement line
    let c = case(DIFFUSION_2D);
    let r = results(&c);
    let d = r.dispersion.as_ref().expect("dispersion");
    assert!(d
        .resolution
        .iter()
        .all(|x| x.semi.is_none() && x.discrete.is_none()));
    assert!(d.resolution.iter().any(|x| x.decay.is_some()));
    let tmp = tempfile::tempdir().expect("temp dir");
    let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
    assert_eq!(files.len(), 1);
    let p = decode(&files[0]);
    assert_eq!((p.width, p.height), SIZE);
    assert!(
        count_colour(&p, CRIMSON) > 200,
        "the worst direction and its requirement"
    );
    // one panel across the width: curves right of the middle too
    assert!(
        dark_pixels(
            &p,
            (p.width / 2 + 40, p.width - 40),
            (p.height / 3, p.height - 120)
        ) > 100
    );
}

#[test]
fn dispersion_picture_leaves_gaps_at_nan_and_clips_far_ratios() {
    for text in [DISPERSION_1D, DISPERSION_2D] {
        let c = case(text);
        let mut r = results(&c);
        let d = r.dispersion.as_mut().expect("dispersion");
        for curves in [
            &mut d.phase_curves,
            &mut d.phase_curves_discrete,
            &mut d.group_curves,
        ] {
            for (k, dir) in curves.iter_mut().enumerate() {
                for (j, row) in dir.iter_mut().enumerate() {
                    for v in row.iter_mut() {
                        match (j + k) % 9 {
                            1 => *v = f64::NAN,
                            4 => *v = 40.0,
                            7 => *v = -1e9,
                            8 => *v = f64::INFINITY,
                            _ => {}
                        }
                    }
                }
            }
        }
        let tmp = tempfile::tempdir().expect("temp dir");
        let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
        assert_looks_like_a_picture(&files[0]);
        // no requirement at all, but curves: the note stands instead
        let d = r.dispersion.as_mut().expect("dispersion");
        d.resolution
            .iter_mut()
            .for_each(|x| *x = Default::default());
        let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
        let p = decode(&files[0]);
        assert_eq!((p.width, p.height), SIZE);
    }
}

/// Forward–backward on a C-grid basin: |λ| = 1 at every wavevector (the
/// zero-frequency mode alone sees G act as the identity). A flat radius map
/// has no worst wavevector, so no crimson marker is drawn (the legend says the
/// map is flat); a map that is not flat (RK4 + C2 advection) keeps its marker.
#[test]
fn a_flat_radius_map_marks_no_worst_wavevector() {
    let text = "[grid]\nspacing = [1000.0, 1000.0]\n[model]\nkind = \"shallow-water\"\ndepth = 10.0\ngravity = 9.81\n[space]\nfirst = \"central2\"\narrangement = \"c\"\n[time]\nmethod = \"forward-backward\"\nsequence = [\"h\", \"u\", \"v\"]\ncourant = 0.5\n[scan]\npoints = [33, 33]\nanalyses = [\"radius\"]\n";
    let (_tmp, out) = run(text);
    let flat = decode(&out.join("radius.png"));
    assert_eq!(count_colour(&flat, CRIMSON), 0, "a marker on a flat map");
    let advection = "[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0, 0.5]\n[space]\nfirst = \"central2\"\n[time]\nmethod = \"rk4\"\ncourant = 0.5\n[scan]\npoints = [33, 33]\nanalyses = [\"radius\"]\n";
    let (_tmp2, out2) = run(advection);
    let marked = decode(&out2.join("radius.png"));
    let ring = count_colour(&marked, CRIMSON);
    assert!(
        ring > 20,
        "the marker of a non-flat map: {ring} crimson pixels"
    );
}

#[test]
fn a_nearly_neutral_radius_map_is_drawn_as_its_damping() {
    // RK4 + C4 at ν = 0.2: ρ within 1e-5 of 1 everywhere, 1 − ρ spanning
    // decades; the picture shows log10(1 − ρ) with the least damped node marked
    let text = "name = \"pic-nearly-neutral\"\n[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0, 0.5]\n[space]\nfirst = \"central4\"\n[time]\nmethod = \"rk4\"\ncourant = 0.2\n[scan]\npoints = [33, 33]\nanalyses = [\"radius\"]\n";
    let c = case(text);
    let r = results(&c);
    let rad = r.radius.as_ref().expect("radius");
    assert!(kgain::report::plot::radius::damping_view(&rad.map).is_some());
    let tmp = tempfile::tempdir().expect("temp dir");
    let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
    assert_looks_like_a_picture(&files[0]);
    assert!(
        count_colour(&decode(&files[0]), CRIMSON) > 50,
        "the least damped node is marked"
    );
}

#[test]
fn the_fourier_footprint_is_drawn_for_one_step_and_multistep_methods_only() {
    // C2 advection, a = 1, h = 1: Δt·μ = −i ν sin θ (common practice); RK4 at
    // ν = 0.5 and AB3 at ν = 0.2 get footprint.png; a composite scheme
    // (forward–backward on the C-grid) has no footprint (G is not a function of
    // Δt·L) and no picture.
    for (method, courant) in [("rk4", 0.5), ("ab3", 0.2)] {
        let text = format!("name = \"pic-footprint\"\n[grid]\nspacing = [1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0]\n[space]\nfirst = \"central2\"\n[time]\nmethod = \"{method}\"\ncourant = {courant}\n[scan]\npoints = [33]\nanalyses = [\"radius\", \"limit\"]\n");
        let c = case(&text);
        let r = results(&c);
        let f = r.footprint.as_ref().expect("a footprint");
        assert_eq!(f.theta_norm.len(), 33);
        for (k, &flat) in f.index.iter().enumerate() {
            let th = r.grid.coords[0][flat];
            let want = num_complex::Complex64::new(0.0, -courant * th.sin());
            assert!(
                (f.z[k] - want).norm() <= 1e-14,
                "{method} at {th}: {}",
                f.z[k]
            );
            assert!((f.theta_norm[k] - th.abs()).abs() <= 1e-15);
        }
        let tmp = tempfile::tempdir().expect("temp dir");
        let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
        let fp = files
            .iter()
            .find(|p| p.ends_with("footprint.png"))
            .expect("footprint.png");
        assert_looks_like_a_picture(fp);
        // the stability region's fill (light green) covers a good part of the plot
        let region = count_colour(&decode(fp), [0xdc, 0xef, 0xe1]);
        assert!(region > 20_000, "{method}: {region} region pixels");
    }
    let basin = "name = \"pic-fb\"\n[grid]\nspacing = [1000.0, 1000.0]\n[model]\nkind = \"shallow-water\"\ndepth = 10.0\ngravity = 9.81\n[space]\narrangement = \"c\"\n[time]\nmethod = \"forward-backward\"\nsequence = [\"h\", \"u\", \"v\"]\ncourant = 0.5\n[scan]\npoints = [9, 9]\nanalyses = [\"radius\"]\n";
    let c = case(basin);
    let r = results(&c);
    assert!(r.footprint.is_none());
    let tmp = tempfile::tempdir().expect("temp dir");
    let files = write_pictures(tmp.path(), &c.problem, &r).expect("pictures drawn");
    assert!(files.iter().all(|p| !p.ends_with("footprint.png")));
}
