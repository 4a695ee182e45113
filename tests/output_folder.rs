//! The output folder through the library: the two-rename swap used where a file
//! system has no atomic exchange, and the completion of such a swap that a killed
//! run left half done (its journal names both folders).

#[path = "support/mod.rs"]
mod support;

use kgain::destination::marker::{verify, Owner};
use kgain::destination::Destination;
use serde_json::json;
use std::path::Path;

fn owner() -> Owner {
    Owner {
        name: "basin".into(),
        source: "/cases/basin.toml".into(),
    }
}

/// Writes one output file with the given content; the manifest is minimal.
fn writer(
    content: &'static str,
) -> impl FnOnce(&Path) -> Result<serde_json::Value, std::io::Error> {
    move |dir| {
        std::fs::write(dir.join("result.txt"), content)?;
        Ok(json!({ "format": "kgain output" }))
    }
}

fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

#[test]
fn two_rename_swap_replaces_kgain_files_and_keeps_the_users() {
    let root = tempfile::tempdir().unwrap();
    let out = root.path().join("out");
    let claim = || {
        Destination::claim(&out, owner(), false)
            .unwrap()
            .without_exchange()
    };
    claim()
        .commit(writer("first"))
        .map_err(|_| "commit")
        .unwrap();
    std::fs::write(out.join("notes.txt"), "mine").unwrap();
    claim()
        .commit(writer("second"))
        .map_err(|_| "commit")
        .unwrap();
    assert_eq!(
        std::fs::read_to_string(out.join("result.txt")).unwrap(),
        "second"
    );
    assert_eq!(
        std::fs::read_to_string(out.join("notes.txt")).unwrap(),
        "mine"
    );
    verify(&out).unwrap();
    assert_eq!(
        names(root.path()),
        vec!["out"],
        "no journal, lock or hidden folder left"
    );
}

#[test]
fn a_swap_killed_between_its_two_renames_is_completed_by_the_next_run() {
    let root = tempfile::tempdir().unwrap();
    let out = root.path().join("out");
    let claim = || Destination::claim(&out, owner(), false).unwrap();
    claim().commit(writer("old")).map_err(|_| "commit").unwrap();
    std::fs::write(out.join("notes.txt"), "mine").unwrap();
    // The state after the first rename of a two-rename swap: the old folder under
    // its retired name, the new one still under its staging name, the path empty.
    let fresh = root.path().join("fresh");
    Destination::claim(&fresh, owner(), false)
        .unwrap()
        .commit(writer("new"))
        .map_err(|_| "commit")
        .unwrap();
    std::fs::hard_link(out.join("notes.txt"), fresh.join("notes.txt")).unwrap();
    let (old_name, new_name) = (".out.kgain-old-77-ab", ".out.kgain-new-77-ab");
    std::fs::rename(&out, root.path().join(old_name)).unwrap();
    std::fs::rename(&fresh, root.path().join(new_name)).unwrap();
    std::fs::write(
        root.path().join(".out.kgain-journal"),
        json!({ "old": old_name, "new": new_name }).to_string(),
    )
    .unwrap();
    assert!(!out.exists());
    // The next claim completes the swap and clears the old folder.
    drop(claim());
    assert_eq!(
        std::fs::read_to_string(out.join("result.txt")).unwrap(),
        "new"
    );
    assert_eq!(
        std::fs::read_to_string(out.join("notes.txt")).unwrap(),
        "mine"
    );
    verify(&out).unwrap();
    assert_eq!(names(root.path()), vec!["out"]);
}

#[test]
fn a_claim_that_is_not_used_leaves_nothing_behind() {
    let root = tempfile::tempdir().unwrap();
    let out = root.path().join("a").join("b").join("out");
    drop(Destination::claim(&out, owner(), false).unwrap());
    assert!(
        names(root.path()).is_empty(),
        "created folders and the lock are removed"
    );
}

#[test]
fn a_failed_writer_leaves_the_previous_output_untouched() {
    let root = tempfile::tempdir().unwrap();
    let out = root.path().join("out");
    let claim = || Destination::claim(&out, owner(), false).unwrap();
    claim().commit(writer("old")).map_err(|_| "commit").unwrap();
    let failed = claim().commit(|dir| {
        std::fs::write(dir.join("result.txt"), "half")?;
        Err::<serde_json::Value, _>(std::io::Error::other("disk full"))
    });
    assert!(failed.is_err());
    assert_eq!(
        std::fs::read_to_string(out.join("result.txt")).unwrap(),
        "old"
    );
    verify(&out).unwrap();
    assert_eq!(names(root.path()), vec!["out"]);
}
