//! The exit-code matrix of `kgain`, one row per documented code and command
//! (see src/main.rs: 0 success, 1 any other failure, 2 invalid case, usage or
//! refused destination, 3 unstable with --require-stable), each run in its own
//! temporary folder and each asserting the exact code.

#[path = "support/mod.rs"]
mod support;

use std::path::Path;
use std::process::Command;
use support::RK4_LINE as LINE;

/// One row of the matrix: a name, the arguments, the exit code.
struct Row {
    name: &'static str,
    args: &'static [&'static str],
    code: i32,
}

const ROWS: &[Row] = &[
    // 0: success.
    Row {
        name: "check a valid case",
        args: &["check", "line.toml"],
        code: 0,
    },
    Row {
        name: "run a valid case",
        args: &["run", "line.toml", "--out", "out", "--quiet"],
        code: 0,
    },
    Row {
        name: "run stable with --require-stable",
        args: &[
            "run",
            "line.toml",
            "--out",
            "out",
            "--quiet",
            "--require-stable",
            "--set",
            "time.courant=2.82",
        ],
        code: 0,
    },
    Row {
        name: "run unstable without --require-stable",
        args: &[
            "run",
            "line.toml",
            "--out",
            "out",
            "--quiet",
            "--set",
            "time.courant=2.84",
        ],
        code: 0,
    },
    Row {
        name: "list everything",
        args: &["list"],
        code: 0,
    },
    Row {
        name: "list methods",
        args: &["list", "methods"],
        code: 0,
    },
    Row {
        name: "help",
        args: &["--help"],
        code: 0,
    },
    Row {
        name: "version",
        args: &["--version"],
        code: 0,
    },
    // 1: a failure that is not the user's input.
    Row {
        name: "run into a folder that cannot be made",
        args: &[
            "run",
            "line.toml",
            "--out",
            "/proc/kgain-exit-codes/out",
            "--quiet",
        ],
        code: 1,
    },
    // 2: invalid case.
    Row {
        name: "check a missing case",
        args: &["check", "nowhere.toml"],
        code: 2,
    },
    Row {
        name: "check a malformed case",
        args: &["check", "bad.toml"],
        code: 2,
    },
    Row {
        name: "run a malformed case",
        args: &["run", "bad.toml", "--out", "out"],
        code: 2,
    },
    Row {
        name: "check with a bad --set",
        args: &["check", "line.toml", "--set", "time.courant"],
        code: 2,
    },
    Row {
        name: "check with an invalid --set value",
        args: &["check", "line.toml", "--set", "time.courant=-1"],
        code: 2,
    },
    // 2: usage.
    Row {
        name: "no command",
        args: &[],
        code: 2,
    },
    Row {
        name: "unknown command",
        args: &["inspect", "line.toml"],
        code: 2,
    },
    Row {
        name: "unknown flag of run",
        args: &["run", "line.toml", "--fast"],
        code: 2,
    },
    Row {
        name: "unknown flag of check",
        args: &["check", "line.toml", "--out", "out"],
        code: 2,
    },
    Row {
        name: "check without its case",
        args: &["check"],
        code: 2,
    },
    Row {
        name: "run without its case",
        args: &["run"],
        code: 2,
    },
    Row {
        name: "--out without its folder",
        args: &["run", "line.toml", "--out"],
        code: 2,
    },
    Row {
        name: "list of an unknown kind",
        args: &["list", "schemes"],
        code: 2,
    },
    Row {
        name: "--threads 0",
        args: &["run", "line.toml", "--out", "out", "--threads", "0"],
        code: 2,
    },
    Row {
        name: "--threads not a number",
        args: &["run", "line.toml", "--out", "out", "--threads", "many"],
        code: 2,
    },
    // 2: refused destination.
    Row {
        name: "run into a file",
        args: &["run", "line.toml", "--out", "line.toml"],
        code: 2,
    },
    Row {
        name: "run into a folder kgain did not write",
        args: &["run", "line.toml", "--out", "mine"],
        code: 2,
    },
    // 3: unstable with --require-stable.
    Row {
        name: "run unstable with --require-stable",
        args: &[
            "run",
            "line.toml",
            "--out",
            "out",
            "--quiet",
            "--require-stable",
            "--set",
            "time.courant=2.84",
        ],
        code: 3,
    },
];

/// A folder with `line.toml`, a malformed `bad.toml` and a folder `mine/` of the
/// user's own.
fn workspace(root: &Path) {
    std::fs::write(root.join("line.toml"), LINE).unwrap();
    std::fs::write(root.join("bad.toml"), LINE.replace("courant", "corant")).unwrap();
    std::fs::create_dir(root.join("mine")).unwrap();
    std::fs::write(root.join("mine/thesis.txt"), "my own file").unwrap();
}

#[test]
fn every_documented_exit_code_per_command() {
    let mut wrong = Vec::new();
    for row in ROWS {
        let dir = tempfile::tempdir().unwrap();
        workspace(dir.path());
        let out = Command::new(env!("CARGO_BIN_EXE_kgain"))
            .current_dir(dir.path())
            .args(row.args)
            .output()
            .unwrap();
        let stderr = String::from_utf8_lossy(&out.stderr);
        if out.status.code() != Some(row.code) {
            wrong.push(format!(
                "{}: kgain {}: exit {:?}, want {}; stderr: {stderr}",
                row.name,
                row.args.join(" "),
                out.status.code(),
                row.code
            ));
        }
        if row.code == 1 || row.code == 2 {
            assert!(
                !stderr.trim().is_empty(),
                "{}: exit {} without a message",
                row.name,
                row.code
            );
        }
        assert!(!stderr.contains("panicked"), "{}: {stderr}", row.name);
    }
    assert!(wrong.is_empty(), "{}", wrong.join("\n"));
}

#[test]
fn the_matrix_covers_every_code_and_command() {
    for code in 0..=3 {
        assert!(
            ROWS.iter().any(|r| r.code == code),
            "no row for exit {code}"
        );
    }
    for command in ["check", "run", "list"] {
        for code in [0, 2] {
            assert!(
                ROWS.iter()
                    .any(|r| r.args.first() == Some(&command) && r.code == code),
                "no row for `{command}` with exit {code}"
            );
        }
    }
}
