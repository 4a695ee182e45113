//! Wavevector domains for the search: the whole box [−π, π]^d (half of it, since
//! real coefficients give ρ(G(−θ)) = ρ(G(θ))) with its faces and corners, plus a
//! geometric set of small |θ| down to 1e-5 along many directions; or one ray
//! θ = s·n, 0 < s ≤ s_max, fine in s including small s. Each domain also says how
//! its points are refined (coordinates, initial step) and along which directions
//! the long-wave limit is taken.

use std::f64::consts::PI;

/// Points, refinement coordinates and long-wave directions.
#[derive(Debug, Clone)]
pub struct Domain {
    /// Wavevectors.
    pub points: Vec<Vec<f64>>,
    /// Refinement coordinates of each point (θ itself, or s on a ray).
    pub params: Vec<Vec<f64>>,
    /// Initial refinement step (grid spacing in the coordinates).
    pub step: f64,
    /// How many separated candidates are refined.
    pub candidates: usize,
    /// Directions of the long-wave limit.
    pub long_wave: Vec<Vec<f64>>,
    /// The ray direction, when the domain is a ray.
    pub ray: Option<Vec<f64>>,
}

/// Small magnitudes 0.3·10^(−k/2), k = 0..9 (0.3 down to ~1e-5).
fn small_magnitudes() -> Vec<f64> {
    (0..10).map(|k| 0.3 * 10f64.powf(-0.5 * k as f64)).collect()
}

/// Directions on a half circle or a hemisphere (n and −n are equivalent).
pub fn half_directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    match dims {
        1 => vec![vec![1.0]],
        2 => (0..count)
            .map(|j| {
                let a = PI * (j as f64 + 0.5) / count as f64;
                vec![a.cos(), a.sin()]
            })
            .collect(),
        _ => {
            let golden = PI * (3.0 - 5f64.sqrt());
            (0..count)
                .map(|j| {
                    let z = 1.0 - (j as f64 + 0.5) / count as f64;
                    let r = (1.0 - z * z).sqrt();
                    let phi = golden * j as f64;
                    vec![r * phi.cos(), r * phi.sin(), z]
                })
                .collect()
        }
    }
}

impl Domain {
    /// The half box on a grid of `n` points per axis (the first axis in [0, π]),
    /// plus small wavevectors along `dirs` half-space directions.
    pub fn whole(dims: usize, n: usize, dirs: usize) -> Domain {
        let axis = |k: usize, half: bool| {
            let lo = if half { 0.0 } else { -PI };
            let count = if half { n / 2 + 1 } else { n };
            (0..count)
                .map(|i| lo + (PI - lo) * i as f64 / (count - 1) as f64)
                .collect::<Vec<f64>>()
                .get(k)
                .copied()
        };
        let mut points: Vec<Vec<f64>> = vec![Vec::new()];
        for d in 0..dims {
            let vals: Vec<f64> = (0..).map_while(|k| axis(k, d == 0)).collect();
            points = points
                .into_iter()
                .flat_map(|p| {
                    vals.iter().map(move |v| {
                        let mut q = p.clone();
                        q.push(*v);
                        q
                    })
                })
                .collect();
        }
        let long_wave = half_directions(dims, dirs);
        for nvec in &long_wave {
            for s in small_magnitudes() {
                points.push(nvec.iter().map(|x| x * s).collect());
            }
        }
        Domain {
            params: points.clone(),
            points,
            step: 2.0 * PI / (n - 1) as f64,
            candidates: 3,
            long_wave,
            ray: None,
        }
    }

    /// The ray θ = s·n, 0 < s ≤ π / max|n_d|: `n` uniform values of s plus the
    /// small magnitudes.
    pub fn ray(direction: &[f64], n: usize) -> Domain {
        let smax = PI / direction.iter().map(|x| x.abs()).fold(0.0, f64::max);
        let mut s: Vec<f64> = (1..=n).map(|k| smax * k as f64 / n as f64).collect();
        s.extend(
            small_magnitudes()
                .into_iter()
                .filter(|x| *x < smax / n as f64),
        );
        Domain {
            points: s
                .iter()
                .map(|x| direction.iter().map(|d| d * x).collect())
                .collect(),
            params: s.iter().map(|x| vec![*x]).collect(),
            step: smax / n as f64,
            candidates: 2,
            long_wave: vec![direction.to_vec()],
            ray: Some(direction.to_vec()),
        }
    }

    /// The wavevector of refinement coordinates x (wrapped into the box, or
    /// clamped onto the ray).
    pub fn theta_of(&self, x: &[f64]) -> Vec<f64> {
        match &self.ray {
            Some(n) => {
                let smax = PI / n.iter().map(|v| v.abs()).fold(0.0, f64::max);
                let s = x[0].clamp(1e-9 * smax, smax);
                n.iter().map(|v| v * s).collect()
            }
            None => x
                .iter()
                .map(|v| (v + PI).rem_euclid(2.0 * PI) - PI)
                .collect(),
        }
    }

    /// Distance between two points in refinement coordinates.
    pub fn distance(&self, i: usize, j: usize) -> f64 {
        self.params[i]
            .iter()
            .zip(&self.params[j])
            .map(|(a, b)| (a - b).powi(2))
            .sum::<f64>()
            .sqrt()
    }
}
