//! Paths that are not case files: a folder, a named pipe with no writer,
//! `/dev/zero` and a file over the 1 MiB cap are refused promptly with exit 2,
//! naming the path; a missing file names it too.

use super::kgain;
use super::refusal::check;
use super::snapshot_settings;
use std::time::Duration;

/// Refusals of these must come at once, not after reading forever.
const PROMPT: Duration = Duration::from_secs(10);

#[test]
fn a_folder_is_refused_as_not_a_case_file() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir(dir.path().join("folder.toml")).unwrap();
    let r = check(dir.path(), "folder.toml", PROMPT);
    r.names_file_plainly("folder.toml");
    assert!(r.stderr.contains("folder"), "{}", r.stderr);
    snapshot_settings().bind(|| insta::assert_snapshot!("path-folder", r.stderr));
}

#[test]
fn a_named_pipe_without_a_writer_is_refused_at_once() {
    let dir = tempfile::tempdir().unwrap();
    let made = mkfifo(&dir.path().join("pipe.toml"));
    assert!(made, "mkfifo failed");
    let r = check(dir.path(), "pipe.toml", PROMPT);
    r.names_file_plainly("pipe.toml");
    snapshot_settings().bind(|| insta::assert_snapshot!("path-fifo", r.stderr));
}

/// Creates a named pipe with the system's `mkfifo`.
fn mkfifo(path: &std::path::Path) -> bool {
    std::process::Command::new("mkfifo")
        .arg(path)
        .status()
        .is_ok_and(|s| s.success())
}

#[test]
fn a_named_pipe_with_a_writer_is_read() {
    let dir = tempfile::tempdir().unwrap();
    let pipe = dir.path().join("pipe.toml");
    assert!(mkfifo(&pipe), "mkfifo failed");
    let case = std::fs::read(super::cases_dir().join("courant-negative.toml")).unwrap();
    let writer = std::thread::spawn(move || {
        use std::io::Write;
        // Blocks until kgain opens the pipe, then writes the whole case.
        let mut w = std::fs::OpenOptions::new().write(true).open(&pipe).unwrap();
        w.write_all(&case).unwrap();
    });
    // Give the writer time to block in open, so kgain finds it attached.
    std::thread::sleep(Duration::from_millis(200));
    let out = kgain()
        .current_dir(dir.path())
        .args(["check", "pipe.toml"])
        .output()
        .unwrap();
    writer.join().unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains("key `time.courant`: must be positive"),
        "{stderr}"
    );
}

#[test]
fn dev_zero_is_refused_promptly_at_the_size_cap() {
    let r = check(std::path::Path::new("/"), "/dev/zero", PROMPT);
    r.names_file_plainly("/dev/zero");
    assert!(r.stderr.contains("1 MiB"), "{}", r.stderr);
    snapshot_settings().bind(|| insta::assert_snapshot!("path-dev-zero", r.stderr));
}

#[test]
fn a_file_over_the_cap_is_refused_and_one_at_it_is_read() {
    let dir = tempfile::tempdir().unwrap();
    let cap = kgain::case::MAX_BYTES as usize;
    let valid = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("cases/duct-acoustics.toml"),
    )
    .unwrap();
    let padded = |len: usize| {
        let mut t = valid.clone() + "\n#";
        t.push_str(&"x".repeat(len - t.len()));
        t
    };
    std::fs::write(dir.path().join("big.toml"), padded(cap + 1)).unwrap();
    let r = check(dir.path(), "big.toml", PROMPT);
    r.names_file_plainly("big.toml");
    snapshot_settings().bind(|| insta::assert_snapshot!("path-over-cap", r.stderr));

    std::fs::write(dir.path().join("full.toml"), padded(cap)).unwrap();
    let out = kgain()
        .current_dir(dir.path())
        .args(["check", "full.toml"])
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn a_missing_file_is_refused_naming_it() {
    let dir = tempfile::tempdir().unwrap();
    let r = check(dir.path(), "nowhere.toml", PROMPT);
    r.names_file_plainly("nowhere.toml");
    snapshot_settings().bind(|| insta::assert_snapshot!("path-missing", r.stderr));
}
