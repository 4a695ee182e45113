//! `kgain check` and `kgain list`.

use super::*;

#[test]
fn check_prints_the_assembled_problem_and_writes_nothing() {
    let text = TINY.replace("[time]", "[space]\nfirst = \"central4\"\n\n[time]");
    let cf = CaseFile::new("tiny", &text);
    let res = kgain()
        .current_dir(cf.root())
        .args(["check", "tiny.toml"])
        .output()
        .unwrap();
    assert_eq!(
        res.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&res.stderr)
    );
    let stdout = String::from_utf8(res.stdout).unwrap();
    for item in ["tiny", "advection", "central4", "rk4"] {
        assert!(stdout.contains(item), "`{item}` in: {stdout}");
    }
    assert_eq!(
        listing(cf.root()),
        vec!["tiny.toml"],
        "check writes nothing"
    );
    // and an invalid case is refused the same way as by run
    let bad = CaseFile::new("bad", &TINY.replace("rk4", "rk5"));
    let res = kgain()
        .current_dir(bad.root())
        .args(["check", "bad.toml"])
        .output()
        .unwrap();
    assert_eq!(res.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&res.stderr).contains("did you mean 'rk4'"));
}

#[test]
fn list_names_every_builtin_model_stencil_and_method() {
    let res = kgain().arg("list").output().unwrap();
    assert_eq!(res.status.code(), Some(0));
    let stdout = String::from_utf8(res.stdout).unwrap();
    for name in [
        "advection",
        "acoustics",
        "euler",
        "linear",
        "central2",
        "central4",
        "compact4",
        "compact6",
        "drp7",
        "upwind1",
        "heun",
        "ssprk3",
        "rk4",
        "ab3",
        "leapfrog",
        "bdf2",
        "crank-nicolson",
        "backward-euler",
    ] {
        assert!(stdout.contains(name), "`{name}` in the list");
    }
    for what in ["models", "stencils", "methods"] {
        let res = kgain().args(["list", what]).output().unwrap();
        assert_eq!(res.status.code(), Some(0), "list {what}");
        assert!(!res.stdout.is_empty(), "list {what} prints something");
    }
}

/// The numbers on the row of `name` in a listing, with the tolerance their printed
/// digits allow.
fn row_numbers(listing: &str, name: &str) -> Vec<(f64, f64)> {
    let row = listing
        .lines()
        .find(|l| l.split_whitespace().next() == Some(name))
        .unwrap_or_else(|| panic!("no row for {name}: {listing}"));
    row.split_whitespace()
        .filter_map(|t| {
            let v: f64 = t.parse().ok()?;
            let decimals = t.split_once('.').map_or(0, |(_, d)| d.len()) as i32;
            Some((v, if v == 0.0 { 0.0 } else { quoted(v, decimals) }))
        })
        .collect()
}

#[test]
fn list_methods_reports_the_published_stability_intervals() {
    // Hairer & Wanner II: RK4 2√2 on the imaginary axis and the root of
    // x³ − 4x² + 12x − 24 on the negative real axis; SSP RK3 √3 (Gottlieb & Shu 1998).
    let res = kgain().args(["list", "methods"]).output().unwrap();
    let stdout = String::from_utf8(res.stdout).unwrap();
    let rk4_real = support::bisect(|x| x * x * x - 4.0 * x * x + 12.0 * x - 24.0, 2.0, 3.0);
    let nums = row_numbers(&stdout, "rk4");
    let (imag, real) = (nums[nums.len() - 2], nums[nums.len() - 1]);
    assert_close(
        imag.0,
        2.0 * SQRT_2,
        imag.1,
        "rk4 imaginary limit as listed",
    );
    assert_close(real.0, rk4_real, real.1, "rk4 real limit as listed");
    let nums = row_numbers(&stdout, "ssprk3");
    let imag = nums[nums.len() - 2];
    assert_close(
        imag.0,
        3f64.sqrt(),
        imag.1,
        "ssprk3 imaginary limit as listed",
    );
}

#[test]
fn list_stencils_reports_the_maximum_modified_wavenumbers() {
    // Columns: name, derivative, order, max k*h. Maxima: 1 (central2), the closed
    // form for central4, √3 for compact4 (Lele 1992).
    let res = kgain().args(["list", "stencils"]).output().unwrap();
    let stdout = String::from_utf8(res.stdout).unwrap();
    let c = 1.0 - 6f64.sqrt() / 2.0;
    let c4 = (1.0 - c * c).sqrt() * (4.0 - c) / 3.0;
    for (name, order, max) in [
        ("central2", 2.0, 1.0),
        ("central4", 4.0, c4),
        ("compact4", 4.0, 3f64.sqrt()),
    ] {
        let nums = row_numbers(&stdout, name);
        assert_eq!(nums[0].0, 1.0, "{name}: first derivative row");
        assert_eq!(nums[1].0, order, "{name}: order");
        assert_close(
            nums[2].0,
            max,
            nums[2].1,
            &format!("{name}: max k*h as listed"),
        );
    }
}
