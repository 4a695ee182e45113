//! The malformed-case suite: every file in `tests/malformed/cases/` (derived from
//! the bundled cases, one fault each, described by its header comments) and a
//! few paths that are not case files at all (a folder, a named pipe,
//! `/dev/zero`, a file over the size cap) must be refused by `kgain check` with
//! exit code 2 and a message that names the file, the line and column where the
//! reader knows them, the dotted key, a "did you mean" for a misspelt name, and
//! no program type names. The messages are pinned as snapshots in
//! `tests/malformed/snapshots/`; for a handful, `kgain run` must write nothing.

#[path = "malformed/expect.rs"]
mod expect;
#[path = "malformed/refusal.rs"]
mod refusal;

#[path = "malformed/files.rs"]
mod files;
#[path = "malformed/not_files.rs"]
mod not_files;
#[path = "malformed/run_writes_nothing.rs"]
mod run_writes_nothing;

use std::path::PathBuf;

/// The folder of the malformed case files.
fn cases_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/malformed/cases")
}

/// `kgain` as a command.
fn kgain() -> std::process::Command {
    std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
}

/// Insta settings that keep the snapshots in `tests/malformed/snapshots/`.
fn snapshot_settings() -> insta::Settings {
    let mut s = insta::Settings::clone_current();
    s.set_snapshot_path("snapshots");
    s.set_prepend_module_to_snapshot(false);
    s
}
