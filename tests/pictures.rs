//! The PNG pictures: each case dimension gets its pictures, every picture
//! decodes at the stated size, is not blank, carries text drawn with the
//! embedded font, and is listed in manifest.json; missing or non-finite data
//! leaves gaps rather than failing.

use kgain::analysis::{analyse, Options, Results};
use kgain::case::Case;
use kgain::report::plot::{write_pictures, SIZE, TITLE_BAND};
use kgain::sample::Par;
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
    Case::from_str_with(text, Path::new("x.toml"), &[]).expect("valid case")
}

fn results(case: &Case) -> Results {
    let opts = Options {
        par: Par::Seq,
        progress: false,
    };
    analyse(case, &opts).expect("analysis runs")
}

/// Runs a case through the library into a temporary output folder.
fn run(text: &str) -> (tempfile::TempDir, PathBuf) {
    let c = case(text);
    let r = results(&c);
    let tmp = tempfile::tempdir().expect("temp dir");
    let out = kgain::report::write(&tmp.path().join("out"), &c, &r).expect("report written");
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

fn check_case(text: &str) {
    let (_tmp, out) = run(text);
    let listed = manifest_pictures(&out);
    assert_eq!(listed, ["radius.png", "limit_polar.png"]);
    for name in &listed {
        assert_looks_like_a_picture(&out.join(name));
    }
}

#[test]
fn one_dimensional_case_gets_a_radius_curve_and_limit_bars() {
    check_case(ADVECTION_1D);
}

#[test]
fn two_dimensional_case_gets_a_radius_map_and_a_polar_limit() {
    check_case(ADVECTION_2D);
}

#[test]
fn three_dimensional_case_gets_slices_and_a_direction_scatter() {
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
    assert_eq!(manifest_pictures(&out), ["radius.png"]);
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
        let dl = r.directional.as_mut().expect("directional");
        for (i, v) in dl.dt.iter_mut().enumerate() {
            match i % 5 {
                0 => *v = f64::INFINITY,
                2 => *v = f64::NAN,
                _ => {}
            }
        }
        let tmp = tempfile::tempdir().expect("temp dir");
        let files = write_pictures(tmp.path(), &c, &r).expect("pictures drawn");
        assert_eq!(files.len(), 2);
        for f in &files {
            assert_looks_like_a_picture(f);
        }
        // nothing finite at all: still a picture, with a note
        let rad = r.radius.as_mut().expect("radius");
        rad.map.iter_mut().for_each(|v| *v = f64::NAN);
        let dl = r.directional.as_mut().expect("directional");
        dl.dt.iter_mut().for_each(|v| *v = f64::INFINITY);
        let files = write_pictures(tmp.path(), &c, &r).expect("pictures drawn");
        for f in &files {
            let p = decode(f);
            assert_eq!((p.width, p.height), SIZE);
            assert!(dark_pixels(&p, (0, p.width / 2), (0, TITLE_BAND / 2)) > 300);
        }
    }
}
