//! The command line as a testable value (README: Commands, Output folder): `kgain run`, `check` and
//! `list` on tiny cases, each test in its own temporary folder. Covers the output
//! folder's contents, strict JSON, exit codes (0 success, 2 invalid case or
//! arguments with file, key and line:col in the message, 3 unstable with
//! --require-stable or short of --require-margin), the folder-replacement
//! policy and the flags.

#[path = "../support/mod.rs"]
mod support;

mod check_list;
mod extremes;
mod flags;
mod gate;
mod output;
mod policy;
mod refusals;

use assert_cmd::Command;
use serde_json::Value;
use std::f64::consts::{PI, SQRT_2};
use std::path::{Path, PathBuf};
use support::{assert_close, position_of, quoted, CaseFile, EPS};

fn kgain() -> Command {
    Command::new(env!("CARGO_BIN_EXE_kgain"))
}

/// A tiny 2-D case: RK4 + C2 advection, a = (0.6, 0.8) so s = |a| = 1, h = (1, 0.5),
/// unequal point counts so that axis order is visible in the array shapes.
const TINY: &str = r#"description = "tiny test case"

[grid]
spacing = [1.0, 0.5]

[model]
kind = "advection"
velocity = [0.6, 0.8]

[time]
method = "rk4"
courant = 0.5

[scan]
points = [33, 17]
directions = 36
"#;

/// RK4 + C2 in 2D: Δt_max = 2√2 / (a_x/h_x + a_y/h_y) (Hairer & Wanner II for 2√2;
/// the sum of the per-axis symbol maxima, attained together at θ = (π/2, π/2)).
fn tiny_dt_max() -> f64 {
    2.0 * SQRT_2 / (0.6 / 1.0 + 0.8 / 0.5)
}

/// The files in a folder, sorted.
fn listing(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

fn read_json(path: &Path) -> Value {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    assert_strict_json(&text, &path.display().to_string())
}

/// Parses JSON strictly (serde_json rejects NaN and Infinity) and checks that no
/// bare NaN, Infinity or inf token appears outside strings.
#[track_caller]
fn assert_strict_json(text: &str, what: &str) -> Value {
    let mut outside = String::new();
    let (mut in_string, mut escaped) = (false, false);
    for ch in text.chars() {
        if in_string {
            if escaped {
                escaped = false;
            } else if ch == '\\' {
                escaped = true;
            } else if ch == '"' {
                in_string = false;
            }
        } else if ch == '"' {
            in_string = true;
            outside.push(' ');
        } else {
            outside.push(ch);
        }
    }
    for token in ["NaN", "Infinity", "inf"] {
        assert!(
            !outside.contains(token),
            "{what}: bare `{token}` token in JSON"
        );
    }
    serde_json::from_str(text).unwrap_or_else(|e| panic!("{what}: not strict JSON: {e}"))
}

/// Header of an NPY file: (descr, fortran_order, shape).
fn npy_header(path: &Path) -> (String, bool, Vec<usize>) {
    let bytes = std::fs::read(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    assert_eq!(&bytes[..6], b"\x93NUMPY", "{}: NPY magic", path.display());
    let (len, start) = match bytes[6] {
        1 => (u16::from_le_bytes([bytes[8], bytes[9]]) as usize, 10),
        _ => (
            u32::from_le_bytes([bytes[8], bytes[9], bytes[10], bytes[11]]) as usize,
            12,
        ),
    };
    let header = std::str::from_utf8(&bytes[start..start + len]).expect("ASCII header");
    let field = |key: &str| {
        let i = header
            .find(key)
            .unwrap_or_else(|| panic!("{header}: no {key}"));
        &header[i + key.len()..]
    };
    let descr = field("'descr':").trim_start().trim_start_matches('\'');
    let descr = descr[..descr.find('\'').unwrap()].to_string();
    let fortran = field("'fortran_order':").trim_start().starts_with("True");
    let shape_text = field("'shape':");
    let shape_text = &shape_text[shape_text.find('(').unwrap() + 1..shape_text.find(')').unwrap()];
    let shape = shape_text
        .split(',')
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .map(|s| s.parse().unwrap())
        .collect();
    (descr, fortran, shape)
}

fn read_npy(path: &Path) -> ndarray::ArrayD<f64> {
    ndarray_npy::read_npy(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Runs `kgain run <stem>.toml --out out` in the case's folder, expecting exit 0.
fn run_ok(cf: &CaseFile, extra: &[&str]) -> (PathBuf, String) {
    let out = kgain()
        .current_dir(cf.root())
        .arg("run")
        .arg(&cf.path)
        .args(["--out", "out"])
        .args(extra)
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(0), "kgain run failed: {stderr}");
    (
        cf.root().join("out"),
        String::from_utf8(out.stdout).unwrap(),
    )
}

/// Expects `kgain run` of `text` to be refused with exit 2, a message containing
/// every needle, no panic, and nothing written next to the case file.
#[track_caller]
fn assert_refused(text: &str, extra: &[&str], needles: &[String]) -> String {
    let cf = CaseFile::new("case", text);
    let out = kgain()
        .current_dir(cf.root())
        .args(["run", "case.toml", "--out", "out"])
        .args(extra)
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
    assert_eq!(out.status.code(), Some(2), "exit code; stderr: {stderr}");
    assert!(!stderr.contains("panicked"), "a panic message: {stderr}");
    for n in needles {
        assert!(
            stderr.contains(n.as_str()),
            "message should contain `{n}`: {stderr}"
        );
    }
    assert_eq!(
        listing(cf.root()),
        vec!["case.toml"],
        "nothing is created on refusal"
    );
    stderr
}

/// "case.toml:<line>:<col>" for the first occurrence of `needle` on the line
/// containing `marker`.
fn at(text: &str, marker: &str, needle: &str) -> String {
    let (l, c) = position_of(text, marker, needle);
    format!("case.toml:{l}:{c}")
}
