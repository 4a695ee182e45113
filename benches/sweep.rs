//! The radius-map sweep of the NumPy peer's linearised 2-D Euler case (C4, RK4,
//! 513² wavevectors) through the library, without writing outputs: 1 thread
//! against 2, and the Courant-limit search on the peer's 129² grid.

use criterion::{criterion_group, criterion_main, Criterion};
use kgain::analysis::analyse;
use kgain::case::Case;
use kgain::sample::{NoProgress, Par};
use std::path::Path;

fn peer(points: usize, analysis: &str) -> Case {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/bench/peer-euler2d.toml"
    ))
    .expect("bench case");
    let sets = [
        format!("scan.points=[{points},{points}]"),
        format!("scan.analyses=[\"{analysis}\"]"),
    ];
    Case::from_str_with(&text, Path::new("peer-euler2d.toml"), &sets).expect("valid case")
}

fn sweep(c: &mut Criterion) {
    let map = peer(513, "radius");
    let mut g = c.benchmark_group("radius_map_513");
    g.sample_size(10);
    for threads in [1, 2] {
        g.bench_function(format!("{threads}_thread"), |b| {
            b.iter(|| {
                analyse(&map.problem, &map.plan, Par::Threads(threads), &NoProgress).expect("runs")
            })
        });
    }
    g.finish();
    let lim = peer(129, "limit");
    let mut g = c.benchmark_group("courant_limit_129");
    g.sample_size(10);
    g.bench_function("2_threads", |b| {
        b.iter(|| analyse(&lim.problem, &lim.plan, Par::Threads(2), &NoProgress).expect("runs"))
    });
    g.finish();
}

criterion_group!(benches, sweep);
criterion_main!(benches);
