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

/// Longest run of first losses extrapolated.
const RUN: usize = 10;
/// Smallest crossing clarity: ρ − 1 at 1.01·Δt*(s) below this is roundoff.
const CLARITY: f64 = 2e-15;
/// The same for a point of the trend, at twice its first loss: a first loss
/// found where ρ − 1 barely leaves roundoff is biased low, which would bend
/// the trend's last slopes.
const TREND_CLARITY: f64 = 16.0 * CLARITY;

/// Δt*(0⁺ n) along one direction: first losses below 1.5·`cap` at
/// s = 0.6·0.8^j (from the first below it) for as long as the crossing
/// stays clear of roundoff (at least four of them), extrapolated to s = 0.
/// A trend is followed from the first loss below 8·`cap` and a little
/// further in, for as long as ρ − 1 at twice the first loss is clear of
/// roundoff: first losses that fall like a power of s there sink to 0 (no
/// stable Δt), however few of them are accurate.
pub fn along(s: &Scheme, n: &[f64], cap: f64) -> Option<LongWave> {
    let (mut xs, mut ys): (Vec<f64>, Vec<f64>) = (Vec::new(), Vec::new());
    let (mut trend_x, mut trend_y): (Vec<f64>, Vec<f64>) = (Vec::new(), Vec::new());
    let mut closed = false;
    for j in 0..24 {
        let mag = 0.6 * 0.8f64.powi(j);
        let p = Point::new(s, n.iter().map(|v| v * mag).collect(), ALLOWANCE);
        let t = match trend_y.last() {
            None => p.first_loss_from(0.25 * cap, 8.0 * cap, 24, 20),
            Some(prev) => p
                .first_loss_from(0.97 * prev, 1.03 * prev, 6, 20)
                .or_else(|| p.first_loss_from(0.5 * prev, 2.0 * prev, 12, 20)),
        };
        let clear_at = |k: f64, floor: f64| t.is_some_and(|t| t > 0.0 && p.excess(k * t) > floor);
        let Some(t) = t.filter(|_| clear_at(2.0, TREND_CLARITY)) else {
            if trend_y.is_empty() && t.is_none() {
                // above the cap at the longest waves tried: a first loss that
                // falls with s may come below it further in
                continue;
            }
            break;
        };
        trend_x.push(mag * mag);
        trend_y.push(t);
        // the extrapolated run: from the first point below 1.5·cap, unbroken,
        // at most RUN points (further in, rounding enters the crossings)
        if clear_at(1.01, CLARITY) && t <= 1.5 * cap && !closed && ys.len() < RUN {
            xs.push(mag * mag);
            ys.push(t);
        } else if !ys.is_empty() {
            closed = true;
        }
    }
    let falling = |y: &[f64]| y.windows(2).all(|w| w[1] < w[0]);
    if falling(&trend_y) && power_law(&trend_x, &trend_y) {
        return Some(LongWave {
            dt: 0.0,
            direction: n.to_vec(),
            converged: true,
            spread: 0.0,
        });
    }
    if ys.len() < 4 {
        return None;
    }
    let (value, deviation) = neville(&xs, &ys);
    if falling(&ys) && value < 1e-3 * ys[0] {
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

/// Whether the first losses y at x = s² fall like a power of s down to the
/// last: the last three local slopes d ln y / d ln s agree to 10 % and are
/// above 0.1 (a first loss tending to a constant c + d s² has slopes
/// 2ds²/(c + ds²), which shrink by 0.64 a step once ds² < c; where ds² ≫ c
/// at every resolved s, c is beneath everything the samples can show). AB2
/// with sixth-order dissipation: y ∝ s^(2/3).
fn power_law(xs: &[f64], ys: &[f64]) -> bool {
    if xs.len() < 4 {
        return false;
    }
    let slopes: Vec<f64> = xs
        .windows(2)
        .zip(ys.windows(2))
        .map(|(x, y)| 2.0 * (y[0] / y[1]).ln() / (x[0] / x[1]).ln())
        .collect();
    let last = &slopes[slopes.len() - 3..];
    let p = last[2];
    p > 0.1 && last.iter().all(|q| (q / p - 1.0).abs() < 0.1)
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
