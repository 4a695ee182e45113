//! The marker that identifies a folder kgain wrote, and the inventory of its files.
//!
//! `manifest.json` lists, under `files`, every file kgain wrote into the folder
//! (except itself and the marker) with its size in bytes and SHA-256; the marker
//! `.kgain-output.json` names the case that wrote the folder and gives the size
//! and SHA-256 of `manifest.json`. Together they say which files are kgain's and
//! whether the folder is complete: [`verify`] recomputes every checksum.

use super::names::STAGING_LABEL;
use rayon::prelude::*;
use serde_json::{json, Value};
use sha2::{Digest, Sha256};
use std::io::Read;
use std::path::Path;

/// The marker file's name.
pub const MARKER: &str = ".kgain-output.json";
/// The manifest's name.
pub const MANIFEST: &str = "manifest.json";

/// Who wrote an output folder: the case's name and its source (the case file's
/// canonical path, or any string a library caller chooses).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Owner {
    /// Case name.
    pub name: String,
    /// Where the case came from.
    pub source: String,
}

impl Owner {
    /// "NAME from SOURCE".
    pub fn describe(&self) -> String {
        format!("case '{}' from {}", self.name, self.source)
    }
}

/// A marker read back from a folder.
#[derive(Debug, Clone)]
pub struct Marker {
    /// The case that wrote the folder.
    pub owner: Owner,
    /// Every name kgain wrote there: the listed files, the manifest and the marker.
    pub ours: Vec<String>,
}

impl Marker {
    /// The marker of `dir`, if it holds a readable one (its listed files need not
    /// all be present: a folder is kgain's if kgain says so).
    pub fn read(dir: &Path) -> Option<Marker> {
        let Some(marker) = read_json(&dir.join(MARKER)) else {
            return legacy(dir);
        };
        if marker["format"] != "kgain output marker" {
            return None;
        }
        let owner = Owner {
            name: marker["case"].as_str()?.to_string(),
            source: marker["case_source"].as_str()?.to_string(),
        };
        let mut ours: Vec<String> = marker["files"]
            .as_object()
            .map(|f| f.keys().cloned().collect())
            .unwrap_or_default();
        ours.push(MARKER.to_string());
        ours.push(STAGING_LABEL.to_string());
        if let Ok(bytes) = std::fs::read(dir.join(MANIFEST)) {
            if let Ok(manifest) = serde_json::from_slice::<Value>(&bytes) {
                if let Some(files) = manifest["files"].as_object() {
                    ours.extend(files.keys().filter(|k| is_plain_name(k)).cloned());
                }
            }
        }
        ours.retain(|n| is_plain_name(n));
        ours.sort();
        ours.dedup();
        Some(Marker { owner, ours })
    }
}

/// The output of kgain 0.1, which wrote no marker: a `manifest.json` of format
/// "kgain output" names its arrays and pictures; with `summary.json` and the
/// manifest itself they are kgain's, everything else in the folder the user's.
fn legacy(dir: &Path) -> Option<Marker> {
    let manifest = read_json(&dir.join(MANIFEST))?;
    if manifest["format"] != "kgain output" {
        return None;
    }
    let summary = read_json(&dir.join("summary.json"))?;
    let owner = Owner {
        name: summary["name"].as_str()?.to_string(),
        source: summary["case_file"].as_str()?.to_string(),
    };
    let mut ours = vec![MANIFEST.to_string(), "summary.json".to_string()];
    if let Some(arrays) = manifest["arrays"].as_object() {
        ours.extend(
            arrays
                .values()
                .filter_map(|a| a["file"].as_str())
                .map(String::from),
        );
    }
    if let Some(pictures) = manifest["pictures"].as_array() {
        ours.extend(pictures.iter().filter_map(|p| p.as_str()).map(String::from));
    }
    ours.retain(|n| is_plain_name(n));
    Some(Marker { owner, ours })
}

fn read_json(path: &Path) -> Option<Value> {
    serde_json::from_slice(&std::fs::read(path).ok()?).ok()
}

/// A file name without any path component (what a marker may list).
fn is_plain_name(name: &str) -> bool {
    !name.is_empty() && name != "." && name != ".." && !name.contains(['/', '\\', '\0'])
}

/// Size and SHA-256 (hex) of a file, flushed to disk first.
pub fn checksum(path: &Path) -> std::io::Result<(u64, String)> {
    let mut file = std::fs::File::open(path)?;
    file.sync_all()?;
    let mut hasher = Sha256::new();
    let mut buf = vec![0u8; 1 << 16];
    let mut size = 0u64;
    loop {
        let n = file.read(&mut buf)?;
        if n == 0 {
            break;
        }
        size += n as u64;
        hasher.update(&buf[..n]);
    }
    Ok((size, super::hashing::hex(&hasher.finalize())))
}

/// Lists and checksums every file in `dir`, completes `manifest` with the list,
/// writes it and then the marker. Returns every name written. A file the
/// manifest's `files` already lists with its size and SHA-256 (summed as it was
/// written, [`HashingFile`](super::hashing::HashingFile)) keeps that entry;
/// every other file is read back and summed.
pub(super) fn seal(dir: &Path, mut manifest: Value, owner: &Owner) -> std::io::Result<Vec<String>> {
    let mut names: Vec<String> = std::fs::read_dir(dir)?
        .filter_map(|e| e.ok())
        .filter(|e| e.file_type().is_ok_and(|t| t.is_file()))
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .filter(|n| n != MANIFEST && n != MARKER && n != STAGING_LABEL)
        .collect();
    names.sort();
    // files summed as they were written keep their sums; the rest are read
    // back, one file per worker of the caller's pool
    let known = |n: &str| -> Option<(u64, String)> {
        let entry = manifest.get("files")?.get(n)?;
        Some((
            entry.get("size")?.as_u64()?,
            entry.get("sha256")?.as_str()?.to_string(),
        ))
    };
    let sums: Vec<(u64, String)> = names
        .par_iter()
        .map(|n| known(n).map_or_else(|| checksum(&dir.join(n)), Ok))
        .collect::<std::io::Result<_>>()?;
    let mut files = serde_json::Map::new();
    for (n, (size, sha256)) in names.iter().zip(sums) {
        files.insert(n.clone(), json!({ "size": size, "sha256": sha256 }));
    }
    manifest["files"] = Value::Object(files);
    write_synced(&dir.join(MANIFEST), &manifest)?;
    let (size, sha256) = checksum(&dir.join(MANIFEST))?;
    let marker = json!({
        "format": "kgain output marker",
        "written_by": format!("kgain {}", env!("CARGO_PKG_VERSION")),
        "case": owner.name,
        "case_source": owner.source,
        "files": { MANIFEST: { "size": size, "sha256": sha256 } },
        "note": "kgain wrote this folder; it replaces only the files listed here and in manifest.json",
    });
    write_synced(&dir.join(MARKER), &marker)?;
    names.push(MANIFEST.to_string());
    names.push(MARKER.to_string());
    Ok(names)
}

fn write_synced(path: &Path, value: &Value) -> std::io::Result<()> {
    let text = serde_json::to_string_pretty(value).expect("JSON values serialise") + "\n";
    std::fs::write(path, text)?;
    std::fs::File::open(path)?.sync_all()
}

/// Flushes a folder's entries to disk.
pub(super) fn sync_dir(dir: &Path) -> std::io::Result<()> {
    std::fs::File::open(dir)?.sync_all()
}

/// Whether `dir` is a complete kgain output: the marker's manifest checksum and
/// every file the manifest lists match. Returns the first mismatch.
pub fn verify(dir: &Path) -> Result<(), String> {
    let marker: Value = std::fs::read(dir.join(MARKER))
        .ok()
        .and_then(|b| serde_json::from_slice(&b).ok())
        .ok_or("no readable marker")?;
    let mut listed: Vec<(String, Value)> = Vec::new();
    let want = &marker["files"][MANIFEST];
    listed.push((MANIFEST.to_string(), want.clone()));
    let manifest: Value = std::fs::read(dir.join(MANIFEST))
        .ok()
        .and_then(|b| serde_json::from_slice(&b).ok())
        .ok_or("no readable manifest")?;
    if let Some(files) = manifest["files"].as_object() {
        listed.extend(files.iter().map(|(k, v)| (k.clone(), v.clone())));
    } else {
        return Err("the manifest lists no files".into());
    }
    for (name, want) in listed {
        let (size, sha) = checksum(&dir.join(&name)).map_err(|e| format!("{name}: {e}"))?;
        if want["size"] != size || want["sha256"] != sha.as_str() {
            return Err(format!("{name}: size or checksum differs from the listing"));
        }
    }
    Ok(())
}
