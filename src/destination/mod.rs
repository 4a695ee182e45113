//! The output folder, written so that no user file is ever lost or hidden.
//!
//! kgain replaces only what it wrote itself. A folder it wrote holds a marker
//! file ([`marker::MARKER`]) naming the case and the checksum of `manifest.json`,
//! and the manifest lists every other file kgain wrote with its size and SHA-256.
//! [`Destination::claim`] decides, before anything is computed, whether a path may
//! be written: a new path, an empty folder, or a folder kgain wrote (for the same
//! case, or for any case with `force`). Any other folder is refused, with or
//! without `force`; a file or a symbolic link is refused too.
//!
//! While a run holds a destination it holds an exclusive lock (`lock`), so a
//! second run into the same folder is refused instead of silently replacing the
//! first. [`Destination::commit`] writes the new output into a hidden sibling
//! folder, lists and checksums it, links every file the user keeps in the old
//! folder into it (`carry`), and swaps the two folders with one atomic
//! exchange (`swap`): at every instant the user's path holds either the old
//! complete output or the new complete one, each with the user's own files. The
//! old output is then removed file by file — only files it lists as kgain's, and
//! links of files the new folder also holds. Hidden folders left by a killed run
//! are recovered by the next run into the same path (`recover`): anything in
//! them that kgain did not write is moved back, never deleted.

mod carry;
pub mod hashing;
mod lock;
pub mod marker;
mod names;
mod recover;
mod swap;

use lock::Lock;
use marker::{Marker, Owner};
use serde_json::Value;
use std::path::{Path, PathBuf};

/// Why a destination cannot be used or written.
#[derive(Debug, thiserror::Error)]
pub enum DestinationError {
    /// The path holds something kgain may not replace (exit 2).
    #[error("{path}: {why}")]
    Refused {
        /// The user's path.
        path: String,
        /// Why, and how to proceed.
        why: String,
    },
    /// Another kgain run is writing the same folder (exit 2).
    #[error("{path}: another kgain run is writing this folder right now; wait for it or choose another --out")]
    Busy {
        /// The user's path.
        path: String,
    },
    /// A file-system error (exit 1).
    #[error("{path}: {source}")]
    Io {
        /// The path involved (the user's path where one is meant).
        path: String,
        /// The cause.
        source: std::io::Error,
    },
}

impl DestinationError {
    /// Whether the error is the user's to fix (exit code 2) rather than a failure.
    pub fn is_refusal(&self) -> bool {
        matches!(
            self,
            DestinationError::Refused { .. } | DestinationError::Busy { .. }
        )
    }
}

pub(crate) fn io_at(path: &Path) -> impl FnOnce(std::io::Error) -> DestinationError + '_ {
    move |source| DestinationError::Io {
        path: path.display().to_string(),
        source,
    }
}

/// What the path holds when it is claimed.
#[derive(Debug, Clone)]
enum Previous {
    /// Nothing yet.
    Nothing,
    /// A folder that may be replaced (empty, or written by kgain), with the
    /// names kgain lists in it as its own; everything else in it is the user's.
    Folder(Vec<String>),
}

/// A claimed output folder: checked, locked and recovered; written by [`commit`].
///
/// [`commit`]: Destination::commit
#[derive(Debug)]
pub struct Destination {
    path: PathBuf,
    parent: PathBuf,
    leaf: String,
    owner: Owner,
    previous: Previous,
    exchange: bool,
    lock: Option<Lock>,
    created: Vec<PathBuf>,
}

impl Drop for Destination {
    /// An unused claim leaves nothing behind: the lock file goes, and so do the
    /// folders the claim created on the way to the path (if still empty).
    fn drop(&mut self) {
        if let Some(lock) = self.lock.take() {
            lock.release();
            Undo(std::mem::take(&mut self.created));
        }
    }
}

/// Folders created by a claim, removed again (when empty) unless disarmed.
struct Undo(Vec<PathBuf>);

impl Undo {
    fn disarm(mut self) -> Vec<PathBuf> {
        std::mem::take(&mut self.0)
    }
}

impl Drop for Undo {
    fn drop(&mut self) {
        for dir in &self.0 {
            let _ = std::fs::remove_dir(dir);
        }
    }
}

/// Creates `dir` and its missing ancestors; returns the ones created, deepest first.
fn create_parents(dir: &Path) -> std::io::Result<Vec<PathBuf>> {
    let mut missing = Vec::new();
    let mut at = Some(dir);
    while let Some(d) = at.filter(|d| !d.as_os_str().is_empty()) {
        match std::fs::metadata(d) {
            Ok(m) if m.is_dir() => break,
            Ok(_) => return Err(std::io::ErrorKind::NotADirectory.into()),
            Err(_) => missing.push(d.to_path_buf()),
        }
        at = d.parent();
    }
    for d in missing.iter().rev() {
        std::fs::create_dir(d)?;
    }
    Ok(missing)
}

impl Destination {
    /// Checks that `path` may receive the output of `owner`, locks it and
    /// recovers what a killed earlier run left next to it. With `force`, a folder
    /// kgain wrote for another case may be replaced; a folder kgain did not write
    /// never is.
    pub fn claim(path: &Path, owner: Owner, force: bool) -> Result<Destination, DestinationError> {
        let refuse = |why: String| DestinationError::Refused {
            path: path.display().to_string(),
            why,
        };
        let leaf = path
            .file_name()
            .map(|s| s.to_string_lossy().into_owned())
            .filter(|s| s != "." && s != "..")
            .ok_or_else(|| {
                refuse(
                    "is not a folder name kgain can create; give a path such as output/run1".into(),
                )
            })?;
        let parent = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."))
            .to_path_buf();
        let created = create_parents(&parent).map_err(|e| match e.kind() {
            std::io::ErrorKind::NotADirectory | std::io::ErrorKind::AlreadyExists => {
                refuse(format!("{} is not a folder", parent.display()))
            }
            _ => io_at(path)(e),
        })?;
        let undo = Undo(created);
        let lock = Lock::acquire(&parent, &leaf).map_err(|e| match e {
            lock::LockError::Busy => DestinationError::Busy {
                path: path.display().to_string(),
            },
            lock::LockError::Io(source) => DestinationError::Io {
                path: path.display().to_string(),
                source,
            },
        })?;
        recover::stale_siblings(&parent, &leaf, path)?;
        let previous = inspect(path, &owner, force).map_err(|why| match why {
            Inspect::Refused(why) => refuse(why),
            Inspect::Io(e) => e,
        })?;
        Ok(Destination {
            path: path.to_path_buf(),
            parent,
            leaf,
            owner,
            previous,
            exchange: true,
            lock: Some(lock),
            created: undo.disarm(),
        })
    }

    /// Uses two plain renames (with a journal that the next run completes) instead
    /// of the atomic exchange; for file systems without it, and for tests.
    pub fn without_exchange(mut self) -> Self {
        self.exchange = false;
        self
    }

    /// The user's path.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// Writes the output: `write` fills a fresh folder and returns the manifest's
    /// content; the manifest is completed with every file's size and checksum,
    /// the marker is added, the user's files are carried over and the folder is
    /// swapped into place. On any error nothing at the user's path changes.
    pub fn commit<E>(
        mut self,
        write: impl FnOnce(&Path) -> Result<Value, E>,
    ) -> Result<PathBuf, CommitError<E>> {
        let staging = self.parent.join(format!(
            ".{}{}{}-{}",
            self.leaf,
            names::STAGING_TAG,
            std::process::id(),
            unique_suffix()
        ));
        std::fs::create_dir(&staging)
            .and_then(|()| std::fs::write(staging.join(names::STAGING_LABEL), b"kgain staging\n"))
            .map_err(io_at(&self.path))
            .map_err(CommitError::Destination)?;
        let written = write(&staging)
            .map_err(CommitError::Write)
            .and_then(|manifest| {
                self.seal(&staging, manifest)
                    .map_err(CommitError::Destination)
            });
        if let Err(e) = written {
            let _ = std::fs::remove_dir_all(&staging);
            return Err(e);
        }
        self.swap_in(&staging).map_err(CommitError::Destination)?;
        let _ = std::fs::remove_file(self.path.join(names::STAGING_LABEL));
        if let Some(lock) = self.lock.take() {
            lock.release();
        }
        Ok(self.path.clone())
    }

    /// Completes the manifest with the inventory of `staging` and writes it and
    /// the marker; links the user's files of the old folder into `staging`.
    fn seal(&self, staging: &Path, manifest: Value) -> Result<(), DestinationError> {
        let names = marker::seal(staging, manifest, &self.owner).map_err(io_at(&self.path))?;
        if let Previous::Folder(ours) = &self.previous {
            let users = carry::user_entries(&self.path, ours).map_err(io_at(&self.path))?;
            if let Some(clash) = users.iter().find(|u| names.contains(u)) {
                return Err(DestinationError::Refused {
                    path: self.path.display().to_string(),
                    why: format!(
                        "holds a file `{clash}` that kgain did not write but is about to write; move it away and run again"
                    ),
                });
            }
            carry::link_into(&self.path, staging, &users).map_err(io_at(&self.path))?;
        }
        carry::copy_permissions(&self.path, staging);
        marker::sync_dir(staging).map_err(io_at(&self.path))?;
        Ok(())
    }

    /// Puts `staging` at the user's path and clears the old output out of the way.
    fn swap_in(&self, staging: &Path) -> Result<(), DestinationError> {
        let fresh = matches!(self.previous, Previous::Nothing);
        let old = swap::put_in_place(
            &self.path,
            staging,
            fresh,
            self.exchange,
            &self.parent,
            &self.leaf,
        )?;
        if let Some(old) = old {
            let ours = match &self.previous {
                Previous::Folder(v) => v.as_slice(),
                Previous::Nothing => &[],
            };
            recover::drain_into(&old, &self.path, ours)?;
        }
        marker::sync_dir(&self.parent).map_err(io_at(&self.path))?;
        Ok(())
    }
}

/// An error of [`Destination::commit`]: the caller's writer, or the folder.
#[derive(Debug)]
pub enum CommitError<E> {
    /// The caller's writer failed.
    Write(E),
    /// The folder could not be prepared or swapped.
    Destination(DestinationError),
}

enum Inspect {
    Refused(String),
    Io(DestinationError),
}

/// Decides what the path holds and whether `owner` may replace it.
fn inspect(path: &Path, owner: &Owner, force: bool) -> Result<Previous, Inspect> {
    let meta = match std::fs::symlink_metadata(path) {
        Ok(m) => m,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => return Ok(Previous::Nothing),
        Err(e) => return Err(Inspect::Io(io_at(path)(e))),
    };
    if meta.file_type().is_symlink() {
        return Err(Inspect::Refused(
            "is a symbolic link; kgain writes only into a real folder (give the link's target instead)"
                .into(),
        ));
    }
    if !meta.is_dir() {
        return Err(Inspect::Refused(
            "is a file, not a folder; kgain never replaces a file (choose another --out)".into(),
        ));
    }
    let mut entries = std::fs::read_dir(path).map_err(|e| Inspect::Io(io_at(path)(e)))?;
    if entries.next().is_none() {
        return Ok(Previous::Folder(Vec::new()));
    }
    match Marker::read(path) {
        Some(found) => {
            if !force && found.owner != *owner {
                return Err(Inspect::Refused(format!(
                    "holds kgain's output of another case ({}); pass --force to replace it (files kgain did not write are kept)",
                    found.owner.describe()
                )));
            }
            Ok(Previous::Folder(found.ours))
        }
        None => Err(Inspect::Refused(
            "exists and was not written by kgain (it has no kgain marker), so kgain will not write into it, even with --force; choose a new or empty folder"
                .into(),
        )),
    }
}

/// A suffix that differs between runs started in the same nanosecond by the same pid.
fn unique_suffix() -> String {
    use std::sync::atomic::{AtomicU64, Ordering};
    static COUNT: AtomicU64 = AtomicU64::new(0);
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_nanos());
    format!("{nanos:x}{}", COUNT.fetch_add(1, Ordering::Relaxed))
}
