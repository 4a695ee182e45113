//! Accuracy of the linalg kernels against slow references: the closed forms
//! (m ≤ 2) and the fixed-size Hessenberg–QR kernels (3 ≤ m ≤ 8) against
//! nalgebra's general complex Schur decomposition, the one-sided Jacobi singular
//! values against nalgebra's SVD, and the general path (m = 9, 10) against
//! identities. Tolerances are multiples of ε·‖A‖_F (times the eigenvalue
//! condition number where the spectrum is not normal); seeded random matrices
//! for m = 1…10 plus degenerate inputs.

#[path = "support/mod.rs"]
mod support;

use kgain::linalg::{self, reference, EigSolver, LinalgError, SvdSolver};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};

use support::EPS;
/// Sizes checked: the closed forms, every fixed-size kernel, and the general path.
const SIZES: std::ops::RangeInclusive<usize> = 1..=10;
const SAMPLES: usize = 300;

fn c(re: f64, im: f64) -> C64 {
    C64::new(re, im)
}

/// Entries uniform in the unit square of the complex plane.
fn random(rng: &mut StdRng, m: usize) -> Vec<C64> {
    (0..m * m)
        .map(|_| c(rng.random_range(-1.0..1.0), rng.random_range(-1.0..1.0)))
        .collect()
}

/// i·S for a real symmetric S (the symbol of a central scheme: normal, with
/// imaginary eigenvalues), and i times the eigenvalues of S from nalgebra's
/// symmetric eigensolver.
fn i_symmetric(rng: &mut StdRng, m: usize) -> (Vec<C64>, Vec<C64>) {
    let mut s = DMatrix::<f64>::zeros(m, m);
    for i in 0..m {
        for j in i..m {
            let v = rng.random_range(-1.0..1.0);
            s[(i, j)] = v;
            s[(j, i)] = v;
        }
    }
    let a = (0..m * m).map(|k| c(0.0, s[(k / m, k % m)])).collect();
    let lam = s
        .symmetric_eigen()
        .eigenvalues
        .iter()
        .map(|&x| c(0.0, x))
        .collect();
    (a, lam)
}

/// A random unitary matrix (Q of a QR factorisation), row-major.
fn unitary(rng: &mut StdRng, m: usize) -> Vec<C64> {
    let qr = linalg::to_matrix(&random(rng, m), m).qr();
    linalg::from_matrix(&qr.q())
}

/// U·diag(d)·Uᴴ for a random unitary U: a normal matrix with spectrum d.
fn normal_with_spectrum(rng: &mut StdRng, d: &[C64]) -> Vec<C64> {
    let m = d.len();
    let u = linalg::to_matrix(&unitary(rng, m), m);
    let dm = DMatrix::from_diagonal(&nalgebra::DVector::from_column_slice(d));
    linalg::from_matrix(&(&u * dm * u.adjoint()))
}

fn eig(a: &[C64], m: usize) -> Vec<C64> {
    linalg::eigenvalues(a, m).expect("kernel failed")
}

/// The largest eigenvalue condition number 1/|yᴴx| (unit x, yᴴx = 1 scaled),
/// from the kernel's own eigenvectors V: the row norms of V⁻¹.
fn max_condition(a: &[C64], m: usize) -> f64 {
    let (_, v) = linalg::eigenvalues_and_vectors(a, m).expect("kernel failed");
    match linalg::to_matrix(&v, m).try_inverse() {
        Some(w) => (0..m).map(|i| w.row(i).norm()).fold(1.0, f64::max),
        None => f64::INFINITY,
    }
}

fn trace(a: &[C64], m: usize) -> C64 {
    (0..m).map(|i| a[i * m + i]).sum()
}

#[test]
fn random_eigenvalues_match_nalgebra_to_condition_scaled_roundoff() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e01);
    for m in SIZES {
        let mut worst = 0.0f64;
        let mut worst_plain = 0.0f64;
        for _ in 0..SAMPLES {
            let a = random(&mut rng, m);
            let fro = reference::frobenius(&a);
            let err =
                reference::pairing_error(&eig(&a, m), &reference::eigenvalues(&a, m).unwrap());
            let kappa = max_condition(&a, m);
            worst = worst.max(err / (EPS * fro * kappa));
            worst_plain = worst_plain.max(err / (EPS * fro));
        }
        eprintln!("m = {m}: max err/(ε‖A‖κ) = {worst:.2}, max err/(ε‖A‖) = {worst_plain:.2}");
        assert!(worst <= 8.0 * m as f64, "m = {m}: error {worst} ε‖A‖_F κ");
    }
}

#[test]
fn i_times_symmetric_eigenvalues_are_imaginary_and_match_the_symmetric_solver() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e02);
    for m in SIZES {
        let mut worst = 0.0f64;
        for _ in 0..SAMPLES {
            let (a, lam) = i_symmetric(&mut rng, m);
            let fro = reference::frobenius(&a);
            let ours = eig(&a, m);
            let err = reference::pairing_error(&ours, &lam);
            let re = ours.iter().map(|z| z.re.abs()).fold(0.0, f64::max);
            worst = worst.max(err.max(re) / (EPS * fro));
        }
        eprintln!("m = {m}: i·S max err/(ε‖A‖) = {worst:.2}");
        assert!(worst <= 8.0 * m as f64, "m = {m}: error {worst} ε‖A‖_F");
    }
}

#[test]
fn eigenvalues_sum_to_the_trace() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e03);
    for m in SIZES {
        for _ in 0..SAMPLES {
            let a = random(&mut rng, m);
            let sum: C64 = eig(&a, m).iter().sum();
            let tol = 4.0 * m as f64 * EPS * reference::frobenius(&a);
            assert!((sum - trace(&a, m)).norm() <= tol, "m = {m}");
        }
    }
}

#[test]
fn normal_matrices_with_repeated_eigenvalues_are_resolved_to_roundoff() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e04);
    for m in SIZES {
        let d: Vec<C64> = (0..m)
            .map(|k| {
                if k % 3 == 0 {
                    c(1.0, 1.0)
                } else {
                    c(-2.0, 0.5)
                }
            })
            .collect();
        for _ in 0..20 {
            let a = normal_with_spectrum(&mut rng, &d);
            let err = reference::pairing_error(&eig(&a, m), &d);
            assert!(
                err <= 8.0 * m as f64 * EPS * reference::frobenius(&a),
                "m = {m}: {err}"
            );
        }
    }
}

#[test]
fn zero_identity_diagonal_and_triangular_matrices_give_their_diagonal_exactly() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e05);
    for m in SIZES {
        let zero = vec![c(0.0, 0.0); m * m];
        assert!(
            eig(&zero, m).iter().all(|z| *z == c(0.0, 0.0)),
            "zero, m = {m}"
        );
        let mut id = zero.clone();
        for i in 0..m {
            id[i * m + i] = c(1.0, 0.0);
        }
        assert!(
            eig(&id, m).iter().all(|z| *z == c(1.0, 0.0)),
            "identity, m = {m}"
        );
        let mut upper = random(&mut rng, m);
        for i in 0..m {
            for j in 0..i {
                upper[i * m + j] = c(0.0, 0.0);
            }
        }
        let diag: Vec<C64> = (0..m).map(|i| upper[i * m + i]).collect();
        if m <= linalg::MAX_FIXED && m > 2 {
            // Fixed-size kernels deflate a triangular matrix without touching it.
            assert_eq!(
                reference::pairing_error(&eig(&upper, m), &diag),
                0.0,
                "m = {m}"
            );
        }
        let err = reference::pairing_error(&eig(&upper, m), &diag);
        assert!(
            err <= 8.0 * EPS * reference::frobenius(&upper),
            "triangular, m = {m}: {err}"
        );
    }
}

#[test]
fn jordan_blocks_give_their_eigenvalue_to_the_defective_accuracy() {
    let lam = c(0.5, -2.0);
    for m in SIZES {
        // Upper: already triangular, so the eigenvalue is exact.
        let mut upper = vec![c(0.0, 0.0); m * m];
        for i in 0..m {
            upper[i * m + i] = lam;
            if i + 1 < m {
                upper[i * m + i + 1] = c(1.0, 0.0);
            }
        }
        let err = eig(&upper, m)
            .iter()
            .map(|z| (z - lam).norm())
            .fold(0.0, f64::max);
        assert!(err <= 4.0 * EPS, "upper Jordan, m = {m}: {err}");
        // Lower (the transpose): a defective eigenvalue moves by O(ε^{1/m}).
        let mut lower = vec![c(0.0, 0.0); m * m];
        for i in 0..m {
            for j in 0..m {
                lower[i * m + j] = upper[j * m + i];
            }
        }
        let fro = reference::frobenius(&lower);
        let err = eig(&lower, m)
            .iter()
            .map(|z| (z - lam).norm())
            .fold(0.0, f64::max);
        let tol = 4.0 * (EPS * fro).powf(1.0 / m as f64) * fro.powf(1.0 - 1.0 / m as f64);
        assert!(err <= tol, "lower Jordan, m = {m}: {err} > {tol}");
        let sum: C64 = eig(&lower, m).iter().sum();
        assert!(
            (sum - lam * m as f64).norm() <= 8.0 * m as f64 * EPS * fro,
            "trace, m = {m}"
        );
    }
}

#[test]
fn cyclic_permutations_give_the_roots_of_unity() {
    for m in SIZES {
        let mut p = vec![c(0.0, 0.0); m * m];
        for i in 0..m {
            p[((i + 1) % m) * m + i] = c(1.0, 0.0);
        }
        let roots: Vec<C64> = (0..m)
            .map(|k| C64::from_polar(1.0, 2.0 * std::f64::consts::PI * k as f64 / m as f64))
            .collect();
        let err = reference::pairing_error(&eig(&p, m), &roots);
        assert!(err <= 16.0 * m as f64 * EPS, "m = {m}: {err}");
    }
}

#[test]
fn scaling_by_huge_and_tiny_powers_scales_the_eigenvalues() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e06);
    for m in SIZES {
        for _ in 0..20 {
            let a = random(&mut rng, m);
            let base = eig(&a, m);
            let fro = reference::frobenius(&a);
            for s in [1e150, 1e-150, 1e300, 1e-300, 1e-305] {
                let scaled: Vec<C64> = a.iter().map(|z| z * s).collect();
                let got: Vec<C64> = eig(&scaled, m).iter().map(|z| z / s).collect();
                assert!(
                    got.iter().all(|z| z.re.is_finite() && z.im.is_finite()),
                    "m = {m}, s = {s}"
                );
                let err = reference::pairing_error(&got, &base);
                let kappa = max_condition(&a, m);
                // 1e-305 pushes entries into the subnormals: a few digits are lost.
                let lost = if s < 1e-300 { 1e4 } else { 1.0 };
                assert!(
                    err <= 16.0 * m as f64 * lost * EPS * fro * kappa,
                    "m = {m}, s = {s}: {err}"
                );
            }
        }
    }
}

#[test]
fn non_finite_input_is_an_error_not_a_hang() {
    for m in SIZES {
        for bad in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
            let mut a = vec![c(1.0, 0.0); m * m];
            a[m * m / 2] = c(0.5, bad);
            let mut solver = EigSolver::new(m);
            let mut out = vec![c(0.0, 0.0); m];
            let mut vec = vec![c(0.0, 0.0); m * m];
            assert_eq!(
                solver.eigenvalues(&a, &mut out),
                Err(LinalgError::NonFinite),
                "m = {m}"
            );
            assert_eq!(
                solver.eigenvalues_and_vectors(&a, &mut out, &mut vec),
                Err(LinalgError::NonFinite)
            );
            let mut sv = vec![0.0; m];
            assert_eq!(
                SvdSolver::new(m).singular_values(&a, &mut sv),
                Err(LinalgError::NonFinite)
            );
        }
    }
}

#[test]
fn eigenvectors_have_unit_norm_and_roundoff_residuals() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e07);
    for m in SIZES {
        let mut worst = 0.0f64;
        for k in 0..SAMPLES {
            let a = if k % 2 == 0 {
                random(&mut rng, m)
            } else {
                i_symmetric(&mut rng, m).0
            };
            let (values, v) = linalg::eigenvalues_and_vectors(&a, m).unwrap();
            let fro = reference::frobenius(&a);
            for j in 0..m {
                let col: Vec<C64> = (0..m).map(|i| v[i * m + j]).collect();
                let nrm: f64 = col.iter().map(|z| z.norm_sqr()).sum::<f64>().sqrt();
                assert!(
                    (nrm - 1.0).abs() <= 4.0 * m as f64 * EPS,
                    "m = {m}: ‖v‖ = {nrm}"
                );
                let res = (0..m)
                    .map(|i| {
                        let av: C64 = (0..m).map(|l| a[i * m + l] * col[l]).sum();
                        (av - values[j] * col[i]).norm_sqr()
                    })
                    .sum::<f64>()
                    .sqrt();
                worst = worst.max(res / (EPS * (m as f64).sqrt() * fro));
            }
            let err = reference::pairing_error(&values, &eig(&a, m));
            assert!(
                err <= 8.0 * m as f64 * EPS * fro * max_condition(&a, m),
                "m = {m}"
            );
        }
        eprintln!("m = {m}: max ‖Av − λv‖/(ε√m‖A‖) = {worst:.2}");
        assert!(
            worst <= 8.0 * m as f64,
            "m = {m}: residual {worst} ε√m‖A‖_F"
        );
    }
}

#[test]
fn defective_and_degenerate_inputs_still_give_small_eigenvector_residuals() {
    for m in SIZES {
        let mut jordan = vec![c(0.0, 0.0); m * m];
        for i in 0..m {
            jordan[i * m + i] = c(2.0, 1.0);
            if i + 1 < m {
                jordan[(i + 1) * m + i] = c(1.0, 0.0);
            }
        }
        let zero = vec![c(0.0, 0.0); m * m];
        for a in [jordan, zero] {
            let (values, v) = linalg::eigenvalues_and_vectors(&a, m).unwrap();
            assert!(
                v.iter().all(|z| z.re.is_finite() && z.im.is_finite()),
                "m = {m}"
            );
            let fro = reference::frobenius(&a).max(1.0);
            for j in 0..m {
                let res = (0..m)
                    .map(|i| {
                        let av: C64 = (0..m).map(|l| a[i * m + l] * v[l * m + j]).sum();
                        (av - values[j] * v[i * m + j]).norm()
                    })
                    .fold(0.0, f64::max);
                assert!(
                    res <= 64.0 * m as f64 * EPS.powf(1.0 / m as f64) * fro,
                    "m = {m}: {res}"
                );
            }
        }
    }
}

#[test]
fn singular_values_match_nalgebra_svd() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e08);
    for m in SIZES {
        let mut worst = 0.0f64;
        for k in 0..SAMPLES {
            let mut a = random(&mut rng, m);
            if k % 10 == 0 && m > 1 {
                // Rank deficient: one row repeated.
                let (first, rest) = a.split_at_mut(m);
                rest[..m].copy_from_slice(first);
            }
            let ours = linalg::singular_values(&a, m).unwrap();
            let want = reference::singular_values(&a, m).unwrap();
            let err = ours
                .iter()
                .zip(&want)
                .map(|(x, y)| (x - y).abs())
                .fold(0.0, f64::max);
            worst = worst.max(err / (EPS * reference::frobenius(&a)));
            assert!(ours.windows(2).all(|w| w[0] >= w[1]), "not descending");
        }
        eprintln!("m = {m}: singular values max err/(ε‖A‖) = {worst:.2}");
        assert!(worst <= 4.0 * m as f64, "m = {m}: {worst}");
    }
}

#[test]
fn norm2_bounds_the_spectral_radius_and_is_one_for_unitary_matrices() {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e09);
    for m in SIZES {
        for _ in 0..50 {
            let a = random(&mut rng, m);
            let n2 = linalg::norm2(&a, m).unwrap();
            let rho = linalg::spectral_radius(&a, m).unwrap();
            assert!(
                rho <= n2 * (1.0 + 8.0 * m as f64 * EPS),
                "m = {m}: ρ {rho} > ‖A‖₂ {n2}"
            );
            assert!(n2 <= reference::frobenius(&a) * (1.0 + 4.0 * EPS));
            let u = unitary(&mut rng, m);
            assert!((linalg::norm2(&u, m).unwrap() - 1.0).abs() <= 8.0 * m as f64 * EPS);
        }
        let zero = vec![c(0.0, 0.0); m * m];
        assert_eq!(linalg::norm2(&zero, m).unwrap(), 0.0);
        let mut diag = zero.clone();
        for i in 0..m {
            diag[i * m + i] = c(0.0, -(i as f64) - 1.0);
        }
        assert!((linalg::norm2(&diag, m).unwrap() - m as f64).abs() <= 4.0 * EPS * m as f64);
        for s in [1e150, 1e-150, 1e300] {
            let scaled: Vec<C64> = diag.iter().map(|z| z * s).collect();
            let n2 = linalg::norm2(&scaled, m).unwrap();
            assert!(
                (n2 / (s * m as f64) - 1.0).abs() <= 8.0 * EPS,
                "m = {m}, s = {s}"
            );
        }
    }
}

mod fuzz {
    //! Matrices built from a few hostile values (zeros, ±1, ±i, 1e±300,
    //! subnormals) in any pattern: every kernel returns, never panics, and a
    //! successful result satisfies Σλ = trace.
    use super::*;
    use proptest::prelude::*;

    const VALUES: [(f64, f64); 9] = [
        (0.0, 0.0),
        (1.0, 0.0),
        (-1.0, 0.0),
        (0.0, 1.0),
        (0.0, -1.0),
        (1e300, 0.0),
        (0.0, -1e-300),
        (5e-324, 0.0),
        (1.0, 1e-12),
    ];

    fn hostile() -> impl Strategy<Value = (usize, Vec<C64>)> {
        (1usize..=10).prop_flat_map(|m| {
            proptest::collection::vec(0..VALUES.len(), m * m).prop_map(move |idx| {
                (
                    m,
                    idx.iter().map(|&k| c(VALUES[k].0, VALUES[k].1)).collect(),
                )
            })
        })
    }

    /// Entries of random sign and phase with magnitudes 10^k, k in −300..300.
    fn graded() -> impl Strategy<Value = (usize, Vec<C64>)> {
        (1usize..=10).prop_flat_map(|m| {
            proptest::collection::vec((-300i32..300, 0.0..std::f64::consts::TAU), m * m).prop_map(
                move |e| {
                    (
                        m,
                        e.iter()
                            .map(|&(k, t)| C64::from_polar(10f64.powi(k), t))
                            .collect(),
                    )
                },
            )
        })
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(300))]
        #[test]
        fn graded_matrices_keep_the_trace((m, a) in graded()) {
            let fro = reference::frobenius(&a);
            let lam = linalg::eigenvalues(&a, m);
            prop_assert!(lam.is_ok(), "{:?}", lam);
            let sum: C64 = lam.unwrap().iter().sum();
            prop_assert!((sum - trace(&a, m)).norm() <= 16.0 * m as f64 * EPS * fro);
            let (values, _) = linalg::eigenvalues_and_vectors(&a, m).unwrap();
            let sum: C64 = values.iter().sum();
            prop_assert!((sum - trace(&a, m)).norm() <= 16.0 * m as f64 * EPS * fro);
            let s = linalg::singular_values(&a, m).unwrap();
            prop_assert!(s[0] <= fro * (1.0 + 4.0 * EPS) && s[0] >= fro / (m as f64).sqrt() * (1.0 - 4.0 * EPS));
        }
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(400))]
        #[test]
        fn hostile_matrices_return_a_value_and_keep_the_trace((m, a) in hostile()) {
            let fro = reference::frobenius(&a);
            match linalg::eigenvalues(&a, m) {
                Ok(lam) => {
                    let sum: C64 = lam.iter().sum();
                    let tol = 16.0 * m as f64 * EPS * fro;
                    prop_assert!((sum - trace(&a, m)).norm() <= tol, "Σλ = {sum}, trace {}", trace(&a, m));
                }
                Err(e) => prop_assert_eq!(e, LinalgError::NotConverged),
            }
            if let Ok((values, v)) = linalg::eigenvalues_and_vectors(&a, m) {
                prop_assert!(values.iter().chain(&v).all(|z| z.re.is_finite() && z.im.is_finite()));
            }
            if let Ok(s) = linalg::singular_values(&a, m) {
                prop_assert!(s.iter().all(|x| x.is_finite() && *x >= 0.0));
                prop_assert!(s[0] <= fro * (1.0 + 4.0 * EPS));
            }
        }
    }
}
