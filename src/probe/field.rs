//! The amplification matrices of a probed program at the wavevectors its own
//! periodic grid carries, θ_d = 2π j / N_d, and the discrete Fourier transform
//! that turns impulse responses into them.
//!
//! Nodes are stored in C order over the axes, each axis in ascending θ from
//! −π (even N) or −π(N−1)/N (odd N) — the FFT's order shifted so that θ = 0 is
//! in the middle — and each matrix row-major (`g[(node·m + i)·m + j]`).

use num_complex::Complex64 as C64;
use rustfft::FftPlanner;
use std::f64::consts::PI;

/// G(θ) at every grid wavevector.
#[derive(Debug, Clone, PartialEq)]
pub struct GField {
    /// Cells per axis.
    pub cells: Vec<usize>,
    /// Variables.
    pub m: usize,
    /// The matrices, node by node.
    pub g: Vec<C64>,
}

/// θ of the axis with `n` cells, ascending: 2π(j − ⌊n/2⌋)/n.
pub fn theta_axis(n: usize) -> Vec<f64> {
    (0..n)
        .map(|j| 2.0 * PI * (j as f64 - (n / 2) as f64) / n as f64)
        .collect()
}

/// The FFT index of ascending position `j` on an axis of `n` cells.
fn fft_index(j: usize, n: usize) -> usize {
    (j + n - n / 2) % n
}

impl GField {
    /// An all-zero field.
    pub fn zeros(cells: &[usize], m: usize) -> GField {
        let nodes: usize = cells.iter().product();
        GField {
            cells: cells.to_vec(),
            m,
            g: vec![C64::new(0.0, 0.0); nodes * m * m],
        }
    }

    /// Number of wavevectors.
    pub fn nodes(&self) -> usize {
        self.cells.iter().product()
    }

    /// The matrix at `node`.
    pub fn at(&self, node: usize) -> &[C64] {
        let mm = self.m * self.m;
        &self.g[node * mm..(node + 1) * mm]
    }

    /// θ of `node`.
    pub fn theta(&self, node: usize) -> Vec<f64> {
        let mut rest = node;
        let mut theta = vec![0.0; self.cells.len()];
        for d in (0..self.cells.len()).rev() {
            let n = self.cells[d];
            theta[d] = 2.0 * PI * ((rest % n) as f64 - (n / 2) as f64) / n as f64;
            rest /= n;
        }
        theta
    }

    /// The largest entry modulus.
    pub fn max_abs(&self) -> f64 {
        self.g.iter().fold(0.0, |a, z| a.max(z.norm()))
    }

    /// Sets column `j` from the responses `r[i]` (each a C-order array over the
    /// cells) to an impulse of size `amplitude` at cell `at`:
    /// G_ij(θ) = e^{iθ·at} Σ_n r_i\[n\] e^{−iθ·n} / amplitude.
    pub fn set_column(&mut self, j: usize, responses: &[Vec<f64>], at: &[usize], amplitude: f64) {
        let mut planner = FftPlanner::<f64>::new();
        let spectra: Vec<Vec<C64>> = responses
            .iter()
            .map(|r| {
                let mut data: Vec<C64> = r.iter().map(|&x| C64::new(x, 0.0)).collect();
                fft_nd(&mut data, &self.cells, &mut planner);
                data
            })
            .collect();
        for node in 0..self.nodes() {
            let shift: f64 = self
                .theta(node)
                .iter()
                .zip(at)
                .map(|(t, &c)| t * c as f64)
                .sum();
            let factor = C64::from_polar(1.0 / amplitude, shift);
            let src = self.fft_node(node);
            for (i, data) in spectra.iter().enumerate() {
                self.g[(node * self.m + i) * self.m + j] = data[src] * factor;
            }
        }
    }

    /// The FFT-order index of ascending-order `node`.
    fn fft_node(&self, node: usize) -> usize {
        let mut rest = node;
        let mut index = 0;
        let mut stride = 1;
        for d in (0..self.cells.len()).rev() {
            let n = self.cells[d];
            index += fft_index(rest % n, n) * stride;
            stride *= n;
            rest /= n;
        }
        index
    }

    /// Moves every variable's phase to its own position in the cell:
    /// G_ij ← e^{−iθ·x_i} G_ij e^{iθ·x_j} for offsets `locations`.
    pub fn shift_to_locations(&mut self, locations: &[Vec<f64>]) {
        let m = self.m;
        for node in 0..self.nodes() {
            let theta = self.theta(node);
            let phase: Vec<f64> = locations
                .iter()
                .map(|x| x.iter().zip(&theta).map(|(a, t)| a * t).sum())
                .collect();
            for i in 0..m {
                for j in 0..m {
                    let k = (node * m + i) * m + j;
                    self.g[k] *= C64::from_polar(1.0, phase[j] - phase[i]);
                }
            }
        }
    }

    /// The largest |a − b| over entries, with its node, row and column.
    pub fn largest_difference(&self, other: &GField) -> (f64, usize, usize, usize) {
        let m = self.m;
        let mut worst = (0.0, 0, 0, 0);
        for (k, (a, b)) in self.g.iter().zip(&other.g).enumerate() {
            let d = (a - b).norm();
            if d > worst.0 || d.is_nan() {
                worst = (d, k / (m * m), (k / m) % m, k % m);
                if d.is_nan() {
                    break;
                }
            }
        }
        worst
    }
}

/// In-place forward DFT over every axis of a C-order array.
fn fft_nd(data: &mut [C64], cells: &[usize], planner: &mut FftPlanner<f64>) {
    let total = data.len();
    let mut stride = 1;
    for d in (0..cells.len()).rev() {
        let n = cells[d];
        let fft = planner.plan_fft_forward(n);
        let mut line = vec![C64::new(0.0, 0.0); n];
        let block = n * stride;
        for start in (0..total).step_by(block) {
            for offset in 0..stride {
                for (k, v) in line.iter_mut().enumerate() {
                    *v = data[start + offset + k * stride];
                }
                fft.process(&mut line);
                for (k, v) in line.iter().enumerate() {
                    data[start + offset + k * stride] = *v;
                }
            }
        }
        stride = block;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn theta_axis_is_ascending_with_zero_in_the_middle() {
        let t = theta_axis(4);
        assert_eq!(t, vec![-PI, -PI / 2.0, 0.0, PI / 2.0]);
        let t = theta_axis(5);
        assert!((t[0] + 4.0 * PI / 5.0).abs() < 1e-15 && t[2] == 0.0);
    }

    #[test]
    fn a_shift_by_one_cell_has_the_symbol_of_a_translation() {
        // u_new[n] = u[n-1]: G(θ) = e^{-iθ}
        let cells = [6, 4];
        let mut f = GField::zeros(&cells, 1);
        let mut r = vec![0.0; 24];
        r[4] = 1.0; // impulse at (0,0) moved to (1,0)
        f.set_column(0, &[r], &[0, 0], 1.0);
        for node in 0..f.nodes() {
            let th = f.theta(node);
            let want = C64::from_polar(1.0, -th[0]);
            assert!((f.at(node)[0] - want).norm() < 1e-14);
        }
    }
}
