//! The parallel sweep over a wavevector grid: the spatial symbol at every node
//! from per-axis tables, its eigenvalues with one reusable [`Spectrum`] per worker, and
//! a caller's closure per node; results come back in C order. With the conjugate
//! symmetry L(−θ) = conj L(θ) of real schemes only half the rows are computed and
//! the rest mirrored.

use super::{Grid, Par, Progress};
use crate::linalg::LinalgError;
use crate::operator::{Operator, Spectrum};
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// What the sweep hands to the caller at each node.
pub struct Node<'a> {
    /// Flat C-order index.
    pub flat: usize,
    /// θ at the node.
    pub theta: &'a [f64],
    /// The eigenvalues of L(θ) (see [`crate::operator::Spectrum`]), or the
    /// kernel's failure.
    pub eigenvalues: Result<&'a [C64], LinalgError>,
}

/// Whether the sweep may use the conjugate symmetry L(−θ) = conj L(θ).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Symmetry {
    /// The caller's value at −θ equals its value at θ: compute half the grid
    /// and mirror (the θ grid is symmetric, so −θ of flat index f is N−1−f).
    Even,
    /// Compute every node.
    None,
}

/// Evaluates `f` at every grid node in C order.
pub fn sweep<T, F>(
    op: &Operator,
    tolerance: f64,
    grid: &Grid,
    par: Par,
    symmetry: Symmetry,
    progress: &dyn Progress,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&Node) -> T + Sync,
{
    sweep_span(op, tolerance, grid, par, Span::Grid(symmetry), progress, f)
}

/// Evaluates `f` at the nodes of grid rows `rows` only (rows along the last axis,
/// in C order): one slab of a larger scan, so that a caller can fold results as it
/// goes instead of holding a value per node.
pub fn sweep_rows<T, F>(
    op: &Operator,
    tolerance: f64,
    grid: &Grid,
    par: Par,
    rows: std::ops::Range<usize>,
    progress: &dyn Progress,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&Node) -> T + Sync,
{
    sweep_span(op, tolerance, grid, par, Span::Rows(rows), progress, f)
}

/// Rows a sweep should cover: the whole grid (half of it mirrored when even) or
/// one slab of rows.
enum Span {
    Grid(Symmetry),
    Rows(std::ops::Range<usize>),
}

/// Number of rows a sweep computes for a symmetry (the rest are mirrored).
pub fn computed_rows(grid: &Grid, symmetry: Symmetry) -> usize {
    let rows = grid.len() / grid.points[grid.points.len() - 1];
    match symmetry {
        Symmetry::Even => rows.div_ceil(2),
        Symmetry::None => rows,
    }
}

fn sweep_span<T, F>(
    op: &Operator,
    tolerance: f64,
    grid: &Grid,
    par: Par,
    span: Span,
    progress: &dyn Progress,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&Node) -> T + Sync,
{
    let tables = op.tabulate(&grid.coords);
    let dims = grid.points.len();
    let row = grid.points[dims - 1];
    let m = op.m;
    let init = || {
        (
            Spectrum::new(op, tolerance),
            vec![C64::new(0.0, 0.0); m],
            vec![0usize; dims],
            vec![0.0; dims],
        )
    };
    type Work<'s> = (Spectrum<'s>, Vec<C64>, Vec<usize>, Vec<f64>);
    let work = |ws: &mut Work, (r, chunk): (usize, &mut [T])| {
        let (spectrum, eig, idx, theta) = ws;
        for (j, slot) in chunk.iter_mut().enumerate() {
            let flat = r * row + j;
            grid.unravel(flat, idx);
            for d in 0..dims {
                theta[d] = grid.coords[d][idx[d]];
            }
            let res = spectrum.at_tables(&tables, idx, eig).map(|_| &eig[..]);
            *slot = f(&Node {
                flat,
                theta,
                eigenvalues: res,
            });
        }
    };
    by_rows(grid, par, span, progress, init, work)
}

/// Runs `work(workspace, (row, chunk))` over the rows of the output in C order
/// (only the first half of them when `symmetry` is even, the rest mirrored:
/// −θ of flat index f is N−1−f), one workspace per worker.
fn by_rows<T, W, I, F>(
    grid: &Grid,
    par: Par,
    span: Span,
    progress: &dyn Progress,
    init: I,
    work: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    W: Send,
    I: Fn() -> W + Sync + Send,
    F: Fn(&mut W, (usize, &mut [T])) + Sync + Send,
{
    let row = grid.points[grid.points.len() - 1];
    let total = grid.len();
    let (first, count, mirror) = match span {
        Span::Grid(symmetry) => (0, computed_rows(grid, symmetry), true),
        Span::Rows(r) => (r.start, r.len(), false),
    };
    let mut out = vec![T::default(); if mirror { total } else { count * row }];
    let (head, tail) = out.split_at_mut(count * row);
    let counted = |ws: &mut W, (r, chunk): (usize, &mut [T])| {
        let n = chunk.len() as u64;
        work(ws, (first + r, chunk));
        progress.advance(n);
    };
    match par {
        Par::Seq => {
            let mut ws = init();
            for item in head.chunks_mut(row).enumerate() {
                counted(&mut ws, item);
            }
        }
        Par::Threads(_) => par.run(|| {
            // one row per task, so that a worker never commits to a long
            // stretch of costly rows while the other waits
            head.par_chunks_mut(row)
                .enumerate()
                .with_max_len(1)
                .for_each_init(&init, |ws, item| counted(ws, item));
        }),
    }
    for (k, slot) in tail.iter_mut().enumerate() {
        *slot = head[total - 1 - (count * row + k)].clone();
    }
    progress.advance(tail.len() as u64);
    out
}

/// Evaluates `f(θ)` at every grid node in C order (for quantities that need more
/// than the eigenvalues of L, such as composite amplification matrices).
pub fn map<T, F>(grid: &Grid, par: Par, symmetry: Symmetry, progress: &dyn Progress, f: F) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&[f64]) -> T + Sync,
{
    map_with(grid, par, symmetry, progress, || (), |_, theta| f(theta))
}

/// Evaluates `f(workspace, θ)` at every grid node in C order, with one
/// workspace from `init` per worker (for per-node work that reuses buffers).
pub fn map_with<T, W, I, F>(
    grid: &Grid,
    par: Par,
    symmetry: Symmetry,
    progress: &dyn Progress,
    init: I,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    W: Send,
    I: Fn() -> W + Sync + Send,
    F: Fn(&mut W, &[f64]) -> T + Sync,
{
    let dims = grid.points.len();
    let row = grid.points[dims - 1];
    let init = || (init(), vec![0usize; dims], vec![0.0; dims]);
    let work = |(ws, idx, theta): &mut (W, Vec<usize>, Vec<f64>), (r, chunk): (usize, &mut [T])| {
        for (j, slot) in chunk.iter_mut().enumerate() {
            grid.unravel(r * row + j, idx);
            for d in 0..dims {
                theta[d] = grid.coords[d][idx[d]];
            }
            *slot = f(ws, theta);
        }
    };
    by_rows(grid, par, Span::Grid(symmetry), progress, init, work)
}
