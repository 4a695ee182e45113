//! The output folder policy: refuse a folder that is not this case's output
//! unless --force, replace one's own output, write atomically (INTERFACE.md).

use super::*;

#[test]
fn refuses_an_existing_folder_that_is_not_kgain_output_without_force() {
    let cf = CaseFile::new("tiny", TINY);
    let out = cf.root().join("out");
    std::fs::create_dir(&out).unwrap();
    std::fs::write(out.join("keep.txt"), "precious").unwrap();
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "tiny.toml", "--out", "out"])
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&res.stderr);
    assert_eq!(res.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains("--force"),
        "the message says how to proceed: {stderr}"
    );
    assert_eq!(listing(&out), vec!["keep.txt"], "folder untouched");
    assert_eq!(
        std::fs::read_to_string(out.join("keep.txt")).unwrap(),
        "precious"
    );
    assert_eq!(
        listing(cf.root()),
        vec!["out", "tiny.toml"],
        "no temporary leftovers"
    );
}

#[test]
fn refuses_the_output_of_another_case_without_force_and_replaces_it_with_force() {
    let cf = CaseFile::new("first", TINY);
    cf.add("second", &TINY.replace("courant = 0.5", "courant = 0.25"));
    let (out, _) = run_ok(&cf, &[]);
    let before = std::fs::read(out.join("summary.json")).unwrap();
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "second.toml", "--out", "out"])
        .output()
        .unwrap();
    assert_eq!(
        res.status.code(),
        Some(2),
        "{}",
        String::from_utf8_lossy(&res.stderr)
    );
    assert_eq!(
        std::fs::read(out.join("summary.json")).unwrap(),
        before,
        "folder untouched"
    );
    // With --force the other case's output replaces it entirely.
    std::fs::write(out.join("stray.txt"), "x").unwrap();
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "second.toml", "--out", "out", "--force"])
        .output()
        .unwrap();
    assert_eq!(
        res.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&res.stderr)
    );
    let s = read_json(&out.join("summary.json"));
    assert_eq!(s["name"], "second");
    assert!(!out.join("stray.txt").exists(), "replaced, not merged");
}

#[test]
fn refuses_an_output_path_that_is_a_file() {
    let cf = CaseFile::new("tiny", TINY);
    std::fs::write(cf.root().join("out"), "not a folder").unwrap();
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "tiny.toml", "--out", "out"])
        .output()
        .unwrap();
    assert_eq!(
        res.status.code(),
        Some(2),
        "{}",
        String::from_utf8_lossy(&res.stderr)
    );
    assert_eq!(
        std::fs::read_to_string(cf.root().join("out")).unwrap(),
        "not a folder"
    );
}

#[test]
fn unwritable_output_location_exits_one_without_a_panic() {
    // INTERFACE.md: 1 for anything else than invalid input (here an I/O failure:
    // the parent of the output folder is a regular file).
    let cf = CaseFile::new("tiny", TINY);
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "tiny.toml", "--out", "tiny.toml/out"])
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&res.stderr);
    assert_eq!(res.status.code(), Some(1), "{stderr}");
    assert!(
        !stderr.contains("panicked") && stderr.contains("tiny.toml"),
        "{stderr}"
    );
}

#[test]
fn rerunning_the_same_case_replaces_its_own_folder() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    std::fs::write(out.join("stray.txt"), "x").unwrap();
    let (out, _) = run_ok(&cf, &["--set", "time.courant=0.25"]);
    let s = read_json(&out.join("summary.json"));
    assert_close(
        s["courant"].as_f64().unwrap(),
        0.25,
        4.0 * EPS,
        "the new run's Courant",
    );
    assert!(!out.join("stray.txt").exists(), "the folder was replaced");
    assert_eq!(
        listing(cf.root()),
        vec!["out", "tiny.toml"],
        "no temporary leftovers"
    );
}

#[test]
fn default_output_folder_is_output_slash_case_name() {
    // INTERFACE.md: default folder output/<name>/ under the current directory.
    let cf = CaseFile::new("tiny", &format!("name = \"named-case\"\n{TINY}"));
    let res = kgain()
        .current_dir(cf.root())
        .args(["run", "tiny.toml"])
        .output()
        .unwrap();
    assert_eq!(
        res.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&res.stderr)
    );
    let out = cf.root().join("output").join("named-case");
    assert!(out.join("summary.json").exists());
    assert_eq!(read_json(&out.join("summary.json"))["name"], "named-case");
}
