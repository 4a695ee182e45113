//! The dispersion maps over the whole wavevector grid, streamed: the output
//! arrays are allocated once at their final size and cut into chunks of
//! consecutive nodes; each worker fills a chunk in place — frequencies, group
//! velocities and every derived map of a node in one pass — from its own
//! [`NodeWork`]. Nothing is held per node besides the outputs themselves, and
//! every node is computed alone, so the arrays do not depend on the number of
//! threads.

use super::frequencies::Frequencies;
use super::maps::{DerivedMaps, NodeFrequencies, MAP_COUNT};
use super::node::{NodeSlots, NodeWork};
use super::opposes;
use crate::analysis::context::Context;
use crate::physics::ModelKind;
use crate::sample::{Stage, Symmetry};
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// Nodes per chunk of work.
const CHUNK: usize = 64;

/// The node-major arrays of the dispersion analysis.
pub struct NodeArrays {
    /// Semi-discrete ω (nodes × m).
    pub numerical: Vec<C64>,
    /// Exact ω (nodes × m).
    pub exact: Vec<C64>,
    /// Fully discrete ω (nodes × discrete modes).
    pub discrete: Vec<C64>,
    /// Semi-discrete group velocities (nodes × m × d).
    pub group: Vec<f64>,
    /// Exact group velocities.
    pub group_exact: Vec<f64>,
    /// Fully discrete group velocities.
    pub group_discrete: Vec<f64>,
    /// The derived maps (nodes × m each).
    pub maps: DerivedMaps,
    /// Per mode: nodes where the numerical group velocity opposes the exact one.
    pub opposed: Vec<usize>,
}

/// One chunk's share of every array.
struct Chunk<'a> {
    first: usize,
    nodes: usize,
    /// Fully discrete frequencies per node.
    discrete_modes: usize,
    numerical: &'a mut [C64],
    exact: &'a mut [C64],
    discrete: &'a mut [C64],
    group: &'a mut [f64],
    group_exact: &'a mut [f64],
    group_discrete: &'a mut [f64],
    maps: [&'a mut [f64]; MAP_COUNT],
}

/// Every node of the context's grid, with `discrete_modes` fully discrete
/// frequencies per node; half of them mirrored where [`mirrors`] allows.
pub fn sweep(ctx: &Context, f: &Frequencies, discrete_modes: usize) -> NodeArrays {
    sweep_with(ctx, f, discrete_modes, true)
}

/// Whether the nodes of the second half of the grid may be copied from their
/// mirror images −θ in the first (see `mirror`): real coefficients (L(−θ) is
/// the complex conjugate of L(θ), as for the radius map), no source or
/// diffusion (the exact spectrum scales along the ray, so every mode order is
/// ascending frequency, which the mirror reverses), one of kgain's own models
/// (a user's `linear` system names its modes by the shapes of its x-flux
/// matrix's eigenvectors instead), and a one-step method, whose fully
/// discrete modes are the principal roots alone.
pub fn mirrors(ctx: &Context, f: &Frequencies, discrete_modes: usize) -> bool {
    ctx.symmetry() == Symmetry::Even
        && f.homogeneous()
        && ctx.problem.system.kind != ModelKind::Linear
        && !ctx.is_composite()
        && discrete_modes == ctx.op.m
}

/// [`sweep`], copying mirror images only when `mirror` is asked and
/// [`mirrors`] allows it (false: every node computed).
pub fn sweep_with(
    ctx: &Context,
    f: &Frequencies,
    discrete_modes: usize,
    mirror: bool,
) -> NodeArrays {
    let grid = &ctx.grid;
    let (n, d, m) = (grid.len(), grid.points.len(), ctx.op.m);
    // complex zeros are written, not mapped zeroed like f64 ones: on the
    // workers, so that first touching the pages is not one thread's job
    let zeros = |len: usize| -> Vec<C64> {
        ctx.par.run(|| {
            (0..len)
                .into_par_iter()
                .map(|_| C64::new(0.0, 0.0))
                .collect()
        })
    };
    let mut out = NodeArrays {
        numerical: zeros(n * m),
        exact: zeros(n * m),
        discrete: zeros(n * discrete_modes),
        group: vec![0.0; n * m * d],
        group_exact: vec![0.0; n * m * d],
        group_discrete: vec![0.0; n * m * d],
        maps: DerivedMaps::zeroed(n * m),
        opposed: vec![0; m],
    };
    // the first `computed` nodes are computed (the middle row included, so
    // that every node of the rest has its mirror image among them)
    let row = grid.points[d - 1];
    let computed = if mirror && mirrors(ctx, f, discrete_modes) {
        crate::sample::computed_rows(grid, Symmetry::Even) * row
    } else {
        n
    };
    let mut chunks = cut(&mut out, n, m, d, discrete_modes);
    chunks.retain(|c| c.first < computed);
    for c in chunks.iter_mut() {
        c.nodes = c.nodes.min(computed - c.first);
    }
    ctx.progress.start(Stage::Dispersion, n as u64);
    let mut opposed = ctx.par.run(|| {
        // one chunk per task: the cost per node varies by orders of magnitude
        // (continuation near θ = ±π), and a worker's committed stretch of
        // chunks could otherwise leave the other idle at the end
        chunks
            .into_par_iter()
            .with_max_len(1)
            .map_init(
                || (NodeWork::new(m, d), vec![0usize; d], vec![0.0; d]),
                |(work, idx, theta), chunk| fill(ctx, f, work, idx, theta, chunk),
            )
            .reduce(
                || vec![0; m],
                |a, b| a.iter().zip(&b).map(|(x, y)| x + y).collect(),
            )
    });
    if computed < n {
        let more = ctx
            .par
            .run(|| super::mirror::mirror(&mut out, computed, m, d));
        for (o, k) in opposed.iter_mut().zip(more) {
            *o += k;
        }
        ctx.progress.advance((n - computed) as u64);
    }
    ctx.progress.finish();
    out.opposed = opposed;
    out
}

/// Cuts every array into chunks of [`CHUNK`] nodes.
fn cut<'a>(
    out: &'a mut NodeArrays,
    n: usize,
    m: usize,
    d: usize,
    discrete_modes: usize,
) -> Vec<Chunk<'a>> {
    let (c, md) = (CHUNK, m * d);
    let mut numerical = out.numerical.chunks_mut(c * m);
    let mut exact = out.exact.chunks_mut(c * m);
    let mut discrete = out.discrete.chunks_mut((c * discrete_modes).max(1));
    let mut group = out.group.chunks_mut((c * md).max(1));
    let mut group_exact = out.group_exact.chunks_mut((c * md).max(1));
    let mut group_discrete = out.group_discrete.chunks_mut((c * md).max(1));
    let mut maps: Vec<_> = out
        .maps
        .columns_mut()
        .into_iter()
        .map(|column| column.chunks_mut(c * m))
        .collect();
    let mut chunks = Vec::with_capacity(n.div_ceil(c));
    for first in (0..n).step_by(c) {
        let mut next_map = |k: usize| maps[k].next().unwrap_or_default();
        chunks.push(Chunk {
            first,
            nodes: c.min(n - first),
            discrete_modes,
            numerical: numerical.next().unwrap_or_default(),
            exact: exact.next().unwrap_or_default(),
            discrete: discrete.next().unwrap_or_default(),
            group: group.next().unwrap_or_default(),
            group_exact: group_exact.next().unwrap_or_default(),
            group_discrete: group_discrete.next().unwrap_or_default(),
            maps: std::array::from_fn(&mut next_map),
        });
    }
    chunks
}

/// Fills one chunk; returns its count of opposed group velocities per mode.
fn fill(
    ctx: &Context,
    f: &Frequencies,
    work: &mut NodeWork,
    idx: &mut [usize],
    theta: &mut [f64],
    mut chunk: Chunk,
) -> Vec<usize> {
    let grid = &ctx.grid;
    let (m, d) = (ctx.op.m, theta.len());
    let dm = chunk.discrete_modes;
    let mut opposed = vec![0; m];
    for i in 0..chunk.nodes {
        grid.unravel(chunk.first + i, idx);
        for (a, t) in theta.iter_mut().enumerate() {
            *t = grid.coords[a][idx[a]];
        }
        let (modes, vectors) = (i * m..(i + 1) * m, i * m * d..(i + 1) * m * d);
        work.evaluate(
            f,
            theta,
            ctx.dt,
            NodeSlots {
                numerical: &mut chunk.numerical[modes.clone()],
                exact: &mut chunk.exact[modes.clone()],
                discrete: &mut chunk.discrete[i * dm..(i + 1) * dm],
                group: &mut chunk.group[vectors.clone()],
                group_exact: &mut chunk.group_exact[vectors.clone()],
                group_discrete: &mut chunk.group_discrete[vectors.clone()],
            },
        );
        let node = NodeFrequencies {
            numerical: &chunk.numerical[modes.clone()],
            exact: &chunk.exact[modes.clone()],
            discrete: &chunk.discrete[i * dm..(i + 1) * dm],
            group: &chunk.group[vectors.clone()],
            group_exact: &chunk.group_exact[vectors.clone()],
            group_discrete: &chunk.group_discrete[vectors],
        };
        let scale = node.scale();
        for (j, count) in opposed.iter_mut().enumerate() {
            for (map, v) in chunk.maps.iter_mut().zip(node.map_values(j, scale)) {
                map[i * m + j] = v;
            }
            let modes = j * d..(j + 1) * d;
            if opposes(&node.group[modes.clone()], &node.group_exact[modes]) {
                *count += 1;
            }
        }
    }
    ctx.progress.advance(chunk.nodes as u64);
    opposed
}
