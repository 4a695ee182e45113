//! `kgain run` of a handful of malformed files, with `--out` in a temporary
//! folder: exit 2, the same message as `kgain check`, and nothing written.

use super::{cases_dir, kgain};

/// One file of each kind of fault: syntax, encoding, a wrong type, a missing
/// key, a misspelt key, a value out of range, a rule between keys.
const SAMPLE: [&str; 8] = [
    "syntax-unclosed-list.toml",
    "invalid-utf8.toml",
    "courant-list.toml",
    "method-missing.toml",
    "sound-speed-misspelt.toml",
    "points-too-many.toml",
    "courant-and-dt.toml",
    "empty.toml",
];

#[test]
fn run_refuses_like_check_and_writes_nothing() {
    for name in SAMPLE {
        let tmp = tempfile::tempdir().unwrap();
        let out_dir = tmp.path().join("out");
        let run = kgain()
            .current_dir(cases_dir())
            .arg("run")
            .arg(name)
            .arg("--out")
            .arg(&out_dir)
            .output()
            .unwrap();
        let check = kgain()
            .current_dir(cases_dir())
            .args(["check", name])
            .output()
            .unwrap();
        let stderr = String::from_utf8_lossy(&run.stderr);
        assert_eq!(run.status.code(), Some(2), "{name}: {stderr}");
        assert_eq!(run.stderr, check.stderr, "{name}: run and check differ");
        assert!(run.stdout.is_empty(), "{name}: printed on stdout");
        let left: Vec<_> = std::fs::read_dir(tmp.path()).unwrap().collect();
        assert!(left.is_empty(), "{name}: {} entries written", left.len());
    }
}
