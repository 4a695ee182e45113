//! The CI gate of `kgain run`: `--require-margin F` (exit 3 unless
//! dt ≤ F·dt_max) and the one-line JSON verdict on stderr whenever the exit
//! code is 3, even with `--quiet`.

use super::*;

/// RK4 + C2, a = h = 1, 1-D: dt_max = 2√2, so the Courant number is the
/// ratio × 2√2.
const LINE: &str = support::RK4_LINE;

fn run_gate(cf: &CaseFile, courant: f64, extra: &[&str]) -> (Option<i32>, String) {
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "line.toml", "--out", "out", "--quiet"])
        .args(["--set", &format!("time.courant={courant}")])
        .args(extra)
        .output()
        .unwrap();
    (
        res.status.code(),
        String::from_utf8_lossy(&res.stderr).into_owned(),
    )
}

/// The JSON object of the `kgain-verdict:` line.
fn verdict_of(stderr: &str) -> Value {
    let line = stderr
        .lines()
        .find_map(|l| l.strip_prefix("kgain-verdict: "))
        .unwrap_or_else(|| panic!("no verdict line in: {stderr}"));
    assert_strict_json(line, "verdict line")
}

#[test]
fn require_margin_passes_below_the_fraction_and_fails_above_it_with_a_verdict() {
    let cf = CaseFile::new("line", LINE);
    let limit = 2.0 * SQRT_2;
    // 0.79 × limit passes a 0.8 margin, 0.81 × limit fails it (but is stable)
    let (code, stderr) = run_gate(&cf, 0.79 * limit, &["--require-margin", "0.8"]);
    assert_eq!(code, Some(0), "{stderr}");
    assert!(stderr.is_empty(), "quiet success prints nothing: {stderr}");
    let (code, stderr) = run_gate(&cf, 0.81 * limit, &["--require-margin", "0.8"]);
    assert_eq!(code, Some(3), "{stderr}");
    let v = verdict_of(&stderr);
    assert_eq!(v["verdict"], "fail");
    assert_close(v["dt"].as_f64().unwrap(), 0.81 * limit, 1e-12, "dt");
    assert_close(v["dt_max"].as_f64().unwrap(), limit, 1e-9, "dt_max");
    assert_close(v["ratio"].as_f64().unwrap(), 0.81, 1e-8, "ratio");
    assert_eq!(v["margin"].as_f64(), Some(0.8));
    assert_eq!(v["limit_kind"], "bounded");
    // the limit is set at θ = ±π/2 (where sin θ = 1)
    let w = v["worst_wavevector"][0].as_f64().unwrap();
    assert_close(w.abs(), PI / 2.0, 1e-6, "worst wavevector");
    assert!(v["mode"].is_string(), "a mode description: {v}");
    // the same run without a margin is a success: stable at 0.81 × limit
    let (code, _) = run_gate(&cf, 0.81 * limit, &[]);
    assert_eq!(code, Some(0));
}

#[test]
fn require_stable_failure_prints_its_verdict_even_when_quiet() {
    let cf = CaseFile::new("line", LINE);
    let (code, stderr) = run_gate(&cf, 2.9, &["--require-stable"]);
    assert_eq!(code, Some(3));
    let v = verdict_of(&stderr);
    assert_eq!(v["reason"], "unstable at the case's dt");
    assert!(v["ratio"].as_f64().unwrap() > 1.0, "{v}");
    assert!(v["radius_max"].as_f64().unwrap() > 1.0, "{v}");
}

#[test]
fn a_scheme_with_no_stable_step_fails_any_margin() {
    let cf = CaseFile::new("line", LINE);
    let (code, stderr) = run_gate(
        &cf,
        0.1,
        &["--require-margin", "1", "--set", "time.method=heun"],
    );
    assert_eq!(code, Some(3), "{stderr}");
    let v = verdict_of(&stderr);
    assert_eq!(v["limit_kind"], "none");
    assert!(
        v["dt_max"].as_f64() == Some(0.0) && v["ratio"].is_null(),
        "{v}"
    );
}

#[test]
fn margin_outside_zero_one_or_without_a_limit_is_refused() {
    let cf = CaseFile::new("line", LINE);
    for bad in ["0", "1.5", "-0.2", "abc"] {
        let flag = format!("--require-margin={bad}");
        let (code, stderr) = run_gate(&cf, 1.0, &[flag.as_str()]);
        assert_eq!(code, Some(2), "margin {bad}: {stderr}");
        assert!(stderr.contains("--require-margin"), "{stderr}");
    }
    let (code, stderr) = run_gate(
        &cf,
        1.0,
        &[
            "--require-margin",
            "0.9",
            "--set",
            "scan.analyses=[\"radius\"]",
        ],
    );
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("limit analysis"), "{stderr}");
}

#[test]
fn a_full_stderr_is_not_a_panic() {
    // exit 3 with its verdict line written into /dev/full: the write fails,
    // the exit code still tells
    let cf = CaseFile::new("line", LINE);
    let Ok(full) = std::fs::OpenOptions::new().write(true).open("/dev/full") else {
        return; // no /dev/full on this system
    };
    let res = std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
        .current_dir(cf.root())
        .args([
            "run",
            "line.toml",
            "--out",
            "out",
            "--quiet",
            "--require-stable",
        ])
        .args(["--set", "time.courant=2.9"])
        .stderr(full)
        .output()
        .unwrap();
    assert_eq!(res.status.code(), Some(3));
}
