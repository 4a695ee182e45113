//! `radius.png`: the spectral radius ρ(G(θ)) at the case's Δt.
//!
//! 2-D: a square heat map over (θx, θy) ∈ [−π, π]² with a colour bar, the
//! stability boundary |λ| = 1 + tolerance as a contour and the worst
//! wavevector marked and annotated. 1-D: the radius against θ with the level
//! drawn as a dashed line and the unstable stretches in crimson. 3-D: three
//! heat maps on one colour scale, the planes θz, θy and θx = const through the
//! worst wavevector, with the colour bar and the legend in the fourth quarter.
//! The layout is [`field`]'s, shared with the non-normality maps.

use super::colormap::Scale;
use super::field::{self, Level, Spec};
use super::{style, title_band, Area, Res};
use crate::analysis::{RadiusResult, Results};
use crate::problem::Problem;

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

/// "max |λ| = … (stable)" and "at θ = (…)".
fn worst_lines(rad: &RadiusResult) -> Vec<String> {
    let verdict = if rad.stable { "stable" } else { "unstable" };
    let digits = if (rad.max - 1.0).abs() < 1e-3 { 8 } else { 5 };
    vec![
        format!("max |λ| = {} ({verdict})", style::num(rad.max, digits)),
        format!("at θ = {}", style::theta_tuple(&rad.wavevector)),
    ]
}
