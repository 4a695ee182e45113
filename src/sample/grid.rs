//! Wavevector grids: θ_i = −π + 2π·i/(N−1) per axis, computed from the integer
//! i (both ends included), nodes in C order, and rays from θ = 0 to the boundary
//! of the box [−π, π]^d.

use std::f64::consts::PI;

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

/// Length of the ray from θ = 0 along unit vector n to the boundary of [−π, π]^d.
pub fn ray_length(n: &[f64]) -> f64 {
    PI / n.iter().map(|x| x.abs()).fold(0.0, f64::max)
}
