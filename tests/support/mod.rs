//! Shared helpers of the integration tests: building cases from TOML text (in
//! memory or as a file in a temporary folder), running the analyses, the one
//! relative comparator every test uses, and small independent numerical tools
//! (golden-section search, bisection) for computing expected values from formulas
//! without going through the engine.
//!
//! Each test crate uses only part of this module.
#![allow(dead_code)]

use kgain::analysis::{self, Results};
use kgain::case::Case;
use kgain::sample::{NoProgress, Par};
use num_complex::Complex64 as C64;
use std::path::{Path, PathBuf};

/// A 1-D RK4 + central2 advection case at Courant number 1; with a = h = 1 it is
/// stable for Courant numbers up to 2√2 ≈ 2.828 (the reach of RK4 on the
/// imaginary axis, Hairer & Wanner, Solving ODEs II, times the largest C2
/// symbol 1).
pub const RK4_LINE: &str = r#"[grid]
spacing = [1.0]
[model]
kind = "advection"
velocity = [1.0]
[time]
method = "rk4"
courant = 1.0
[scan]
points = [33]
"#;

/// Unit roundoff of f64 (the ε of every tolerance in these tests).
pub const EPS: f64 = f64::EPSILON;

/// The relative tolerance of a check value quoted to `decimals` digits after the
/// point: one unit in the last quoted digit (published digits are sometimes
/// rounded, sometimes truncated).
pub fn quoted(value: f64, decimals: i32) -> f64 {
    10f64.powi(-decimals) / value.abs()
}

/// The shared comparator: |got − want| ≤ tol · scale, with a message naming the
/// check. Every other assertion on numbers in the tests goes through it.
#[track_caller]
pub fn assert_close_to_scale(got: f64, want: f64, tol: f64, scale: f64, context: &str) {
    let err = (got - want).abs();
    assert!(
        got.is_finite() == want.is_finite() && (err <= tol * scale || got == want),
        "{context}: got {got:.17e}, want {want:.17e}; |error| = {err:.3e} exceeds {tol:.3e} × {scale:.3e}"
    );
}

/// Relative comparison |got − want| ≤ rel · |want| (exact equality when want = 0).
#[track_caller]
pub fn assert_close(got: f64, want: f64, rel: f64, context: &str) {
    assert_close_to_scale(got, want, rel, want.abs(), context);
}

/// A virtual path for cases built in memory.
pub fn virtual_path(name: &str) -> PathBuf {
    PathBuf::from(format!("{name}.toml"))
}

/// Validates case text (as if read from `<name>.toml`), panicking with the error.
#[track_caller]
pub fn case(text: &str) -> Case {
    case_with(text, &[])
}

/// Validates case text with `--set`-style overrides such as `time.dt=0.5`.
#[track_caller]
pub fn case_with(text: &str, overrides: &[String]) -> Case {
    Case::from_str_with(text, &virtual_path("case"), overrides)
        .unwrap_or_else(|e| panic!("case should be valid: {e}\n--- case ---\n{text}"))
}

/// Runs every analysis the case asks for, sequentially and without progress bars.
#[track_caller]
pub fn analyse(case: &Case) -> Results {
    analysis::analyse(&case.problem, &case.plan, Par::Seq, &NoProgress)
        .unwrap_or_else(|e| panic!("analysis should succeed: {e}"))
}

/// Runs the analyses in parallel on `threads` threads.
#[track_caller]
pub fn analyse_par(case: &Case, threads: usize) -> Results {
    analysis::analyse(
        &case.problem,
        &case.plan,
        Par::Threads(threads),
        &NoProgress,
    )
    .unwrap_or_else(|e| panic!("analysis should succeed: {e}"))
}

/// Builds and analyses case text in one go.
#[track_caller]
pub fn run(text: &str) -> (Case, Results) {
    let c = case(text);
    let r = analyse(&c);
    (c, r)
}

/// The largest stable Δt of a bounded result, panicking otherwise.
#[track_caller]
pub fn dt_max(results: &Results) -> f64 {
    let l = results.limit.as_ref().expect("the limit analysis ran");
    assert_eq!(
        l.kind,
        analysis::LimitKind::Bounded,
        "expected a bounded limit, got {:?}",
        l.kind
    );
    l.dt_max
}

/// Formats numbers as a TOML array, each with full round-trip precision.
pub fn toml_list(v: &[f64]) -> String {
    let parts: Vec<String> = v.iter().map(|x| format!("{x:?}")).collect();
    format!("[{}]", parts.join(", "))
}

/// A case written as a file in its own temporary folder (for `Case::load` and the CLI).
pub struct CaseFile {
    /// The temporary folder (removed on drop).
    pub dir: tempfile::TempDir,
    /// The case file inside it.
    pub path: PathBuf,
}

impl CaseFile {
    /// Writes `text` to `<dir>/<stem>.toml` in a fresh temporary folder.
    pub fn new(stem: &str, text: &str) -> CaseFile {
        let dir = tempfile::tempdir().expect("temporary folder");
        let path = dir.path().join(format!("{stem}.toml"));
        std::fs::write(&path, text).expect("write the case file");
        CaseFile { dir, path }
    }

    /// Writes another case file into the same folder; returns its path.
    pub fn add(&self, stem: &str, text: &str) -> PathBuf {
        let path = self.dir.path().join(format!("{stem}.toml"));
        std::fs::write(&path, text).expect("write the case file");
        path
    }

    /// The folder.
    pub fn root(&self) -> &Path {
        self.dir.path()
    }

    /// Loads and validates the file with overrides.
    pub fn load(&self, overrides: &[String]) -> Case {
        Case::load(&self.path, overrides).unwrap_or_else(|e| panic!("case should be valid: {e}"))
    }
}

/// 1-based (line, column) of the first occurrence of `needle` in `text`, found on
/// the first line that contains `line_marker`.
pub fn position_of(text: &str, line_marker: &str, needle: &str) -> (usize, usize) {
    for (i, line) in text.lines().enumerate() {
        if line.contains(line_marker) {
            let col = line
                .find(needle)
                .unwrap_or_else(|| panic!("`{needle}` not on the line `{line}`"));
            return (i + 1, line[..col].chars().count() + 1);
        }
    }
    panic!("no line contains `{line_marker}`");
}

/// Golden-section search for the maximum of a unimodal `f` on [a, b]: (x, f(x)).
/// An independent tool for expected values (the engine has its own).
pub fn golden_max(f: impl Fn(f64) -> f64, mut a: f64, mut b: f64) -> (f64, f64) {
    let g = 0.5 * (5f64.sqrt() - 1.0);
    let mut c = b - g * (b - a);
    let mut d = a + g * (b - a);
    let (mut fc, mut fd) = (f(c), f(d));
    for _ in 0..200 {
        if fc > fd {
            b = d;
            d = c;
            fd = fc;
            c = b - g * (b - a);
            fc = f(c);
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + g * (b - a);
            fd = f(d);
        }
        if (b - a).abs() <= 4.0 * EPS * (a.abs() + b.abs()) {
            break;
        }
    }
    let x = 0.5 * (a + b);
    (x, f(x))
}

/// The maximum of `f` on [a, b]: a fine uniform scan, then golden-section search
/// around the best sample.
pub fn scan_max(f: impl Fn(f64) -> f64, a: f64, b: f64, samples: usize) -> (f64, f64) {
    let h = (b - a) / samples as f64;
    let (mut best_x, mut best) = (a, f(a));
    for i in 1..=samples {
        let x = a + h * i as f64;
        let v = f(x);
        if v > best {
            best = v;
            best_x = x;
        }
    }
    let (x, v) = golden_max(&f, (best_x - h).max(a), (best_x + h).min(b));
    if v >= best {
        (x, v)
    } else {
        (best_x, best)
    }
}

/// A root of `f` in [a, b] (f(a) and f(b) of opposite signs) by bisection to the
/// last bit.
pub fn bisect(f: impl Fn(f64) -> f64, mut a: f64, mut b: f64) -> f64 {
    let fa = f(a);
    assert!(
        fa.signum() != f(b).signum(),
        "bisect: no sign change on [{a}, {b}]"
    );
    for _ in 0..200 {
        let m = 0.5 * (a + b);
        if m <= a || m >= b {
            break;
        }
        if f(m).signum() == fa.signum() {
            a = m;
        } else {
            b = m;
        }
    }
    0.5 * (a + b)
}

/// Wraps an angle into (−π, π].
pub fn wrap_angle(x: f64) -> f64 {
    let pi = std::f64::consts::PI;
    let y = (x + pi).rem_euclid(2.0 * pi) - pi;
    if y == -pi {
        pi
    } else {
        y
    }
}

/// Matches two spectra one-to-one, closest pairs first, and returns the largest
/// distance between matched eigenvalues (order-independent comparison).
pub fn spectrum_distance(got: &[C64], want: &[C64]) -> f64 {
    assert_eq!(got.len(), want.len(), "spectra of different sizes");
    let mut pairs: Vec<(f64, usize, usize)> = Vec::new();
    for (i, g) in got.iter().enumerate() {
        for (j, w) in want.iter().enumerate() {
            pairs.push(((g - w).norm(), i, j));
        }
    }
    pairs.sort_by(|a, b| a.0.total_cmp(&b.0));
    let (mut used_g, mut used_w) = (vec![false; got.len()], vec![false; want.len()]);
    let mut worst: f64 = 0.0;
    for (d, i, j) in pairs {
        if !used_g[i] && !used_w[j] {
            used_g[i] = true;
            used_w[j] = true;
            worst = worst.max(d);
        }
    }
    worst
}
pub mod kernels;
