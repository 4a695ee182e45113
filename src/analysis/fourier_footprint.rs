//! The Fourier footprint: Δt times the eigenvalues of the spatial operator
//! L(θ) at (a sample of) the grid wavevectors, the points a one-step or
//! multistep method must keep inside its stability region. Drawn over that
//! region in `footprint.png`, it is the picture used to choose an integrator:
//! how far the spectrum is from the region's boundary, and which wavenumbers
//! (coloured by |θ|) get there first. Composite schemes (IMEX, splitting,
//! forward–backward, staggered leapfrog) have no footprint: their G is not a
//! function of Δt·L alone. Second-order-in-time methods have theirs in their
//! own variable z = Δt²·μ ([`crate::time::Method::step_variable`]).

use super::context::Context;
use crate::linalg::EigSolver;
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// At most this many wavevectors are sampled (evenly strided over the grid).
pub const MAX_NODES: usize = 8192;

/// Δt·eig L(θ) at sampled wavevectors.
#[derive(Debug, Clone)]
pub struct FourierFootprint {
    /// z = Δt μ (Δt² μ for second-order-in-time methods) at the case's Δt,
    /// `nodes × m`, node-major (eigenvalues unordered).
    pub z: Vec<C64>,
    /// |θ|₂ of each sampled wavevector.
    pub theta_norm: Vec<f64>,
    /// Flat C-order grid index of each sampled wavevector.
    pub index: Vec<usize>,
    /// Eigenvalues per wavevector (m).
    pub m: usize,
    /// The case's Δt.
    pub dt: f64,
}

/// The footprint of a one-step or multistep method (None for composite schemes).
pub fn footprint(ctx: &Context) -> Option<FourierFootprint> {
    if ctx.problem.method.composite().is_some() {
        return None;
    }
    let (grid, op, dt) = (&ctx.grid, &ctx.op, ctx.dt);
    let step = ctx.problem.method.step_variable(dt);
    let m = op.m;
    let total = grid.len();
    let stride = total.div_ceil(MAX_NODES).max(1);
    let picked: Vec<usize> = (0..total).step_by(stride).collect();
    // chunks of sampled wavevectors on the workers, concatenated in order
    let chunks: Vec<FourierFootprint> = ctx.par.run(|| {
        picked
            .par_chunks(CHUNK)
            .map(|flats| sample(ctx, flats, step))
            .collect()
    });
    let mut out = FourierFootprint {
        z: Vec::with_capacity(m * picked.len()),
        theta_norm: Vec::with_capacity(picked.len()),
        index: Vec::with_capacity(picked.len()),
        m,
        dt,
    };
    for c in chunks {
        out.z.extend(c.z);
        out.theta_norm.extend(c.theta_norm);
        out.index.extend(c.index);
    }
    Some(out)
}

/// Wavevectors sampled by one task.
const CHUNK: usize = 256;

/// The footprint at the grid nodes `flats` (those whose eigenvalues fail are
/// left out).
fn sample(ctx: &Context, flats: &[usize], step: f64) -> FourierFootprint {
    let (grid, op) = (&ctx.grid, &ctx.op);
    let m = op.m;
    let mut solver = EigSolver::new(m);
    let mut eig = vec![C64::new(0.0, 0.0); m];
    let mut idx = vec![0usize; grid.points.len()];
    let mut out = FourierFootprint {
        z: Vec::with_capacity(m * flats.len()),
        theta_norm: Vec::with_capacity(flats.len()),
        index: Vec::with_capacity(flats.len()),
        m,
        dt: ctx.dt,
    };
    for &flat in flats {
        grid.unravel(flat, &mut idx);
        let theta = grid.theta(&idx);
        if solver.eigenvalues(&op.symbol(&theta), &mut eig).is_err() {
            continue;
        }
        out.z.extend(eig.iter().map(|mu| mu * step));
        out.theta_norm
            .push(theta.iter().map(|t| t * t).sum::<f64>().sqrt());
        out.index.push(flat);
    }
    out
}
