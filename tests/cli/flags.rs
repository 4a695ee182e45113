//! Flags of `kgain run`: --require-stable, --quiet, --json, --set, --threads, and
//! the human summary on stdout.

use super::*;

#[test]
fn require_stable_exits_three_when_unstable_and_zero_when_stable() {
    // RK4 + C2 (a = h = 1, 1D): stable iff ν ≤ 2√2 = 2.8284… (Hairer & Wanner, Solving ODEs II).
    let cf = CaseFile::new("line", support::RK4_LINE);
    for (nu, code) in [(2.82, 0), (2.84, 3)] {
        let res = kgain()
            .current_dir(cf.root())
            .args([
                "run",
                "line.toml",
                "--out",
                "out",
                "--require-stable",
                "--quiet",
            ])
            .args(["--set", &format!("time.courant={nu}")])
            .output()
            .unwrap();
        assert_eq!(
            res.status.code(),
            Some(code),
            "ν = {nu}: {}",
            String::from_utf8_lossy(&res.stderr)
        );
        // Without the flag an unstable scheme is a result, not an error.
        let res = kgain()
            .current_dir(cf.root())
            .args(["run", "line.toml", "--out", "out", "--quiet"])
            .args(["--set", &format!("time.courant={nu}")])
            .output()
            .unwrap();
        assert_eq!(
            res.status.code(),
            Some(0),
            "ν = {nu} without --require-stable"
        );
    }
    // Heun + C2 has no stable Δt at all (Hairer & Wanner, Solving ODEs II): exit 3.
    let res = kgain()
        .current_dir(cf.root())
        .args([
            "run",
            "line.toml",
            "--out",
            "out",
            "--require-stable",
            "--set",
            "time.method=heun",
        ])
        .output()
        .unwrap();
    assert_eq!(res.status.code(), Some(3));
}

#[test]
fn quiet_prints_nothing_on_stdout_on_success() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, stdout) = run_ok(&cf, &["--quiet"]);
    assert!(stdout.is_empty(), "stdout: {stdout}");
    assert!(
        out.join("summary.json").exists(),
        "the output is still written"
    );
}

#[test]
fn human_summary_reports_the_limit_on_stdout() {
    let cf = CaseFile::new("tiny", TINY);
    let (_, stdout) = run_ok(&cf, &[]);
    assert!(
        stdout.contains("tiny") && stdout.contains("rk4"),
        "{stdout}"
    );
    // The "largest dt" row carries the Courant limit ν_max = sΔt_max/h.
    let row = stdout
        .lines()
        .find(|l| l.contains("largest dt"))
        .unwrap_or_else(|| panic!("no largest-dt row: {stdout}"));
    let after = row
        .split("Courant")
        .nth(1)
        .unwrap_or_else(|| panic!("no Courant in `{row}`"));
    let token: String = after
        .trim_start()
        .chars()
        .take_while(|c| c.is_ascii_digit() || *c == '.' || *c == 'e' || *c == '-')
        .collect();
    let printed: f64 = token
        .parse()
        .unwrap_or_else(|_| panic!("`{token}` in `{row}`"));
    let decimals = token.split_once('.').map_or(0, |(_, d)| d.len()) as i32;
    assert_close(
        printed,
        tiny_dt_max() / 0.5,
        quoted(printed, decimals),
        "ν_max as printed",
    );
}

#[test]
fn json_flag_prints_the_summary_written_to_the_folder() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, stdout) = run_ok(&cf, &["--json"]);
    let printed = assert_strict_json(&stdout, "stdout");
    assert_eq!(printed, read_json(&out.join("summary.json")));
}

#[test]
fn set_courant_override_changes_the_reported_courant_and_time_step() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &["--set", "time.courant=0.37"]);
    let s = read_json(&out.join("summary.json"));
    assert_close(s["courant"].as_f64().unwrap(), 0.37, 4.0 * EPS, "ν");
    assert_close(
        s["dt"].as_f64().unwrap(),
        0.37 * 0.5 / 1.0,
        4.0 * EPS,
        "Δt = ν h/s",
    );
    // Setting dt replaces the courant of the file (exactly one of the two).
    let (out, _) = run_ok(&cf, &["--set", "time.dt=0.125"]);
    let s = read_json(&out.join("summary.json"));
    assert_close(s["dt"].as_f64().unwrap(), 0.125, 0.0, "Δt as set");
    assert_close(
        s["courant"].as_f64().unwrap(),
        0.125 * 1.0 / 0.5,
        4.0 * EPS,
        "ν = sΔt/h",
    );
    assert_eq!(s["dt_given_as"], "dt");
}

#[test]
fn thread_count_does_not_change_any_output() {
    // Sequential and parallel sweeps are bit-identical.
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &["--threads", "1"]);
    let one: Vec<Vec<u8>> = ["radius.npy", "limit_by_direction.npy", "summary.json"]
        .iter()
        .map(|f| std::fs::read(out.join(f)).unwrap())
        .collect();
    let (out, _) = run_ok(&cf, &["--threads", "2"]);
    for (f, bytes) in ["radius.npy", "limit_by_direction.npy", "summary.json"]
        .iter()
        .zip(one)
    {
        assert_eq!(
            std::fs::read(out.join(f)).unwrap(),
            bytes,
            "{f} differs between 1 and 2 threads"
        );
    }
}

#[test]
fn summary_table_and_json_report_the_same_numbers() {
    // The table prints dt_max to 10 significant digits and the Courant limit to
    // 10 decimals; both must be the values in summary.json.
    let cf = CaseFile::new("tiny", TINY);
    let (_, table) = run_ok(&cf, &[]);
    let (out, _) = run_ok(&cf, &["--json"]);
    let s = read_json(&out.join("summary.json"));
    let line = table
        .lines()
        .find(|l| l.trim_start().starts_with("largest dt"))
        .expect("a largest-dt row");
    let field = |name: &str| -> f64 {
        let rest = &line[line.find(name).expect("field present") + name.len()..];
        rest.trim_start_matches([' ', '='])
            .split([',', ' '])
            .next()
            .unwrap()
            .parse()
            .expect("a number")
    };
    let dt = s["limit"]["dt_max"].as_f64().unwrap();
    let nu = s["limit"]["courant_max"].as_f64().unwrap();
    assert_close(field("dt_max"), dt, 1e-9, "dt_max in the table");
    assert_close(field("Courant"), nu, 1e-9, "Courant limit in the table");
    let verdict = if s["radius"]["stable"].as_bool().unwrap() {
        "STABLE"
    } else {
        "UNSTABLE"
    };
    assert!(
        table.contains(&format!("{verdict}:")),
        "verdict {verdict} in the table"
    );
}
