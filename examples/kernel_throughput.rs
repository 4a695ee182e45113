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
//! cargo run --release --example kernel_throughput -- --sizes 2,4 --uniform
//! ```

use kgain::linalg::{reference, EigSolver, LinalgError};
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

/// CPU time consumed so far by all threads of this process, in nanoseconds
/// (Linux: the sum of /proc/self/task/*/schedstat), or `None` elsewhere.
fn cpu_ns() -> Option<u64> {
    let mut total = 0;
    for task in std::fs::read_dir("/proc/self/task").ok()? {
        let stat = std::fs::read_to_string(task.ok()?.path().join("schedstat")).ok()?;
        total += stat.split_whitespace().next()?.parse::<u64>().ok()?;
    }
    Some(total)
}

/// A throughput figure: million matrices per wall-clock second, and per
/// CPU-second (which does not depend on what else the machine is running).
#[derive(Clone, Copy)]
struct Rate {
    wall: f64,
    cpu: Option<f64>,
}

/// Throughput of `count` solves on `threads` threads (best of two runs), with a
/// checksum so that no solve is optimised away.
fn throughput<S, F>(threads: usize, m: usize, mats: &[C64], count: usize, make: F) -> Rate
where
    F: Fn() -> S + Sync,
    S: FnMut(&[C64], &mut [C64]) -> Result<(), LinalgError>,
{
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(threads)
        .build()
        .expect("thread pool");
    let mut best = f64::INFINITY;
    let mut best_cpu: Option<f64> = None;
    for _ in 0..2 {
        let cpu0 = cpu_ns();
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
        if let (Some(a), Some(b)) = (cpu0, cpu_ns()) {
            let secs = (b - a) as f64 * 1e-9;
            best_cpu = Some(best_cpu.map_or(secs, |x| x.min(secs)));
        }
    }
    Rate {
        wall: count as f64 / best / 1e6,
        cpu: best_cpu.map(|s| count as f64 / s / 1e6),
    }
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

fn show(r: Option<f64>) -> String {
    r.map_or("n/a".to_string(), |x| format!("{x:.3}"))
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let quick = args.iter().any(|a| a == "--quick");
    let uniform_only = args.iter().any(|a| a == "--uniform");
    let sizes: Vec<usize> = match args.iter().position(|a| a == "--sizes") {
        Some(k) => args
            .get(k + 1)
            .map(|list| {
                list.split(',')
                    .filter_map(|x| x.trim().parse().ok())
                    .collect()
            })
            .unwrap_or_default(),
        None => SIZES.to_vec(),
    };
    let count = if quick { 1 << 16 } else { 1 << 20 };
    println!(
        "{count} matrices per kernel figure (m > 8: {}), 1/{NALGEBRA_FRACTION} of that for nalgebra",
        count / 8
    );
    println!("M matrices/s: wall clock on 1 and 2 threads, and per CPU-second on 2 threads");
    let families = [
        (Family::Uniform, "uniform complex"),
        (Family::ISymmetric, "i·(real symmetric)"),
    ];
    for &(family, name) in &families[..if uniform_only { 1 } else { 2 }] {
        println!("\n{name}");
        println!(
            "{:>3} {:>9} {:>9} {:>9} {:>9} {:>9} {:>9} {:>8} {:>11} {:>4}",
            "m",
            "kgain 1t",
            "kgain 2t",
            "kg /cpu-s",
            "nalg 1t",
            "nalg 2t",
            "na /cpu-s",
            "speed-up",
            "max err/‖A‖",
            "fail"
        );
        for &m in &sizes {
            let mats = pool(m, family, 0x6b67_6169_6e00 + m as u64);
            // The general path (m > 8) is timed on fewer matrices.
            let count = if m > 8 { count / 8 } else { count };
            let ours = |t| {
                throughput(t, m, &mats, count, || {
                    let mut s = EigSolver::new(m);
                    move |a: &[C64], out: &mut [C64]| s.eigenvalues(a, out)
                })
            };
            let theirs = |t| {
                throughput(t, m, &mats, count / NALGEBRA_FRACTION, || {
                    let mut s = reference::NalgebraEigenvalues::new(m);
                    move |a: &[C64], out: &mut [C64]| s.eigenvalues(a, out)
                })
            };
            let (k1, k2) = (ours(1), ours(2));
            let (n1, n2) = (theirs(1), theirs(2));
            let speed_up = match (k2.cpu, n2.cpu) {
                (Some(a), Some(b)) => a / b,
                _ => k1.wall / n1.wall,
            };
            let (err, failures) = max_error(m, &mats);
            println!(
                "{m:>3} {:>9.3} {:>9.3} {:>9} {:>9.3} {:>9.3} {:>9} {speed_up:>7.1}x {err:>11.2e} {failures:>4}",
                k1.wall, k2.wall, show(k2.cpu), n1.wall, n2.wall, show(n2.cpu)
            );
        }
    }
}
