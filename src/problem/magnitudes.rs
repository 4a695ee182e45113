//! Every derived number of a problem must be a finite number the analyses can
//! work with: the matrices of the system, its reference speed, the entries of
//! L(θ), the time step, its Courant and diffusion numbers, and Δt‖L‖. A value
//! that overflows (a velocity of 1e300 squared, a spacing of 5e-324 inverted, a
//! Δt of 1e308 times a wave speed) is refused here, naming the key, instead of
//! turning into an infinite reference speed and a false verdict downstream.

use super::Step;
use crate::error::InputError;
use crate::operator::Operator;
use crate::physics::System;

/// Δt‖L‖ above this is refused: stability functions and companion matrices
/// would be evaluated at arguments whose powers overflow.
pub const MAX_DT_NORM: f64 = 1e30;

fn not_finite(key: &str, what: &str, value: f64) -> InputError {
    InputError::new(
        key,
        format!("{what} is {value:e}, not a finite positive number"),
    )
    .hint("rescale the problem (choose units in which the coefficients are nearer 1)")
}

/// Checks the magnitudes of a built problem; `step` is the time step as given.
pub(super) fn check(
    sys: &System,
    spacing: &[f64],
    op: &Operator,
    step: Step,
    dissipation: Option<f64>,
) -> Result<f64, InputError> {
    let all = sys
        .flux
        .iter()
        .chain(&sys.diffusion)
        .chain(std::iter::once(&sys.source));
    for a in all {
        if a.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
            return Err(not_finite(
                "model",
                "an entry of the model's matrices",
                f64::INFINITY,
            ));
        }
    }
    let s = sys.reference_speed;
    if !s.is_finite() {
        return Err(not_finite("model", "the largest characteristic speed", s));
    }
    let scale = op.scale();
    if !scale.is_finite() {
        return Err(not_finite(
            "grid.spacing",
            "the size of the spatial operator L (coefficients over spacing or spacing squared)",
            scale,
        ));
    }
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let (key, dt) = match step {
        Step::Dt(dt) => ("time.dt", dt),
        Step::Courant(nu) => ("time.courant", nu * h / s),
    };
    if !(dt.is_finite() && dt > 0.0) {
        return Err(not_finite(key, "the time step", dt));
    }
    if s > 0.0 && !(s * dt / h).is_finite() {
        return Err(not_finite(key, "the Courant number s dt / h", s * dt / h));
    }
    if let Some(d) = sys.diffusivity_max {
        if !(dt * d / (h * h)).is_finite() {
            return Err(not_finite(
                key,
                "the diffusion number dt D / h^2",
                dt * d / (h * h),
            ));
        }
    }
    let damping = dissipation.map_or(0.0, |sigma| sigma * s / h);
    if dt * damping > MAX_DT_NORM || !damping.is_finite() {
        return Err(InputError::new(
            "space.dissipation.strength",
            format!(
                "dt times the dissipation rate sigma s / h is {:e}, above {MAX_DT_NORM:e}",
                dt * damping
            ),
        )
        .hint("dissipation strengths are typically below 1"));
    }
    if dt * scale > MAX_DT_NORM {
        return Err(InputError::new(
            key,
            format!(
                "dt times the size of L is {:e}, above {MAX_DT_NORM:e}: the amplification matrix cannot be evaluated reliably",
                dt * scale
            ),
        )
        .hint("choose a time step nearer the scheme's scale (see kgain check), or rescale model coefficients that differ by many orders of magnitude"));
    }
    Ok(dt)
}
