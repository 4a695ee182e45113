//! `kgain run` and `kgain check` on temporary wave cases: the limit in
//! summary.json, and exit code 2 naming file, key and line for bad input.

use assert_cmd::Command;
use std::path::Path;

const CASE: &str = r#"name = "string"
[grid]
spacing = [0.02]
[model]
kind = "wave"
speed = 5.0
[time]
method = "central-difference"
courant = 0.8
[scan]
points = 17
analyses = ["radius", "limit", "growth"]
steps = 10
"#;

fn kgain(dir: &Path, args: &[&str]) -> std::process::Output {
    Command::cargo_bin("kgain")
        .expect("the kgain binary")
        .current_dir(dir)
        .args(args)
        .output()
        .expect("kgain runs")
}

fn temp_case(text: &str) -> tempfile::TempDir {
    let dir = tempfile::tempdir().expect("a temporary folder");
    std::fs::write(dir.path().join("case.toml"), text).expect("case written");
    dir
}

#[test]
fn run_reports_the_courant_one_limit_in_summary_json() {
    let dir = temp_case(CASE);
    let out = kgain(dir.path(), &["run", "case.toml", "--out", "out", "--quiet"]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(dir.path().join("out/summary.json")).expect("summary");
    let s: serde_json::Value = serde_json::from_str(&text).expect("strict JSON");
    let dt_max = s["limit"]["dt_max"].as_f64().expect("dt_max");
    // h/c = 0.02/5 (central difference + C2: ν ≤ 1)
    assert!((dt_max - 0.004).abs() <= 1e-12 * 0.004, "{dt_max}");
    assert!(s["dispersion"].is_null(), "dispersion is not computed");
    let cautions = s["cautions"].to_string();
    assert!(cautions.contains("second order in time"), "{cautions}");
}

#[test]
fn default_analyses_leave_out_dispersion_and_run() {
    let text = CASE.replace("analyses = [\"radius\", \"limit\", \"growth\"]\n", "");
    let dir = temp_case(&text);
    let out = kgain(dir.path(), &["run", "case.toml", "--out", "out", "--quiet"]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(!dir.path().join("out/dispersion.png").exists());
    assert!(dir.path().join("out/footprint.png").exists());
}

/// (override, key named in the message, line of that key in the case).
const REFUSALS: &[(&[&str], &str, &str)] = &[
    (
        &["time.method=\"newmark\"", "time.beta=-0.25"],
        "time.beta",
        ":10:",
    ),
    (
        &["time.method=\"newmark\"", "time.gamma=0.45"],
        "time.gamma",
        ":10:",
    ),
    (&["time.method=\"rk4\""], "time.method", ":8:"),
    (&["time.beta=0.25"], "time.beta", ":10:"),
    (
        &["scan.analyses=[\"radius\", \"dispersion\"]"],
        "scan.analyses",
        ":12:",
    ),
];

#[test]
fn bad_input_exits_2_naming_file_key_and_line() {
    let dir = temp_case(CASE);
    for (sets, key, line) in REFUSALS {
        let mut args = vec!["check", "case.toml"];
        for s in *sets {
            args.extend(["--set", s]);
        }
        let out = kgain(dir.path(), &args);
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{sets:?}: {err}");
        assert!(err.contains(&format!("`{key}`")), "{sets:?}: {err}");
        assert!(err.contains(&format!("case.toml{line}")), "{sets:?}: {err}");
    }
}

#[test]
fn newmark_with_a_first_order_model_exits_2_naming_the_method() {
    let text = CASE
        .replace(
            "kind = \"wave\"\nspeed = 5.0",
            "kind = \"advection\"\nvelocity = [5.0]",
        )
        .replace("central-difference", "newmark");
    let dir = temp_case(&text);
    let out = kgain(dir.path(), &["run", "case.toml", "--out", "out", "--quiet"]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(
        err.contains("case.toml:8:") && err.contains("`time.method`"),
        "{err}"
    );
    assert!(err.contains("wave"), "the hint names the wave model: {err}");
    assert!(!dir.path().join("out").exists());
}

#[test]
fn list_methods_names_both_second_order_methods() {
    let dir = tempfile::tempdir().expect("a temporary folder");
    let out = kgain(dir.path(), &["list", "methods"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("central-difference") && text.contains("[-4.0000000000, 0]"),
        "{text}"
    );
    assert!(
        text.contains("newmark") && text.contains("whole negative real axis"),
        "{text}"
    );
}
