//! The nalgebra-facing wrappers of `linalg::dense` on the crate's own kernels,
//! and the error paths of the new kernels: Schur form and SVD of `DMatrix`
//! values (scaled LAPACK ratios of `tests/support/kernels.rs`), prompt answers
//! for tiny and subnormal matrices (where nalgebra's SVD does not return),
//! closed forms for σ_min, the dominant right singular vector and the
//! eigenvector condition number, typed errors for NaN, singular systems and
//! solutions beyond the f64 range, and LU at extreme scales.

mod support;

use kgain::linalg::{self, dense, LinalgError, LuSolver, SchurSolver, SvdSolver};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};
use std::time::{Duration, Instant};
use support::kernels::{lu_ratio, schur_ratio, unitarity, LU_LIMIT, SCHUR_LIMIT};

const EPS: f64 = f64::EPSILON;

fn c(re: f64, im: f64) -> C64 {
    C64::new(re, im)
}

fn random(rng: &mut StdRng, n: usize) -> Vec<C64> {
    (0..n * n)
        .map(|_| c(rng.random_range(-1.0..1.0), rng.random_range(-1.0..1.0)))
        .collect()
}

#[test]
fn dense_schur_is_a_unitary_similarity_onto_a_triangle() {
    let mut rng = StdRng::seed_from_u64(11);
    for n in [1, 2, 3, 5, 8, 10, 16] {
        let a = random(&mut rng, n);
        let (q, t) = dense::schur(&linalg::to_matrix(&a, n)).expect("Schur form");
        let (q, t) = (linalg::from_matrix(&q), linalg::from_matrix(&t));
        assert!(schur_ratio(&a, &t, &q, n) <= SCHUR_LIMIT, "n = {n}");
        assert!(unitarity(&q, n) <= SCHUR_LIMIT, "n = {n}");
        assert!((0..n).all(|i| t[i * n..i * n + i].iter().all(|z| *z == c(0.0, 0.0))));
    }
}

#[test]
fn tiny_and_subnormal_matrices_get_their_singular_values_promptly() {
    let mut rng = StdRng::seed_from_u64(12);
    for n in [2, 4, 8, 12] {
        let a = random(&mut rng, n);
        let want = linalg::reference::singular_values(&a, n).expect("reference");
        for s in [1e-160, 1e-200, 1e-300, 1e-310] {
            let start = Instant::now();
            let got = dense::singular_values(&linalg::to_matrix(&a, n).map(|z| z * s));
            assert!(
                start.elapsed() < Duration::from_secs(5),
                "n = {n}, scale {s}"
            );
            // Rounding of the scaled entries (subnormal below 2.2e-308) included.
            let lost = if s < 1e-300 { 1e-13 } else { 0.0 };
            for (g, w) in got.iter().zip(&want) {
                let tol = 35.0 * n as f64 * EPS * want[0] * s + lost * want[0] * s;
                assert!(
                    (g - w * s).abs() <= tol,
                    "n = {n}, scale {s}: {g:e} vs {:e}",
                    w * s
                );
            }
        }
    }
}

#[test]
fn sigma_min_of_a_shifted_diagonal_is_the_distance_to_the_nearest_entry() {
    // σ(zI − D) = {|z − d_i|} for diagonal D: the resolvent norm is 1/min|z − d_i|.
    let d = [c(0.5, 0.0), c(0.0, -0.9), c(-0.3, 0.3), c(0.99, 0.1)];
    for z in [c(1.0, 0.0), c(0.0, 1.0), c(-2.0, 0.5)] {
        let shifted = DMatrix::from_fn(4, 4, |i, j| if i == j { z - d[i] } else { c(0.0, 0.0) });
        let want = d
            .iter()
            .map(|x| (z - x).norm())
            .fold(f64::INFINITY, f64::min);
        assert!(
            (dense::sigma_min(&shifted) - want).abs() <= 4.0 * EPS * want,
            "z = {z}"
        );
        let top = d.iter().map(|x| (z - x).norm()).fold(0.0, f64::max);
        assert!(
            (dense::norm2(&shifted) - top).abs() <= 4.0 * EPS * top,
            "z = {z}"
        );
    }
}

#[test]
fn dominant_right_singular_vector_is_stretched_by_the_two_norm() {
    let mut rng = StdRng::seed_from_u64(13);
    for n in [1, 2, 4, 8, 11] {
        let a = linalg::to_matrix(&random(&mut rng, n), n);
        let (sigma, v) = dense::dominant_right_singular_vector(&a).expect("SVD");
        let v = nalgebra::DVector::from_vec(v);
        assert!((v.norm() - 1.0).abs() <= 4.0 * n as f64 * EPS);
        assert!(
            ((&a * &v).norm() - sigma).abs() <= 8.0 * n as f64 * EPS * sigma,
            "n = {n}"
        );
        assert_eq!(sigma, dense::norm2(&a));
    }
}

#[test]
fn eigenvector_condition_of_a_two_by_two_triangle_has_its_closed_form() {
    // T = [[a, b], [0, d]]: unit eigenvectors e₁ and (b, d − a)/r with
    // r = √(|b|² + |d − a|²); YᴴY = [[1, γ], [γ̄, 1]], γ = b/r, has eigenvalues
    // 1 ± |γ|, so κ₂(Y) = √((1 + |γ|)/(1 − |γ|)).
    for (a, b, d) in [
        (c(1.0, 0.0), c(3.0, -1.0), c(0.5, 0.5)),
        (c(0.0, 1.0), c(1e-3, 0.0), c(0.0, -1.0)),
    ] {
        let t = DMatrix::from_row_slice(2, 2, &[a, b, c(0.0, 0.0), d]);
        let gamma = b.norm() / (b.norm_sqr() + (d - a).norm_sqr()).sqrt();
        let want = ((1.0 + gamma) / (1.0 - gamma)).sqrt();
        let got = dense::eigvec_condition(&t, &t);
        assert!((got - want).abs() <= 64.0 * EPS * want, "{got} vs {want}");
    }
}

#[test]
fn non_finite_input_is_a_typed_error_for_every_new_kernel() {
    for n in [1, 3, 8, 10] {
        let mut a = vec![c(1.0, 0.0); n * n];
        a[n * n / 2] = c(f64::NAN, 0.0);
        let mut m = vec![c(0.0, 0.0); n * n];
        let mut q = vec![c(0.0, 0.0); n * n];
        let mut s = vec![0.0; n];
        assert_eq!(
            SchurSolver::new(n).decompose(&a, &mut m, &mut q),
            Err(LinalgError::NonFinite)
        );
        let svd = SvdSolver::new(n).decompose(&a, &mut s, Some(&mut m), Some(&mut q));
        assert_eq!(svd, Err(LinalgError::NonFinite));
        assert_eq!(SvdSolver::new(n).sigma_min(&a), Err(LinalgError::NonFinite));
        assert_eq!(LuSolver::new(n).factor(&a), Err(LinalgError::NonFinite));
        assert!(dense::schur(&linalg::to_matrix(&a, n)).is_none());
        assert!(dense::norm2(&linalg::to_matrix(&a, n)).is_nan());
        let identity: Vec<C64> = (0..n * n)
            .map(|k| c(if k % (n + 1) == 0 { 1.0 } else { 0.0 }, 0.0))
            .collect();
        let mut lu = LuSolver::new(n);
        lu.factor(&identity).expect("identity");
        let mut b = vec![c(f64::INFINITY, 0.0); n];
        assert_eq!(lu.solve_in_place(&mut b, 1), Err(LinalgError::NonFinite));
    }
}

#[test]
fn lu_solves_several_right_hand_sides_at_extreme_scales() {
    let mut rng = StdRng::seed_from_u64(14);
    for n in [1, 2, 5, 8, 9, 16] {
        for (sa, sb) in [
            (1.0, 1.0),
            (1e300, 1e300),
            (1e-300, 1e-300),
            (1e-310, 1e-310),
            (1e300, 1e-3),
            (1e-300, 1e3),
        ] {
            let a: Vec<C64> = random(&mut rng, n).iter().map(|z| z * sa).collect();
            let b: Vec<C64> = (0..3 * n)
                .map(|_| c(rng.random_range(-1.0..1.0), 0.0) * sb)
                .collect();
            let x = linalg::solve(&a, &b, n, 3)
                .unwrap_or_else(|e| panic!("n = {n}, {sa:e}/{sb:e}: {e}"));
            let r = lu_ratio(&a, &x, &b, n, 3);
            assert!(r <= LU_LIMIT, "n = {n}, scales {sa:e}/{sb:e}: ratio {r}");
        }
    }
}

#[test]
fn singular_systems_and_unrepresentable_solutions_are_typed_errors() {
    for n in [2, 4, 8, 12] {
        // Rank one: x yᴴ.
        let a: Vec<C64> = (0..n * n)
            .map(|k| c((k / n) as f64 + 1.0, 0.0) * c(1.0, (k % n) as f64))
            .collect();
        let mut b = vec![c(1.0, 0.0); n];
        assert_eq!(
            LuSolver::new(n).solve(&a, &mut b, 1),
            Err(LinalgError::Singular)
        );
        // 1e-300·I x = 1e300: x = 1e600 is beyond the f64 range.
        let tiny: Vec<C64> = (0..n * n)
            .map(|k| {
                if k % (n + 1) == 0 {
                    c(1e-300, 0.0)
                } else {
                    c(0.0, 0.0)
                }
            })
            .collect();
        let mut b = vec![c(1e300, 0.0); n];
        assert_eq!(
            LuSolver::new(n).solve(&tiny, &mut b, 1),
            Err(LinalgError::OutOfRange)
        );
    }
}

#[test]
fn one_factorisation_serves_many_solves_identically() {
    let mut rng = StdRng::seed_from_u64(15);
    for n in [3, 8, 10] {
        let a = random(&mut rng, n);
        let b = random(&mut rng, n);
        let mut lu = LuSolver::new(n);
        lu.factor(&a).expect("factor");
        let mut all = b.clone();
        lu.solve_in_place(&mut all, n).expect("solve");
        for j in 0..n {
            let mut col: Vec<C64> = (0..n).map(|i| b[i * n + j]).collect();
            lu.solve_in_place(&mut col, 1).expect("solve");
            assert!(
                (0..n).all(|i| col[i] == all[i * n + j]),
                "n = {n}, column {j}"
            );
        }
    }
}
