//! The output folder: NPY arrays, manifest.json, summary.json, and the human
//! summary printed by `kgain run`.
//!
//! The folder is checked before any computation ([`check_destination`]) and
//! written atomically: everything goes into a temporary sibling folder that is
//! renamed into place at the end, so a failed run leaves nothing half-written and
//! an existing folder from another case is never replaced without `--force`.

mod arrays;
mod summary;
mod text;

use crate::analysis::Results;
use crate::case::Case;
use std::path::{Path, PathBuf};

pub use summary::summary_json;
pub use text::human_summary;

/// Errors while writing the output folder.
#[derive(Debug, thiserror::Error)]
pub enum ReportError {
    /// The destination holds something that is not this case's output.
    #[error("{path}: the folder exists and {why}; pass --force to replace it")]
    Exists {
        /// The folder.
        path: String,
        /// Why it is not ours to replace.
        why: String,
    },
    /// A file-system error.
    #[error("{path}: {source}")]
    Io {
        /// Where.
        path: String,
        /// The cause.
        source: std::io::Error,
    },
    /// An NPY writer error.
    #[error("{path}: cannot write the array: {message}")]
    Npy {
        /// Where.
        path: String,
        /// The cause.
        message: String,
    },
}

fn io(path: &Path) -> impl FnOnce(std::io::Error) -> ReportError + '_ {
    move |source| ReportError::Io {
        path: path.display().to_string(),
        source,
    }
}

/// The case file's canonical path, as recorded in summary.json.
pub fn case_identity(case: &Case) -> String {
    std::fs::canonicalize(&case.file)
        .unwrap_or_else(|_| case.file.clone())
        .display()
        .to_string()
}

/// Refuses a destination that exists and is not an earlier output of this case,
/// unless `force`. Called before the sweep.
pub fn check_destination(out: &Path, case: &Case, force: bool) -> Result<(), ReportError> {
    if force || !out.exists() {
        return Ok(());
    }
    let refuse = |why: &str| {
        Err(ReportError::Exists {
            path: out.display().to_string(),
            why: why.to_string(),
        })
    };
    if !out.is_dir() {
        return refuse("is not a folder");
    }
    let Ok(text) = std::fs::read_to_string(out.join("summary.json")) else {
        return refuse("is not a kgain output folder (no summary.json)");
    };
    let prev: serde_json::Value = serde_json::from_str(&text).unwrap_or_default();
    let same = prev["name"] == case.name && prev["case_file"] == case_identity(case);
    if same {
        Ok(())
    } else {
        refuse("holds the output of another case")
    }
}

/// Writes the whole output folder atomically; returns the folder written.
pub fn write(out: &Path, case: &Case, results: &Results) -> Result<PathBuf, ReportError> {
    let parent = out
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    std::fs::create_dir_all(parent).map_err(io(parent))?;
    let leaf = out
        .file_name()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| case.name.clone());
    let tmp = parent.join(format!(".{leaf}.tmp-{}", std::process::id()));
    if tmp.exists() {
        std::fs::remove_dir_all(&tmp).map_err(io(&tmp))?;
    }
    std::fs::create_dir_all(&tmp).map_err(io(&tmp))?;
    let result = (|| {
        let manifest = arrays::write_arrays(&tmp, case, results)?;
        let summary = summary_json(case, results);
        let write_json = |name: &str, v: &serde_json::Value| {
            let p = tmp.join(name);
            let s = serde_json::to_string_pretty(v).expect("JSON values serialise");
            std::fs::write(&p, s + "\n").map_err(io(&p))
        };
        write_json("manifest.json", &manifest)?;
        write_json("summary.json", &summary)?;
        Ok(())
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_dir_all(&tmp);
        return Err(e);
    }
    if out.exists() {
        let old = parent.join(format!(".{leaf}.old-{}", std::process::id()));
        std::fs::rename(out, &old).map_err(io(out))?;
        std::fs::rename(&tmp, out).map_err(io(out))?;
        let _ = std::fs::remove_dir_all(&old);
    } else {
        std::fs::rename(&tmp, out).map_err(io(out))?;
    }
    Ok(out.to_path_buf())
}
