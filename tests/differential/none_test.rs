//! The "none" classification: halve Δt from half the natural scale while some
//! wavevector is unstable. A scheme is unstable for every Δt > 0 when the largest
//! excess ρ − 1 stays above roundoff down to 1e-7 natural scales, or falls like a
//! power of Δt (steady slope of log excess against log Δt) until it meets the
//! roundoff allowance — decreasing to zero at a finite Δt is a limit instead.

use crate::probe::{Point, PointSet};

/// Why the scheme was classified "none".
#[derive(Debug, Clone)]
pub struct NoneVerdict {
    /// The worst wavevector at the smallest Δt tried.
    pub witness: Vec<f64>,
    /// Whether the power law was seen clearly.
    pub conclusive: bool,
    /// The excesses seen.
    pub note: String,
}

/// Slopes d log(excess)/d log(Δt) steady to this much count as a power law.
const STEADY: f64 = 0.15;

fn steady(slopes: &[f64]) -> bool {
    slopes.len() >= 3 && {
        let last = &slopes[slopes.len() - 3..];
        let last = last.iter().map(|p| p.abs()).collect::<Vec<f64>>();
        last.iter().all(|p| *p > 0.3) && last.windows(2).all(|w| (w[1] - w[0]).abs() < STEADY)
    }
}

/// Returns a stable Δt, or the verdict that there is none.
pub fn descend(set: &PointSet, scale: f64) -> Result<f64, NoneVerdict> {
    let mut dt = 0.5 * scale;
    let mut seen: Vec<(f64, f64)> = Vec::new();
    let mut slopes: Vec<f64> = Vec::new();
    let mut worst;
    let mut worst_few: Vec<usize> = Vec::new();
    loop {
        let (e, i) = set.max_excess(dt);
        if e <= 0.0 {
            // the worst point of the last unstable step: does its excess follow
            // a power of Δt down to roundoff (no limit), or vanish at a finite Δt?
            let last_dt = seen.last().map_or(dt, |x| x.0);
            for &i in &worst_few {
                if !seen.is_empty() && power_law_at(set, i, last_dt) {
                    return Err(verdict(
                        set,
                        i,
                        true,
                        &seen,
                        "power law at one wavevector down to roundoff",
                    ));
                }
            }
            // stable here, but every smaller Δt must be too: an eigenvalue
            // of L with a small positive real part is unstable for the small
            // Δt of A-stable methods and stable for larger ones (BDF2 on a
            // non-hyperbolic system, seed 1320); the descent goes on from
            // the first unstable Δt below (Δt/4, Δt/16, … down to 1e-8 Δt)
            let unstable_below = (1..=13).map(|k| dt * 0.25f64.powi(k)).find_map(|d| {
                let (e, i) = set.max_excess(d);
                (e > 0.0).then_some((d, i))
            });
            match unstable_below {
                Some((d, _)) if d >= 1e-7 * scale => {
                    (dt, seen, slopes) = (d, Vec::new(), Vec::new());
                    continue;
                }
                Some((_, i)) => {
                    return Err(verdict(
                        set,
                        i,
                        false,
                        &seen,
                        "stable at some Δt, unstable again below 1e-7 scales",
                    ));
                }
                None => return Ok(dt),
            }
        }
        if let Some((_, last)) = seen.last() {
            slopes.push((last / e).log2());
        }
        seen.push((dt, e));
        worst = i;
        worst_few = set.worst(dt, 4);
        if dt < 1e-7 * scale {
            let clear = steady(&slopes) || power_law_at(set, worst, dt);
            return Err(verdict(
                set,
                worst,
                clear,
                &seen,
                "unstable down to 1e-7 scales",
            ));
        }
        dt *= 0.5;
    }
}

fn verdict(
    set: &PointSet,
    worst: usize,
    conclusive: bool,
    seen: &[(f64, f64)],
    why: &str,
) -> NoneVerdict {
    let tail: Vec<String> = seen
        .iter()
        .rev()
        .take(4)
        .map(|(dt, e)| format!("dt {dt:.2e}: excess {e:.2e}"))
        .collect();
    NoneVerdict {
        witness: set.points[worst].theta().to_vec(),
        conclusive,
        note: format!("{why}; {}", tail.join(", ")),
    }
}

/// Whether the raw excess ρ − 1 at point `i` grows like a power of Δt over
/// Δt·2^k, k = 0..4 (all positive, slopes steady and positive), and is clear
/// of roundoff (the point is unstable with its allowance) at every one of
/// them: the rounding of the eigenvalues of ΔtL is itself proportional to Δt
/// (slope 1), and at a neutral wavevector (a rank-deficient diffusion matrix
/// at the corner θ = (π, 0), seed 2005) it would pass for a power law.
fn power_law_at(set: &PointSet, i: usize, dt: f64) -> bool {
    let p = &set.points[i];
    let raw = Point::new(p.scheme(), p.theta().to_vec(), 0.0);
    let steps: Vec<f64> = (0..5).map(|k| dt * 2f64.powi(k)).collect();
    let own: Vec<f64> = steps.iter().map(|d| raw.excess(*d)).collect();
    let slopes: Vec<f64> = own.windows(2).map(|w| (w[1] / w[0]).log2()).collect();
    own.iter().all(|x| *x > 0.0)
        && steps.iter().all(|d| p.excess(*d) > 0.0)
        && slopes.windows(2).all(|w| (w[1] - w[0]).abs() < STEADY)
        && slopes.iter().all(|p| *p > 0.3)
}
