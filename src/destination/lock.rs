//! An exclusive lock on one output path, held for the whole run.
//!
//! The lock is an advisory `flock` on a hidden file next to the output folder
//! (`.<name>.kgain-lock`). The kernel drops it when the process ends, however it
//! ends, so a killed run never leaves a stale lock behind. The file is removed
//! on release; a run that opened the file just before it was removed notices
//! (the path no longer names the file it locked) and tries again.

use super::names::lock_name;
use std::fs::{File, OpenOptions, TryLockError};
use std::os::unix::fs::MetadataExt;
use std::path::{Path, PathBuf};

/// Why the lock was not taken.
#[derive(Debug)]
pub(super) enum LockError {
    /// Another process holds it.
    Busy,
    /// The lock file could not be created or locked.
    Io(std::io::Error),
}

/// A held lock; released on [`Lock::release`] or when dropped.
#[derive(Debug)]
pub(super) struct Lock {
    file: File,
    path: PathBuf,
}

impl Lock {
    /// Takes the lock of the output folder `leaf` inside `parent`, without waiting.
    pub(super) fn acquire(parent: &Path, leaf: &str) -> Result<Lock, LockError> {
        let path = parent.join(lock_name(leaf));
        for _ in 0..16 {
            let file = OpenOptions::new()
                .create(true)
                .truncate(false)
                .write(true)
                .open(&path)
                .map_err(LockError::Io)?;
            match file.try_lock() {
                Ok(()) => {}
                Err(TryLockError::WouldBlock) => return Err(LockError::Busy),
                Err(TryLockError::Error(e)) => return Err(LockError::Io(e)),
            }
            // The holder before us may have removed the file after we opened it.
            let held = file.metadata().map_err(LockError::Io)?;
            match std::fs::metadata(&path) {
                Ok(now) if now.ino() == held.ino() && now.dev() == held.dev() => {
                    return Ok(Lock { file, path });
                }
                _ => continue,
            }
        }
        Err(LockError::Busy)
    }

    /// Removes the lock file and releases the lock (as dropping it does).
    pub(super) fn release(self) {}
}

impl Drop for Lock {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.path);
        let _ = self.file.unlock();
    }
}
