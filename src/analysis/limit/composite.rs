//! The overall limit of a composite scheme, assembled from the steps of
//! [`super::search`]: the small-Δt test, the first loss over the grid, the scan
//! below it, the refinement of the critical wavevectors with the per-wavevector
//! first loss, and the limits approached at θ = 0 and at the corners and faces.
//! Schemes with G = I + ΔtL + O(Δt²) are first checked for an unstable spatial
//! operator ([`super::abscissa`]).

use super::abscissa;
use super::certify::Evidence;
use super::longwave;
use super::loss::FirstLoss;
use super::overall::degenerate;
use super::search::{CompositeEval, PerTheta, SmallDt, VERIFY_STEPS};
use super::{Limit, LimitKind, Verification};
use crate::numeric::minimise::compass_min;
use crate::operator::Operator;
use crate::sample::Grid;
use rayon::prelude::*;

/// How many separated critical wavevectors are refined.
const REFINED: usize = 8;

/// The limit of a composite scheme over the grid, its bracket and the scan below it.
pub fn overall(
    ev: &CompositeEval,
    op: &Operator,
    tolerance: f64,
    grid: &Grid,
) -> (Limit, Option<(f64, f64)>, Verification) {
    let dims = grid.points.len();
    let mut idx = vec![0usize; dims];
    let mut points: Vec<Vec<f64>> = (0..grid.len())
        .map(|i| {
            grid.unravel(i, &mut idx);
            grid.theta(&idx)
        })
        .collect();
    points.push(vec![0.0; dims]);
    let mut verification = Verification {
        steps_scanned: VERIFY_STEPS,
        stable_below: true,
        moved_down: false,
    };
    let mut evidence = Evidence::default();
    if ev.tends_to_identity() {
        if let Some(theta) = abscissa::unstable_wavevector(op, tolerance, grid) {
            evidence.offer(0.0, &theta);
            return (evidence.conclude(dims).0, None, verification);
        }
    }
    let start = match ev.small_dt(&points) {
        SmallDt::Unstable(i) => {
            evidence.offer(0.0, &points[i]);
            return (evidence.conclude(dims).0, None, verification);
        }
        SmallDt::Stable(dt) => dt,
    };
    let Some((mut lo, mut hi, mut worst)) = ev.first_loss(&points, start) else {
        let limit = Limit {
            kind: LimitKind::Unconditional,
            dt_max: f64::INFINITY,
            wavevector: vec![0.0; dims],
            long_wave_floor: f64::INFINITY,
        };
        return (limit, None, verification);
    };
    // a stable window below the first loss found must not hide an earlier one
    for _ in 0..4 {
        let Some(dt) = ev.earlier_loss(&points, lo) else {
            break;
        };
        verification.moved_down = true;
        match ev.first_loss(&points, dt / (VERIFY_STEPS + 1) as f64) {
            Some((l, h, w)) if l < lo => (lo, hi, worst) = (l, h, w),
            _ => {
                verification.stable_below = false;
                break;
            }
        }
    }
    evidence.offer(hi, &points[worst]);
    let per = PerTheta::new(ev, 0.5 * lo);
    let step = (0..dims)
        .map(|d| grid.step(d))
        .fold(f64::INFINITY, f64::min);
    let g = |x: &[f64]| per.at(x).bound_or_inf();
    for c in critical(ev, &points, hi * 1.02, grid) {
        let (x, v) = compass_min(&g, &c, step, 1e-9, 600);
        evidence.offer(v, &x);
    }
    for o in longwave::origins(dims) {
        if degenerate(op, tolerance, &o) {
            let lw = longwave::overall(&per, &o);
            evidence.approach(lw);
        }
    }
    let (limit, bracket) = evidence.conclude(dims);
    (limit, bracket, verification)
}

/// Up to `REFINED` points with the largest excess at Δt, three cells apart.
fn critical(ev: &CompositeEval, points: &[Vec<f64>], dt: f64, grid: &Grid) -> Vec<Vec<f64>> {
    let mut scored: Vec<(f64, usize)> = points
        .par_iter()
        .enumerate()
        .map(|(i, p)| (ev.excess(p, dt), i))
        .filter(|(e, _)| e.is_finite())
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    let far = 3.0
        * (0..grid.points.len())
            .map(|d| grid.step(d))
            .fold(0.0, f64::max);
    let mut chosen: Vec<Vec<f64>> = Vec::new();
    for (_, i) in scored {
        let p = &points[i];
        if chosen
            .iter()
            .all(|c| c.iter().zip(p).any(|(a, b)| (a - b).abs() > far))
        {
            chosen.push(p.clone());
            if chosen.len() == REFINED {
                break;
            }
        }
    }
    chosen
}
