//! The limit does not depend on the number of worker threads: its refinements
//! of separated candidates, its long-wave and box-corner approaches and its
//! per-direction rays run on the workers, each with its own evaluator, and
//! their evidence is taken in a fixed order. Sequential and two-thread runs
//! must give the same limit to the last bit (compared through `Debug`, which
//! prints every f64 so that it reads back exactly).

mod support;

use kgain::analysis::LimitResult;

/// The limit of a case on its own scan cut to `points`, sequentially and on two
/// threads.
fn both(text: &str, points: &str) -> (LimitResult, LimitResult) {
    let overrides = [
        format!("scan.points={points}"),
        "scan.analyses=[\"limit\"]".to_string(),
    ];
    let case = support::case_with(text, &overrides);
    let seq = support::analyse(&case).limit.expect("a limit");
    let par = support::analyse_par(&case, 2).limit.expect("a limit");
    (seq, par)
}

#[track_caller]
fn same(text: &str, points: &str) {
    let (seq, par) = both(text, points);
    assert_eq!(format!("{seq:?}"), format!("{par:?}"));
}

#[test]
fn rk4_euler_2d_limit_is_the_same_on_one_and_two_threads() {
    same(include_str!("../bench/peer-euler2d.toml"), "[65, 65]");
}

#[test]
fn rk4_euler_3d_limit_is_the_same_on_one_and_two_threads() {
    same(
        include_str!("../cases/combustor-euler3d.toml"),
        "[17, 17, 17]",
    );
}

#[test]
fn multistep_limit_is_the_same_on_one_and_two_threads() {
    // leapfrog on the rotating shallow-water lake, AB3 on the telegraph line
    same(
        include_str!("../cases/lake-rotating-waves.toml"),
        "[33, 33]",
    );
    same(include_str!("../cases/feedline-telegraph.toml"), "[65]");
}

#[test]
fn composite_and_implicit_limits_are_the_same_on_one_and_two_threads() {
    // IMEX CN/AB2 (a composite scheme, searched) and Crank–Nicolson
    same(include_str!("../cases/estuary-imex.toml"), "[33, 33]");
    same(include_str!("../cases/kiln-wall-heat.toml"), "[33, 33]");
}
