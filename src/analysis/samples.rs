//! Amplification matrices at a few grid nodes spread over the grid, kept for
//! external cross-checks (numpy recomputes their eigenvalues and rebuilds G
//! from L).

use super::context::Context;
use num_complex::Complex64 as C64;

/// Amplification matrices at sample nodes, for external cross-checks.
#[derive(Debug, Clone)]
pub struct Samples {
    /// Flat indices of the nodes.
    pub index: Vec<usize>,
    /// θ at each node.
    pub theta: Vec<Vec<f64>>,
    /// L(θ), row-major m×m each.
    pub symbol: Vec<Vec<C64>>,
    /// G(θ, Δt), row-major M×M each.
    pub amplification: Vec<Vec<C64>>,
    /// M.
    pub size: usize,
}

/// `k` flat indices spread over a grid of `n` nodes (a large stride modulo n, so
/// that samples cover every axis).
fn sample_indices(k: usize, n: usize) -> Vec<usize> {
    (0..k)
        .map(|j| {
            if k == 1 {
                n / 2
            } else {
                ((j as u128 * (n as u128 - 1) * 7919 / (k as u128 - 1)) % n as u128) as usize
            }
        })
        .collect()
}

/// L and G at `count` nodes.
pub(super) fn sample(ctx: &Context, count: usize) -> Samples {
    let grid = &ctx.grid;
    let k = count.min(grid.len());
    let index = sample_indices(k, grid.len());
    let mut idx = vec![0usize; grid.points.len()];
    let mut s = Samples {
        index: index.clone(),
        theta: Vec::new(),
        symbol: Vec::new(),
        amplification: Vec::new(),
        size: ctx.op.m * ctx.problem.method.levels(),
    };
    for &i in &index {
        grid.unravel(i, &mut idx);
        let th = grid.theta(&idx);
        let g = ctx.amplification(&th, ctx.dt);
        s.symbol.push(ctx.op.symbol(&th));
        s.amplification.push(crate::linalg::from_matrix(&g));
        s.theta.push(th);
    }
    s
}
