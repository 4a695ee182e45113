//! Every file in `tests/malformed/cases/`: refused with exit 2, naming the file,
//! its line and column (all but the empty file), the key its header names and
//! the suggestion its header asks for; each message pinned as a snapshot.

use super::expect;
use super::refusal::check;
use super::{cases_dir, snapshot_settings};
use std::time::Duration;

/// The case files, sorted by name.
fn case_files() -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(cases_dir())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".toml"))
        .collect();
    names.sort();
    names
}

#[test]
fn the_suite_holds_at_least_a_hundred_files() {
    let n = case_files().len();
    assert!(n >= 100, "only {n} malformed case files");
}

#[test]
fn every_malformed_file_is_refused_with_file_line_key_and_hint() {
    let settings = snapshot_settings();
    for name in case_files() {
        let bytes = std::fs::read(cases_dir().join(&name)).unwrap();
        let e = expect::read(&bytes);
        let r = check(&cases_dir(), &name, Duration::from_secs(20));
        r.names_file_plainly(&name);
        if !bytes.iter().all(u8::is_ascii_whitespace) {
            let lines = bytes.split(|b| *b == b'\n').count();
            r.names_position(&name, lines);
        }
        if let Some(key) = &e.key {
            assert!(
                r.stderr.contains(&format!("`{key}`")),
                "{name}: key `{key}` not named: {}",
                r.stderr
            );
        }
        if let Some(hint) = &e.hint {
            let named = [
                format!("did you mean `{hint}`"),
                format!("did you mean '{hint}'"),
            ];
            assert!(
                named.iter().any(|h| r.stderr.contains(h.as_str())),
                "{name}: no suggestion of `{hint}`: {}",
                r.stderr
            );
        }
        let stem = name.trim_end_matches(".toml");
        let mut s = settings.clone();
        s.set_description(e.what.unwrap_or_else(|| "no header".into()));
        s.bind(|| insta::assert_snapshot!(stem, r.stderr));
    }
}
