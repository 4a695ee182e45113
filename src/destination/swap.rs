//! Putting a finished folder at the user's path in one atomic step.
//!
//! A new path is created by renaming the finished folder onto it, refusing to
//! replace anything that appeared meanwhile (`RENAME_NOREPLACE`). An existing
//! folder is swapped with the finished one by `renameat2(RENAME_EXCHANGE)`: the
//! two names trade places in one step, so the user's path never lacks a complete
//! folder, and the old one ends up under the hidden staging name.
//!
//! Where the file system has no exchange, two renames are used (old folder to a
//! hidden name, finished folder to the user's path) with a journal next to them
//! naming both; a run killed between the two renames leaves the path empty for
//! that instant, and the next run into the same path completes the move from the
//! journal ([`super::recover`]).

use super::names::{journal_name, RETIRED_TAG, STAGING_TAG};
use super::{io_at, DestinationError};
use rustix::fs::{renameat_with, RenameFlags, CWD};
use rustix::io::Errno;
use serde_json::json;
use std::path::{Path, PathBuf};

fn unsupported(e: Errno) -> bool {
    e == Errno::INVAL || e == Errno::NOSYS || e == Errno::OPNOTSUPP
}

/// Moves `staging` to `path`; returns where the previous content of `path` went.
pub(super) fn put_in_place(
    path: &Path,
    staging: &Path,
    fresh: bool,
    exchange: bool,
    parent: &Path,
    leaf: &str,
) -> Result<Option<PathBuf>, DestinationError> {
    let user_io = |e: Errno| io_at(path)(std::io::Error::from(e));
    if fresh {
        return match renameat_with(CWD, staging, CWD, path, RenameFlags::NOREPLACE) {
            Ok(()) => Ok(None),
            Err(e) if unsupported(e) => {
                if path.exists() {
                    Err(refused_new(path))
                } else {
                    std::fs::rename(staging, path).map_err(io_at(path))?;
                    Ok(None)
                }
            }
            Err(Errno::EXIST) | Err(Errno::NOTEMPTY) => Err(refused_new(path)),
            Err(e) => Err(user_io(e)),
        };
    }
    if exchange {
        match renameat_with(CWD, staging, CWD, path, RenameFlags::EXCHANGE) {
            Ok(()) => return Ok(Some(staging.to_path_buf())),
            Err(e) if unsupported(e) => {}
            Err(e) => return Err(user_io(e)),
        }
    }
    two_renames(path, staging, parent, leaf).map(Some)
}

fn refused_new(path: &Path) -> DestinationError {
    DestinationError::Refused {
        path: path.display().to_string(),
        why: "appeared while kgain was computing; nothing was written, run again".into(),
    }
}

/// The journalled fallback: `path` → hidden old name, `staging` → `path`.
fn two_renames(
    path: &Path,
    staging: &Path,
    parent: &Path,
    leaf: &str,
) -> Result<PathBuf, DestinationError> {
    let name = |p: &Path| p.file_name().map(|s| s.to_string_lossy().into_owned());
    let old = parent.join(
        name(staging)
            .unwrap_or_default()
            .replacen(STAGING_TAG, RETIRED_TAG, 1),
    );
    let journal = parent.join(journal_name(leaf));
    let text = json!({ "old": name(&old), "new": name(staging) }).to_string();
    std::fs::write(&journal, text).map_err(io_at(path))?;
    std::fs::File::open(&journal)
        .and_then(|f| f.sync_all())
        .map_err(io_at(path))?;
    super::marker::sync_dir(parent).map_err(io_at(path))?;
    std::fs::rename(path, &old).map_err(io_at(path))?;
    std::fs::rename(staging, path).map_err(io_at(path))?;
    super::marker::sync_dir(parent).map_err(io_at(path))?;
    let _ = std::fs::remove_file(&journal);
    Ok(old)
}
