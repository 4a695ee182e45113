//! Evidence around a disagreement: the reference's ρ(G) − 1 at its witness at
//! the engine's Δt (printed with a "too large" failure), and a second look at
//! the engine's own wavevector when the engine is lower than the reference.

use crate::probe::Point;
use crate::radius::ROUNDOFF;
use crate::scheme::Scheme;
use crate::search::{Kind, Reference};

/// How far above the engine's value its own wavevector is probed: the
/// accuracy asked of a limit (`compare::BELOW`).
const JUST_ABOVE: f64 = 1e-6;

/// When the engine's value is below the reference's (or the engine is bounded
/// where the reference found every ladder rung stable), the engine's own
/// wavevector may hold an earlier loss the reference's search missed: measure
/// its first loss with the reference's criterion, up to just above the
/// engine's value first (a window of Δt narrower than the reference's ladder
/// rungs opens there: Lie-split backward Euler near the corner of the box, seed
/// 4820, unstable on [2.3307, 2.4] between rungs a factor 8 apart), then up to
/// the reference's value, and keep the smaller value. A reference made bounded
/// this way says where.
pub fn improved_with(scheme: &Scheme, r: &Reference, theta: &[f64], engine_dt: f64) -> Reference {
    let comparable = matches!(r.kind, Kind::Bounded | Kind::Unconditional);
    if !comparable
        || theta.len() != scheme.dims()
        || !(engine_dt > 0.0 && engine_dt.is_finite())
        || engine_dt.partial_cmp(&r.dt) != Some(std::cmp::Ordering::Less)
    {
        return r.clone();
    }
    let p = Point::new(scheme, theta.to_vec(), ROUNDOFF);
    let positive = |t: &f64| *t > 0.0 && *t < r.dt;
    let near = (engine_dt * (1.0 + JUST_ABOVE)).min(r.dt);
    let found = p
        .first_loss_from(0.5 * engine_dt, near, 16, 60)
        .filter(positive)
        .or_else(|| match r.kind {
            Kind::Bounded => p
                .first_loss_from(0.5 * engine_dt, r.dt, 16, 60)
                .filter(positive),
            _ => None,
        });
    match found {
        Some(t) => Reference {
            kind: Kind::Bounded,
            dt: t,
            witness: theta.to_vec(),
            uncertainty: 0.0,
            allowance_bias: crate::search::allowance_bias(scheme, theta, t),
            note: format!("{}; improved at the engine's wavevector", r.note),
            ..r.clone()
        },
        None => r.clone(),
    }
}

/// ρ(G) − 1 at the reference's witness at the engine's Δt, for a failure report
/// (at a long-wave witness, the best of a few small multiples of the direction).
pub fn evidence(scheme: &Scheme, r: &Reference, dt: f64) -> String {
    if r.witness.is_empty() || !dt.is_finite() {
        return String::new();
    }
    let best = excess_at_witness(scheme, r, dt);
    format!("; at the witness, rho(G) - 1 = {best:.3e} at the engine's dt")
}

/// ρ(G) − 1 at the reference's witness at `dt` (the best of a few small
/// multiples of the direction at a long-wave witness); −∞ without a witness.
pub fn excess_at_witness(scheme: &Scheme, r: &Reference, dt: f64) -> f64 {
    if r.witness.is_empty() || !dt.is_finite() {
        return f64::NEG_INFINITY;
    }
    let long_wave = r.note.starts_with("long-wave");
    let mags: Vec<f64> = if long_wave {
        (1..12).map(|k| 0.3 * 0.5f64.powi(k)).collect()
    } else {
        vec![1.0]
    };
    let best = mags
        .iter()
        .map(|m| {
            let theta: Vec<f64> = r.witness.iter().map(|x| x * m).collect();
            Point::new(scheme, theta, 0.0).excess(dt)
        })
        .fold(f64::NEG_INFINITY, f64::max);
    best
}
