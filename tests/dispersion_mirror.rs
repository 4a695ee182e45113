//! The dispersion arrays at −θ copied from θ, against computing every node.
//!
//! With real coefficients L(−θ) = conj L(θ), so frequencies at −θ are −conj of
//! those at θ with the mode order reversed, and group velocities and derived
//! maps are the same numbers with the modes reversed
//! (`analysis::dispersion::stream::mirrors` says where that holds). Here the
//! streamed sweep runs twice on bundled cases — every node computed, and the
//! second half mirrored — and every array is compared.
//!
//! What "equal" means, per quantity (each bound is the accuracy of the
//! direct computation itself, not a looser check):
//! - frequencies: 1e-12 of the largest |ω| on the well-scaled 2-D cases; on
//!   the 3-D Euler combustor 1e-11: the eigenvalue kernel is not bit-symmetric
//!   under conjugation, and that symbol's acoustic eigenvalues carry rounding
//!   amplified by its ill-conditioned eigenvectors (primitive variables with
//!   ρc² ≈ 1e5 next to 1/ρ);
//! - group velocities of the semi-discrete and exact modes (exact derivatives
//!   from eigenvectors): 1e-9 of the largest; among modes of equal frequency
//!   each axis's components are compared as a set, since a repeated
//!   eigenvalue's slopes along each axis are dealt out to its modes in an
//!   arbitrary order in either computation; where every mode has the same
//!   frequency (κ = 0 at the grid's corners and edges, a standing grid-scale
//!   wave) they come from differences that pair branches arbitrarily and are
//!   not compared (at most 5 % of the (node, mode) pairs: 4 % on the 16 × 9
//!   grid, whose six nodes with each axis at 0 or ±π are 4 % of it);
//! - fully discrete group velocities, central differences with δ = 1e-6 in
//!   the frequency (rounding ε|ω|/δ ≈ 1e-10 relative): 1e-8 of the largest;
//! - derived maps (ratios of order one): 1e-8 of max(|value|, 1), angles
//!   1e-6 radian (acos of a cosine within rounding of 1 is only known to √ε);
//! - parasitic-wave counts equal, up to the (node, mode) pairs whose vectors
//!   were dealt out differently (inside clusters of equal frequency).

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::context::Context;
use kgain::analysis::dispersion::frequencies::Frequencies;
use kgain::analysis::dispersion::stream::{mirrors, sweep_with, NodeArrays};
use kgain::case::Case;
use kgain::sample::{NoProgress, Par};
use num_complex::Complex64 as C64;

fn load(path: &str, overrides: &[&str]) -> Case {
    let text = std::fs::read_to_string(path).expect("bundled case");
    let mut all: Vec<String> = overrides.iter().map(|s| s.to_string()).collect();
    all.push("scan.analyses=[\"dispersion\"]".into());
    support::case_with(&text, &all)
}

/// Both sweeps of `case` and whether the mirror applies.
fn both(case: &Case) -> (bool, NodeArrays, NodeArrays, usize, usize) {
    let ctx = Context::new(&case.problem, &case.plan, Par::Threads(2), &NoProgress);
    let f = Frequencies::new(&case.problem, &ctx.op);
    let first: Vec<f64> = ctx.grid.coords.iter().map(|c| c[0]).collect();
    let (num, _) = f.matched(&first);
    let discrete_modes = f.discrete(&first, &num, ctx.dt).len();
    let applies = mirrors(&ctx, &f, discrete_modes);
    let direct = sweep_with(&ctx, &f, discrete_modes, false);
    let mirrored = sweep_with(&ctx, &f, discrete_modes, true);
    (applies, direct, mirrored, ctx.op.m, ctx.grid.points.len())
}

fn largest_c(values: &[C64]) -> f64 {
    values
        .iter()
        .filter(|z| z.is_finite())
        .map(|z| z.norm())
        .fold(0.0, f64::max)
}

fn largest(values: &[f64]) -> f64 {
    values
        .iter()
        .filter(|v| v.is_finite())
        .map(|v| v.abs())
        .fold(0.0, f64::max)
}

#[track_caller]
fn close_c(what: &str, got: &[C64], want: &[C64], rel: f64) {
    let tol = rel * largest_c(want);
    for (k, (g, w)) in got.iter().zip(want).enumerate() {
        let nan = g.is_nan() && w.is_nan();
        assert!(
            nan || (g - w).norm() <= tol,
            "{what}[{k}]: mirrored {g}, direct {w} (tolerance {tol:e})"
        );
    }
}

#[track_caller]
fn close(what: &str, got: &[f64], want: &[f64], mask: &[bool], tol: impl Fn(f64) -> f64) {
    for (k, (g, w)) in got.iter().zip(want).enumerate() {
        let nan = (g.is_nan() && w.is_nan()) || !mask[k];
        assert!(
            nan || (g - w).abs() <= tol(*w),
            "{what}[{k}]: mirrored {g}, direct {w}"
        );
    }
}

/// Group velocities (nodes × m × d) equal, per axis as sets among modes whose
/// frequencies agree to 1e-9 of the largest. Returns, per (node, mode),
/// whether the mode's own vector is equal too (false where a cluster's slopes
/// were dealt out differently).
#[track_caller]
fn close_groups(
    what: &str,
    got: &[f64],
    want: &[f64],
    freq: &[C64],
    m: usize,
    d: usize,
    rel: f64,
) -> Vec<bool> {
    let tol = rel * largest(want);
    let same = 1e-9 * largest_c(freq);
    let nodes = freq.len() / m;
    let mut own = vec![true; nodes * m];
    for i in 0..nodes {
        let w = &freq[i * m..(i + 1) * m];
        let mut done = vec![false; m];
        for j in 0..m {
            if done[j] {
                continue;
            }
            let class: Vec<usize> = (0..m).filter(|k| (w[*k] - w[j]).norm() <= same).collect();
            if m > 1 && class.len() == m {
                // every mode at one frequency (κ = 0: each axis at 0 or ±π, a
                // standing grid-scale wave): the slopes come from differences
                // that pair branches arbitrarily, in either computation
                own[i * m..(i + 1) * m].fill(false);
                break;
            }
            let vectors = |a: &[f64]| -> Vec<Vec<f64>> {
                class
                    .iter()
                    .map(|k| a[(i * m + k) * d..(i * m + k + 1) * d].to_vec())
                    .collect()
            };
            let (g, h) = (vectors(got), vectors(want));
            // per axis, equal as sorted lists: where several modes share a
            // frequency, each axis's slopes are the eigenvalues of the
            // derivative projected on their eigenspace, dealt out in a fixed
            // order — vectors assembled from them belong to no one mode
            let ok = (0..d).all(|a| {
                let sorted = |vs: &[Vec<f64>]| {
                    let mut c: Vec<f64> = vs.iter().map(|v| v[a]).collect();
                    c.sort_by(f64::total_cmp);
                    c
                };
                sorted(&g)
                    .iter()
                    .zip(sorted(&h))
                    .all(|(p, q)| (p - q).abs() <= tol || (p.is_nan() && q.is_nan()))
            });
            assert!(
                ok,
                "{what}: node {i}, modes {class:?}: mirrored {g:?}, direct {h:?}"
            );
            for k in class {
                done[k] = true;
                own[i * m + k] = (0..d).all(|a| {
                    let (p, q) = (got[(i * m + k) * d + a], want[(i * m + k) * d + a]);
                    (p - q).abs() <= tol || (p.is_nan() && q.is_nan())
                });
            }
        }
    }
    own
}

fn check(case: &Case, frequency_rel: f64) {
    let (applies, direct, mirrored, m, d) = both(case);
    assert!(applies, "{}: the mirror should apply", case.problem.name);
    let (got, want) = (&mirrored, &direct);
    close_c("frequency", &got.numerical, &want.numerical, frequency_rel);
    close_c("frequency_exact", &got.exact, &want.exact, frequency_rel);
    close_c(
        "frequency_discrete",
        &got.discrete,
        &want.discrete,
        frequency_rel,
    );
    let own = close_groups(
        "group_velocity",
        &got.group,
        &want.group,
        &want.numerical,
        m,
        d,
        1e-9,
    );
    let own_exact = close_groups(
        "group_velocity_exact",
        &got.group_exact,
        &want.group_exact,
        &want.exact,
        m,
        d,
        1e-9,
    );
    let own_discrete = close_groups(
        "group_velocity_discrete",
        &got.group_discrete,
        &want.group_discrete,
        &want.numerical,
        m,
        d,
        1e-8,
    );
    // maps from group velocities only where each mode's own vector agreed
    let and =
        |a: &[bool], b: &[bool]| -> Vec<bool> { a.iter().zip(b).map(|(x, y)| *x && *y).collect() };
    let every = vec![true; own.len()];
    let semi = and(&own, &own_exact);
    let full = and(&own_discrete, &own_exact);
    let masks: [&[bool]; 12] = [
        &every, &every, &semi, &semi, &full, &full, &every, &every, &own_exact, &own_exact, &every,
        &every,
    ];
    let skipped = full.iter().filter(|x| !**x).count();
    assert!(
        skipped * 20 <= full.len(),
        "{skipped} of {} (node, mode) pairs have group velocities dealt out differently",
        full.len()
    );
    // the group-velocity angles (maps 3 and 5) to 1e-6 radian
    for (k, (g, w)) in maps_of(got).iter().zip(maps_of(want)).enumerate() {
        if k == 3 || k == 5 {
            close(&format!("map {k}"), g, &w, masks[k], |_| 1e-6);
        } else {
            // ratios of order one; those of the fully discrete group
            // velocity inherit its differences' absolute rounding
            close(&format!("map {k}"), g, &w, masks[k], |v| {
                1e-8 * v.abs().max(1.0)
            });
        }
    }
    // parasitic-wave counts equal, but for the pairs dealt out differently
    for j in 0..m {
        let loose = (0..semi.len() / m).filter(|i| !semi[i * m + j]).count();
        let (g, w) = (got.opposed[j], want.opposed[j]);
        assert!(
            g.abs_diff(w) <= loose,
            "mode {j}: {g} parasitic nodes mirrored, {w} direct ({loose} undetermined)"
        );
    }
}

/// Every derived map of a sweep, in `DerivedMaps::columns_mut` order.
fn maps_of(a: &NodeArrays) -> Vec<Vec<f64>> {
    let mut maps = a.maps.clone();
    maps.columns_mut().into_iter().map(std::mem::take).collect()
}

#[test]
fn two_d_euler_peer_case() {
    check(
        &load("bench/peer-euler2d.toml", &["scan.points=[65,65]"]),
        1e-12,
    );
}

#[test]
fn two_d_euler_on_an_even_by_odd_grid() {
    // an even number of rows: the middle row is not a row of nodes, and every
    // copied row has its image among the computed ones all the same
    check(
        &load("bench/peer-euler2d.toml", &["scan.points=[16,9]"]),
        1e-12,
    );
}

#[test]
fn acoustics_in_a_duct() {
    check(&load("cases/duct-acoustics.toml", &[]), 1e-12);
}

#[test]
fn supersonic_tunnel() {
    check(&load("cases/tunnel-euler-mach.toml", &[]), 1e-12);
}

#[test]
fn three_d_euler_combustor() {
    check(&load("cases/combustor-euler3d.toml", &[]), 1e-11);
}

#[test]
fn no_mirror_where_a_source_or_a_composite_scheme_breaks_the_symmetry() {
    for path in [
        "cases/lake-rotating-waves.toml",
        "cases/basin-cgrid.toml",
        "cases/estuary-imex.toml",
    ] {
        let case = load(path, &[]);
        let (applies, ..) = both(&case);
        assert!(!applies, "{path}: the mirror should not apply");
    }
}
