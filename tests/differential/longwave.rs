//! The long-wave limit: many limits are set as θ → 0, where ρ − 1 above the limit
//! is of order |θ|² × (Δt − limit) and sinks below roundoff. Along a direction n
//! the first loss Δt*(s n) is measured where the crossing is clear
//! (s = 0.6·0.8^j while ρ − 1 just above it is beyond roundoff) and
//! extrapolated to s → 0 by Neville's scheme in
//! s² (Δt*(−s n) = Δt*(s n) for real coefficients, so the expansion is even);
//! the spread of the last two extrapolants says whether it converged. Over
//! directions the smallest value is refined by a pattern search on the angles.

use crate::domain::Domain;
use crate::pattern::minimise;
use crate::probe::Point;
use crate::scheme::Scheme;
use std::f64::consts::PI;

/// Roundoff allowance of the long-wave crossings: none. The excess there is
/// small by nature (of order s² × the distance in Δt) and any allowance would
/// bias Δt*(s) by allowance/s², which no extrapolation in s² removes; only
/// crossings clear of roundoff are used.
const ALLOWANCE: f64 = 0.0;
/// Extrapolants agreeing to this relative spread count as converged.
const CONVERGED: f64 = 1e-10;

/// The long-wave limit over a domain's directions.
#[derive(Debug, Clone)]
pub struct LongWave {
    /// Extrapolated Δt*(0⁺ n).
    pub dt: f64,
    /// The direction n.
    pub direction: Vec<f64>,
    /// Whether the extrapolation converged.
    pub converged: bool,
    /// Relative spread of the last extrapolants.
    pub spread: f64,
}

/// Neville extrapolation of y(x) to x = 0: the last diagonal value and the
/// largest distance from it of the three before (a conservative error
/// estimate: the points carry roundoff as well as truncation error).
fn neville(x: &[f64], y: &[f64]) -> (f64, f64) {
    let mut p = y.to_vec();
    let mut diag = vec![y[0]];
    for k in 1..x.len() {
        for i in (k..x.len()).rev() {
            p[i] = (x[i] * p[i - 1] - x[i - k] * p[i]) / (x[i] - x[i - k]);
        }
        diag.push(p[x.len() - 1]);
    }
    let last = diag[diag.len() - 1];
    let deviation = diag[diag.len().saturating_sub(4)..diag.len() - 1]
        .iter()
        .map(|d| (d - last).abs())
        .fold(0.0, f64::max);
    (last, deviation)
}

/// Smallest crossing clarity: ρ − 1 at 1.01·Δt*(s) below this is roundoff.
const CLARITY: f64 = 2e-15;

/// Δt*(0⁺ n) along one direction, if it lies below 1.5·`cap`: first losses at
/// s = 0.6·0.8^j for as long as the crossing stays clear of roundoff (at least
/// four of them), extrapolated to s = 0.
pub fn along(s: &Scheme, n: &[f64], cap: f64) -> Option<LongWave> {
    let mut xs = Vec::new();
    let mut ys: Vec<f64> = Vec::new();
    for j in 0..10 {
        let mag = 0.6 * 0.8f64.powi(j);
        let p = Point::new(s, n.iter().map(|v| v * mag).collect(), ALLOWANCE);
        let t = match ys.last() {
            None => p.first_loss_from(0.25 * cap, 1.5 * cap, 24, 20),
            Some(prev) => p
                .first_loss_from(0.97 * prev, 1.03 * prev, 6, 20)
                .or_else(|| p.first_loss_from(0.5 * prev, 2.0 * prev, 12, 20)),
        };
        let clear = t.is_some_and(|t| t > 0.0 && p.excess(1.01 * t) > CLARITY);
        match t {
            Some(t) if clear => {
                xs.push(mag * mag);
                ys.push(t);
            }
            _ if ys.len() >= 4 => break,
            _ => return None,
        }
    }
    let (value, deviation) = neville(&xs, &ys);
    let decreasing = ys.windows(2).all(|w| w[1] < w[0]);
    if decreasing && value < 1e-3 * ys[0] {
        // the first loss sinks to zero with the wavenumber: no stable Δt
        return Some(LongWave {
            dt: 0.0,
            direction: n.to_vec(),
            converged: true,
            spread: 0.0,
        });
    }
    let spread = (deviation / value).abs();
    (value > 0.0).then(|| LongWave {
        dt: value,
        direction: n.to_vec(),
        converged: spread < CONVERGED,
        spread,
    })
}

fn direction_of(dims: usize, x: &[f64]) -> Vec<f64> {
    match dims {
        2 => vec![x[0].cos(), x[0].sin()],
        _ => {
            let (st, ct) = x[0].sin_cos();
            let (sp, cp) = x[1].sin_cos();
            vec![st * cp, st * sp, ct]
        }
    }
}

fn angles_of(n: &[f64]) -> Vec<f64> {
    match n.len() {
        2 => vec![n[1].atan2(n[0])],
        _ => vec![n[2].clamp(-1.0, 1.0).acos(), n[1].atan2(n[0])],
    }
}

/// The smallest long-wave limit over the domain's directions, refined over
/// directions on the whole box (not on a ray), if any lies below 1.5·`cap`.
pub fn limit(s: &Scheme, dom: &Domain, cap: f64) -> Option<LongWave> {
    let mut best: Option<LongWave> = None;
    for n in &dom.long_wave {
        if let Some(lw) = along(s, n, cap) {
            if best.as_ref().is_none_or(|b| lw.dt < b.dt) {
                best = Some(lw);
            }
        }
    }
    let found = best?;
    let dims = found.direction.len();
    if dom.ray.is_some() || dims == 1 {
        return Some(found);
    }
    let f = |x: &[f64], c: f64| along(s, &direction_of(dims, x), c).map_or(c, |lw| lw.dt.min(c));
    let step = PI / dom.long_wave.len() as f64;
    let (x, v) = minimise(&f, &angles_of(&found.direction), step, found.dt, (1e-7, 80));
    if v < found.dt {
        return along(s, &direction_of(dims, &x), found.dt).or(Some(found));
    }
    Some(found)
}
