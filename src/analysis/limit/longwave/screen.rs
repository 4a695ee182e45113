//! The global minimum over directions of the closed-form long-wave limit at
//! one origin ([`super::overall`] uses it where the leading orders give the
//! limit in closed form): a dense screen of directions (a circle in 2-D, a
//! sphere in 3-D, and in 3-D each coordinate plane as well), its best
//! separated points refined by golden-section or pattern search. Also the
//! conversions between a direction and its angles that the refinements share.

use crate::analysis::limit::loss::FirstLoss;
use crate::numeric::{directions, minimise};
use std::f64::consts::PI;

/// Directions screened with the closed form: 180 angles in 2-D, 2048 sphere
/// points in 3-D (2° and about 4.5° apart).
const SCREEN_2D: usize = 180;
const SCREEN_3D: usize = 2048;
/// How many separated local minima of the screen are refined.
const STARTS: usize = 6;

/// The direction of the smallest closed-form long-wave limit at `origin` over
/// all directions (None in 1-D, or when `f` has no closed form): a dense screen,
/// then up to `STARTS` of its best points at least two screen spacings apart
/// refined by golden-section (2-D, over the angle) or pattern search (3-D, over
/// polar and azimuthal angles). Sequential: `f` keeps per-worker buffers, and
/// this runs inside the parallel limit analysis.
pub(super) fn closed_form_minimum(f: &dyn FirstLoss, origin: &[f64]) -> Option<Vec<f64>> {
    let dims = origin.len();
    if dims < 2 {
        return None;
    }
    let value = |n: &[f64]| f.long_wave(origin, n).map_or(f64::INFINITY, |c| c.limit);
    let screen: Vec<Vec<f64>> = match dims {
        2 => directions::circle(SCREEN_2D)
            .into_iter()
            .map(|a| vec![a.cos(), a.sin()])
            .collect(),
        _ => directions::sphere(SCREEN_3D)
            .into_iter()
            .map(|p| p.to_vec())
            .collect(),
    };
    let mut scored: Vec<(f64, usize)> = screen
        .iter()
        .enumerate()
        .map(|(i, n)| (value(n), i))
        .filter(|(v, _)| v.is_finite())
        .collect();
    if scored.is_empty() && dims != 3 {
        return None;
    }
    scored.sort_by(|a, b| a.0.total_cmp(&b.0));
    let spacing = match dims {
        2 => 2.0 * PI / SCREEN_2D as f64,
        _ => (4.0 * PI / SCREEN_3D as f64).sqrt(),
    };
    let mut starts: Vec<&Vec<f64>> = Vec::new();
    for (_, i) in &scored {
        let n = &screen[*i];
        let apart = |m: &&Vec<f64>| {
            let c: f64 = m.iter().zip(n).map(|(a, b)| a * b).sum();
            c.clamp(-1.0, 1.0).acos() > 2.0 * spacing
        };
        if starts.iter().all(apart) {
            starts.push(n);
            if starts.len() == STARTS {
                break;
            }
        }
    }
    let g = |x: &[f64]| value(&unit_of(x));
    let mut refined: Vec<(Vec<f64>, f64)> = starts
        .iter()
        .map(|n| {
            let x0 = angles_of(n);
            let (x, v) = match dims {
                2 => {
                    let h = 2.0 * spacing;
                    let (a, v) = minimise::golden_min(&|a| g(&[a]), x0[0] - h, x0[0] + h);
                    (vec![a], v)
                }
                _ => minimise::pattern_min(&g, &x0, spacing, 1e-9, 3000),
            };
            (unit_of(&x), v)
        })
        .collect();
    if dims == 3 {
        refined.extend(coordinate_planes(&value));
    }
    refined
        .into_iter()
        .filter(|(_, v)| v.is_finite())
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(n, _)| n)
}

/// The closed-form minimum in each coordinate plane n_d = 0 of 3-D θ-space
/// (a screen of `SCREEN_2D` angles, its best `STARTS` points two spacings
/// apart refined by golden-section search over the angle in the plane), each
/// with its value. A damping term of lower order along axis d vanishes
/// exactly in that plane and nowhere near it: off the plane it sets the
/// leading order (no long-wave limit) or, at a component too small to
/// dominate the fit, spoils it (no closed form), so the sphere screen and its
/// refinement in polar and azimuthal angles never see the plane's closed
/// forms (IMEX CNAB2, seed 10767: upwinding of order 2 along x; the minimum,
/// 0.0313663607 at n = (0, 0.99926, 0.03853), lies in n_x = 0).
fn coordinate_planes(value: &dyn Fn(&[f64]) -> f64) -> Vec<(Vec<f64>, f64)> {
    let spacing = 2.0 * PI / SCREEN_2D as f64;
    let mut out = Vec::new();
    for d in 0..3 {
        let (i, j) = ((d + 1) % 3, (d + 2) % 3);
        let unit = |a: f64| {
            let mut n = vec![0.0; 3];
            (n[i], n[j]) = (a.cos(), a.sin());
            n
        };
        let mut scored: Vec<(f64, f64)> = directions::circle(SCREEN_2D)
            .into_iter()
            .map(|a| (value(&unit(a)), a))
            .filter(|(v, _)| v.is_finite())
            .collect();
        scored.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut starts: Vec<f64> = Vec::new();
        for (_, a) in scored {
            let gap = |b: &f64| {
                let diff = (a - b).rem_euclid(2.0 * PI);
                diff.min(2.0 * PI - diff) > 2.0 * spacing
            };
            if starts.iter().all(gap) {
                starts.push(a);
                if starts.len() == STARTS {
                    break;
                }
            }
        }
        for a0 in starts {
            let h = 2.0 * spacing;
            let (a, v) = minimise::golden_min(&|a| value(&unit(a)), a0 - h, a0 + h);
            out.push((unit(a), v));
        }
    }
    out
}

/// A direction's angles: its angle in 2-D; polar and azimuthal angles in 3-D.
pub(super) fn angles_of(n: &[f64]) -> Vec<f64> {
    match n.len() {
        2 => vec![n[1].atan2(n[0])],
        _ => vec![n[2].clamp(-1.0, 1.0).acos(), n[1].atan2(n[0])],
    }
}

/// The unit vector of [`angles_of`]'s angles.
pub(super) fn unit_of(x: &[f64]) -> Vec<f64> {
    match x.len() {
        1 => vec![x[0].cos(), x[0].sin()],
        _ => {
            let (st, ct) = x[0].sin_cos();
            let (sp, cp) = x[1].sin_cos();
            vec![st * cp, st * sp, ct]
        }
    }
}
