//! `kgain sweep` and `kgain merge` (README: Parameter sweeps): shards merge into
//! exactly the unsharded output, foreign and missing shards are refused, a
//! sweep over the time method reproduces single runs and the published ratio
//! of the RK4 and SSP-RK3 limits, and bad arguments exit 2 naming themselves.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn kgain(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_kgain"))
        .args(args)
        .output()
        .expect("kgain runs")
}

fn case(name: &str) -> String {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join(name)
        .display()
        .to_string()
}

/// Every file of a folder (hidden ones included) and its bytes.
fn files(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| {
            let e = e.unwrap();
            (
                e.file_name().to_string_lossy().into_owned(),
                std::fs::read(e.path()).unwrap(),
            )
        })
        .collect()
}

const VARY: [&str; 4] = [
    "--vary",
    "model.mach=0:0.9:4",
    "--vary",
    "model.flow_angle_deg=0,30",
];

fn sweep(out: &Path, extra: &[&str]) -> Output {
    let tunnel = case("cases/tunnel-euler-mach.toml");
    let mut args = vec!["sweep", tunnel.as_str()];
    args.extend(VARY);
    args.extend(["--set", "scan.points=[17,17]", "--quiet", "--out"]);
    let out = out.display().to_string();
    args.push(&out);
    args.extend(extra);
    kgain(&args)
}

#[test]
fn merged_shards_equal_the_unsharded_sweep_byte_for_byte() {
    let tmp = tempfile::tempdir().unwrap();
    let whole = tmp.path().join("whole");
    let r = sweep(&whole, &[]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let mut shards = Vec::new();
    for i in [3, 1, 2] {
        let dir = tmp.path().join(format!("shard{i}"));
        let r = sweep(&dir, &["--shard", &format!("{i}/3"), "--threads", "1"]);
        assert_eq!(
            r.status.code(),
            Some(0),
            "{}",
            String::from_utf8_lossy(&r.stderr)
        );
        shards.push(dir.display().to_string());
    }
    // a re-run shard gives identical bytes, also with more threads than its
    // combinations (then each combination runs parallel over wavevectors)
    let again = tmp.path().join("again");
    sweep(&again, &["--shard", "1/3", "--threads", "4"]);
    assert_eq!(
        files(&again)["shard.npy"],
        files(&tmp.path().join("shard1"))["shard.npy"]
    );
    let merged = tmp.path().join("merged");
    let mut args = vec!["merge"];
    args.extend(shards.iter().map(String::as_str));
    let m = merged.display().to_string();
    args.extend(["--out", m.as_str(), "--quiet"]);
    let r = kgain(&args);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let (a, b) = (files(&whole), files(&merged));
    assert_eq!(a.keys().collect::<Vec<_>>(), b.keys().collect::<Vec<_>>());
    for (name, bytes) in &a {
        assert!(
            bytes == &b[name],
            "{name} differs between the sweep and the merge"
        );
    }
    for f in [
        "limit_courant_max.npy",
        "sweep.csv",
        "sweep.json",
        "manifest.json",
    ] {
        assert!(a.contains_key(f), "{f} missing");
    }
}

#[test]
fn foreign_and_missing_shards_are_refused_with_exit_2() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = |n: &str| tmp.path().join(n).display().to_string();
    for i in 1..=2 {
        sweep(
            Path::new(&dir(&format!("s{i}"))),
            &["--shard", &format!("{i}/3")],
        );
    }
    let r = kgain(&["merge", &dir("s1"), &dir("s2"), "--out", &dir("m")]);
    assert_eq!(r.status.code(), Some(2));
    let err = String::from_utf8_lossy(&r.stderr);
    assert!(err.contains("shards missing: 3 of 3"), "{err}");
    assert!(!tmp.path().join("m").exists());
    // shard 3 of a sweep over other values
    let tunnel = case("cases/tunnel-euler-mach.toml");
    let other = dir("s3");
    let r = kgain(&[
        "sweep",
        &tunnel,
        "--vary",
        "model.mach=0:0.9:5",
        "--vary",
        "model.flow_angle_deg=0,30",
        "--set",
        "scan.points=[17,17]",
        "--shard",
        "3/3",
        "--quiet",
        "--out",
        &other,
    ]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let r = kgain(&["merge", &dir("s1"), &dir("s2"), &other, "--out", &dir("m")]);
    assert_eq!(r.status.code(), Some(2));
    let err = String::from_utf8_lossy(&r.stderr);
    assert!(err.contains("belongs to a different sweep"), "{err}");
    let r = kgain(&["merge", &dir("s1"), &dir("s1"), "--out", &dir("m")]);
    assert_eq!(r.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&r.stderr).contains("given twice"));
    let r = kgain(&["merge", &tunnel, "--out", &dir("m")]);
    assert_eq!(r.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&r.stderr).contains("not a kgain sweep shard"));
}

fn single_limit(method: &str) -> f64 {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("run").display().to_string();
    let peer = case("bench/peer-euler2d.toml");
    let m = format!("time.method={method}");
    let r = kgain(&[
        "run",
        &peer,
        "--set",
        "scan.points=[33,33]",
        "--set",
        &m,
        "--set",
        "scan.analyses=[\"limit\"]",
        "--quiet",
        "--out",
        &out,
    ]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let s: serde_json::Value =
        serde_json::from_slice(&std::fs::read(tmp.path().join("run/summary.json")).unwrap())
            .unwrap();
    s["limit"]["dt_max"].as_f64().unwrap()
}

#[test]
fn a_sweep_over_the_method_reproduces_single_runs_and_the_rk_ratio() {
    // C4 central differences on linearised Euler: eig L is imaginary, so the
    // limit is each method's imaginary-axis interval over the largest |eig L|:
    // SSP-RK3 √3 (Gottlieb & Shu 1998) against RK4 2√2 (Hairer & Wanner; common
    // practice), a ratio of √3/(2√2).
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("methods");
    let peer = case("bench/peer-euler2d.toml");
    let o = out.display().to_string();
    let r = kgain(&[
        "sweep",
        &peer,
        "--vary",
        "time.method=rk4,ssprk3",
        "--figures",
        "limit.dt_max,limit.kind_is_missing",
        "--set",
        "scan.points=[33,33]",
        "--quiet",
        "--out",
        &o,
    ]);
    assert_eq!(r.status.code(), Some(2), "an unknown figure is refused");
    assert!(String::from_utf8_lossy(&r.stderr).contains("limit.kind_is_missing"));
    let r = kgain(&[
        "sweep",
        &peer,
        "--vary",
        "time.method=rk4,ssprk3",
        "--figures",
        "limit.dt_max",
        "--set",
        "scan.points=[33,33]",
        "--quiet",
        "--out",
        &o,
    ]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let csv = std::fs::read_to_string(out.join("sweep.csv")).unwrap();
    let rows: Vec<Vec<&str>> = csv
        .lines()
        .skip(1)
        .map(|l| l.split(',').collect())
        .collect();
    assert_eq!(rows[0][0], "rk4");
    assert_eq!(rows[1][0], "ssprk3");
    let rk4: f64 = rows[0][1].parse().unwrap();
    let ssp: f64 = rows[1][1].parse().unwrap();
    assert_eq!(
        rk4,
        single_limit("rk4"),
        "the sweep's RK4 limit is the single run's"
    );
    assert_eq!(
        ssp,
        single_limit("ssprk3"),
        "the sweep's SSP-RK3 limit is the single run's"
    );
    let want = 3f64.sqrt() / (2.0 * 2f64.sqrt());
    assert!(
        (ssp / rk4 - want).abs() <= 1e-9 * want,
        "{} vs {want}",
        ssp / rk4
    );
}

#[test]
fn array_elements_can_be_varied() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("velocity");
    let peer = case("bench/peer-euler2d.toml");
    let o = out.display().to_string();
    let r = kgain(&[
        "sweep",
        &peer,
        "--vary",
        "model.velocity[0]=0,0.5",
        "--figures",
        "reference_speed",
        "--set",
        "scan.points=[9,9]",
        "--quiet",
        "--out",
        &o,
    ]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let csv = std::fs::read_to_string(out.join("sweep.csv")).unwrap();
    // s = |u| + c with c = √(γp/ρ) = 1 and u = (u0, 0.2)
    let speeds: Vec<f64> = csv
        .lines()
        .skip(1)
        .map(|l| l.split(',').nth(1).unwrap().parse().unwrap())
        .collect();
    assert!((speeds[0] - 1.2).abs() < 1e-12, "{speeds:?}");
    assert!(
        (speeds[1] - (1.0 + (0.25f64 + 0.04).sqrt())).abs() < 1e-12,
        "{speeds:?}"
    );
}

#[test]
fn bad_arguments_exit_2_naming_themselves() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("x").display().to_string();
    let peer = case("bench/peer-euler2d.toml");
    for (args, named) in [
        (vec!["--vary", "model.mach=0:1"], "--vary 'model.mach=0:1'"),
        (vec!["--vary", "mach=1,2"], "--vary 'mach=1,2'"),
        (vec!["--vary", "time.courant=0.5,0.5"], "listed twice"),
        (
            vec!["--vary", "time.courant=0.5", "--shard", "5/4"],
            "--shard '5/4'",
        ),
        (
            vec!["--vary", "time.courant=0.5", "--figures", "limit..dt"],
            "limit..dt",
        ),
        (
            vec!["--vary", "time.courant=0.5,-1"],
            "combination 1 (time.courant=-1)",
        ),
        (
            vec!["--vary", "time.method=rk4,rk5"],
            "combination 1 (time.method=rk5)",
        ),
        (vec!["--vary", "model.velocity[7]=1"], "model.velocity[7]"),
    ] {
        let mut all = vec!["sweep", peer.as_str()];
        all.extend(args.iter().copied());
        all.extend(["--quiet", "--out", out.as_str()]);
        let r = kgain(&all);
        let err = String::from_utf8_lossy(&r.stderr);
        assert_eq!(r.status.code(), Some(2), "{args:?}: {err}");
        assert!(err.contains(named), "{args:?}: {err}");
        assert!(!Path::new(&out).exists(), "{args:?} wrote output");
    }
}

#[test]
fn combinations_run_at_once_must_fit_in_memory_together() {
    // under an address-space limit of ~390 MB, four 513^2 combinations at a
    // time do not fit (each fits alone): refused before anything runs, exit 2
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("mem");
    let tunnel = case("cases/tunnel-euler-mach.toml");
    let script = format!(
        "ulimit -v 400000; exec {} sweep {} --vary model.mach=0:0.9:4 --set 'scan.points=[513,513]' --threads 4 --quiet --out {}",
        env!("CARGO_BIN_EXE_kgain"),
        tunnel,
        out.display()
    );
    let r = Command::new("sh").arg("-c").arg(&script).output().unwrap();
    let err = String::from_utf8_lossy(&r.stderr);
    assert_eq!(r.status.code(), Some(2), "{err}");
    assert!(
        err.contains("--threads 4: 4 combinations at a time"),
        "{err}"
    );
    assert!(!out.exists());
}

#[test]
fn the_terminal_names_each_figures_extremes_and_the_cautions() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("t").display().to_string();
    let peer = case("bench/peer-euler2d.toml");
    let r = kgain(&[
        "sweep",
        &peer,
        "--vary",
        "time.method=rk4,ssprk3",
        "--figures",
        "limit.courant_max",
        "--set",
        "scan.points=[17,17]",
        "--out",
        &out,
    ]);
    assert_eq!(
        r.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&r.stderr)
    );
    let text = String::from_utf8_lossy(&r.stdout);
    // SSP-RK3 has the smaller imaginary-axis interval (√3 against 2√2)
    assert!(text.contains("limit.courant_max"), "{text}");
    assert!(text.contains("at (time.method=ssprk3), max"), "{text}");
    assert!(text.contains("at (time.method=rk4)\n"), "{text}");
    assert!(text.contains("necessary condition"), "{text}");
    assert!(text.contains("safety margin"), "{text}");
}
