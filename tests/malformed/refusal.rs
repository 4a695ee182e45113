//! One refused case: runs `kgain check`, and checks the exit code and what every
//! refusal message must hold, returning the message for its snapshot.

use super::kgain;
use std::path::Path;
use std::time::{Duration, Instant};

/// Words of the program's own types or of the serde layer that a user should
/// never see.
const JARGON: [&str; 14] = [
    "f64",
    "f32",
    "i64",
    "i128",
    "usize",
    "Vec<",
    "Option<",
    "struct ",
    "Raw",
    "invalid type",
    "invalid length",
    "untagged",
    "a sequence",
    "a map",
];

/// A refusal: exit code and message.
pub struct Refusal {
    /// stderr, whole.
    pub stderr: String,
}

/// Runs `kgain check NAME` in `dir`, which must finish within `limit`.
pub fn check(dir: &Path, name: &str, limit: Duration) -> Refusal {
    let start = Instant::now();
    let out = kgain()
        .current_dir(dir)
        .args(["check", name])
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
    assert!(
        start.elapsed() < limit,
        "{name}: took {:?}",
        start.elapsed()
    );
    assert_eq!(
        out.status.code(),
        Some(2),
        "{name}: exit code; stderr: {stderr}"
    );
    assert!(out.stdout.is_empty(), "{name}: printed on stdout");
    Refusal { stderr }
}

impl Refusal {
    /// The message names the file right after the error prefix, has no panic and
    /// no program jargon.
    #[track_caller]
    pub fn names_file_plainly(&self, name: &str) {
        let m = &self.stderr;
        assert!(
            m.starts_with(&format!("kgain: error: {name}:")),
            "{name}: {m}"
        );
        assert!(!m.contains("panicked"), "{name}: {m}");
        for word in JARGON {
            assert!(!m.contains(word), "{name}: `{word}` in {m}");
        }
    }

    /// The line and column after the file name, with the line within `lines`.
    #[track_caller]
    pub fn names_position(&self, name: &str, lines: usize) -> (usize, usize) {
        let rest = &self.stderr[format!("kgain: error: {name}:").len()..];
        let mut parts = rest.splitn(3, ':');
        let mut number = || parts.next().and_then(|p| p.parse::<usize>().ok());
        let (Some(line), Some(col)) = (number(), number()) else {
            panic!("{name}: no line:col in {}", self.stderr);
        };
        assert!(
            line >= 1 && line <= lines.max(1) && col >= 1,
            "{name}: {line}:{col}"
        );
        (line, col)
    }
}
