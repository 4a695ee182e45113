//! Throughput of the eigenvalue kernel in million matrices per second, on 1 and 2
//! threads (a local rayon pool, one solver per worker, as in the sweep), for the
//! new kernel and for nalgebra's general complex Schur path (the previous
//! implementation), with the largest eigenvalue error of the kernel against
//! nalgebra relative to ‖A‖_F.
//!
//! Two families of seeded random matrices: entries uniform in the unit square
//! of ℂ, and i·S with S real symmetric (the symbol of a central scheme).
//!
//! ```text
//! cargo run --release --example kernel_throughput            # 2^20 matrices per figure
//! cargo run --release --example kernel_throughput -- --quick # 2^16
//! ```

use kgain::linalg::{reference, EigSolver, LinalgError};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use rand::rngs::StdRng;
use rand::{Rng, SeedableRng};
use rayon::prelude::*;
use std::time::Instant;

/// Distinct matrices per size; the timed batch cycles through them.
const POOL: usize = 1 << 14;
/// Matrices per rayon task.
const CHUNK: usize = 1 << 12;
/// nalgebra is timed on this fraction of the batch.
const NALGEBRA_FRACTION: usize = 8;
const SIZES: [usize; 8] = [2, 3, 4, 5, 6, 7, 8, 12];

#[derive(Clone, Copy)]
enum Family {
    Uniform,
    ISymmetric,
}

fn pool(m: usize, family: Family, seed: u64) -> Vec<C64> {
    let mut rng = StdRng::seed_from_u64(seed);
    let mut out = Vec::with_capacity(POOL * m * m);
    for _ in 0..POOL {
        match family {
            Family::Uniform => {
                for _ in 0..m * m {
                    out.push(C64::new(
                        rng.random_range(-1.0..1.0),
                        rng.random_range(-1.0..1.0),
                    ));
                }
            }
            Family::ISymmetric => {
                let mut a = vec![C64::new(0.0, 0.0); m * m];
                for i in 0..m {
                    for j in i..m {
                        let s = rng.random_range(-1.0..1.0);
                        a[i * m + j] = C64::new(0.0, s);
                        a[j * m + i] = C64::new(0.0, s);
                    }
                }
                out.extend(a);
            }
        }
    }
    out
}

/// The previous implementation: nalgebra's complex Schur on a reused matrix.
struct NalgebraSolver {
    m: usize,
    work: DMatrix<C64>,
}

impl NalgebraSolver {
    fn new(m: usize) -> Self {
        NalgebraSolver {
            m,
            work: DMatrix::zeros(m, m),
        }
    }

    fn eigenvalues(&mut self, a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
        let m = self.m;
        for i in 0..m {
            for j in 0..m {
                self.work[(i, j)] = a[i * m + j];
            }
        }
        let mat = std::mem::replace(&mut self.work, DMatrix::zeros(0, 0));
        let schur = nalgebra::linalg::Schur::try_new(mat, f64::EPSILON, 200 * m)
            .ok_or(LinalgError::NotConverged)?;
        let (_, t) = schur.unpack();
        for (i, o) in out.iter_mut().enumerate() {
            *o = t[(i, i)];
        }
        self.work = t;
        Ok(())
    }
}

/// Million matrices per second for `count` solves on `threads` threads (best
/// of three runs), with a checksum so that no solve is optimised away.
fn throughput<S, F>(threads: usize, m: usize, mats: &[C64], count: usize, make: F) -> f64
where
    F: Fn() -> S + Sync,
    S: FnMut(&[C64], &mut [C64]) -> Result<(), LinalgError>,
{
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(threads)
        .build()
        .expect("thread pool");
    let mut best = f64::INFINITY;
    for _ in 0..3 {
        let start = Instant::now();
        let checksum: f64 = pool.install(|| {
            (0..count.div_ceil(CHUNK))
                .into_par_iter()
                .map_init(
                    || (make(), vec![C64::new(0.0, 0.0); m]),
                    |(solve, out), c| {
                        let mut acc = 0.0;
                        for i in c * CHUNK..((c + 1) * CHUNK).min(count) {
                            let k = i % POOL;
                            if solve(&mats[k * m * m..(k + 1) * m * m], out).is_ok() {
                                acc += out[0].re;
                            }
                        }
                        acc
                    },
                )
                .sum()
        });
        std::hint::black_box(checksum);
        best = best.min(start.elapsed().as_secs_f64());
    }
    count as f64 / best / 1e6
}

/// Largest |λ − λ_ref| / ‖A‖_F over the pool, and the number of failures.
fn max_error(m: usize, mats: &[C64]) -> (f64, usize) {
    let mut solver = EigSolver::new(m);
    let mut out = vec![C64::new(0.0, 0.0); m];
    let mut worst = 0.0f64;
    let mut failures = 0;
    for a in mats.chunks_exact(m * m) {
        match (
            solver.eigenvalues(a, &mut out),
            reference::eigenvalues(a, m),
        ) {
            (Ok(()), Ok(want)) => {
                worst = worst.max(reference::pairing_error(&out, &want) / reference::frobenius(a));
            }
            _ => failures += 1,
        }
    }
    (worst, failures)
}

fn main() {
    let quick = std::env::args().any(|a| a == "--quick");
    let count = if quick { 1 << 16 } else { 1 << 20 };
    println!(
        "{count} matrices per kernel figure, {} per nalgebra figure; M matrices/s",
        count / NALGEBRA_FRACTION
    );
    for (family, name) in [
        (Family::Uniform, "uniform complex"),
        (Family::ISymmetric, "i·(real symmetric)"),
    ] {
        println!("\n{name}");
        println!(
            "{:>3} {:>10} {:>10} {:>10} {:>10} {:>10} {:>12} {:>5}",
            "m", "kgain 1t", "kgain 2t", "nalg 1t", "nalg 2t", "speed-up", "max err/‖A‖", "fail"
        );
        for (idx, &m) in SIZES.iter().enumerate() {
            let mats = pool(m, family, 0x6b67_6169_6e00 + idx as u64);
            let ours = |t| {
                throughput(t, m, &mats, count, || {
                    let mut s = EigSolver::new(m);
                    move |a: &[C64], out: &mut [C64]| s.eigenvalues(a, out)
                })
            };
            let theirs = |t| {
                throughput(t, m, &mats, count / NALGEBRA_FRACTION, || {
                    let mut s = NalgebraSolver::new(m);
                    move |a: &[C64], out: &mut [C64]| s.eigenvalues(a, out)
                })
            };
            let (k1, k2) = (ours(1), ours(2));
            let (n1, n2) = (theirs(1), theirs(2));
            let (err, failures) = max_error(m, &mats);
            println!(
                "{m:>3} {k1:>10.3} {k2:>10.3} {n1:>10.3} {n2:>10.3} {:>9.1}x {err:>12.2e} {failures:>5}",
                k1 / n1
            );
        }
    }
}
