//! The named special matrices of the kernel tests, each run through every
//! kernel (eigenvectors, Schur form, SVD with vectors, LU) and judged by the
//! scaled LAPACK test ratios of `tests/support/kernels.rs`, plus what is known
//! of its spectrum: zero, identity, Jordan blocks J_k(λ) with |λ| = 1 (k =
//! 2..8, six phases, as given, transposed and unitarily rotated), graded and
//! clustered diagonals, U T Uᴴ with random unitary U, X T X⁻¹ with κ₂(X) =
//! 1/√ε, entries near overflow and underflow and subnormal, a single nonzero
//! entry at every position, and permutations (cyclic shift, reversal, random).
//!
//! A perturbation E of a Jordan block of size k moves its eigenvalue by about
//! ‖E‖^(1/k) (Trefethen & Embree, Spectra and Pseudospectra, 2005, §2; Golub
//! & Van Loan, Matrix Computations, §7.2), so with a backward error of c·n·ε·‖A‖
//! the eigenvalues of a rotated Jordan block are checked to
//! 2·(20·k·ε·‖A‖₁)^(1/k)·‖A‖₁^(1 − 1/k).

mod support;

use kgain::linalg::{self, to_matrix};
use num_complex::Complex64 as C64;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};
use support::kernels::{norm1, Kernels};

const EPS: f64 = f64::EPSILON;
const ZERO: C64 = C64::new(0.0, 0.0);
const ONE: C64 = C64::new(1.0, 0.0);
const SIZES: [usize; 11] = [1, 2, 3, 4, 5, 6, 7, 8, 9, 12, 16];

fn uniform(rng: &mut StdRng) -> C64 {
    C64::new(rng.random_range(-1.0..1.0), rng.random_range(-1.0..1.0))
}

fn random(rng: &mut StdRng, n: usize) -> Vec<C64> {
    (0..n * n).map(|_| uniform(rng)).collect()
}

fn identity(n: usize) -> Vec<C64> {
    (0..n * n)
        .map(|k| if k % (n + 1) == 0 { ONE } else { ZERO })
        .collect()
}

fn diagonal(d: &[C64]) -> Vec<C64> {
    let n = d.len();
    (0..n * n)
        .map(|k| if k % (n + 1) == 0 { d[k / n] } else { ZERO })
        .collect()
}

/// A random unitary matrix: the Q factor of a random one (nalgebra's QR).
fn unitary(rng: &mut StdRng, n: usize) -> Vec<C64> {
    linalg::from_matrix(&to_matrix(&random(rng, n), n).qr().q())
}

fn product(a: &[C64], b: &[C64], n: usize) -> Vec<C64> {
    support::kernels::matmul(a, b, n, n, n)
}

/// U A Uᴴ.
fn rotated(u: &[C64], a: &[C64], n: usize) -> Vec<C64> {
    product(&product(u, a, n), &support::kernels::adjoint(u, n), n)
}

fn upper_random(rng: &mut StdRng, n: usize, diag: impl Fn(usize) -> C64) -> Vec<C64> {
    let mut t = random(rng, n);
    for i in 0..n {
        t[i * n + i] = diag(i);
        t[i * n..i * n + i].fill(ZERO);
    }
    t
}

/// Runs every kernel on `a` and asserts every ratio; returns the eigenvalues.
#[track_caller]
fn check(name: &str, a: &[C64], n: usize, rng: &mut StdRng) -> Vec<C64> {
    let scale = a.iter().map(|z| z.norm()).fold(0.0, f64::max);
    let b: Vec<C64> = (0..2 * n)
        .map(|_| uniform(rng) * scale.max(1e-300))
        .collect();
    let ratios = Kernels::new(n)
        .check(a, &b, 2)
        .unwrap_or_else(|e| panic!("{name}, n = {n}: {e}"));
    ratios.assert_within_limits(&format!("{name}, n = {n}"));
    linalg::eigenvalues(a, n).unwrap_or_else(|e| panic!("{name}, n = {n}: {e}"))
}

/// max over computed λ̂ of the distance to the nearest wanted eigenvalue.
fn spectrum_error(got: &[C64], want: &[C64]) -> f64 {
    linalg::reference::pairing_error(got, want)
}

#[test]
fn zero_and_identity_give_exact_spectra() {
    let mut rng = StdRng::seed_from_u64(1);
    for n in SIZES {
        assert!(check("zero", &vec![ZERO; n * n], n, &mut rng)
            .iter()
            .all(|z| *z == ZERO));
        assert!(check("identity", &identity(n), n, &mut rng)
            .iter()
            .all(|z| *z == ONE));
    }
}

#[test]
fn jordan_blocks_on_the_unit_circle_keep_the_defective_accuracy() {
    let mut rng = StdRng::seed_from_u64(2);
    for k in 2..=8 {
        for phase in [0.0, 0.5, 1.0, 2.0, 3.0, -2.5] {
            let lam = C64::from_polar(1.0, phase);
            let mut j = diagonal(&vec![lam; k]);
            for i in 0..k - 1 {
                j[i * k + i + 1] = ONE;
            }
            let transposed: Vec<C64> = (0..k * k).map(|p| j[(p % k) * k + p / k]).collect();
            let u = unitary(&mut rng, k);
            let turned = rotated(&u, &j, k);
            // Already triangular: the kernels return its diagonal (m = 2 goes
            // through the closed form, exact to a few ulps).
            let exact = check("Jordan block", &j, k, &mut rng);
            let err = spectrum_error(&exact, &vec![lam; k]);
            assert!(err <= 4.0 * EPS, "J_{k}({lam}): {exact:?}");
            for (name, a) in [
                ("transposed Jordan", &transposed),
                ("rotated Jordan", &turned),
            ] {
                let got = check(name, a, k, &mut rng);
                let anorm = norm1(a, k, k);
                let kf = k as f64;
                let tol =
                    2.0 * (20.0 * kf * EPS * anorm).powf(1.0 / kf) * anorm.powf(1.0 - 1.0 / kf);
                let err = spectrum_error(&got, &vec![lam; k]);
                assert!(err <= tol, "{name} J_{k}({lam}): error {err:e} > {tol:e}");
            }
        }
    }
}

#[test]
fn graded_and_clustered_diagonals_pass_every_ratio() {
    let mut rng = StdRng::seed_from_u64(3);
    for n in SIZES {
        let graded: Vec<C64> = (0..n)
            .map(|i| {
                C64::new(
                    10f64.powi(if i % 2 == 0 { i as i32 } else { -(i as i32) }),
                    0.0,
                )
            })
            .collect();
        assert_eq!(
            spectrum_error(
                &check("graded diagonal", &diagonal(&graded), n, &mut rng),
                &graded
            ),
            0.0
        );
        // D R D with D = diag(10^(2i − n)): entries from 10^(−2n) to 10^(2n).
        let r = random(&mut rng, n);
        let d = |i: usize| 10f64.powi(2 * i as i32 - n as i32);
        let drd: Vec<C64> = (0..n * n).map(|p| r[p] * d(p / n) * d(p % n)).collect();
        check("graded full", &drd, n, &mut rng);
        let cluster: Vec<C64> = (0..n)
            .map(|i| C64::new(1.0 + i as f64 * 1e-12, 0.0))
            .collect();
        check("clustered diagonal", &diagonal(&cluster), n, &mut rng);
        let t = upper_random(&mut rng, n, |i| cluster[i]);
        check("clustered triangle", &t, n, &mut rng);
        let u = unitary(&mut rng, n);
        let got = check(
            "rotated clustered diagonal",
            &rotated(&u, &diagonal(&cluster), n),
            n,
            &mut rng,
        );
        // A normal matrix: every eigenvalue within its backward error.
        assert!(
            spectrum_error(&got, &cluster)
                <= 20.0 * n as f64 * EPS * norm1(&cluster, 1, n).max(1.0)
        );
    }
}

#[test]
fn unitary_and_ill_conditioned_similarities_of_triangles_pass_every_ratio() {
    let mut rng = StdRng::seed_from_u64(4);
    for n in SIZES {
        for _ in 0..10 {
            let t = upper_random(&mut rng, n, |_| ZERO);
            let t = {
                let mut t = t;
                for i in 0..n {
                    t[i * n + i] = C64::from_polar(1.0, i as f64);
                }
                t
            };
            let u = unitary(&mut rng, n);
            check("U T Uᴴ", &rotated(&u, &t, n), n, &mut rng);
            // X = U diag(s) Wᴴ with s from 1 to 1/√ε: κ₂(X) = 1/√ε exactly.
            let w = unitary(&mut rng, n);
            let s = |i: usize| {
                if n == 1 {
                    1.0
                } else {
                    EPS.powf(-0.5 * i as f64 / (n - 1) as f64)
                }
            };
            let x: Vec<C64> = (0..n * n).map(|p| u[p] * s(p % n)).collect();
            let x = product(&x, &support::kernels::adjoint(&w, n), n);
            let wsi: Vec<C64> = (0..n * n).map(|p| w[p] / s(p % n)).collect();
            let x_inv = product(&wsi, &support::kernels::adjoint(&u, n), n);
            check(
                "X T X⁻¹, κ(X) = 1/√ε",
                &product(&product(&x, &t, n), &x_inv, n),
                n,
                &mut rng,
            );
        }
    }
}

#[test]
fn entries_near_overflow_underflow_and_subnormal_pass_every_ratio() {
    let mut rng = StdRng::seed_from_u64(5);
    for n in SIZES {
        let a = random(&mut rng, n);
        for (name, s) in [
            ("near overflow", 1e300),
            ("near underflow", 1e-300),
            ("subnormal", 1e-310),
        ] {
            let scaled: Vec<C64> = a.iter().map(|z| z * s).collect();
            check(name, &scaled, n, &mut rng);
        }
        let tiniest: Vec<C64> = (0..n * n)
            .map(|p| C64::new(f64::from_bits(1 + (p % 3) as u64), 0.0))
            .collect();
        check("smallest subnormals", &tiniest, n, &mut rng);
        let huge = diagonal(&vec![C64::new(f64::MAX / 4.0, 0.0); n]);
        check("scaled identity near f64::MAX", &huge, n, &mut rng);
    }
}

#[test]
fn a_single_nonzero_entry_anywhere_passes_every_ratio() {
    let mut rng = StdRng::seed_from_u64(6);
    for n in SIZES.into_iter().take(9) {
        for p in 0..n * n {
            let mut a = vec![ZERO; n * n];
            a[p] = uniform(&mut rng);
            let got = check("single nonzero entry", &a, n, &mut rng);
            let want: Vec<C64> = (0..n)
                .map(|i| if p == i * (n + 1) { a[p] } else { ZERO })
                .collect();
            assert_eq!(spectrum_error(&got, &want), 0.0, "entry {p} of n = {n}");
        }
    }
}

#[test]
fn permutations_have_roots_of_unity_as_eigenvalues() {
    let mut rng = StdRng::seed_from_u64(7);
    for n in SIZES {
        let mut cyclic = vec![ZERO; n * n];
        for i in 0..n {
            cyclic[((i + 1) % n) * n + i] = ONE;
        }
        let roots: Vec<C64> = (0..n)
            .map(|k| C64::from_polar(1.0, std::f64::consts::TAU * k as f64 / n as f64))
            .collect();
        let got = check("cyclic shift", &cyclic, n, &mut rng);
        assert!(
            spectrum_error(&got, &roots) <= 20.0 * n as f64 * EPS,
            "n = {n}"
        );
        let reversal: Vec<C64> = (0..n * n)
            .map(|p| if p / n + p % n == n - 1 { ONE } else { ZERO })
            .collect();
        check("reversal", &reversal, n, &mut rng);
        let mut perm: Vec<usize> = (0..n).collect();
        for i in (1..n).rev() {
            perm.swap(i, rng.random_range(0..=i));
        }
        let p: Vec<C64> = (0..n * n)
            .map(|q| if perm[q / n] == q % n { ONE } else { ZERO })
            .collect();
        for z in check("random permutation", &p, n, &mut rng) {
            assert!(
                (z.norm() - 1.0).abs() <= 20.0 * n as f64 * EPS,
                "n = {n}: |λ| = {}",
                z.norm()
            );
        }
    }
}
