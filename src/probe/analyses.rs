//! The analyses of a measured amplification-matrix field: the spectral-radius
//! map, the growth envelope max_θ ‖W Gⁿ W⁻¹‖₂ over a horizon, and the fully
//! discrete frequencies ω = i ln λ / Δt of each mode, compared with the exact
//! relation of a built-in model when one is named.

use super::field::GField;
use crate::analysis::dispersion::frequencies::log_branch;
use crate::analysis::dispersion::phase_ratio;
use crate::linalg::{self, LinalgError, SvdSolver};
use crate::numeric::assignment::optimal_assignment;
use crate::physics::System;
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// ρ(G) at every node.
#[derive(Debug, Clone, PartialEq)]
pub struct RadiusMap {
    /// The map, node by node.
    pub map: Vec<f64>,
    /// Its largest value.
    pub max: f64,
    /// The node where it is largest.
    pub worst: usize,
}

/// Spectral radius at every node (NaN where the eigenvalue kernel fails).
pub fn radius(g: &GField) -> RadiusMap {
    let map: Vec<f64> = (0..g.nodes())
        .into_par_iter()
        .map(|n| linalg::spectral_radius(g.at(n), g.m).unwrap_or(f64::NAN))
        .collect();
    let (worst, max) = map
        .iter()
        .enumerate()
        .fold((0, f64::NEG_INFINITY), |(w, mx), (i, &r)| {
            if r > mx || r.is_nan() && !mx.is_nan() {
                (i, r)
            } else {
                (w, mx)
            }
        });
    RadiusMap { map, max, worst }
}

/// Transient growth over a horizon.
#[derive(Debug, Clone, PartialEq)]
pub struct Growth {
    /// max_θ ‖W Gⁿ W⁻¹‖₂ for n = 0..=steps.
    pub envelope: Vec<f64>,
    /// max_n ‖W Gⁿ W⁻¹‖₂ at every node.
    pub map: Vec<f64>,
    /// The largest value of the envelope.
    pub max: f64,
    /// The step where it is reached.
    pub at_step: usize,
    /// The node where it is reached.
    pub worst: usize,
}

/// Norms of the powers of W G W⁻¹ up to `steps`, for an invertible m×m
/// row-major `w` (its inverse `w_inv`).
pub fn growth(g: &GField, w: &[f64], w_inv: &[f64], steps: usize) -> Result<Growth, LinalgError> {
    let m = g.m;
    let to_c = |v: &[f64]| -> Vec<C64> { v.iter().map(|&x| C64::new(x, 0.0)).collect() };
    let (wc, wic) = (to_c(w), to_c(w_inv));
    let per_node: Vec<Vec<f64>> = (0..g.nodes())
        .into_par_iter()
        .map_init(
            || {
                let zero = vec![C64::new(0.0, 0.0); m * m];
                (SvdSolver::new(m), zero.clone(), zero.clone(), zero)
            },
            |(svd, a, p, next), node| {
                linalg::multiply_into(&wc, g.at(node), &mut next[..], m);
                linalg::multiply_into(&next[..], &wic, &mut a[..], m);
                set_identity(p, m);
                let mut norms = Vec::with_capacity(steps + 1);
                norms.push(1.0);
                for _ in 0..steps {
                    linalg::multiply_into(a, p, next, m);
                    std::mem::swap(p, next);
                    norms.push(svd.norm2(p)?);
                }
                Ok(norms)
            },
        )
        .collect::<Result<_, LinalgError>>()?;
    let mut envelope = vec![0.0_f64; steps + 1];
    let mut map = Vec::with_capacity(per_node.len());
    let (mut max, mut at_step, mut worst) = (0.0, 0, 0);
    for (node, norms) in per_node.iter().enumerate() {
        let mut best = 0.0_f64;
        for (n, &v) in norms.iter().enumerate() {
            envelope[n] = envelope[n].max(v);
            best = best.max(v);
            if v > max {
                (max, at_step, worst) = (v, n, node);
            }
        }
        map.push(best);
    }
    Ok(Growth {
        envelope,
        map,
        max,
        at_step,
        worst,
    })
}

fn set_identity(p: &mut [C64], m: usize) {
    p.fill(C64::new(0.0, 0.0));
    for i in 0..m {
        p[i * m + i] = C64::new(1.0, 0.0);
    }
}

/// A built-in model to compare frequencies with: its system and, per probed
/// variable, the model variable it is.
pub struct Exact<'a> {
    /// The model.
    pub system: &'a System,
    /// Grid spacing per axis (θ_d = k_d h_d).
    pub spacing: &'a [f64],
    /// `order[i]`: the model's index of probed variable i.
    pub order: Vec<usize>,
}

impl Exact<'_> {
    /// The exact ω at θ, ascending in Re ω.
    pub fn omega(&self, theta: &[f64]) -> Vec<C64> {
        let k: Vec<f64> = theta.iter().zip(self.spacing).map(|(t, h)| t / h).collect();
        let l = self.system.continuous_symbol(&k);
        let m = self.order.len();
        let a: Vec<C64> = (0..m * m)
            .map(|x| l[(self.order[x / m], self.order[x % m])])
            .collect();
        let mut w: Vec<C64> = linalg::eigenvalues(&a, m)
            .unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); m])
            .into_iter()
            .map(|mu| C64::new(0.0, 1.0) * mu)
            .collect();
        w.sort_by(|a, b| a.re.total_cmp(&b.re));
        w
    }
}

/// Fully discrete frequencies at every node.
#[derive(Debug, Clone, PartialEq)]
pub struct Dispersion {
    /// ω per node and mode (mode order: the exact modes' ascending Re ω when a
    /// model is named; else ascending Re ω of the principal branch).
    pub omega: Vec<C64>,
    /// The model's ω per node and mode, when a model is named.
    pub exact: Option<Vec<C64>>,
    /// Re ω / Re ω_exact per node and mode (NaN where the exact mode does not
    /// move), when a model is named.
    pub phase_ratio: Option<Vec<f64>>,
    /// Per mode, the largest |1 − phase ratio| over nodes with at least 10 and
    /// at least 5 cells per wavelength along every axis, leaving out nodes where
    /// the mode's exact phase speed is below 10 % of its fastest (NaN where no
    /// node is left, e.g. a mode that does not move).
    pub worst_phase_error: Option<Vec<(f64, f64)>>,
}

/// Frequencies from the eigenvalues of G at Δt `dt`.
pub fn dispersion(g: &GField, dt: f64, exact: Option<&Exact>) -> Dispersion {
    let m = g.m;
    let per_node: Vec<(Vec<C64>, Option<Vec<C64>>)> = (0..g.nodes())
        .into_par_iter()
        .map(|node| {
            let lam = linalg::eigenvalues(g.at(node), m)
                .unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); m]);
            match exact {
                None => {
                    let mut w: Vec<C64> = lam.iter().map(|l| log_branch(*l, dt, 0.0)).collect();
                    w.sort_by(|a, b| a.re.total_cmp(&b.re));
                    (w, None)
                }
                Some(e) => {
                    let we = e.omega(&g.theta(node));
                    let mut cost = vec![0.0; m * m];
                    for (i, w) in we.iter().enumerate() {
                        let target = (C64::new(0.0, -1.0) * w * dt).exp();
                        for (j, l) in lam.iter().enumerate() {
                            let c = (l - target).norm();
                            cost[i * m + j] = if c.is_finite() { c } else { 1e300 };
                        }
                    }
                    let pick = optimal_assignment(&cost, m);
                    let w = pick
                        .iter()
                        .zip(&we)
                        .map(|(&j, e)| log_branch(lam[j], dt, e.re))
                        .collect();
                    (w, Some(we))
                }
            }
        })
        .collect();
    let omega: Vec<C64> = per_node.iter().flat_map(|(w, _)| w.clone()).collect();
    let Some(_) = exact else {
        return Dispersion {
            omega,
            exact: None,
            phase_ratio: None,
            worst_phase_error: None,
        };
    };
    let exact_w: Vec<C64> = per_node
        .iter()
        .flat_map(|(_, e)| e.clone().unwrap_or_default())
        .collect();
    let scale = exact_w.iter().fold(0.0_f64, |a, w| a.max(w.norm()));
    let ratio: Vec<f64> = omega
        .iter()
        .zip(&exact_w)
        .map(|(n, e)| phase_ratio(*n, *e, scale))
        .collect();
    // phase speed |Re ω_exact|/|k| per node and mode; modes slower than 10 %
    // of their fastest at a wavevector are left out of the worst errors
    let spacing = exact.map_or(&[][..], |e| e.spacing);
    // per node: |k| and the cells per wavelength along the least-resolved axis
    let (wavenumber, ppw): (Vec<f64>, Vec<f64>) = (0..g.nodes())
        .map(|node| {
            let theta = g.theta(node);
            let k = theta
                .iter()
                .zip(spacing)
                .map(|(t, h)| (t / h).powi(2))
                .sum::<f64>()
                .sqrt();
            let top = theta.iter().fold(0.0_f64, |a, t| a.max(t.abs()));
            (k, 2.0 * std::f64::consts::PI / top)
        })
        .unzip();
    let speed = |node: usize, mode: usize| exact_w[node * m + mode].re.abs() / wavenumber[node];
    let mut fastest = vec![0.0_f64; m];
    for node in 0..g.nodes() {
        for (mode, f) in fastest.iter_mut().enumerate() {
            let c = speed(node, mode);
            if c.is_finite() {
                *f = f.max(c);
            }
        }
    }
    let mut worst = vec![(f64::NAN, f64::NAN); m];
    let keep = |old: f64, new: f64| if old.is_nan() || new > old { new } else { old };
    for (node, &ppw) in ppw.iter().enumerate() {
        if ppw.is_infinite() {
            continue; // θ = 0
        }
        for (mode, w) in worst.iter_mut().enumerate() {
            let r = ratio[node * m + mode];
            let fast_enough = matches!(
                speed(node, mode).partial_cmp(&(0.1 * fastest[mode])),
                Some(std::cmp::Ordering::Greater | std::cmp::Ordering::Equal)
            );
            if r.is_nan() || !fast_enough {
                continue;
            }
            let err = (1.0 - r).abs();
            if ppw >= 10.0 {
                w.0 = keep(w.0, err);
            }
            if ppw >= 5.0 {
                w.1 = keep(w.1, err);
            }
        }
    }
    Dispersion {
        omega,
        exact: Some(exact_w),
        phase_ratio: Some(ratio),
        worst_phase_error: Some(worst),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn growth_of_a_jordan_block_is_n_plus_one_bounded() {
        // G = [[1, 1], [0, 1]] at every node: ‖Gⁿ‖₂ = (n + √(n² + 4))/2
        let mut g = GField::zeros(&[3], 2);
        for node in 0..3 {
            g.g[node * 4] = C64::new(1.0, 0.0);
            g.g[node * 4 + 1] = C64::new(1.0, 0.0);
            g.g[node * 4 + 3] = C64::new(1.0, 0.0);
        }
        let i = [1.0, 0.0, 0.0, 1.0];
        let r = growth(&g, &i, &i, 4).unwrap();
        for (n, v) in r.envelope.iter().enumerate() {
            let n = n as f64;
            assert!((v - (n + (n * n + 4.0).sqrt()) / 2.0).abs() < 1e-12);
        }
        assert_eq!(r.at_step, 4);
    }
}
