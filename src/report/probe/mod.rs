//! The report of a probe (`kgain run` on a case with a `[probe]` table): the
//! measured matrices and every map as NPY arrays with the manifest
//! (`arrays`), summary.json (`json`), pictures (`pictures`) and the
//! terminal table (`table`). Like the case report, it computes nothing.

mod arrays;
mod json;
mod pictures;
mod table;

pub use json::probe_summary_json;
pub use table::probe_table;

use super::{io, npy, ReportError};
use crate::case::probe::ProbeCase;
use crate::destination::marker::Owner;
use crate::probe::ProbeResults;
use serde_json::Value;
use std::path::Path;

/// Who wrote a probe's output: the case's name and its file.
pub fn probe_owner(case: &ProbeCase) -> Owner {
    Owner {
        name: case.name.clone(),
        source: std::fs::canonicalize(&case.file)
            .unwrap_or_else(|_| case.file.clone())
            .display()
            .to_string(),
    }
}

/// Writes every output file of a probe into the empty folder `dir` except
/// `manifest.json`, whose content it returns.
pub fn write_probe_into(
    dir: &Path,
    case: &ProbeCase,
    results: &ProbeResults,
) -> Result<Value, ReportError> {
    let list = arrays::arrays(case, results);
    let (written, pictures) = rayon::join(
        || npy::write_all(dir, &list),
        || pictures::write(dir, case, results),
    );
    let npy::Written { described, sums } = written?;
    let mut manifest = serde_json::json!({
        "format": "kgain output",
        "version": 1,
        "case": case.name,
        "kind": "probe",
        "arrays": Value::Object(described),
        // completed (and checked against the folder) by the destination's seal
        "files": Value::Object(sums),
    });
    manifest["pictures"] = pictures?.into();
    let summary = probe_summary_json(case, results);
    let p = dir.join("summary.json");
    let s = serde_json::to_string_pretty(&summary).expect("JSON values serialise");
    std::fs::write(&p, s + "\n").map_err(io(&p))?;
    Ok(manifest)
}
