//! Reading a case file: refused promptly when it is a folder, when there is more
//! than [`MAX_BYTES`] to read (a huge file, `/dev/zero`), when it is not UTF-8
//! text (with the line and column of the first bad byte) or when it is empty.
//! A named pipe with no writer reads as empty instead of blocking forever.

use super::locate::{key_at, line_col};
use super::CaseError;
use rustix::fs::{fcntl_getfl, fcntl_setfl, OFlags};
use std::fs::OpenOptions;
use std::io::Read;
use std::os::unix::fs::{FileTypeExt, OpenOptionsExt};
use std::path::Path;

/// The most a case file may hold; a real one is a few kilobytes.
pub const MAX_BYTES: u64 = 1 << 20;

/// The text of the case file at `path`, named `file` in messages.
pub fn case_text(path: &Path, file: &str) -> Result<String, CaseError> {
    let read_error = |source| CaseError::Read {
        file: file.to_string(),
        source,
    };
    let refused = |reason: &str| CaseError::Refused {
        file: file.to_string(),
        reason: reason.to_string(),
    };
    let kind = std::fs::metadata(path).map_err(read_error)?.file_type();
    if kind.is_dir() {
        return Err(refused("is a folder, not a case file"));
    }
    // Non-blocking open: opening a named pipe for reading would otherwise wait
    // for a writer that may never come.
    let mut handle = OpenOptions::new()
        .read(true)
        .custom_flags(OFlags::NONBLOCK.bits() as i32)
        .open(path)
        .map_err(read_error)?;
    if kind.is_fifo() {
        // Reads block again while a writer is attached; with none, they end at once.
        let flags = fcntl_getfl(&handle).map_err(|e| read_error(e.into()))?;
        fcntl_setfl(&handle, flags - OFlags::NONBLOCK).map_err(|e| read_error(e.into()))?;
    }
    let mut bytes = Vec::new();
    (&mut handle)
        .take(MAX_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(read_error)?;
    if bytes.len() as u64 > MAX_BYTES {
        return Err(refused(
            "holds more than 1 MiB (reading stopped there); a case file is a few kilobytes of TOML text",
        ));
    }
    let text = String::from_utf8(bytes).map_err(|e| {
        let good = e.utf8_error().valid_up_to();
        let bad = e.as_bytes()[good];
        let prefix = std::str::from_utf8(&e.as_bytes()[..good]).unwrap_or_default();
        let (line, col) = line_col(prefix, good);
        let what = format!(
            "not UTF-8 text: byte 0x{bad:02x} is not part of a valid character (save the file as UTF-8)"
        );
        let message = match key_at(prefix, good) {
            Some(k) => format!("key `{k}`: {what}"),
            None => what,
        };
        CaseError::Syntax {
            file: file.to_string(),
            line,
            col,
            message,
        }
    })?;
    if text.trim().is_empty() {
        return Err(refused(
            "is empty; a case needs at least [grid], [model] and [time]",
        ));
    }
    Ok(text)
}
