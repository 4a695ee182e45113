//! Clearing an old or abandoned folder without losing anything kgain did not write.
//!
//! [`drain_into`] empties a folder that sits next to the user's output folder —
//! the old output after a swap, or a hidden folder a killed run left behind —
//! into the output folder: files kgain lists as its own are removed; every other
//! entry is compared with the entry of the same name at the user's path: a link
//! to the very same file is removed, a missing entry is moved back, folders are
//! merged entry by entry, and anything that differs is moved back under a new
//! name (`NAME.kgain-recovered`). Nothing is deleted that exists only here.
//!
//! [`stale_siblings`] runs before every run into a path (under its lock): it
//! completes a journalled two-rename swap that was interrupted, then drains every
//! hidden folder a killed run left next to the path. Those folders are named
//! `.<name>.kgain-new-<pid>-<id>` (staging; it holds a label file while it has not
//! been swapped) and `.<name>.kgain-old-<pid>-<id>` (retired, two-rename swaps).

use super::marker::{Marker, MARKER};
use super::names::{journal_name, RETIRED_TAG, STAGING_LABEL, STAGING_TAG};
use super::{io_at, DestinationError};
use std::os::unix::fs::MetadataExt;
use std::path::{Path, PathBuf};

/// Completes an interrupted swap and drains every stale sibling of `path`.
pub(super) fn stale_siblings(
    parent: &Path,
    leaf: &str,
    path: &Path,
) -> Result<(), DestinationError> {
    finish_journal(parent, leaf, path)?;
    let entries = std::fs::read_dir(parent).map_err(io_at(path))?;
    let mut stale: Vec<PathBuf> = Vec::new();
    for e in entries.flatten() {
        let name = e.file_name().to_string_lossy().into_owned();
        if is_stale_name(&name, leaf) && e.file_type().is_ok_and(|t| t.is_dir()) {
            stale.push(e.path());
        }
    }
    stale.sort();
    for s in stale {
        let ours = stale_ours(&s);
        if !path.exists() && holds_foreign(&s, &ours) {
            std::fs::create_dir(path).map_err(io_at(path))?;
        }
        drain_into(&s, path, &ours)?;
    }
    Ok(())
}

/// Whether `name` is a hidden folder of a run into `leaf`: the tag followed by
/// `<pid>-<hex id>`.
fn is_stale_name(name: &str, leaf: &str) -> bool {
    let Some(rest) = name.strip_prefix('.').and_then(|n| n.strip_prefix(leaf)) else {
        return false;
    };
    let Some(id) = rest
        .strip_prefix(STAGING_TAG)
        .or_else(|| rest.strip_prefix(RETIRED_TAG))
    else {
        return false;
    };
    let Some((pid, hex)) = id.split_once('-') else {
        return false;
    };
    !pid.is_empty()
        && pid.chars().all(|c| c.is_ascii_digit())
        && !hex.is_empty()
        && hex.chars().all(|c| c.is_ascii_hexdigit())
}

/// What in a stale folder kgain wrote: the marker's listing; everything when it
/// is an unsealed staging folder (nothing of the user's is added before sealing);
/// nothing when it is neither (a retired folder that kgain did not write).
fn stale_ours(dir: &Path) -> Vec<String> {
    if let Some(m) = Marker::read(dir) {
        return m.ours;
    }
    if dir.join(STAGING_LABEL).exists() {
        return std::fs::read_dir(dir)
            .map(|it| {
                it.flatten()
                    .filter(|e| e.file_type().is_ok_and(|t| t.is_file()))
                    .map(|e| e.file_name().to_string_lossy().into_owned())
                    .collect()
            })
            .unwrap_or_default();
    }
    Vec::new()
}

/// Whether `dir` holds anything besides kgain's own files.
fn holds_foreign(dir: &Path, ours: &[String]) -> bool {
    std::fs::read_dir(dir).is_ok_and(|it| {
        it.flatten().any(|e| {
            let name = e.file_name().to_string_lossy().into_owned();
            name != STAGING_LABEL && name != MARKER && !ours.contains(&name)
        })
    })
}

/// Completes a two-rename swap a killed run left half done.
fn finish_journal(parent: &Path, leaf: &str, path: &Path) -> Result<(), DestinationError> {
    let journal = parent.join(journal_name(leaf));
    let Ok(text) = std::fs::read_to_string(&journal) else {
        return Ok(());
    };
    let v: serde_json::Value = serde_json::from_str(&text).unwrap_or_default();
    if !path.exists() {
        for key in ["new", "old"] {
            let Some(name) = v[key].as_str().filter(|n| is_stale_name(n, leaf)) else {
                continue;
            };
            let from = parent.join(name);
            if from.is_dir() {
                std::fs::rename(&from, path).map_err(io_at(path))?;
                break;
            }
        }
    }
    std::fs::remove_file(&journal).map_err(io_at(path))
}

/// Empties `old` into `dir` (see the module documentation); removes `old` when
/// nothing is left in it.
pub(super) fn drain_into(old: &Path, dir: &Path, ours: &[String]) -> Result<(), DestinationError> {
    let entries = std::fs::read_dir(old).map_err(io_at(dir))?;
    for e in entries.flatten() {
        let name = e.file_name().to_string_lossy().into_owned();
        let src = e.path();
        let is_file = e.file_type().is_ok_and(|t| t.is_file());
        if is_file && (name == STAGING_LABEL || name == MARKER || ours.contains(&name)) {
            std::fs::remove_file(&src).map_err(io_at(dir))?;
            continue;
        }
        merge(&src, &dir.join(&name)).map_err(io_at(dir))?;
    }
    let _ = std::fs::remove_dir(old);
    Ok(())
}

/// Moves or matches one entry of a stale folder against the user's folder.
fn merge(src: &Path, dst: &Path) -> std::io::Result<()> {
    let s = std::fs::symlink_metadata(src)?;
    let d = match std::fs::symlink_metadata(dst) {
        Ok(d) => d,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => return std::fs::rename(src, dst),
        Err(e) => return Err(e),
    };
    if s.is_dir() && d.is_dir() {
        for e in std::fs::read_dir(src)?.flatten() {
            let name = e.file_name();
            merge(&src.join(&name), &dst.join(&name))?;
        }
        let _ = std::fs::remove_dir(src);
        return Ok(());
    }
    let same_file = s.dev() == d.dev() && s.ino() == d.ino();
    let same_link = s.file_type().is_symlink()
        && d.file_type().is_symlink()
        && std::fs::read_link(src)? == std::fs::read_link(dst)?;
    if same_file || same_link {
        return std::fs::remove_file(src);
    }
    std::fs::rename(src, free_name(dst))
}

/// `PATH.kgain-recovered`, or with a number when that exists too.
fn free_name(dst: &Path) -> PathBuf {
    let base = dst.as_os_str().to_string_lossy().into_owned();
    let mut candidate = PathBuf::from(format!("{base}.kgain-recovered"));
    let mut k = 2;
    while std::fs::symlink_metadata(&candidate).is_ok() {
        candidate = PathBuf::from(format!("{base}.kgain-recovered-{k}"));
        k += 1;
    }
    candidate
}
