//! Mode identity by continuation along the ray, against a fine continuation.
//!
//! Where eigenvector shapes do not name the numerical modes, the dispersion
//! analysis follows the semi-discrete spectrum from the long-wave limit
//! (ascending Re ω at s = 1e-4 of the wavevector) to the wavevector itself,
//! with a few geometric steps that are halved wherever a step's pairing is not
//! clear. The reference here is written independently of the engine's
//! continuation: 2,000 geometric steps, each paired by the least total distance
//! over every permutation (brute force), with a linear prediction from the two
//! previous points. Both must give the same frequency to every mode, to
//! rounding, at every node of coarse grids of four bundled cases (2-D and 3-D
//! Euler, acoustics, a supersonic tunnel) and along the grid-scale edge
//! θx = −π of the peer case, where the frequencies change fastest.
//!
//! On those cases the analysis does not follow the ray at all: it sorts the
//! frequencies at θ by Re ω, which names them as the continuation would when
//! the symbol is the model's at a real modified wavevector that never vanishes
//! along the ray (`kgain::analysis::dispersion::sorted`). Both the shortcut and
//! the engine's continuation are checked against the fine one; cases outside
//! the shortcut's conditions must keep the continuation, and one of them (a
//! wide central difference whose modified wavenumber vanishes at θ = π/2)
//! shows why: there the continuation does not end in ascending order.

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::dispersion::frequencies::Frequencies;
use kgain::case::Case;
use num_complex::Complex64 as C64;

/// Start of the ray (relative), as in the engine.
const START: f64 = 1e-4;
/// Steps of the reference continuation.
const FINE_STEPS: usize = 2000;

fn load(path: &str, overrides: &[&str]) -> Case {
    let text = std::fs::read_to_string(path).expect("bundled case");
    let all: Vec<String> = overrides.iter().map(|s| s.to_string()).collect();
    support::case_with(&text, &all)
}

/// Every permutation of 0..m (m ≤ 6), in lexicographic order.
fn permutations(m: usize) -> Vec<Vec<usize>> {
    if m == 0 {
        return vec![Vec::new()];
    }
    let mut all = Vec::new();
    for rest in permutations(m - 1) {
        for at in 0..m {
            let mut p = rest.clone();
            p.insert(at, m - 1);
            all.push(p);
        }
    }
    all
}

/// `new` reordered so that the total distance to `target` is least.
fn closest(target: &[C64], new: &[C64], perms: &[Vec<usize>]) -> Vec<C64> {
    let cost = |p: &[usize]| -> f64 {
        p.iter()
            .zip(target)
            .map(|(&j, t)| (t - new[j]).norm())
            .sum()
    };
    let best = perms
        .iter()
        .min_by(|a, b| cost(a).total_cmp(&cost(b)))
        .expect("at least one permutation");
    best.iter().map(|&j| new[j]).collect()
}

/// The semi-discrete frequencies at θ followed from the long-wave limit with
/// [`FINE_STEPS`] geometric steps, and the largest |ω| met on the way (the
/// scale of rounding: at a wavevector where every frequency vanishes, as for
/// central differences at θ = (0, π), they are rounding noise in any order).
fn fine_continuation(f: &Frequencies, theta: &[f64], perms: &[Vec<usize>]) -> (Vec<C64>, f64) {
    let at = |s: f64| -> Vec<f64> { theta.iter().map(|t| t * s).collect() };
    let mut prev = f.numerical_raw(&at(START));
    prev.sort_by(|a, b| a.re.total_cmp(&b.re));
    let ratio = (1.0 / START).powf(1.0 / FINE_STEPS as f64);
    let (mut prev2, mut s_prev, mut s_prev2) = (prev.clone(), START, START);
    let mut largest = 0.0f64;
    for k in 1..=FINE_STEPS {
        let s = if k == FINE_STEPS {
            1.0
        } else {
            START * ratio.powi(k as i32)
        };
        let predicted: Vec<C64> = if k == 1 {
            prev.iter().map(|a| a * (s / s_prev)).collect()
        } else {
            let slope = (s - s_prev) / (s_prev - s_prev2);
            prev.iter()
                .zip(&prev2)
                .map(|(a, b)| a + (a - b) * slope)
                .collect()
        };
        let next = closest(&predicted, &f.numerical_raw(&at(s)), perms);
        largest = next.iter().map(|w| w.norm()).fold(largest, f64::max);
        prev2 = std::mem::replace(&mut prev, next);
        (s_prev2, s_prev) = (s_prev, s);
    }
    (prev, largest)
}

/// The engine's continuation equals the fine one at every θ of `thetas`.
fn agrees_with_the_fine_continuation(case: &Case, thetas: &[Vec<f64>]) {
    let problem = &case.problem;
    let op = problem.operator();
    let f = Frequencies::new(problem, &op);
    let perms = permutations(op.m);
    let mut compared = 0;
    for theta in thetas {
        let (want, scale) = fine_continuation(&f, theta, &perms);
        let named = [
            ("continuation", f.numerical_followed(theta)),
            ("naming (sorted where it may be)", f.numerical_by_ray(theta)),
        ];
        for (how, got) in named {
            let same = got
                .iter()
                .zip(&want)
                .all(|(g, w)| (g - w).norm() <= 1e-9 * scale);
            assert!(
                same,
                "{}: at theta = {theta:?} the engine's {how} gives {got:?}, the fine continuation {want:?}",
                problem.name
            );
        }
        compared += 1;
    }
    assert_eq!(compared, thetas.len());
}

/// The nodes of an n^d grid over [−π, π)^d (θ = 0 left out: no ray).
fn grid(n: usize, dims: usize) -> Vec<Vec<f64>> {
    let coord = |i: usize| -std::f64::consts::PI + 2.0 * std::f64::consts::PI * i as f64 / n as f64;
    let total = n.pow(dims as u32);
    (0..total)
        .map(|flat| {
            let mut rest = flat;
            (0..dims)
                .map(|_| {
                    let c = coord(rest % n);
                    rest /= n;
                    c
                })
                .collect::<Vec<f64>>()
        })
        .filter(|t| t.iter().any(|x| *x != 0.0))
        .collect()
}

#[test]
fn two_d_euler_peer_case_every_node_of_a_coarse_grid() {
    let case = load("bench/peer-euler2d.toml", &[]);
    agrees_with_the_fine_continuation(&case, &grid(24, 2));
}

#[test]
fn two_d_euler_peer_case_along_the_grid_scale_edge() {
    // θx = −π: the x-derivative's symbol vanishes there, so the acoustic
    // frequencies move fastest over the last stretch of every ray
    let case = load("bench/peer-euler2d.toml", &[]);
    // every fourth θy of kgain's 513-point axis
    let thetas: Vec<Vec<f64>> = kgain::sample::axis_coords(513)
        .into_iter()
        .step_by(4)
        .map(|ty| vec![-std::f64::consts::PI, ty])
        .collect();
    agrees_with_the_fine_continuation(&case, &thetas);
}

#[test]
fn the_acoustic_wave_keeps_its_name_at_the_grid_scale_edge() {
    // With central differences the semi-discrete frequencies of the 2-D Euler
    // equations are u·κ − c|κ|, u·κ (twice) and u·κ + c|κ| for the modified
    // wavevector κ(θ), which vanishes only at θ = 0: along a ray they never
    // cross, so continuation must return them in ascending order. Twenty fixed
    // geometric steps gave the slow acoustic wave's name to a convected one
    // here (the last step, from 0.63θ to θ, was too long).
    let case = load("bench/peer-euler2d.toml", &[]);
    let op = case.problem.operator();
    let f = Frequencies::new(&case.problem, &op);
    let theta = [-std::f64::consts::PI, -0.748582624488193];
    let got = f.numerical_by_ray(&theta);
    let mut sorted = f.numerical_raw(&theta);
    sorted.sort_by(|a, b| a.re.total_cmp(&b.re));
    let scale = sorted.iter().map(|w| w.norm()).fold(0.0, f64::max);
    for (g, w) in got.iter().zip(&sorted) {
        assert!(
            (g - w).norm() <= 1e-12 * scale,
            "{got:?} is not in ascending order {sorted:?}"
        );
    }
    // and the slow acoustic wave is well apart from the convected pair
    assert!((sorted[1] - sorted[0]).norm() > 0.1 * scale);
}

#[test]
fn acoustics_in_a_duct_every_node_of_a_coarse_grid() {
    let case = load("cases/duct-acoustics.toml", &[]);
    agrees_with_the_fine_continuation(&case, &grid(24, 2));
}

#[test]
fn supersonic_tunnel_every_node_of_a_coarse_grid() {
    let case = load("cases/tunnel-euler-mach.toml", &[]);
    agrees_with_the_fine_continuation(&case, &grid(24, 2));
}

#[test]
fn three_d_euler_combustor_every_node_of_a_coarse_grid() {
    let case = load("cases/combustor-euler3d.toml", &[]);
    agrees_with_the_fine_continuation(&case, &grid(8, 3));
}

/// Whether the analysis names the numerical modes of `case` by sorting.
fn sorts(case: &Case) -> bool {
    let op = case.problem.operator();
    Frequencies::new(&case.problem, &op).names_by_ascending_frequency()
}

#[test]
fn the_central_euler_and_acoustics_cases_are_named_by_sorting() {
    // so that the comparisons above exercise the shortcut as well as the ray
    for path in [
        "bench/peer-euler2d.toml",
        "cases/duct-acoustics.toml",
        "cases/tunnel-euler-mach.toml",
        "cases/combustor-euler3d.toml",
    ] {
        assert!(sorts(&load(path, &[])), "{path}");
    }
}

#[test]
fn staggered_upwinded_compact_and_user_systems_keep_the_ray() {
    let refused: [(&str, &[&str]); 6] = [
        ("cases/cavity-yee3d.toml", &[]),
        ("cases/basin-cgrid.toml", &["model.coriolis=0.0"]),
        ("cases/basin-agrid.toml", &[]),
        ("bench/peer-euler2d.toml", &["space.first=\"upwind3\""]),
        ("bench/peer-euler2d.toml", &["space.first=\"compact4\""]),
        ("cases/feedline-telegraph.toml", &[]),
    ];
    for (path, overrides) in refused {
        assert!(!sorts(&load(path, overrides)), "{path} {overrides:?}");
    }
    // the collocated shallow-water basin is refused for its Coriolis source
    // only: without it, it is named by sorting
    assert!(sorts(&load(
        "cases/basin-agrid.toml",
        &["model.coriolis=0.0"]
    )));
}

#[test]
fn a_modified_wavenumber_vanishing_inside_the_ray_keeps_the_ray() {
    // (u_{j+2} − u_{j−2})/(4h): κ(t) = sin(2t)/2 vanishes at t = π/2, so on the
    // diagonal ray to θ = (2.4, 2.4) the modified wavevector passes through
    // zero at s = π/4.8 and comes back reversed: every branch κ·λ_j changes
    // sign, and the continuation ends in descending, not ascending, order
    let text = std::fs::read_to_string("bench/peer-euler2d.toml").expect("bundled case");
    let text = text.replace(
        "[space]",
        "[space.stencils.wide]\nderivative = 1\noffsets = [-2, 2]\nweights = [-0.25, 0.25]\n\n[space]",
    );
    let case = support::case_with(&text, &["space.first=\"wide\"".to_string()]);
    assert!(!sorts(&case));
    let op = case.problem.operator();
    let f = Frequencies::new(&case.problem, &op);
    let theta = [2.4, 2.4];
    let (fine, scale) = fine_continuation(&f, &theta, &permutations(op.m));
    let mut sorted = f.numerical_raw(&theta);
    sorted.sort_by(|a, b| a.re.total_cmp(&b.re));
    let apart = fine
        .iter()
        .zip(&sorted)
        .any(|(a, b)| (a - b).norm() > 0.1 * scale);
    assert!(apart, "continuation {fine:?}, ascending {sorted:?}");
    // and the analysis follows the ray there, agreeing with the fine continuation
    agrees_with_the_fine_continuation(&case, &[theta.to_vec()]);
}
