//! Criterion benchmarks of the eigenvalue kernel on one thread: matrices per
//! second for m = 2, 3, 4, 5, 8 (and 12 on the general path), for
//! `EigSolver::eigenvalues` and for nalgebra's general complex Schur path (the
//! previous implementation, on a reused matrix), plus eigenvectors and the
//! spectral norm, the Schur form, the SVD with both sets of singular vectors
//! and an LU solve with one right-hand side. Each iteration solves a batch of
//! seeded random matrices with entries uniform in the unit square of ℂ;
//! throughput is reported per matrix.
//!
//! `cargo bench --bench kernel` (append a filter such as `eigenvalues/kgain`).

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use kgain::linalg::{reference, EigSolver, LuSolver, SchurSolver, SvdSolver};
use num_complex::Complex64 as C64;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};
use std::hint::black_box;
use std::time::Duration;

/// Matrices per benchmark iteration.
const BATCH: usize = 256;
const SIZES: [usize; 6] = [2, 3, 4, 5, 8, 12];

fn batch(m: usize) -> Vec<C64> {
    let mut rng = StdRng::seed_from_u64(0x6b67_6169_6e00 + m as u64);
    (0..BATCH * m * m)
        .map(|_| C64::new(rng.random_range(-1.0..1.0), rng.random_range(-1.0..1.0)))
        .collect()
}

fn eigenvalues(c: &mut Criterion) {
    let mut group = c.benchmark_group("eigenvalues");
    group.throughput(Throughput::Elements(BATCH as u64));
    for m in SIZES {
        let mats = batch(m);
        group.bench_with_input(BenchmarkId::new("kgain", m), &m, |b, &m| {
            let mut solver = EigSolver::new(m);
            let mut out = vec![C64::new(0.0, 0.0); m];
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    solver
                        .eigenvalues(black_box(a), &mut out)
                        .expect("converged");
                    black_box(&out);
                }
            })
        });
        group.bench_with_input(BenchmarkId::new("nalgebra", m), &m, |b, &m| {
            let mut solver = reference::NalgebraEigenvalues::new(m);
            let mut out = vec![C64::new(0.0, 0.0); m];
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    solver
                        .eigenvalues(black_box(a), &mut out)
                        .expect("converged");
                    black_box(&out);
                }
            })
        });
    }
    group.finish();
}

fn vectors_and_norm(c: &mut Criterion) {
    let mut group = c.benchmark_group("vectors_and_norm");
    group.throughput(Throughput::Elements(BATCH as u64));
    for m in SIZES {
        let mats = batch(m);
        group.bench_with_input(BenchmarkId::new("eigenvectors", m), &m, |b, &m| {
            let mut solver = EigSolver::new(m);
            let mut values = vec![C64::new(0.0, 0.0); m];
            let mut vectors = vec![C64::new(0.0, 0.0); m * m];
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    solver
                        .eigenvalues_and_vectors(black_box(a), &mut values, &mut vectors)
                        .expect("converged");
                    black_box(&vectors);
                }
            })
        });
        group.bench_with_input(BenchmarkId::new("norm2", m), &m, |b, &m| {
            let mut solver = SvdSolver::new(m);
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    black_box(solver.norm2(black_box(a)).expect("converged"));
                }
            })
        });
    }
    group.finish();
}

fn factorisations(c: &mut Criterion) {
    let mut group = c.benchmark_group("factorisations");
    group.throughput(Throughput::Elements(BATCH as u64));
    for m in SIZES {
        let mats = batch(m);
        let zeros = vec![C64::new(0.0, 0.0); m * m];
        group.bench_with_input(BenchmarkId::new("schur", m), &m, |b, &m| {
            let mut solver = SchurSolver::new(m);
            let (mut t, mut q) = (zeros.clone(), zeros.clone());
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    solver
                        .decompose(black_box(a), &mut t, &mut q)
                        .expect("converged");
                    black_box((&t, &q));
                }
            })
        });
        group.bench_with_input(BenchmarkId::new("svd_with_vectors", m), &m, |b, &m| {
            let mut solver = SvdSolver::new(m);
            let (mut u, mut v, mut sigma) = (zeros.clone(), zeros.clone(), vec![0.0; m]);
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    solver
                        .decompose(black_box(a), &mut sigma, Some(&mut u), Some(&mut v))
                        .expect("converged");
                    black_box((&sigma, &u, &v));
                }
            })
        });
        group.bench_with_input(BenchmarkId::new("lu_solve", m), &m, |b, &m| {
            let mut solver = LuSolver::new(m);
            let mut x = vec![C64::new(1.0, 0.0); m];
            b.iter(|| {
                for a in mats.chunks_exact(m * m) {
                    x.fill(C64::new(1.0, 0.0));
                    solver.solve(black_box(a), &mut x, 1).expect("nonsingular");
                    black_box(&x);
                }
            })
        });
    }
    group.finish();
}

fn config() -> Criterion {
    Criterion::default()
        .sample_size(20)
        .warm_up_time(Duration::from_millis(500))
        .measurement_time(Duration::from_secs(2))
        .configure_from_args()
}

criterion_group! {
    name = benches;
    config = config();
    targets = eigenvalues, vectors_and_norm, factorisations
}
criterion_main!(benches);
