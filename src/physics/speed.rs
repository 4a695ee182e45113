//! The reference speed of a system: its largest characteristic speed over all
//! directions, max over unit n of ρ(Σ_d n_d A_d).
//!
//! In 1-D that is ρ(A_x); in 2-D a scan of 720 angles refined by golden-section
//! search; in 3-D 2000 Fibonacci-sphere directions, the best of them at least
//! [`SEPARATION`] apart (up to [`STARTS`]) each refined by a compass search in
//! the two angles. ρ of a non-symmetric flux combination can peak sharply
//! between lattice points: the best lattice direction may sit on a lower local
//! maximum (seed 7566: 2.418755 there, 2.419849 at the peak two lattice cells
//! from the runner-up). Every value found is ρ at some unit direction, so no
//! start can lift the result above the true maximum.

use super::System;
use crate::numeric::{directions, minimise};

/// How many separated lattice directions start a refinement in 3-D.
const STARTS: usize = 8;
/// Smallest angle (radians) between two starts, up to sign.
const SEPARATION: f64 = 0.25;

/// Largest characteristic speed of `s` over all directions.
pub(super) fn max_speed(s: &System) -> f64 {
    let m = s.size();
    let speed = |n: &[f64]| {
        let a = crate::linalg::from_matrix(&s.flux_along(n));
        crate::linalg::spectral_radius(&a, m).unwrap_or(f64::NAN)
    };
    match s.dims() {
        1 => speed(&[1.0]),
        2 => {
            let f = |t: f64| speed(&[t.cos(), t.sin()]);
            let n = 720;
            let h = std::f64::consts::PI / n as f64;
            let (i_best, _) = (0..n)
                .map(|i| (i, f(i as f64 * h)))
                .fold((0, f64::MIN), |b, x| if x.1 > b.1 { x } else { b });
            let t0 = i_best as f64 * h;
            let (_, v) = minimise::golden_max(&f, t0 - h, t0 + h);
            v.max(f(t0))
        }
        _ => {
            let dirs = directions::sphere(2000);
            let values: Vec<f64> = dirs.iter().map(|n| speed(n)).collect();
            let mut order: Vec<usize> = (0..dirs.len()).collect();
            order.sort_by(|a, b| values[*b].total_cmp(&values[*a]));
            // ρ is even in n: directions are compared up to sign
            let close = |a: &[f64; 3], b: &[f64; 3]| {
                (a[0] * b[0] + a[1] * b[1] + a[2] * b[2]).abs() >= SEPARATION.cos()
            };
            let mut starts: Vec<usize> = Vec::with_capacity(STARTS);
            for i in order {
                if starts.len() == STARTS {
                    break;
                }
                if !starts.iter().any(|j| close(&dirs[i], &dirs[*j])) {
                    starts.push(i);
                }
            }
            let to_angles = |n: &[f64; 3]| (n[2].clamp(-1.0, 1.0).acos(), n[1].atan2(n[0]));
            let f = |x: &[f64]| {
                let (st, ct) = x[0].sin_cos();
                let (sp, cp) = x[1].sin_cos();
                -speed(&[st * cp, st * sp, ct])
            };
            starts
                .iter()
                .map(|i| {
                    let (a, b) = to_angles(&dirs[*i]);
                    let (_, v) = minimise::compass_min(&f, &[a, b], 0.05, 1e-9, 400);
                    (-v).max(values[*i])
                })
                .fold(f64::MIN, f64::max)
        }
    }
}
