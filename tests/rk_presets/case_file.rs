//! The case file: tableau entries as exact fractions in quotes, a low-storage
//! scheme by its (A, B) coefficients, and exit 2 with the file, line and key
//! for a malformed fraction or a misplaced low-storage table.

use super::support::{case, CaseFile};
use super::{preset, stability_polynomial};

fn line_case(time: &str) -> String {
    format!(
        "[grid]\nspacing = [1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0]\n[time]\n{time}\ncourant = 1.0\n[scan]\npoints = [33]\n"
    )
}

const WILLIAMSON_2N: &str = "method = \"low-storage\"\nlow_storage = { a = [0, \"-5/9\", \"-153/128\"], b = [\"1/3\", \"15/16\", \"8/15\"] }";

#[test]
fn fractions_in_quotes_equal_the_numbers_they_stand_for() {
    let frac = case(&line_case(
        "method = \"tableau\"\ntableau = { a = [[0, 0], [\"2/3\", 0]], b = [\"1/4\", \"3/4\"] }",
    ));
    let num = case(&line_case(&format!(
        "method = \"tableau\"\ntableau = {{ a = [[0, 0], [{:?}, 0]], b = [0.25, 0.75] }}",
        2.0 / 3.0
    )));
    assert_eq!(frac.problem.method.scheme, num.problem.method.scheme);
    assert_eq!(frac.problem.method.order, 2);
}

#[test]
fn a_low_storage_case_is_williamsons_preset() {
    let c = case(&line_case(WILLIAMSON_2N));
    let got = stability_polynomial(&c.problem.method);
    let want = stability_polynomial(&preset("lsrk3"));
    assert_eq!(got.len(), want.len());
    for (g, w) in got.iter().zip(&want) {
        assert!((g - w).abs() < 1e-15, "{got:?} vs {want:?}");
    }
    assert_eq!(c.problem.method.order, 3);
    assert!((c.problem.method.imaginary_limit() - 3f64.sqrt()).abs() < 1e-10);
}

/// `kgain check` on the case: (exit code, stderr).
fn check(stem: &str, text: &str) -> (Option<i32>, String) {
    let f = CaseFile::new(stem, text);
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
        .arg("check")
        .arg(&f.path)
        .output()
        .expect("run kgain");
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[track_caller]
fn refused(stem: &str, time: &str, line: usize, key: &str, words: &str) {
    let (code, err) = check(stem, &line_case(time));
    assert_eq!(code, Some(2), "{err}");
    assert!(
        err.contains(&format!("{stem}.toml:{line}:")),
        "no file and line: {err}"
    );
    assert!(
        err.contains(&format!("key `{key}`")),
        "no key `{key}`: {err}"
    );
    assert!(err.contains(words), "no `{words}`: {err}");
}

#[test]
fn malformed_fractions_are_refused_with_file_line_and_key() {
    refused(
        "zero-denominator",
        "method = \"tableau\"\ntableau = { a = [[0, 0], [\"1/0\", 0]], b = [0.5, 0.5] }",
        8,
        "time.tableau.a.1.0",
        "divides by zero",
    );
    refused(
        "not-a-fraction",
        "method = \"tableau\"\ntableau = { a = [[0, 0], [1, 0]], b = [\"1/2\", \"half\"] }",
        8,
        "time.tableau.b.1",
        "is not a fraction",
    );
    refused(
        "low-storage-fraction",
        "method = \"low-storage\"\nlow_storage = { a = [0, \"-5/9.0\"], b = [\"1/2\", \"1/2\"] }",
        8,
        "time.low_storage.a.1",
        "is not a fraction",
    );
}

#[test]
fn misplaced_or_inconsistent_low_storage_input_is_refused() {
    refused(
        "low-storage-missing",
        "method = \"low-storage\"",
        6,
        "time.low_storage",
        "is required",
    );
    refused(
        "low-storage-unused",
        "method = \"rk4\"\nlow_storage = { a = [0], b = [1] }",
        8,
        "time.low_storage",
        "only used with method = \"low-storage\"",
    );
    refused(
        "low-storage-first-a",
        "method = \"low-storage\"\nlow_storage = { a = [0.5], b = [1] }",
        8,
        "time.low_storage",
        "first A coefficient must be 0",
    );
    refused(
        "low-storage-lengths",
        "method = \"low-storage\"\nlow_storage = { a = [0, 0], b = [1] }",
        8,
        "time.low_storage",
        "as many A as B",
    );
    refused(
        "low-storage-weights",
        "method = \"low-storage\"\nlow_storage = { a = [0], b = [\"1/2\"] }",
        8,
        "time.low_storage",
        "must sum to 1",
    );
}
