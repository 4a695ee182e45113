//! A file written and checksummed in one pass.
//!
//! The inventory of an output folder gives every file's size and SHA-256
//! ([`marker::seal`](super::marker::seal)). For the large arrays, reading each
//! file back to hash it cost as long as writing it; a [`HashingFile`] hashes
//! the bytes as they go to the file instead, and flushes the file to disk when
//! finished, as the read-back did. The seal reuses these sums for the files
//! they name and reads back every other file.

use sha2::{Digest, Sha256};
use std::fs::File;
use std::io::{BufWriter, Write};
use std::path::Path;

/// A buffered file whose bytes are hashed as they are written.
pub struct HashingFile {
    out: BufWriter<File>,
    hasher: Sha256,
    size: u64,
}

impl HashingFile {
    /// Creates (or truncates) the file at `path`.
    pub fn create(path: &Path) -> std::io::Result<Self> {
        Ok(HashingFile {
            out: BufWriter::with_capacity(1 << 20, File::create(path)?),
            hasher: Sha256::new(),
            size: 0,
        })
    }

    /// Flushes the file to disk; returns its size and SHA-256 (hex).
    pub fn finish(self) -> std::io::Result<(u64, String)> {
        let file = self.out.into_inner().map_err(|e| e.into_error())?;
        file.sync_all()?;
        Ok((self.size, hex(&self.hasher.finalize())))
    }
}

impl Write for HashingFile {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        let n = self.out.write(buf)?;
        self.hasher.update(&buf[..n]);
        self.size += n as u64;
        Ok(n)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.out.flush()
    }
}

/// Lower-case hexadecimal of a digest.
pub fn hex(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("{b:02x}")).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_sum_is_that_of_the_file_read_back() {
        let dir = std::env::temp_dir().join(format!("kgain-hashing-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let path = dir.join("a.bin");
        let mut f = HashingFile::create(&path).unwrap();
        let data: Vec<u8> = (0..3_000_000u32).map(|i| (i * 7919 % 251) as u8).collect();
        for piece in data.chunks(65_537) {
            f.write_all(piece).unwrap();
        }
        let (size, sum) = f.finish().unwrap();
        assert_eq!((size, sum), super::super::marker::checksum(&path).unwrap());
        std::fs::remove_dir_all(&dir).unwrap();
    }
}
