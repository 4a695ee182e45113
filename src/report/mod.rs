//! The report: results into files and text, computing nothing.
//!
//! One exporter per format, each reading [`Results`] only: NPY arrays with the
//! manifest ([`npy`]), summary.json ([`summary_json`]), PNG pictures ([`plot`])
//! and the terminal table ([`human_summary`]). What each analysis contributes to
//! each format is written once, in its section (`sections/`). NPY files and
//! pictures are written concurrently. The folder itself — which paths may be
//! written, the lock, the atomic swap, the inventory of checksums — is
//! [`crate::destination`]'s; this module fills a fresh folder ([`write_into`]).

pub mod format;
mod json;
pub mod npy;
pub mod plot;
pub mod probe;
mod sections;
mod table;

use crate::analysis::Results;
use crate::destination::marker::Owner;
use crate::destination::{CommitError, Destination, DestinationError};
use crate::problem::Problem;
use serde_json::Value;
use std::path::{Path, PathBuf};

pub use json::summary_json;
pub use table::{human_summary, human_summary_parts};

/// Errors while writing the output folder.
#[derive(Debug, thiserror::Error)]
pub enum ReportError {
    /// A file-system error.
    #[error("{path}: {source}")]
    Io {
        /// Where.
        path: String,
        /// The cause.
        source: std::io::Error,
    },
    /// A picture could not be drawn or encoded.
    #[error("{path}: cannot draw the picture: {message}")]
    Plot {
        /// Where.
        path: String,
        /// The cause.
        message: String,
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

/// Where the problem came from, as recorded in summary.json.
pub fn case_identity(problem: &Problem) -> String {
    problem
        .source
        .clone()
        .unwrap_or_else(|| problem.name.clone())
}

/// Who wrote an output: the case's name and its file.
pub fn owner(problem: &Problem) -> Owner {
    Owner {
        name: problem.name.clone(),
        source: case_identity(problem),
    }
}

/// Writes every output file of the results into the folder `dir` (which exists
/// and is empty) except `manifest.json`, whose content it returns: the caller's
/// [`Destination`] completes it with the file inventory and writes it.
pub fn write_into(dir: &Path, problem: &Problem, results: &Results) -> Result<Value, ReportError> {
    let arrays = sections::arrays(problem, results);
    let (written, pictures) = rayon::join(
        || npy::write_all(dir, &arrays),
        || plot::write_pictures(dir, problem, results),
    );
    let npy::Written { described, sums } = written?;
    let mut manifest = serde_json::json!({
        "format": "kgain output",
        "version": 1,
        "case": problem.name,
        "arrays": Value::Object(described),
        // completed (and checked against the folder) by the destination's seal
        "files": Value::Object(sums),
    });
    let pictures = pictures?;
    manifest["pictures"] = pictures
        .iter()
        .filter_map(|p| p.file_name().map(|f| f.to_string_lossy().into_owned()))
        .collect::<Vec<_>>()
        .into();
    let summary = summary_json(problem, results);
    let p = dir.join("summary.json");
    let s = serde_json::to_string_pretty(&summary).expect("JSON values serialise");
    std::fs::write(&p, s + "\n").map_err(io(&p))?;
    Ok(manifest)
}

/// Claims `out` (refusing a folder kgain did not write, or another case's output
/// unless `force`) and writes the results into it; returns the folder written.
pub fn write(
    out: &Path,
    problem: &Problem,
    results: &Results,
    force: bool,
) -> Result<PathBuf, WriteError> {
    let dest = Destination::claim(out, owner(problem), force)?;
    dest.commit(|dir| write_into(dir, problem, results))
        .map_err(|e| match e {
            CommitError::Write(e) => WriteError::Report(e),
            CommitError::Destination(e) => WriteError::Destination(e),
        })
}

/// An error of [`write`](fn@write).
#[derive(Debug, thiserror::Error)]
pub enum WriteError {
    /// The destination was refused or could not be swapped.
    #[error(transparent)]
    Destination(#[from] DestinationError),
    /// A file could not be written.
    #[error(transparent)]
    Report(#[from] ReportError),
}
