//! The memory estimate of `kgain run` against the measured peak resident memory
//! of the release binary: 1-D, 2-D and 3-D grids, each analysis alone and all
//! together, a long growth horizon, many directions and many kept matrices. The
//! estimate is read from summary.json (`resources.memory_estimate_bytes`), the
//! peak from `/usr/bin/time -f %M` (the kernel's maximum resident set size).
//! Also: a run whose estimate exceeds the address-space limit (`ulimit -v`) is
//! refused with exit 2, a message naming the key and figures, and no output.

#[path = "support/mod.rs"]
mod support;

use std::path::{Path, PathBuf};
use std::process::Command;

/// Estimate over measured peak must lie in [LOW, HIGH].
const LOW: f64 = 0.90;
const HIGH: f64 = 1.25;

fn case(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("cases")
        .join(format!("{name}.toml"))
}

/// Runs one case with `sets` under /usr/bin/time; returns (estimate, peak) in bytes.
fn measure(name: &str, sets: &[&str]) -> (u64, u64) {
    let dir = tempfile::tempdir().expect("temporary folder");
    let out = dir.path().join("out");
    let timing = dir.path().join("peak.txt");
    let mut cmd = Command::new("/usr/bin/time");
    cmd.arg("-f")
        .arg("%M")
        .arg("-o")
        .arg(&timing)
        .arg(env!("CARGO_BIN_EXE_kgain"))
        .arg("run")
        .arg(case(name))
        .arg("--out")
        .arg(&out)
        .arg("--quiet")
        .arg("--threads")
        .arg("2");
    for s in sets {
        cmd.arg("--set").arg(s);
    }
    let status = cmd.status().expect("/usr/bin/time runs kgain");
    assert!(status.success(), "{name} {sets:?}: kgain failed ({status})");
    let kb: u64 = std::fs::read_to_string(&timing)
        .expect("peak written by /usr/bin/time")
        .trim()
        .lines()
        .last()
        .and_then(|l| l.trim().parse().ok())
        .expect("peak in kB");
    let summary: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(out.join("summary.json")).expect("summary.json written"),
    )
    .expect("summary.json parses");
    let est = summary["resources"]["memory_estimate_bytes"]
        .as_u64()
        .expect("resources.memory_estimate_bytes");
    (est, kb * 1024)
}

#[test]
fn estimate_tracks_measured_peak() {
    let table: [(&str, &[&str]); 10] = [
        ("feedline-telegraph", &["scan.points=[2001]"]),
        (
            "feedline-telegraph",
            &["scan.points=[200001]", "scan.analyses=[\"radius\"]"],
        ),
        (
            "feedline-telegraph",
            &["scan.points=[200001]", "scan.analyses=[\"dispersion\"]"],
        ),
        (
            "duct-acoustics",
            &["scan.points=[401,401]", "scan.analyses=[\"growth\"]"],
        ),
        ("duct-acoustics", &["scan.points=[257,257]"]),
        ("lake-rotating-waves", &["scan.points=[129,129]"]),
        (
            "combustor-euler3d",
            &["scan.points=[41,41,41]", "scan.analyses=[\"radius\"]"],
        ),
        (
            "combustor-euler3d",
            &["scan.points=[41,41,41]", "scan.analyses=[\"dispersion\"]"],
        ),
        (
            "duct-acoustics",
            &[
                "scan.points=[9,9]",
                "scan.analyses=[\"growth\"]",
                "scan.steps=400000",
            ],
        ),
        (
            "duct-acoustics",
            &[
                "scan.points=[65,65]",
                "scan.analyses=[\"radius\",\"dispersion\"]",
                "scan.directions=4000",
                "scan.matrices=20000",
            ],
        ),
    ];
    let mut bad = Vec::new();
    eprintln!("| case | keys | estimate (MB) | peak (MB) | ratio |");
    for (name, sets) in table {
        let (est, peak) = measure(name, sets);
        let ratio = est as f64 / peak as f64;
        eprintln!(
            "| {name} | {} | {:.1} | {:.1} | {ratio:.3} |",
            sets.join(" "),
            est as f64 / 1e6,
            peak as f64 / 1e6
        );
        if !(LOW..=HIGH).contains(&ratio) {
            bad.push(format!("{name} {sets:?}: estimate/peak = {ratio:.3}"));
        }
    }
    assert!(bad.is_empty(), "outside [{LOW}, {HIGH}]: {bad:?}");
}

#[test]
fn address_space_limit_refuses_cleanly() {
    let dir = tempfile::tempdir().expect("temporary folder");
    let out = dir.path().join("out");
    let script = format!(
        "ulimit -v 400000; exec '{}' run '{}' --out '{}' --quiet --set 'scan.points=[801,801]' --set 'scan.analyses=[\"dispersion\"]'",
        env!("CARGO_BIN_EXE_kgain"),
        case("duct-acoustics").display(),
        out.display()
    );
    let run = Command::new("sh")
        .arg("-c")
        .arg(&script)
        .output()
        .expect("sh runs");
    let err = String::from_utf8_lossy(&run.stderr);
    assert_eq!(run.status.code(), Some(2), "stderr: {err}");
    assert!(err.contains("scan.points"), "names the key: {err}");
    assert!(err.contains("GiB"), "gives the figures: {err}");
    assert!(
        err.contains("address-space limit"),
        "names the limit: {err}"
    );
    assert!(!out.exists(), "no output folder is left");
}
