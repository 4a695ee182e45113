//! Probing real solvers (`[probe]` cases, `kgain probe compare`): the example
//! programs in examples/probe/ and the fixtures beside this file are Python
//! with numpy, run as a user's program would be.
//!
//! - Linear examples reproduce the G of their case-file description to 1e-10.
//! - The probed limit of the donor-cell step is |ν_x| + |ν_y| ≤ 1 (LeVeque,
//!   Finite Volume Methods for Hyperbolic Problems, 2002, for the 2-D donor-cell
//!   upwind method with positive velocities), within the search's tolerance and
//!   on the safe side; the C-grid forward-backward limit is the closed form
//!   derived below; both agree with the case-file limit.
//! - The deliberate sign error is found; failing, mis-shaped and hanging
//!   programs give exit 1 with their stderr and write nothing; the linearity and
//!   translation checks flag a nonlinear and a variable-coefficient step.

mod library;

use assert_cmd::Command;
use std::path::{Path, PathBuf};

/// The repository's folder.
fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// An example's path.
fn example(name: &str) -> PathBuf {
    root().join("examples/probe").join(name)
}

/// A fixture program's path.
fn fixture(name: &str) -> String {
    root().join("tests/probe").join(name).display().to_string()
}

/// The example programs need python3 with numpy: installed once with pip (as
/// `.ci/run` does) when it is missing, so that `cargo test --release` on a
/// fresh machine with Python 3 and pip runs these tests rather than failing.
fn ensure_numpy() {
    static READY: std::sync::Once = std::sync::Once::new();
    READY.call_once(|| {
        let has = |_: ()| {
            std::process::Command::new("python3")
                .args(["-c", "import numpy"])
                .status()
                .is_ok_and(|s| s.success())
        };
        if has(()) {
            return;
        }
        for extra in [&[][..], &["--user"][..]] {
            let _ = std::process::Command::new("python3")
                .args(["-m", "pip", "install", "--quiet", "--disable-pip-version-check"])
                .args(extra)
                .arg("numpy")
                .status();
            if has(()) {
                return;
            }
        }
        panic!("the probe tests run Python example programs that need numpy: python3 -m pip install numpy");
    });
}

fn kgain() -> Command {
    ensure_numpy();
    Command::cargo_bin("kgain").expect("the kgain binary")
}

/// A 1-D probe case running `script` (a fixture) on `cells` cells.
fn probe_case_1d(dir: &Path, script: &str, extra: &str) -> PathBuf {
    let text = format!(
        r#"name = "fixture-probe"
[probe]
command = ["python3", "{}", "{{input}}", "{{output}}", "{{dt}}"]
variables = ["q"]
cells = [16]
dt = 0.5
timeout = 20
{extra}
"#,
        fixture(script)
    );
    let path = dir.join("probe.toml");
    std::fs::write(&path, text).unwrap();
    path
}

fn summary(out: &Path) -> serde_json::Value {
    serde_json::from_str(&std::fs::read_to_string(out.join("summary.json")).unwrap()).unwrap()
}

/// Donor cell: the probed matrices equal the case file's to rounding, through
/// the command line.
#[test]
fn donor_cell_probe_reproduces_the_case_file_matrices() {
    let out = kgain()
        .args(["probe", "compare"])
        .arg(example("donor-cell.probe.toml"))
        .arg(example("donor-cell.toml"))
        .args(["--tolerance", "1e-10"])
        .assert()
        .code(0);
    let text = String::from_utf8_lossy(&out.get_output().stdout).into_owned();
    assert!(text.contains("SAME"), "{text}");
}

/// C-grid forward-backward shallow water, velocities on the faces: equal to
/// 1e-10 once each variable's phase is taken at its own location.
#[test]
fn cgrid_probe_reproduces_the_case_file_matrices_with_staggered_phases() {
    let out = kgain()
        .args(["probe", "compare"])
        .arg(example("cgrid-shallow-water.probe.toml"))
        .arg(example("cgrid-shallow-water.toml"))
        .args(["--tolerance", "1e-10"])
        .assert()
        .code(0);
    let text = String::from_utf8_lossy(&out.get_output().stdout).into_owned();
    assert!(text.contains("SAME"), "{text}");
    // without the offsets, the u and v phases are half a cell off
    kgain()
        .args(["probe", "compare"])
        .arg(example("cgrid-shallow-water.probe.toml"))
        .arg(example("cgrid-shallow-water.toml"))
        .args([
            "--set",
            "probe.locations=[[0.0, 0.0], [0.0, 0.0], [0.0, 0.0]]",
        ])
        .assert()
        .code(1);
}

/// The deliberate sign error in the v-momentum update is found: exit 1, the
/// difference is in row v, and it is not small.
#[test]
fn probe_compare_finds_the_deliberate_sign_error() {
    let out = kgain()
        .args(["probe", "compare"])
        .arg(example("cgrid-shallow-water-signbug.probe.toml"))
        .arg(example("cgrid-shallow-water.toml"))
        .assert()
        .code(1);
    let text = String::from_utf8_lossy(&out.get_output().stdout).into_owned();
    assert!(
        text.contains("DIFFERENT") && text.contains("row v"),
        "{text}"
    );
    let rel: f64 = text
        .split("relative")
        .next()
        .and_then(|s| s.rsplit('(').next())
        .and_then(|s| s.trim().parse().ok())
        .expect("a relative difference");
    assert!(rel > 0.5, "{text}");
}

/// The donor-cell limit by re-running the program: the bracket holds the
/// closed form 1/(u/Δx + v/Δy) = 1/0.55 s, dt_max is below it by at most the
/// search tolerance, and the case file's exact limit is the same number.
#[test]
fn donor_cell_probed_limit_matches_the_closed_form_and_the_case_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    kgain()
        .arg("run")
        .arg(example("donor-cell.probe.toml"))
        .arg("--out")
        .arg(&out)
        .args(["--quiet", "--set", r#"scan.analyses=["limit"]"#])
        .assert()
        .code(0);
    let s = summary(&out);
    let closed = 1.0 / (0.8 / 2.0 + 0.3 / 2.0);
    let lo = s["limit"]["bracket"][0].as_f64().unwrap();
    let hi = s["limit"]["bracket"][1].as_f64().unwrap();
    assert_eq!(s["limit"]["kind"], "bounded", "{s:#}");
    assert!(lo <= closed && closed < hi, "[{lo}, {hi}] vs {closed}");
    assert!((hi - lo) / hi <= 1e-4, "[{lo}, {hi}]");
    assert_eq!(s["limit"]["dt_max"].as_f64().unwrap(), lo);
    let case = kgain::case::Case::load(&example("donor-cell.toml"), &[]).unwrap();
    let plan = kgain::Plan::new(&[65, 65]).with_limit(kgain::LimitParams { directions: 8 });
    let r = kgain::analyse(&case.problem, &plan, kgain::Par::Seq, &kgain::NoProgress).unwrap();
    let exact = r.limit.unwrap().dt_max;
    assert!(
        (exact - closed).abs() <= 1e-9 * closed,
        "{exact} vs {closed}"
    );
    assert!(lo <= exact && (exact - lo) / exact <= 1e-4);
}

/// C-grid forward-backward: with ω² = gH Σ_d (2 sin(θ_d/2)/Δ_d)², the step's
/// eigenvalues satisfy λ² − (2 − ω²Δt²)λ + 1 = 0, neutral while ωΔt ≤ 2, so
/// Δt_max = 2/ω_max = 1/(√(gH) √(1/Δx² + 1/Δy²)) (θ = (π, π) is on the even
/// grid). The probe's bracket holds it.
#[test]
fn cgrid_probed_limit_matches_the_forward_backward_closed_form() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    kgain()
        .arg("run")
        .arg(example("cgrid-shallow-water.probe.toml"))
        .arg("--out")
        .arg(&out)
        .args(["--quiet", "--set", r#"scan.analyses=["radius", "limit"]"#])
        .assert()
        .code(0);
    let s = summary(&out);
    let c = (9.81_f64 * 12.0).sqrt();
    let closed = 1.0 / (c * (2.0_f64 / 250.0 / 250.0).sqrt());
    let lo = s["limit"]["bracket"][0].as_f64().unwrap();
    let hi = s["limit"]["bracket"][1].as_f64().unwrap();
    assert!(
        lo <= closed * (1.0 + 1e-9) && closed < hi,
        "[{lo}, {hi}] vs {closed}"
    );
    assert!((hi - lo) / hi <= 1e-4);
    assert_eq!(s["radius"]["stable"], true);
    assert_eq!(s["checks"]["valid"], true);
    assert!(
        s["checks"]["linearity"]["figure"].as_f64().unwrap() < 1e-9,
        "{s:#}"
    );
}

/// A program that fails: exit 1, its stderr tail and exit code in the message,
/// nothing written.
#[test]
fn a_failing_program_gives_exit_1_with_its_stderr_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let case = probe_case_1d(dir.path(), "failing.py", "");
    let out = dir.path().join("out");
    let a = kgain()
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(&out)
        .assert()
        .code(1);
    let err = String::from_utf8_lossy(&a.get_output().stderr).into_owned();
    assert!(err.contains("exited with code 3"), "{err}");
    assert!(err.contains("kestrel-bank.nc"), "{err}");
    assert!(err.contains("nothing was written"), "{err}");
    assert!(!out.exists());
}

/// A program that writes the wrong shape, and one that hangs: exit 1, named.
#[test]
fn wrong_shape_and_timeout_are_reported() {
    let dir = tempfile::tempdir().unwrap();
    let case = probe_case_1d(dir.path(), "wrong_shape.py", "");
    let a = kgain()
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(dir.path().join("out"))
        .assert()
        .code(1);
    let err = String::from_utf8_lossy(&a.get_output().stderr).into_owned();
    assert!(
        err.contains("shape [1, 15]") && err.contains("[1, 16]"),
        "{err}"
    );
    let case = probe_case_1d(dir.path(), "sleepy.py", "");
    let started = std::time::Instant::now();
    let a = kgain()
        .arg("run")
        .arg(&case)
        .args(["--set", "probe.timeout=1"])
        .arg("--out")
        .arg(dir.path().join("out"))
        .assert()
        .code(1);
    let err = String::from_utf8_lossy(&a.get_output().stderr).into_owned();
    assert!(err.contains("probe.timeout = 1 s"), "{err}");
    assert!(started.elapsed().as_secs() < 30);
    assert!(!dir.path().join("out").exists());
}

/// Upwinding by the sign of the local value about a zero base: the linearity
/// check fails (exit 1, reported in the table and summary.json).
#[test]
fn the_linearity_check_flags_a_nonlinear_step() {
    let dir = tempfile::tempdir().unwrap();
    let case = probe_case_1d(
        dir.path(),
        "sign_upwind.py",
        "[scan]\nanalyses = [\"radius\"]\n",
    );
    let out = dir.path().join("out");
    let a = kgain()
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(&out)
        .assert()
        .code(1);
    let text = String::from_utf8_lossy(&a.get_output().stdout).into_owned();
    assert!(text.contains("linearity     FAILED"), "{text}");
    let s = summary(&out);
    assert_eq!(s["checks"]["linearity"]["passed"], false);
    assert!(
        s["checks"]["linearity"]["figure"].as_f64().unwrap() > 0.1,
        "{s:#}"
    );
    assert_eq!(s["checks"]["translation"]["passed"], true);
    assert_eq!(s["checks"]["valid"], false);
}

/// A speed that varies along x: the translation check fails.
#[test]
fn the_translation_check_flags_a_variable_coefficient() {
    let dir = tempfile::tempdir().unwrap();
    let case = probe_case_1d(
        dir.path(),
        "varying_speed.py",
        "[scan]\nanalyses = [\"radius\"]\n",
    );
    let out = dir.path().join("out");
    kgain()
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(&out)
        .assert()
        .code(1);
    let s = summary(&out);
    assert_eq!(s["checks"]["linearity"]["passed"], true);
    assert_eq!(s["checks"]["translation"]["passed"], false);
    assert!(s["checks"]["translation"]["figure"].as_f64().unwrap() > 1e-3);
}

/// The output folder of a probe: the manifest lists the grid's wavevectors
/// 2πj/N (ascending), G with its shape, the maps and the limit search; the
/// radius map equals |1 − ν(1 − e^{−iθ})| of 1-D upwind at ν = 0.5.
#[test]
fn probe_output_folder_holds_the_measured_matrices_and_maps() {
    let dir = tempfile::tempdir().unwrap();
    let case = probe_case_1d(dir.path(), "upwind_1d.py", "");
    let out = dir.path().join("out");
    kgain()
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(&out)
        .arg("--quiet")
        .assert()
        .code(0);
    let manifest: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("manifest.json")).unwrap()).unwrap();
    let arrays = &manifest["arrays"];
    assert_eq!(
        arrays["amplification"]["shape"],
        serde_json::json!([16, 1, 1])
    );
    for name in [
        "theta_x",
        "radius",
        "growth_envelope",
        "omega",
        "limit_search",
    ] {
        assert!(arrays[name].is_object(), "{name} missing: {manifest:#}");
    }
    let theta: ndarray::Array1<f64> = ndarray_npy::read_npy(out.join("theta_x.npy")).unwrap();
    let radius: ndarray::Array1<f64> = ndarray_npy::read_npy(out.join("radius.npy")).unwrap();
    for (j, (t, r)) in theta.iter().zip(&radius).enumerate() {
        let want_t = 2.0 * std::f64::consts::PI * (j as f64 - 8.0) / 16.0;
        assert!((t - want_t).abs() < 1e-15);
        let g = num_complex::Complex64::new(1.0, 0.0)
            - 0.5
                * (num_complex::Complex64::new(1.0, 0.0)
                    - num_complex::Complex64::from_polar(1.0, -t));
        assert!(
            (r - g.norm()).abs() < 1e-12,
            "theta {t}: {r} vs {}",
            g.norm()
        );
    }
    let s = summary(&out);
    assert_eq!(s["kind"], "probe");
    assert_eq!(s["limit"]["kind"], "bounded");
    let lo = s["limit"]["dt_max"].as_f64().unwrap();
    assert!(lo <= 1.0 && lo > 1.0 - 1e-4, "{lo}");
    assert!(std::fs::metadata(out.join("radius.png")).unwrap().len() > 1000);
}

/// Bad probe cases: exit 2 naming the file, the line and the key.
#[test]
fn malformed_probe_cases_name_the_key_and_line() {
    let dir = tempfile::tempdir().unwrap();
    let cases = [
        (
            "[probe]\ncommand = [\"python3\", \"step.py\"]\nvariables = [\"q\"]\ncells = [8]\ndt = 1.0\n",
            "probe.command",
            2,
        ),
        (
            "[probe]\ncommand = [\"p\", \"{input}\", \"{output}\"]\nvariables = [\"q\"]\ncells = [8]\ndt = 1.0\ncourant = 0.5\n",
            "probe.courant",
            6,
        ),
        (
            "[probe]\ncommand = [\"p\", \"{input}\", \"{output}\"]\nvariables = [\"q\"]\ncells = [8]\ndt = 1.0\ntimeout_s = 5\n",
            "probe.timeout_s",
            6,
        ),
        (
            "[probe]\ncommand = [\"p\", \"{input}\", \"{output}\"]\nvariables = [\"q\", \"q\"]\ncells = [8]\ndt = 1.0\n",
            "probe.variables",
            3,
        ),
        (
            "[probe]\ncommand = [\"p\", \"{input}\", \"{output}\"]\nvariables = [\"h\"]\ncells = [8]\ndt = 1.0\n[model]\nkind = \"advection\"\nvelocity = [1.0]\n",
            "probe.variables",
            3,
        ),
    ];
    for (i, (text, key, line)) in cases.iter().enumerate() {
        let path = dir.path().join(format!("bad{i}.toml"));
        std::fs::write(&path, text).unwrap();
        let a = kgain()
            .arg("run")
            .arg(&path)
            .arg("--out")
            .arg(dir.path().join("out"))
            .assert()
            .code(2);
        let err = String::from_utf8_lossy(&a.get_output().stderr).into_owned();
        assert!(
            err.contains(&format!("bad{i}.toml:{line}:")),
            "case {i}: {err}"
        );
        assert!(err.contains(key), "case {i}: {err}");
        assert!(!dir.path().join("out").exists());
    }
}
