//! The hidden names kgain uses next to and inside an output folder `NAME`: the
//! lock file, the staging and retired folders of a swap, the journal of the
//! two-rename fallback, and the label that marks a staging folder.

/// Infix of staging folders: `.<name>.kgain-new-<pid>-<id>`.
pub(super) const STAGING_TAG: &str = ".kgain-new-";
/// Infix of folders retired by a two-rename swap.
pub(super) const RETIRED_TAG: &str = ".kgain-old-";
/// A file inside a staging folder until it is swapped into place: a stale folder
/// that still holds it was never seen at the user's path.
pub(crate) const STAGING_LABEL: &str = ".kgain-staging";

/// The lock file's name for an output folder called `leaf`.
pub(super) fn lock_name(leaf: &str) -> String {
    format!(".{leaf}.kgain-lock")
}

/// Name of the journal of the two-rename fallback for the output folder `leaf`.
pub(super) fn journal_name(leaf: &str) -> String {
    format!(".{leaf}.kgain-journal")
}
