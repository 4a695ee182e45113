//! The sweep charts (`write_chart`): each drawable shape — a line over one
//! numeric key, one line per text value against a numeric key (either order),
//! a heat map over two numeric keys — writes a PNG that decodes at the picture
//! size and shows the case's own point; shapes it cannot draw write nothing;
//! NaN, ±∞, huge, constant and single values draw without failing; the same
//! spec gives the same bytes.

use kgain::report::plot::sweep_chart::{write_chart, ChartAxis, ChartSpec};
use kgain::report::plot::SIZE;
use std::path::Path;

/// The orange of the case's own point (the house `CASE` colour).
const CASE: [u8; 3] = [0xe0, 0x74, 0x0b];
/// The grey of a heat-map cell without a value (the house `MISSING` colour).
const MISSING: [u8; 3] = [0xbf, 0xbf, 0xbf];

fn numeric(key: &str, unit: &str, numbers: &[f64], case: Option<&str>) -> ChartAxis {
    ChartAxis {
        key: key.to_string(),
        unit: unit.to_string(),
        labels: numbers.iter().map(|x| x.to_string()).collect(),
        numbers: numbers.to_vec(),
        case_value: case.map(str::to_string),
    }
}

fn text(key: &str, labels: &[&str], case: Option<&str>) -> ChartAxis {
    ChartAxis {
        key: key.to_string(),
        unit: String::new(),
        labels: labels.iter().map(|s| s.to_string()).collect(),
        numbers: Vec::new(),
        case_value: case.map(str::to_string),
    }
}

fn spec(axes: Vec<ChartAxis>, values: Vec<f64>) -> ChartSpec {
    ChartSpec {
        title: "duct — sweep of limit.courant_max".to_string(),
        subtitle: "ssprk3 in time  ·  central4 in space".to_string(),
        figure: "limit.courant_max".to_string(),
        figure_label: "largest stable Courant number".to_string(),
        figure_unit: String::new(),
        axes,
        values,
    }
}

/// The decoded RGB pixels of a PNG, after checking its signature and size.
fn pixels(path: &Path) -> Vec<[u8; 3]> {
    let bytes = std::fs::read(path).expect("the picture was written");
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n", "PNG signature");
    let decoder = png::Decoder::new(std::io::Cursor::new(bytes));
    let mut reader = decoder.read_info().expect("PNG header");
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).expect("PNG data");
    assert_eq!((info.width, info.height), SIZE);
    assert_eq!(info.color_type, png::ColorType::Rgb);
    buf[..info.buffer_size()]
        .chunks_exact(3)
        .map(|p| [p[0], p[1], p[2]])
        .collect()
}

fn count(px: &[[u8; 3]], colour: [u8; 3]) -> usize {
    px.iter().filter(|p| **p == colour).count()
}

/// Draws `s`, expects a picture, returns its pixels.
fn drawn(dir: &Path, name: &str, s: &ChartSpec) -> Vec<[u8; 3]> {
    let path = dir.join(name);
    assert_eq!(write_chart(&path, s), Ok(true), "{name}");
    let px = pixels(&path);
    let distinct: std::collections::BTreeSet<[u8; 3]> = px.iter().copied().collect();
    assert!(distinct.len() > 20, "{name}: a nearly blank picture");
    px
}

fn mach() -> Vec<f64> {
    vec![0.1, 0.2, 0.3, 0.5, 0.7, 0.8, 0.9]
}

fn line_spec() -> ChartSpec {
    let x = mach();
    let values = x.iter().map(|m| 1.0 / (1.0 + m)).collect();
    spec(vec![numeric("model.mach", "", &x, Some("0.6"))], values)
}

fn lines_spec(numeric_first: bool) -> ChartSpec {
    let x = mach();
    let methods = ["rk4", "ssprk3", "heun"];
    let t = text("time.method", &methods, Some("ssprk3"));
    let n = numeric("model.velocity[0]", "m/s", &x, Some("0.5"));
    let f = |m: f64, k: usize| (2.8 - 0.9 * k as f64) / (1.0 + m);
    let values = if numeric_first {
        x.iter()
            .flat_map(|m| (0..3).map(move |k| f(*m, k)))
            .collect()
    } else {
        (0..3)
            .flat_map(|k| x.iter().map(move |m| f(*m, k)))
            .collect()
    };
    let axes = if numeric_first {
        vec![n, t]
    } else {
        vec![t, n]
    };
    spec(axes, values)
}

/// A map over an uneven grid of Mach numbers and flow angles.
fn map_spec(values: impl Fn(f64, f64) -> f64) -> ChartSpec {
    let x = mach();
    let y = [0.0, 10.0, 15.0, 30.0, 45.0, 60.0, 90.0];
    let v = x
        .iter()
        .flat_map(|m| y.iter().map(|a| (*m, *a)).collect::<Vec<_>>())
        .map(|(m, a)| values(m, a))
        .collect();
    spec(
        vec![
            numeric("model.mach", "", &x, Some("0.45")),
            numeric("model.flow_angle_deg", "deg", &y, Some("20")),
        ],
        v,
    )
}

fn smooth(m: f64, a: f64) -> f64 {
    1.7 / (1.0 + m * (1.0 + (a.to_radians()).sin()))
}

#[test]
fn a_line_chart_marks_the_case_s_own_point() {
    let dir = tempfile::tempdir().unwrap();
    let px = drawn(dir.path(), "line.png", &line_spec());
    // the diamond on the curve plus its legend sample
    assert!(count(&px, CASE) > 150, "{}", count(&px, CASE));
    // without a case value there is no diamond, no dashed line: nothing orange
    let mut s = line_spec();
    s.axes[0].case_value = None;
    let px = drawn(dir.path(), "plain.png", &s);
    assert_eq!(count(&px, CASE), 0);
}

#[test]
fn lines_per_text_value_draw_in_either_axis_order() {
    let dir = tempfile::tempdir().unwrap();
    let a = drawn(dir.path(), "numeric-first.png", &lines_spec(true));
    let b = drawn(dir.path(), "text-first.png", &lines_spec(false));
    assert!(count(&a, CASE) > 150);
    // the same data in the other C order is the same picture
    assert_eq!(a, b);
}

#[test]
fn a_heat_map_greys_missing_cells_and_marks_the_case() {
    let dir = tempfile::tempdir().unwrap();
    let full = drawn(dir.path(), "map.png", &map_spec(smooth));
    assert_eq!(count(&full, MISSING), 0);
    assert!(count(&full, CASE) > 150);
    let holes = map_spec(|m, a| {
        if m > 0.6 && a > 40.0 {
            f64::NAN
        } else {
            smooth(m, a)
        }
    });
    let px = drawn(dir.path(), "holes.png", &holes);
    // 3 × 3 grey cells of some thousand pixels each
    assert!(count(&px, MISSING) > 5000, "{}", count(&px, MISSING));
}

#[test]
fn shapes_without_a_chart_write_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let two_texts = spec(
        vec![text("a", &["x", "y"], None), text("b", &["u", "v"], None)],
        vec![1.0; 4],
    );
    let three = spec(
        vec![
            numeric("a", "", &[1.0, 2.0], None),
            numeric("b", "", &[1.0, 2.0], None),
            numeric("c", "", &[1.0, 2.0], None),
        ],
        vec![1.0; 8],
    );
    let cases = [
        ("none", spec(vec![], vec![])),
        (
            "one-text",
            spec(vec![text("a", &["x", "y"], None)], vec![1.0, 2.0]),
        ),
        ("two-texts", two_texts),
        ("three", three),
        (
            "empty-axis",
            spec(vec![numeric("a", "", &[], None)], vec![]),
        ),
        (
            "non-finite-axis",
            spec(
                vec![numeric("a", "", &[1.0, f64::NAN], None)],
                vec![1.0, 2.0],
            ),
        ),
    ];
    for (name, s) in cases {
        let path = dir.path().join(format!("{name}.png"));
        assert_eq!(write_chart(&path, &s), Ok(false), "{name}");
        assert!(!path.exists(), "{name}: a file was written");
    }
}

#[test]
fn counts_that_do_not_fit_are_an_error_and_write_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bad.png");
    let short = spec(vec![numeric("a", "", &[1.0, 2.0, 3.0], None)], vec![1.0]);
    let err = write_chart(&path, &short).unwrap_err();
    assert!(
        err.contains("limit.courant_max") && err.contains('3'),
        "{err}"
    );
    let mut uneven = spec(vec![numeric("a", "", &[1.0, 2.0], None)], vec![1.0, 2.0]);
    uneven.axes[0].numbers.pop();
    assert!(write_chart(&path, &uneven).is_err());
    assert!(!path.exists());
}

#[test]
fn awkward_values_draw_without_failing() {
    let dir = tempfile::tempdir().unwrap();
    let nan = f64::NAN;
    let inf = f64::INFINITY;
    let x = mach();
    let one = |values: Vec<f64>| spec(vec![numeric("model.mach", "", &x, Some("0.3"))], values);
    let mut cases = vec![
        ("all-nan", one(vec![nan; 7])),
        ("all-inf", one(vec![inf; 7])),
        ("constant", one(vec![0.8; 7])),
        ("mixed", one(vec![0.5, nan, inf, 0.7, -inf, 0.9, nan])),
        ("huge", one(vec![1e300, -1e300, 1.0, 2.0, 3.0, 4.0, 5.0])),
        ("decades", one(vec![1e-6, 1e-4, 1e-2, 1.0, 1e2, 1e4, 1e6])),
        (
            "single",
            spec(
                vec![numeric("model.mach", "", &[0.5], Some("0.5"))],
                vec![0.7],
            ),
        ),
        (
            "zero-axis",
            spec(
                vec![numeric("a", "", &[0.0, 0.0], Some("0"))],
                vec![1.0, 2.0],
            ),
        ),
        ("map-nan", map_spec(|_, _| nan)),
        ("map-inf", map_spec(|m, _| if m < 0.4 { inf } else { m })),
        ("map-constant", map_spec(|_, _| 2.0)),
        (
            "map-minus-inf",
            map_spec(|m, a| if a > 50.0 { -inf } else { m }),
        ),
        (
            "map-1x1",
            spec(
                vec![
                    numeric("a", "", &[1.0], Some("1")),
                    numeric("b", "", &[2.0], None),
                ],
                vec![3.0],
            ),
        ),
    ];
    let mut gaps = lines_spec(true);
    gaps.values[4] = nan;
    gaps.values[7] = inf;
    cases.push(("lines-gaps", gaps));
    for (name, s) in cases {
        drawn(dir.path(), &format!("{name}.png"), &s);
    }
}

#[test]
fn the_same_spec_gives_the_same_bytes() {
    let dir = tempfile::tempdir().unwrap();
    let holes = map_spec(|m, a| {
        if a > 80.0 {
            f64::INFINITY
        } else {
            smooth(m, a)
        }
    });
    for (name, s) in [
        ("line", line_spec()),
        ("lines", lines_spec(true)),
        ("map", holes),
    ] {
        let (a, b) = (dir.path().join("a.png"), dir.path().join("b.png"));
        assert_eq!(write_chart(&a, &s), Ok(true));
        assert_eq!(write_chart(&b, &s), Ok(true));
        let (a, b) = (std::fs::read(a).unwrap(), std::fs::read(b).unwrap());
        assert!(a == b, "{name}: different bytes");
    }
}
