//! Carrying the user's own files from an old output folder into the new one.
//!
//! Every entry of the old folder that kgain did not list as its own is the
//! user's. Before the swap each is recreated in the new folder without copying
//! data: regular files as hard links (the same file, reachable from both
//! folders), symbolic links as links to the same target, folders as new folders
//! filled the same way. So the user's files are at the user's path before, during
//! and after the swap. What cannot be linked (special files, another file system,
//! a file system without hard links) stays behind and is moved across after the
//! swap by [`super::recover::drain_into`].

use std::path::Path;

/// Names in `dir` that are not in `ours` (the user's entries).
pub(super) fn user_entries(dir: &Path, ours: &[String]) -> std::io::Result<Vec<String>> {
    let mut out = Vec::new();
    for e in std::fs::read_dir(dir)? {
        let name = e?.file_name().to_string_lossy().into_owned();
        if !ours.contains(&name) {
            out.push(name);
        }
    }
    out.sort();
    Ok(out)
}

/// Recreates each named entry of `from` in `to` by links (best effort: an entry
/// that cannot be linked is left for the move after the swap).
pub(super) fn link_into(from: &Path, to: &Path, names: &[String]) -> std::io::Result<()> {
    for name in names {
        let (src, dst) = (from.join(name), to.join(name));
        if link_tree(&src, &dst, 0).is_err() {
            // A partial copy would shadow the original at the swap: remove it, so
            // that the original is moved across whole afterwards.
            let _ = remove_links(&dst);
        }
    }
    Ok(())
}

/// Deepest folder nesting that is linked rather than moved.
const MAX_DEPTH: usize = 64;

fn link_tree(src: &Path, dst: &Path, depth: usize) -> std::io::Result<()> {
    let meta = std::fs::symlink_metadata(src)?;
    let kind = meta.file_type();
    if kind.is_symlink() {
        std::os::unix::fs::symlink(std::fs::read_link(src)?, dst)
    } else if kind.is_file() {
        std::fs::hard_link(src, dst)
    } else if kind.is_dir() && depth < MAX_DEPTH {
        std::fs::create_dir(dst)?;
        std::fs::set_permissions(dst, meta.permissions())?;
        for e in std::fs::read_dir(src)? {
            let name = e?.file_name();
            link_tree(&src.join(&name), &dst.join(&name), depth + 1)?;
        }
        Ok(())
    } else {
        Err(std::io::Error::other("not linkable"))
    }
}

/// Removes a tree made by [`link_tree`] (links and the folders created for them).
fn remove_links(path: &Path) -> std::io::Result<()> {
    match std::fs::symlink_metadata(path) {
        Ok(m) if m.is_dir() => std::fs::remove_dir_all(path),
        Ok(_) => std::fs::remove_file(path),
        Err(_) => Ok(()),
    }
}

/// Gives `to` the permission bits of `from` (when `from` exists).
pub(super) fn copy_permissions(from: &Path, to: &Path) {
    if let Ok(m) = std::fs::metadata(from) {
        let _ = std::fs::set_permissions(to, m.permissions());
    }
}
