//! Properties of the eigenvalue kernel (`kgain::linalg`) for m = 1..8, with
//! tolerances scaled by ε, the size and the norm, never flat.
//!
//! A backward-stable eigenvalue solver returns the exact eigenvalues of A + E with
//! ‖E‖ ≤ c·ε·√m·‖A‖_F. From that follow the identities checked here: Σλ = tr A,
//! Πλ = det A (|det(A+E) − det A| ≤ m‖E‖₂‖A‖₂^{m−1} to first order), σ_min(A − λI)
//! ≤ ‖E‖₂, ρ(A) ≤ ‖A‖₂ + ‖E‖₂, and, by the Bauer–Fike theorem, each computed
//! eigenvalue lies within κ(V)‖E‖₂ of an exact one when A = V D V⁻¹ (Trefethen &
//! Embree, Spectra and Pseudospectra, 2005). A Jordan block of size k perturbed by
//! δ moves its eigenvalue by about δ^{1/k}. References: nalgebra's SVD and Schur
//! form (through `linalg::reference`), QR and LU
//! serve as independent slow paths.

mod support;

use kgain::linalg::{eig2, eigenvalues, EigSolver, LinalgError};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use proptest::prelude::*;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};
use support::{assert_close_to_scale, spectrum_distance, EPS};

/// Constant of the backward-error bound c·ε·√m·‖A‖_F used throughout.
const C: f64 = 32.0;

/// Largest matrix size exercised.
const M_MAX: usize = 8;

fn backward_error(m: usize, norm: f64) -> f64 {
    C * EPS * (m as f64).sqrt() * norm
}

fn row_major(a: &DMatrix<C64>) -> Vec<C64> {
    let (r, c) = a.shape();
    (0..r * c).map(|k| a[(k / c, k % c)]).collect()
}

#[track_caller]
fn eig(a: &DMatrix<C64>) -> Vec<C64> {
    eigenvalues(&row_major(a), a.nrows())
        .unwrap_or_else(|e| panic!("eigenvalues of a {}×{} matrix: {e}", a.nrows(), a.ncols()))
}

fn random_c(rng: &mut StdRng) -> C64 {
    C64::new(rng.random_range(-1.0..1.0), rng.random_range(-1.0..1.0))
}

fn random_matrix(rng: &mut StdRng, m: usize) -> DMatrix<C64> {
    DMatrix::from_fn(m, m, |_, _| random_c(rng))
}

fn random_unitary(rng: &mut StdRng, m: usize) -> DMatrix<C64> {
    random_matrix(rng, m).qr().q()
}

/// Singular values by the slow reference (nalgebra's SVD, input scaled).
fn singular_values(a: &DMatrix<C64>) -> Vec<f64> {
    let m = a.nrows();
    kgain::linalg::reference::singular_values(&row_major(a), m).expect("reference SVD")
}

fn two_norm(a: &DMatrix<C64>) -> f64 {
    singular_values(a).into_iter().fold(0.0, f64::max)
}

fn condition(a: &DMatrix<C64>) -> f64 {
    let s = singular_values(a);
    let max = s.iter().copied().fold(0.0, f64::max);
    let min = s.iter().copied().fold(f64::INFINITY, f64::min);
    max / min
}

/// Points in the unit disc, pairwise at least `sep` apart.
fn separated_points(rng: &mut StdRng, m: usize, sep: f64) -> Vec<C64> {
    let mut pts: Vec<C64> = Vec::new();
    while pts.len() < m {
        let z = random_c(rng);
        if z.norm() <= 1.0 && pts.iter().all(|p| (p - z).norm() >= sep) {
            pts.push(z);
        }
    }
    pts
}

/// A = V D V⁻¹ with V = U₁ Σ U₂, singular values of V in [1, 2] (κ(V) ≤ 2), and the
/// inverse formed exactly from the factors. Returns (A, spectrum, κ(V)).
fn known_spectrum(rng: &mut StdRng, m: usize, scale: f64) -> (DMatrix<C64>, Vec<C64>, f64) {
    let d: Vec<C64> = separated_points(rng, m, 0.2)
        .iter()
        .map(|z| z * scale)
        .collect();
    let (u1, u2) = (random_unitary(rng, m), random_unitary(rng, m));
    let sig: Vec<f64> = (0..m).map(|_| rng.random_range(1.0..2.0)).collect();
    let s = DMatrix::from_fn(m, m, |i, j| {
        C64::new(if i == j { sig[i] } else { 0.0 }, 0.0)
    });
    let s_inv = DMatrix::from_fn(m, m, |i, j| {
        C64::new(if i == j { 1.0 / sig[i] } else { 0.0 }, 0.0)
    });
    let v = &u1 * &s * &u2;
    let v_inv = u2.adjoint() * s_inv * u1.adjoint();
    let dm = DMatrix::from_fn(m, m, |i, j| if i == j { d[i] } else { C64::new(0.0, 0.0) });
    let kappa =
        sig.iter().copied().fold(0.0, f64::max) / sig.iter().copied().fold(f64::INFINITY, f64::min);
    (&v * dm * v_inv, d, kappa)
}

/// Matrices with entries in the unit square of ℂ times 10^e, e ∈ [−6, 6].
fn matrices() -> impl Strategy<Value = DMatrix<C64>> {
    (1usize..=M_MAX)
        .prop_flat_map(|m| {
            (
                Just(m),
                prop::collection::vec((-1.0f64..1.0, -1.0f64..1.0), m * m),
                -6i32..=6,
            )
        })
        .prop_map(|(m, entries, e)| {
            let s = 10f64.powi(e);
            DMatrix::from_fn(m, m, |i, j| {
                let (re, im) = entries[i * m + j];
                C64::new(re * s, im * s)
            })
        })
}

/// Reproducible runs: a fixed seed, no regression files.
fn config() -> ProptestConfig {
    ProptestConfig {
        cases: 512,
        rng_seed: proptest::test_runner::RngSeed::Fixed(0x6b67_6169_6e00),
        failure_persistence: None,
        ..ProptestConfig::default()
    }
}

proptest! {
    #![proptest_config(config())]

    #[test]
    fn eigenvalue_sum_equals_the_trace(a in matrices()) {
        let m = a.nrows();
        let lam = eig(&a);
        let sum: C64 = lam.iter().sum();
        let tr = a.trace();
        // |tr E| ≤ √m ‖E‖_F
        let tol = (m as f64).sqrt() * backward_error(m, a.norm());
        assert_close_to_scale((sum - tr).norm(), 0.0, 1.0, tol, &format!("Σλ vs trace, m = {m}"));
    }

    #[test]
    fn eigenvalue_product_equals_the_determinant(a in matrices()) {
        let m = a.nrows();
        let lam = eig(&a);
        let prod: C64 = lam.iter().product();
        let det = a.determinant();
        // |det(A+E) − det A| ≤ m ‖E‖ ‖A‖^{m−1} (first order); LU's det errs likewise.
        let norm = a.norm();
        let tol = 2.0 * m as f64 * backward_error(m, norm) * norm.powi(m as i32 - 1);
        assert_close_to_scale((prod - det).norm(), 0.0, 1.0, tol, &format!("Πλ vs det, m = {m}"));
    }

    #[test]
    fn every_eigenvalue_makes_a_minus_lambda_i_singular(a in matrices()) {
        let m = a.nrows();
        let norm = a.norm();
        for l in eig(&a) {
            let shifted = &a - DMatrix::<C64>::identity(m, m) * l;
            let smin = singular_values(&shifted).into_iter().fold(f64::INFINITY, f64::min);
            // σ_min(A − λI) ≤ ‖E‖₂, plus the SVD's own error ε‖A − λI‖.
            let tol = backward_error(m, norm) + C * EPS * shifted.norm();
            assert_close_to_scale(smin, 0.0, 1.0, tol, &format!("σ_min(A − λI), λ = {l}, m = {m}"));
        }
    }

    #[test]
    fn spectral_radius_never_exceeds_the_two_norm(a in matrices()) {
        let m = a.nrows();
        let rho = eig(&a).iter().map(|z| z.norm()).fold(0.0, f64::max);
        let bound = two_norm(&a) + backward_error(m, a.norm());
        prop_assert!(rho <= bound, "ρ = {rho:e} > ‖A‖₂ + ‖E‖ = {bound:e} (m = {m})");
    }
}

#[test]
fn known_spectrum_is_recovered_from_a_well_conditioned_similarity() {
    // Bauer–Fike: |λ̃ − λ| ≤ κ(V) ‖E‖₂; forming A = V D V⁻¹ itself rounds at
    // ε·κ(V)·‖D‖, hence the κ² in the tolerance.
    let mut rng = StdRng::seed_from_u64(0x6b67_6169);
    for m in 1..=M_MAX {
        for trial in 0..40 {
            let scale = 10f64.powi(rng.random_range(-4..=4));
            let (a, d, kappa) = known_spectrum(&mut rng, m, scale);
            let dist = spectrum_distance(&eig(&a), &d);
            let tol = kappa * kappa * backward_error(m, a.norm().max(scale));
            assert_close_to_scale(dist, 0.0, 1.0, tol, &format!("m = {m}, trial {trial}"));
        }
    }
}

#[test]
fn spectrum_is_invariant_under_unitary_similarity() {
    let mut rng = StdRng::seed_from_u64(7);
    for m in 1..=M_MAX {
        for trial in 0..40 {
            let (a, d, kappa) = known_spectrum(&mut rng, m, 1.0);
            let q = random_unitary(&mut rng, m);
            let b = &q * &a * q.adjoint();
            let (la, lb) = (eig(&a), eig(&b));
            let tol = kappa * kappa * backward_error(m, a.norm());
            let ctx = format!("m = {m}, trial {trial}");
            assert_close_to_scale(spectrum_distance(&la, &lb), 0.0, 1.0, 2.0 * tol, &ctx);
            assert_close_to_scale(spectrum_distance(&lb, &d), 0.0, 1.0, tol, &ctx);
        }
    }
}

#[test]
fn normal_matrices_have_perfectly_conditioned_eigenvalues() {
    // A = Q D Qᴴ with Q unitary: κ(Q) = 1, so every eigenvalue is within ‖E‖₂.
    let mut rng = StdRng::seed_from_u64(11);
    for m in 1..=M_MAX {
        for trial in 0..40 {
            let d = separated_points(&mut rng, m, 0.05);
            let q = random_unitary(&mut rng, m);
            let dm = DMatrix::from_fn(m, m, |i, j| if i == j { d[i] } else { C64::new(0.0, 0.0) });
            let a = &q * dm * q.adjoint();
            let dist = spectrum_distance(&eig(&a), &d);
            let tol = backward_error(m, a.norm());
            assert_close_to_scale(dist, 0.0, 1.0, tol, &format!("m = {m}, trial {trial}"));
        }
    }
}

#[test]
fn hermitian_matrices_have_real_eigenvalues() {
    let mut rng = StdRng::seed_from_u64(13);
    for m in 1..=M_MAX {
        for trial in 0..40 {
            let x = random_matrix(&mut rng, m);
            let a = &x + x.adjoint();
            let tol = backward_error(m, a.norm());
            for l in eig(&a) {
                assert_close_to_scale(
                    l.im,
                    0.0,
                    1.0,
                    tol,
                    &format!("Im λ, m = {m}, trial {trial}"),
                );
            }
        }
    }
}

/// Right eigenvectors of an upper-triangular T with distinct diagonal, by back
/// substitution: x_k = e_k + Σ_{i<k} x_i e_i, x_i = −Σ_{j=i+1..k} T_ij x_j/(T_ii − T_kk).
fn triangular_eigenvectors(t: &DMatrix<C64>) -> DMatrix<C64> {
    let m = t.nrows();
    let mut v = DMatrix::<C64>::zeros(m, m);
    for k in 0..m {
        v[(k, k)] = C64::new(1.0, 0.0);
        for i in (0..k).rev() {
            let s: C64 = (i + 1..=k).map(|j| t[(i, j)] * v[(j, k)]).sum();
            v[(i, k)] = -s / (t[(i, i)] - t[(k, k)]);
        }
    }
    v
}

#[test]
fn triangular_matrices_have_their_diagonal_as_spectrum() {
    // Upper and lower triangular: the diagonal is the spectrum; Bauer–Fike with the
    // eigenvector matrix from back substitution (the transpose has the same κ).
    let mut rng = StdRng::seed_from_u64(17);
    for m in 1..=M_MAX {
        for trial in 0..40 {
            let d = separated_points(&mut rng, m, 0.25);
            let upper = DMatrix::from_fn(m, m, |i, j| {
                if i == j {
                    d[i]
                } else if i < j {
                    random_c(&mut rng) * 0.5
                } else {
                    C64::new(0.0, 0.0)
                }
            });
            let kappa = condition(&triangular_eigenvectors(&upper));
            for (which, a) in [("upper", upper.clone()), ("lower", upper.transpose())] {
                let dist = spectrum_distance(&eig(&a), &d);
                let tol = kappa * backward_error(m, a.norm());
                assert_close_to_scale(
                    dist,
                    0.0,
                    1.0,
                    tol,
                    &format!("{which}, m = {m}, trial {trial}"),
                );
            }
        }
    }
}

#[test]
fn zero_matrix_has_only_zero_eigenvalues() {
    for m in 1..=M_MAX {
        let a = DMatrix::<C64>::zeros(m, m);
        for l in eig(&a) {
            assert_eq!(l, C64::new(0.0, 0.0), "m = {m}");
        }
    }
}

#[test]
fn scaled_identity_has_one_repeated_eigenvalue() {
    let mut rng = StdRng::seed_from_u64(19);
    for m in 1..=M_MAX {
        for _ in 0..10 {
            let alpha = random_c(&mut rng) * 10f64.powi(rng.random_range(-5..=5));
            let a = DMatrix::<C64>::identity(m, m) * alpha;
            let tol = backward_error(m, a.norm());
            for l in eig(&a) {
                assert_close_to_scale(
                    (l - alpha).norm(),
                    0.0,
                    1.0,
                    tol,
                    &format!("m = {m}, α = {alpha}"),
                );
            }
        }
    }
}

#[test]
fn jordan_block_eigenvalues_lie_within_epsilon_to_the_one_over_k() {
    // J_k(λ) = λI + N, rotated by a random unitary so that the kernel cannot see its
    // structure. A perturbation of size δ = ‖E‖ moves a k-fold defective eigenvalue
    // by at most about (2^{k−1} δ)^{1/k} ≤ 2 δ^{1/k}; their mean stays within the
    // trace bound, δ-accurate.
    let mut rng = StdRng::seed_from_u64(23);
    for k in 1..=M_MAX {
        for trial in 0..20 {
            let lambda = C64::from_polar(rng.random_range(0.1..2.0), rng.random_range(-3.0..3.0));
            let j = DMatrix::from_fn(k, k, |r, c| {
                if r == c {
                    lambda
                } else if c == r + 1 {
                    C64::new(1.0, 0.0)
                } else {
                    C64::new(0.0, 0.0)
                }
            });
            let q = random_unitary(&mut rng, k);
            let a = &q * j * q.adjoint();
            let lam = eig(&a);
            let delta = backward_error(k, a.norm());
            let spread = 4.0 * delta.powf(1.0 / k as f64);
            let ctx = format!("k = {k}, λ = {lambda}, trial {trial}");
            for l in &lam {
                assert_close_to_scale((l - lambda).norm(), 0.0, 1.0, spread, &ctx);
            }
            let mean: C64 = lam.iter().sum::<C64>() / k as f64;
            assert_close_to_scale((mean - lambda).norm(), 0.0, 1.0, delta, &ctx);
        }
    }
}

#[test]
fn closed_form_two_by_two_agrees_with_the_general_schur_path() {
    // The m = 2 fast path against nalgebra's complex Schur form T = [[λ₁, n], [0, λ₂]];
    // the eigenvalue condition number of a 2×2 matrix is √(1 + |n|²/|λ₁ − λ₂|²).
    let mut rng = StdRng::seed_from_u64(29);
    for trial in 0..2000 {
        let a = random_matrix(&mut rng, 2) * C64::new(10f64.powi(rng.random_range(-6..=6)), 0.0);
        let (l1, l2) = eig2(a[(0, 0)], a[(0, 1)], a[(1, 0)], a[(1, 1)]);
        let (t, _) = kgain::linalg::reference::schur(&row_major(&a), 2).expect("reference Schur");
        let t = DMatrix::from_row_slice(2, 2, &t);
        let want = [t[(0, 0)], t[(1, 1)]];
        let gap: f64 = (want[0] - want[1]).norm();
        let kappa = (1.0 + t[(0, 1)].norm_sqr() / (gap * gap)).sqrt();
        let kappa: f64 = kappa;
        let tol = 2.0 * kappa * backward_error(2, a.norm());
        let dist = spectrum_distance(&[l1, l2], &want);
        assert_close_to_scale(dist, 0.0, 1.0, tol, &format!("trial {trial}, A = {a}"));
        // and the solver's own m = 2 path is that closed form
        assert_eq!(eig(&a), vec![l1, l2]);
    }
}

#[test]
fn reused_solver_gives_the_same_results_as_a_fresh_one() {
    // The workspace of EigSolver is reused between calls; results must not depend
    // on what was solved before.
    let mut rng = StdRng::seed_from_u64(31);
    for m in 1..=M_MAX {
        let mut solver = EigSolver::new(m);
        assert_eq!(solver.size(), m);
        let mut out = vec![C64::new(0.0, 0.0); m];
        for _ in 0..20 {
            let a = row_major(&random_matrix(&mut rng, m));
            solver.eigenvalues(&a, &mut out).expect("converges");
            let fresh = eigenvalues(&a, m).expect("converges");
            assert_eq!(out, fresh, "m = {m}");
        }
    }
}

#[test]
fn non_finite_input_gives_an_error_or_non_finite_eigenvalues() {
    // Not finite garbage, and never a panic.
    for m in 1..=M_MAX {
        for bad in [f64::NAN, f64::INFINITY] {
            let mut a = vec![C64::new(0.5, 0.0); m * m];
            a[m * m / 2] = C64::new(bad, 0.0);
            match eigenvalues(&a, m) {
                Err(LinalgError::NotConverged | LinalgError::NonFinite) => {}
                Err(e) => panic!("m = {m}, input {bad}: unexpected error {e}"),
                Ok(l) => assert!(
                    l.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()),
                    "m = {m}, input {bad}: finite eigenvalues {l:?}"
                ),
            }
        }
    }
}
