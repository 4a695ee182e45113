//! Extreme numbers and sizes: every value that would overflow a derived
//! quantity (reference speed, Courant number, the entries of L, Δt‖L‖) and every
//! count beyond a cap is refused with exit 2 naming the key — promptly, without
//! a panic, and never turned into a verdict.

use super::*;
use std::time::Duration;

/// Runs `kgain run` on `text` with a time limit; returns (exit code, stderr).
fn run_limited(text: &str, extra: &[&str]) -> (Option<i32>, String) {
    let cf = CaseFile::new("case", text);
    let out = kgain()
        .current_dir(cf.root())
        .args(["run", "case.toml", "--out", "out", "--quiet"])
        .args(extra)
        .timeout(Duration::from_secs(20))
        .output()
        .unwrap();
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn case_1d(model: &str, time: &str, scan: &str) -> String {
    format!("[grid]\nspacing = [1.0]\n[model]\n{model}\n[time]\n{time}\n[scan]\npoints = [17]\n{scan}\n")
}

#[track_caller]
fn assert_refused_naming(text: &str, extra: &[&str], key: &str) {
    let (code, stderr) = run_limited(text, extra);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(!stderr.contains("panicked"), "{stderr}");
    assert!(stderr.contains(key), "the message names `{key}`: {stderr}");
}

#[test]
fn overflowing_derived_quantities_are_refused_naming_the_key() {
    let adv = |v: &str| format!("kind = \"advection\"\nvelocity = [{v}]");
    // a reference speed of 1e300 with dt = 1: Courant number 1e300
    let t = case_1d(&adv("1e300"), "method = \"rk4\"\ndt = 1.0", "");
    assert_refused_naming(&t, &[], "time.dt");
    // leapfrog at dt = 1e308
    let t = case_1d(&adv("1.0"), "method = \"leapfrog\"\ndt = 1e308", "");
    assert_refused_naming(&t, &[], "time.dt");
    // a spacing of 5e-324 makes 1/h infinite
    let t = case_1d(&adv("1.0"), "method = \"rk4\"\ncourant = 0.5", "")
        .replace("spacing = [1.0]", "spacing = [5e-324]");
    assert_refused_naming(&t, &[], "grid.spacing");
    // dissipation 1e308 makes dt‖L‖ astronomical
    let t = case_1d(&adv("1.0"), "method = \"rk4\"\ncourant = 0.5", "").replace(
        "[time]",
        "[space]\ndissipation = { order = 4, strength = 1e308 }\n[time]",
    );
    assert_refused_naming(&t, &[], "space.dissipation.strength");
    // a density of 1e-320 gives 1/rho = inf in the Euler flux
    let euler = "kind = \"euler\"\ndensity = 1e-320\npressure = 1.0\nvelocity = [0.5]";
    let t = case_1d(euler, "method = \"rk4\"\ncourant = 0.5", "");
    assert_refused_naming(&t, &[], "model");
    // a linear system with denormal entries: dt = nu h / s overflows
    let lin =
        "kind = \"linear\"\nvariables = [\"a\", \"b\"]\nflux = [[[0.0, 1e-310], [1e-310, 0.0]]]";
    let t = case_1d(lin, "method = \"leapfrog\"\ncourant = 0.5", "");
    assert_refused_naming(&t, &[], "time.courant");
}

#[test]
fn large_but_representable_values_still_run() {
    // velocity 1e200 with a Courant number: dt = 1e-200, every derived number finite
    let t = case_1d(
        "kind = \"advection\"\nvelocity = [1e200]",
        "method = \"rk4\"\ncourant = 0.5",
        "analyses = [\"radius\", \"limit\"]",
    );
    let (code, stderr) = run_limited(&t, &[]);
    assert_eq!(code, Some(0), "{stderr}");
}

#[test]
fn a_huge_mean_flow_keeps_its_courant_limit() {
    // Acoustics with u = 1e300 ≫ c: L has entries near 1e300, whose squares
    // overflow. The Courant limit (in s = |u| + c) must be the one of u = 1e12,
    // where c is already negligible: once, the overflowing rounding level
    // zeroed every eigenvalue and the limit came out 1e298 times too large.
    let courant = |u: &str| {
        let t = format!(
            "[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"acoustics\"\nsound_speed = 1.0\nvelocity = [{u}, 0.0]\n[time]\nmethod = \"rk4\"\ncourant = 0.5\n[scan]\npoints = [17, 17]\nanalyses = [\"limit\"]\n"
        );
        let cf = CaseFile::new("case", &t);
        let (out, _) = run_ok(&cf, &["--quiet"]);
        let s = read_json(&out.join("summary.json"));
        s["limit"]["courant_max"]
            .as_f64()
            .expect("a bounded Courant limit")
    };
    let (huge, big) = (courant("1e300"), courant("1e12"));
    assert_close(huge, big, 1e-6, "Courant limit at u = 1e300 vs 1e12");
    // RK4 + C2 along x: 2√2 (Hairer & Wanner II), set by the flow
    assert_close(big, 2.0 * SQRT_2, 1e-6, "Courant limit at u = 1e12");
}

#[test]
fn counts_beyond_their_caps_are_refused_with_the_figure() {
    let base = |scan: &str| {
        case_1d(
            "kind = \"advection\"\nvelocity = [1.0]",
            "method = \"rk4\"\ncourant = 0.5",
            scan,
        )
    };
    assert_refused_naming(&base("steps = 9223372036854775807"), &[], "scan.steps");
    assert_refused_naming(
        &base("matrices = 9223372036854775807"),
        &[],
        "scan.matrices",
    );
    let sphere = "[grid]\nspacing = [1.0, 1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0, 0.0, 0.0]\n[time]\nmethod = \"rk4\"\ncourant = 0.5\n[scan]\npoints = [5, 5, 5]\ndirections = 9007199254740992\n";
    assert_refused_naming(sphere, &[], "scan.directions");
    let wide = base("").replace("points = [17]", "points = [9223372036854775807]");
    assert_refused_naming(&wide, &[], "scan.points");
    let (code, stderr) = run_limited(&base(""), &["--threads", "100000"]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("--threads"), "{stderr}");
}
