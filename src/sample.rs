//! Wavevector grids, wave directions and the parallel sweep.
//!
//! Grid coordinates are θ_i = −π + 2π·i/(N−1), computed from the integer i (both
//! ends included). The sweep evaluates the spatial symbol at every node from
//! per-axis tables, computes its eigenvalues with one reusable solver per worker,
//! and hands them to a caller's closure; results come back in C order.
//! Parallelism is passed in ([`Par`]): a sequential and a parallel sweep give
//! bit-identical results.

use crate::linalg::{EigSolver, LinalgError};
use crate::operator::Operator;
use indicatif::ProgressBar;
use num_complex::Complex64 as C64;
use rayon::prelude::*;
use std::f64::consts::PI;

/// Degree of parallelism.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Par {
    /// On the calling thread.
    Seq,
    /// On a local pool of this many threads (0: one per core).
    Threads(usize),
}

impl Par {
    /// Runs `f` under this parallelism (a local rayon pool, never the global one).
    pub fn run<R: Send>(&self, f: impl FnOnce() -> R + Send) -> R {
        match self {
            Par::Seq => f(),
            Par::Threads(n) => match rayon::ThreadPoolBuilder::new().num_threads(*n).build() {
                Ok(pool) => pool.install(f),
                Err(_) => f(),
            },
        }
    }
}

/// The coordinates θ_i = −π + 2π i/(n−1), i = 0..n−1.
pub fn axis_coords(n: usize) -> Vec<f64> {
    (0..n)
        .map(|i| -PI + 2.0 * PI * i as f64 / (n - 1) as f64)
        .collect()
}

/// A tensor grid of wavevectors.
#[derive(Debug, Clone)]
pub struct Grid {
    /// Points per axis.
    pub points: Vec<usize>,
    /// Coordinates per axis.
    pub coords: Vec<Vec<f64>>,
}

impl Grid {
    /// A grid with the given number of points per axis (each ≥ 2).
    pub fn new(points: &[usize]) -> Grid {
        assert!(
            points.iter().all(|&n| n >= 2),
            "grid axes need at least 2 points"
        );
        Grid {
            points: points.to_vec(),
            coords: points.iter().map(|&n| axis_coords(n)).collect(),
        }
    }

    /// Total number of nodes.
    pub fn len(&self) -> usize {
        self.points.iter().product()
    }

    /// Whether the grid is empty (never, for a valid grid).
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Per-axis indices of a flat (C-order) index.
    pub fn unravel(&self, mut flat: usize, idx: &mut [usize]) {
        for d in (0..self.points.len()).rev() {
            idx[d] = flat % self.points[d];
            flat /= self.points[d];
        }
    }

    /// θ at per-axis indices.
    pub fn theta(&self, idx: &[usize]) -> Vec<f64> {
        idx.iter().zip(&self.coords).map(|(i, c)| c[*i]).collect()
    }

    /// Spacing of axis d.
    pub fn step(&self, d: usize) -> f64 {
        2.0 * PI / (self.points[d] - 1) as f64
    }
}

/// D angles 2πj/D, j = 0..D−1 (2D wave directions).
pub fn circle_directions(count: usize) -> Vec<f64> {
    (0..count)
        .map(|j| 2.0 * PI * j as f64 / count as f64)
        .collect()
}

/// D quasi-uniform unit vectors on the sphere (Fibonacci lattice).
pub fn sphere_directions(count: usize) -> Vec<[f64; 3]> {
    let golden = PI * (3.0 - 5f64.sqrt());
    (0..count)
        .map(|j| {
            let z = 1.0 - 2.0 * (j as f64 + 0.5) / count as f64;
            let r = (1.0 - z * z).max(0.0).sqrt();
            let phi = golden * j as f64;
            [r * phi.cos(), r * phi.sin(), z]
        })
        .collect()
}

/// Length of the ray from θ = 0 along unit vector n to the boundary of [−π, π]^d.
pub fn ray_length(n: &[f64]) -> f64 {
    PI / n.iter().map(|x| x.abs()).fold(0.0, f64::max)
}

/// What the sweep hands to the caller at each node.
pub struct Node<'a> {
    /// Flat C-order index.
    pub flat: usize,
    /// θ at the node.
    pub theta: &'a [f64],
    /// The spatial symbol L(θ), row-major.
    pub symbol: &'a [C64],
    /// Its eigenvalues, or the kernel's failure.
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
    grid: &Grid,
    par: Par,
    symmetry: Symmetry,
    bar: Option<&ProgressBar>,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&Node) -> T + Sync,
{
    sweep_span(op, grid, par, Span::Grid(symmetry), bar, f)
}

/// Evaluates `f` at the nodes of grid rows `rows` only (rows along the last axis,
/// in C order): one slab of a larger scan, so that a caller can fold results as it
/// goes instead of holding a value per node.
pub fn sweep_rows<T, F>(
    op: &Operator,
    grid: &Grid,
    par: Par,
    rows: std::ops::Range<usize>,
    bar: Option<&ProgressBar>,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&Node) -> T + Sync,
{
    sweep_span(op, grid, par, Span::Rows(rows), bar, f)
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
    grid: &Grid,
    par: Par,
    span: Span,
    bar: Option<&ProgressBar>,
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
            EigSolver::new(m),
            vec![C64::new(0.0, 0.0); m * m],
            vec![C64::new(0.0, 0.0); m],
            vec![0usize; dims],
            vec![0.0; dims],
        )
    };
    let work = |ws: &mut (EigSolver, Vec<C64>, Vec<C64>, Vec<usize>, Vec<f64>),
                (r, chunk): (usize, &mut [T])| {
        let (solver, sym, eig, idx, theta) = ws;
        for (j, slot) in chunk.iter_mut().enumerate() {
            let flat = r * row + j;
            grid.unravel(flat, idx);
            for d in 0..dims {
                theta[d] = grid.coords[d][idx[d]];
            }
            op.symbol_from_tables(&tables, idx, sym);
            let res = solver.eigenvalues(sym, eig).map(|_| &eig[..]);
            *slot = f(&Node {
                flat,
                theta,
                symbol: sym,
                eigenvalues: res,
            });
        }
    };
    by_rows(grid, par, span, bar, init, work)
}

/// Runs `work(workspace, (row, chunk))` over the rows of the output in C order
/// (only the first half of them when `symmetry` is even, the rest mirrored:
/// −θ of flat index f is N−1−f), one workspace per worker.
fn by_rows<T, W, I, F>(
    grid: &Grid,
    par: Par,
    span: Span,
    bar: Option<&ProgressBar>,
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
        if let Some(b) = bar {
            b.inc(n);
        }
    };
    match par {
        Par::Seq => {
            let mut ws = init();
            for item in head.chunks_mut(row).enumerate() {
                counted(&mut ws, item);
            }
        }
        Par::Threads(_) => par.run(|| {
            head.par_chunks_mut(row)
                .enumerate()
                .for_each_init(&init, |ws, item| counted(ws, item));
        }),
    }
    for (k, slot) in tail.iter_mut().enumerate() {
        *slot = head[total - 1 - (count * row + k)].clone();
    }
    if let Some(b) = bar {
        b.inc(tail.len() as u64);
    }
    out
}

/// Evaluates `f(θ)` at every grid node in C order (for quantities that need more
/// than the eigenvalues of L, such as composite amplification matrices).
pub fn map<T, F>(
    grid: &Grid,
    par: Par,
    symmetry: Symmetry,
    bar: Option<&ProgressBar>,
    f: F,
) -> Vec<T>
where
    T: Send + Clone + Default,
    F: Fn(&[f64]) -> T + Sync,
{
    let dims = grid.points.len();
    let row = grid.points[dims - 1];
    let init = || vec![0usize; dims];
    let work = |idx: &mut Vec<usize>, (r, chunk): (usize, &mut [T])| {
        for (j, slot) in chunk.iter_mut().enumerate() {
            grid.unravel(r * row + j, idx);
            *slot = f(&grid.theta(idx));
        }
    };
    by_rows(grid, par, Span::Grid(symmetry), bar, init, work)
}
