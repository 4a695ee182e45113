//! `radius.png`: the spectral radius ρ(G(θ)) at the case's Δt.
//!
//! 2-D: a square heat map over (θx, θy) ∈ [−π, π]² with a colour bar, the
//! stability boundary |λ| = 1 + tolerance as a contour and the worst
//! wavevector marked and annotated. 1-D: the radius against θ with the level
//! drawn as a dashed line and the unstable stretches in crimson. 3-D: three
//! heat maps on one colour scale, the planes θz, θy and θx = const through the
//! worst wavevector, with the colour bar and the legend in the fourth quarter.
//! The layout is `field`'s, shared with the non-normality maps.
//!
//! A stable map within 1e-3 of 1 everywhere (a nearly neutral scheme: RK4 at a
//! small Courant number, a weakly dissipative filter) looks flat on a linear
//! colour scale although its damping varies over decades; it is drawn as
//! log10(1 − ρ), the damping per step, instead (see [`damping_view`]).

use super::colormap::Scale;
use super::field::{self, Level, Spec};
use super::{style, title_band, Area, Res};
use crate::analysis::{RadiusResult, Results};
use crate::problem::Problem;
use rayon::prelude::*;

/// Draws the picture for the case's dimension.
pub fn draw(root: &Area, problem: &Problem, r: &Results, rad: &RadiusResult) -> Res {
    title_band(
        root,
        problem,
        "spectral radius of the amplification matrix",
        r.dt,
    )?;
    let Some(scale) = Scale::of(rad.map.iter().copied()) else {
        return field::no_data(
            root,
            "no finite spectral radius: the eigenvalue kernel failed at every wavevector",
        );
    };
    if let Some(damping) = damping_view(&rad.map) {
        return draw_damping(root, r, rad, &damping);
    }
    let tol = style::num(r.plan.tolerance, 2);
    let spec = Spec {
        values: &rad.map,
        scale,
        quantity: "spectral radius |λ|max",
        curve: "ρ(G(θ))",
        level: Some(Level {
            value: 1.0 + r.plan.tolerance,
            crossed: format!("|λ| = 1 + {tol}: stability boundary"),
            missed: format!("|λ| = 1 + {tol}: not reached on this map"),
            everywhere: format!("|λ| > 1 + {tol} on the whole map"),
            line: "|λ| = 1 + tolerance".to_string(),
            above: Some("above 1 + tolerance".to_string()),
        }),
        marker: (&rad.wavevector, rad.max),
        marker_label: "largest |λ| on the grid",
        callout: worst_lines(rad),
        slices: "slices through the worst wavevector",
        y_range: None,
    };
    field::draw(root, &r.grid, &spec)
}

/// Spread of ρ below which the damping view is drawn.
const NEAR_ONE: f64 = 1e-3;
/// Floor of 1 − ρ in the damping view (rounding level).
const DAMPING_FLOOR: f64 = 1e-17;

/// log10(max(1 − ρ, 1e-17)) at every node, when that shows what a linear map
/// of ρ cannot: every finite ρ in [1 − 1e-3, 1] (to rounding) and 1 − ρ
/// spanning at least one decade up to more than 1e-12. None otherwise (an
/// unstable or strongly damped map, or one neutral to rounding, which the
/// flat-map note describes).
pub fn damping_view(map: &[f64]) -> Option<Vec<f64>> {
    let finite = map.iter().copied().filter(|v| v.is_finite());
    let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
        (a.min(v), b.max(v))
    });
    if !(lo >= 1.0 - NEAR_ONE && hi <= 1.0 + 1e-12) {
        return None;
    }
    let damping = |v: f64| (1.0 - v).max(DAMPING_FLOOR);
    let (dl, dh) = (damping(hi), damping(lo));
    // a map neutral to rounding (1 − ρ ≤ 1e-12 everywhere) is flat, not damped
    (dh > 1e-12 && dh >= 10.0 * dl).then(|| {
        // a log per node: spread over the caller's workers
        map.par_iter()
            .map(|v| {
                if v.is_finite() {
                    damping(*v).log10()
                } else {
                    f64::NAN
                }
            })
            .collect()
    })
}

/// The damping view: log10(1 − ρ) with the least damped wavevector marked.
fn draw_damping(root: &Area, r: &Results, rad: &RadiusResult, damping: &[f64]) -> Res {
    let Some(scale) = Scale::of(damping.iter().copied()) else {
        return field::no_data(root, "no finite spectral radius");
    };
    let least = (1.0 - rad.max).max(DAMPING_FLOOR).log10();
    let spec = Spec {
        values: damping,
        scale,
        quantity: "log10(1 − ρ): damping per step",
        curve: "log10(1 − ρ(G(θ)))",
        level: None,
        marker: (&rad.wavevector, least),
        marker_label: "largest |λ| (least damped) on the grid",
        callout: worst_lines(rad),
        slices: "slices through the least damped wavevector",
        y_range: None,
    };
    field::draw(root, &r.grid, &spec)
}

/// "max |λ| = … (stable)" and "at θ = (…)".
fn worst_lines(rad: &RadiusResult) -> Vec<String> {
    let verdict = if rad.stable { "stable" } else { "unstable" };
    let digits = if (rad.max - 1.0).abs() < 1e-3 { 8 } else { 5 };
    vec![
        format!("max |λ| = {} ({verdict})", style::num(rad.max, digits)),
        format!("at θ = {}", style::theta_tuple(&rad.wavevector)),
    ]
}

#[cfg(test)]
mod tests {
    use super::damping_view;

    #[test]
    fn the_damping_view_is_taken_only_for_a_stable_map_near_one_with_decades_of_damping() {
        // RK4 at a small Courant number: 1 − ρ from 1e-16 to 1e-8
        let nearly_neutral: Vec<f64> = (0..9).map(|k| 1.0 - 10f64.powi(-8 - k)).collect();
        let view = damping_view(&nearly_neutral).expect("damping view");
        assert!((view[0] + 8.0).abs() < 1e-6 && view[8] < -15.5, "{view:?}");
        // exactly neutral, or neutral to rounding (flat): no view, the
        // flat-map note says it
        assert!(damping_view(&[1.0; 9]).is_none());
        assert!(damping_view(&[1.0, 1.0 - 2e-16, 1.0 - 1e-16, 1.0 + 2e-16]).is_none());
        // strongly damped somewhere, or unstable somewhere: the linear map
        assert!(damping_view(&[1.0, 0.5, 0.99]).is_none());
        assert!(damping_view(&[1.0 - 1e-9, 1.0 + 1e-6]).is_none());
        // near one but within one decade of damping: nothing to gain
        assert!(damping_view(&[1.0 - 2e-5, 1.0 - 5e-5]).is_none());
        // NaN nodes stay NaN
        let v = damping_view(&[1.0 - 1e-9, f64::NAN, 1.0 - 1e-4]).expect("view");
        assert!(v[1].is_nan());
    }
}
