//! `departure.png` and `norm.png`: how far G(θ) is from a normal matrix, and
//! how much one step can amplify, over the wavevector grid.
//!
//! The relative Henrici departure sqrt(‖G‖F² − Σ|λ|²)/‖G‖F lies in [0, 1]: 0
//! for a normal G, whose powers grow exactly like ρ(G)ⁿ, towards 1 for a G
//! dominated by its strictly triangular Schur part. Its colour scale starts at
//! 0 and ends at 1 or at a round value just above the largest departure, so
//! that small departures stay visible; a map that is normal to roundoff is
//! drawn on [0, 1] and says so. ‖G‖₂ (in the case's weighted norm) is drawn on
//! the range of its values with the contour ‖G‖₂ = 1 + tolerance, beyond
//! which a single step amplifies. Both use [`field`]'s layout, marking the
//! largest value.

use super::colormap::Scale;
use super::field::{self, Level, Spec};
use super::{style, title_band, Area, Res};
use crate::analysis::growth::GrowthResult;
use crate::analysis::Results;
use crate::problem::Problem;

/// Below this largest departure G is normal up to roundoff.
const ROUNDOFF: f64 = 1e-8;

/// Index and value of the largest non-NaN value.
fn largest(values: &[f64]) -> Option<(usize, f64)> {
    values
        .iter()
        .enumerate()
        .filter(|(_, v)| !v.is_nan())
        .max_by(|a, b| a.1.total_cmp(b.1))
        .map(|(i, v)| (i, *v))
}

/// The wavevector of a flat grid index.
fn theta_at(r: &Results, i: usize) -> Vec<f64> {
    let mut idx = vec![0usize; r.grid.points.len()];
    r.grid.unravel(i, &mut idx);
    r.grid.theta(&idx)
}

/// The upper end of the departure colour scale: 1, or the smallest 1–2–5
/// step at or above the largest departure.
pub fn departure_top(max: f64) -> f64 {
    if !(ROUNDOFF..0.5).contains(&max) {
        return 1.0;
    }
    let mag = 10f64.powf(max.log10().floor());
    [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|t| *t >= max * (1.0 - 1e-12))
        .unwrap_or(1.0)
        .min(1.0)
}

/// Draws `departure.png`.
pub fn departure(root: &Area, problem: &Problem, r: &Results, g: &GrowthResult) -> Res {
    title_band(root, problem, "departure from normality of G", r.dt)?;
    let Some((imax, max)) = largest(&g.departure) else {
        return field::no_data(
            root,
            "no departure value: the Schur factorisation failed everywhere",
        );
    };
    let theta = theta_at(r, imax);
    let top = departure_top(max);
    let mut callout = vec![format!("max departure = {}", style::num(max, 4))];
    if max < ROUNDOFF {
        callout.push("G is normal to roundoff:".to_string());
        callout.push("||G^n|| follows ρ(G)^n".to_string());
    } else {
        callout.push(format!("at θ = {}", style::theta_tuple(&theta)));
    }
    let spec = Spec {
        values: &g.departure,
        scale: Scale { lo: 0.0, hi: top },
        quantity: "Henrici departure (relative)",
        curve: "departure of G(θ)",
        level: None,
        marker: (&theta, max),
        marker_label: "largest departure on the grid",
        callout,
        slices: "slices through the largest departure",
        y_range: Some((-0.03 * top, top * 1.06)),
    };
    field::draw(root, &r.grid, &spec)
}

/// Draws `norm.png`.
pub fn norm(root: &Area, problem: &Problem, r: &Results, g: &GrowthResult) -> Res {
    title_band(root, problem, "one-step amplification ||G||_2", r.dt)?;
    let (Some(scale), Some((imax, max))) = (Scale::of(g.norm.iter().copied()), largest(&g.norm))
    else {
        return field::no_data(
            root,
            "no finite norm: the factorisation failed at every wavevector",
        );
    };
    let theta = theta_at(r, imax);
    let digits = if (max - 1.0).abs() < 1e-3 { 8 } else { 5 };
    let tol = style::num(r.plan.tolerance, 2);
    let spec = Spec {
        values: &g.norm,
        scale,
        quantity: "||G||_2 (weighted norm)",
        curve: "||G(θ)||_2",
        level: Some(Level {
            value: 1.0 + r.plan.tolerance,
            crossed: format!("||G||_2 = 1 + {tol}: one step amplifies beyond"),
            missed: format!("||G||_2 = 1 + {tol}: not reached on this map"),
            everywhere: format!("||G||_2 > 1 + {tol} on the whole map"),
            line: "||G||_2 = 1 + tolerance".to_string(),
            above: Some("one step amplifies".to_string()),
        }),
        marker: (&theta, max),
        marker_label: "largest ||G||_2 on the grid",
        callout: vec![
            format!("max ||G||_2 = {}", style::num(max, digits)),
            format!("at θ = {}", style::theta_tuple(&theta)),
        ],
        slices: "slices through the largest ||G||_2",
        y_range: None,
    };
    field::draw(root, &r.grid, &spec)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn departure_scale_ends_at_a_round_value_above_the_maximum() {
        assert_eq!(departure_top(0.9), 1.0);
        assert_eq!(departure_top(0.31), 0.5);
        assert_eq!(departure_top(0.12), 0.2);
        assert!((departure_top(0.0004) - 0.0005).abs() < 1e-15);
        assert_eq!(departure_top(0.2), 0.2);
        // normal to roundoff, or no data: the full range
        assert_eq!(departure_top(3e-16), 1.0);
        assert_eq!(departure_top(f64::NAN), 1.0);
    }
}
