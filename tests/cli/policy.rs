//! The output folder policy: kgain writes only into a new folder, an empty one or
//! one it wrote itself; it replaces only the files it listed as its own, keeps
//! everything else, refuses a second run into a folder being written, and never
//! leaves a hidden folder or a half-written output behind.

use super::*;
use sha2::{Digest, Sha256};

/// Runs `kgain run` in the case's folder with the given arguments.
fn run_in(cf: &CaseFile, args: &[&str]) -> std::process::Output {
    kgain()
        .current_dir(cf.root())
        .arg("run")
        .args(args)
        .output()
        .unwrap()
}

fn stderr_of(o: &std::process::Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// SHA-256 of a file, hex.
fn sha256(path: &Path) -> String {
    let bytes = std::fs::read(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    Sha256::digest(&bytes)
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

/// Checks, without kgain's own code, that `out` is a complete kgain output: the
/// marker's size and checksum of manifest.json match, and so do those of every
/// file the manifest lists. Returns the listed names.
fn assert_complete_output(out: &Path) -> Vec<String> {
    let marker = read_json(&out.join(".kgain-output.json"));
    let m = &marker["files"]["manifest.json"];
    let manifest_path = out.join("manifest.json");
    assert_eq!(m["sha256"], sha256(&manifest_path), "manifest checksum");
    assert_eq!(
        m["size"].as_u64(),
        Some(std::fs::metadata(&manifest_path).unwrap().len())
    );
    let manifest = read_json(&manifest_path);
    let files = manifest["files"].as_object().expect("manifest lists files");
    assert!(files.contains_key("summary.json") && files.contains_key("radius.npy"));
    for (name, entry) in files {
        let p = out.join(name);
        assert_eq!(
            entry["size"].as_u64(),
            Some(std::fs::metadata(&p).unwrap().len()),
            "{name}: size"
        );
        assert_eq!(entry["sha256"], sha256(&p), "{name}: checksum");
    }
    let mut names: Vec<String> = files.keys().cloned().collect();
    names.extend(["manifest.json".into(), ".kgain-output.json".into()]);
    names
}

/// A folder of the user's: notes, a hidden folder and a script in a subfolder.
fn plant_user_files(dir: &Path) {
    std::fs::create_dir_all(dir.join(".ssh")).unwrap();
    std::fs::create_dir_all(dir.join("scripts")).unwrap();
    std::fs::write(dir.join("thesis.tex"), "chapter 1").unwrap();
    std::fs::write(dir.join(".ssh").join("id_ed25519"), "secret").unwrap();
    std::fs::write(dir.join("scripts").join("plot.py"), "import numpy").unwrap();
}

fn assert_user_files(dir: &Path) {
    let read =
        |p: PathBuf| std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{}: {e}", p.display()));
    assert_eq!(read(dir.join("thesis.tex")), "chapter 1");
    assert_eq!(read(dir.join(".ssh").join("id_ed25519")), "secret");
    assert_eq!(read(dir.join("scripts").join("plot.py")), "import numpy");
}

#[test]
fn refuses_a_folder_kgain_did_not_write_even_with_force() {
    let cf = CaseFile::new("tiny", TINY);
    let out = cf.root().join("out");
    plant_user_files(&out);
    for extra in [&[][..], &["--force"][..]] {
        let mut args = vec!["tiny.toml", "--out", "out"];
        args.extend_from_slice(extra);
        let res = run_in(&cf, &args);
        let stderr = stderr_of(&res);
        assert_eq!(res.status.code(), Some(2), "{stderr}");
        assert!(
            stderr.contains("out") && stderr.contains("not written by kgain"),
            "the message names the path and says why: {stderr}"
        );
        assert!(
            !stderr.contains(".kgain-new"),
            "no temporary path: {stderr}"
        );
        assert_user_files(&out);
        assert_eq!(listing(&out), vec![".ssh", "scripts", "thesis.tex"]);
        assert_eq!(listing(cf.root()), vec!["out", "tiny.toml"], "nothing else");
    }
}

#[test]
fn refuses_the_folder_that_holds_the_case_file() {
    let cf = CaseFile::new("tiny", TINY);
    let res = run_in(&cf, &["tiny.toml", "--out", ".", "--force"]);
    assert_eq!(res.status.code(), Some(2), "{}", stderr_of(&res));
    let res = run_in(&cf, &["tiny.toml", "--out", "../", "--force"]);
    assert_eq!(res.status.code(), Some(2), "{}", stderr_of(&res));
    assert_eq!(listing(cf.root()), vec!["tiny.toml"]);
}

#[test]
fn refuses_the_output_of_another_case_without_force_and_keeps_user_files_with_force() {
    let cf = CaseFile::new("first", TINY);
    cf.add("second", &TINY.replace("courant = 0.5", "courant = 0.25"));
    let (out, _) = run_ok(&cf, &[]);
    plant_user_files(&out);
    let before = std::fs::read(out.join("summary.json")).unwrap();
    let res = run_in(&cf, &["second.toml", "--out", "out"]);
    let stderr = stderr_of(&res);
    assert_eq!(res.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains("another case") && stderr.contains("--force"),
        "{stderr}"
    );
    assert_eq!(std::fs::read(out.join("summary.json")).unwrap(), before);
    let res = run_in(&cf, &["second.toml", "--out", "out", "--force"]);
    assert_eq!(res.status.code(), Some(0), "{}", stderr_of(&res));
    assert_eq!(read_json(&out.join("summary.json"))["name"], "second");
    assert_user_files(&out);
    assert_complete_output(&out);
}

#[test]
fn rerunning_the_same_case_replaces_only_its_own_files() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(
        &cf,
        &["--set", r#"scan.analyses=["radius","limit","growth"]"#],
    );
    assert!(out.join("growth.npy").exists());
    plant_user_files(&out);
    std::os::unix::fs::symlink("thesis.tex", out.join("link-to-thesis")).unwrap();
    let inode = |p: &Path| std::os::unix::fs::MetadataExt::ino(&std::fs::metadata(p).unwrap());
    let thesis_inode = inode(&out.join("thesis.tex"));
    let (out, _) = run_ok(&cf, &["--set", "time.courant=0.25"]);
    let s = read_json(&out.join("summary.json"));
    assert_close(
        s["courant"].as_f64().unwrap(),
        0.25,
        4.0 * EPS,
        "the new run's Courant",
    );
    assert!(
        out.join("growth.npy").exists(),
        "the default analyses include growth"
    );
    let (out, _) = run_ok(&cf, &["--set", r#"scan.analyses=["radius"]"#]);
    assert!(!out.join("growth.npy").exists(), "kgain's old file is gone");
    assert_user_files(&out);
    assert_eq!(
        inode(&out.join("thesis.tex")),
        thesis_inode,
        "the very same file"
    );
    assert_eq!(
        std::fs::read_link(out.join("link-to-thesis")).unwrap(),
        Path::new("thesis.tex")
    );
    assert_complete_output(&out);
    assert_eq!(
        listing(cf.root()),
        vec!["out", "tiny.toml"],
        "no hidden leftovers"
    );
}

#[test]
fn writes_into_an_existing_empty_folder() {
    let cf = CaseFile::new("tiny", TINY);
    std::fs::create_dir(cf.root().join("out")).unwrap();
    let (out, _) = run_ok(&cf, &[]);
    assert_complete_output(&out);
}

#[test]
fn refuses_an_output_path_that_is_a_file_or_a_link_even_with_force() {
    let cf = CaseFile::new("tiny", TINY);
    std::fs::write(cf.root().join("out"), "not a folder").unwrap();
    std::fs::create_dir(cf.root().join("real")).unwrap();
    std::os::unix::fs::symlink("real", cf.root().join("link")).unwrap();
    for target in ["out", "link"] {
        let res = run_in(&cf, &["tiny.toml", "--out", target, "--force"]);
        assert_eq!(res.status.code(), Some(2), "{}", stderr_of(&res));
    }
    assert_eq!(
        std::fs::read_to_string(cf.root().join("out")).unwrap(),
        "not a folder"
    );
    assert_eq!(listing(cf.root()), vec!["link", "out", "real", "tiny.toml"]);
}

#[test]
fn an_output_path_under_a_file_is_refused_without_a_panic() {
    let cf = CaseFile::new("tiny", TINY);
    let res = run_in(&cf, &["tiny.toml", "--out", "tiny.toml/out"]);
    let stderr = stderr_of(&res);
    assert_eq!(res.status.code(), Some(2), "{stderr}");
    assert!(
        !stderr.contains("panicked") && stderr.contains("tiny.toml"),
        "{stderr}"
    );
}

#[test]
fn a_second_run_into_a_folder_being_written_is_refused() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let before = std::fs::read(out.join("summary.json")).unwrap();
    // Hold the folder's lock as a running kgain would.
    let lock = std::fs::File::create(cf.root().join(".out.kgain-lock")).unwrap();
    lock.try_lock().unwrap();
    let res = run_in(
        &cf,
        &["tiny.toml", "--out", "out", "--set", "time.courant=0.25"],
    );
    let stderr = stderr_of(&res);
    assert_eq!(res.status.code(), Some(2), "{stderr}");
    assert!(stderr.contains("another kgain run"), "{stderr}");
    assert_eq!(std::fs::read(out.join("summary.json")).unwrap(), before);
    drop(lock);
    let res = run_in(
        &cf,
        &["tiny.toml", "--out", "out", "--set", "time.courant=0.25"],
    );
    assert_eq!(res.status.code(), Some(0), "{}", stderr_of(&res));
}

#[test]
fn stale_folders_of_a_killed_run_are_cleared_and_user_files_in_them_moved_back() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    // An unsealed staging folder: only kgain's partial output.
    let staging = cf.root().join(".out.kgain-new-4242-1f");
    std::fs::create_dir(&staging).unwrap();
    std::fs::write(staging.join(".kgain-staging"), "").unwrap();
    std::fs::write(staging.join("radius.npy"), "partial").unwrap();
    // A folder the swap retired while a user file was still only in it.
    let retired = cf.root().join(".out.kgain-new-4243-2e");
    std::fs::create_dir(&retired).unwrap();
    std::fs::write(retired.join("late-notes.txt"), "written during the swap").unwrap();
    let first_summary = std::fs::read(out.join("summary.json")).unwrap();
    std::fs::write(retired.join("summary.json"), &first_summary).unwrap();
    let (out, _) = run_ok(&cf, &["--set", "time.courant=0.25"]);
    assert_eq!(
        std::fs::read_to_string(out.join("late-notes.txt")).unwrap(),
        "written during the swap"
    );
    assert_eq!(
        std::fs::read(out.join("summary.json.kgain-recovered")).unwrap(),
        first_summary,
        "a file that is not the one at the user's path is kept under a new name"
    );
    assert_eq!(
        listing(cf.root()),
        vec!["out", "tiny.toml"],
        "no hidden leftovers"
    );
}

#[test]
fn the_manifest_lists_every_file_with_its_size_and_checksum() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let mut listed = assert_complete_output(&out);
    listed.sort();
    assert_eq!(listed, listing(&out), "every file is listed, none is extra");
}

/// A 2-D case that takes a noticeable time to write (a 513² radius map and its picture).
const SLOW: &str = r#"
[grid]
spacing = [1.0, 1.0]

[model]
kind = "advection"
velocity = [0.6, 0.8]

[time]
method = "rk4"
courant = 0.5

[scan]
points = [513, 513]
analyses = ["radius", "limit"]
"#;

#[test]
fn killing_a_run_at_random_instants_leaves_the_old_or_the_new_complete_output() {
    let cf = CaseFile::new("slow", SLOW);
    let (out, _) = run_ok(&cf, &[]);
    plant_user_files(&out);
    let duration = (0..3)
        .map(|_| {
            let start = std::time::Instant::now();
            run_ok(&cf, &["--set", "time.courant=0.25"]);
            start.elapsed().as_secs_f64()
        })
        .fold(f64::INFINITY, f64::min);
    let mut seed: u64 = 0x5eed_1234;
    let mut next = || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    let (mut killed, mut runs, mut while_writing) = (0, 0, 0);
    while killed < 50 && runs < 400 {
        runs += 1;
        let courant = if runs % 2 == 0 {
            "time.courant=0.5"
        } else {
            "time.courant=0.25"
        };
        let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
            .current_dir(cf.root())
            .args([
                "run",
                "slow.toml",
                "--out",
                "out",
                "--quiet",
                "--set",
                courant,
            ])
            .spawn()
            .unwrap();
        std::thread::sleep(std::time::Duration::from_secs_f64(duration * next()));
        if child.try_wait().unwrap().is_none() {
            child.kill().unwrap(); // SIGKILL
            killed += 1;
        }
        child.wait().unwrap();
        if listing(cf.root())
            .iter()
            .any(|n| n.starts_with(".out.kgain-new-"))
        {
            while_writing += 1;
        }
        assert_complete_output(&out);
        assert_user_files(&out);
    }
    eprintln!("{killed} kills in {runs} runs, {while_writing} while writing");
    assert!(
        while_writing >= 10,
        "only {while_writing} kills landed while the output was being written"
    );
    assert!(
        killed >= 50,
        "only {killed} of {runs} runs were killed mid-way"
    );
    run_ok(&cf, &[]);
    assert_complete_output(&out);
    assert_user_files(&out);
    assert_eq!(
        listing(cf.root()),
        vec!["out", "slow.toml"],
        "no hidden leftovers"
    );
}

#[test]
fn default_output_folder_is_output_slash_case_name() {
    // README (Output folder): default folder output/<name>/ under the current directory.
    let cf = CaseFile::new("tiny", &format!("name = \"named-case\"\n{TINY}"));
    let res = run_in(&cf, &["tiny.toml"]);
    assert_eq!(res.status.code(), Some(0), "{}", stderr_of(&res));
    let out = cf.root().join("output").join("named-case");
    assert_eq!(read_json(&out.join("summary.json"))["name"], "named-case");
}
