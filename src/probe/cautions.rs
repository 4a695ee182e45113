//! The cautions of a probe: what measured matrices do and do not establish,
//! and what the checks found.

use super::{ProbeLimitKind, ProbePlan, ProbeResults, ProbeSpec};

/// Whether the probe's Δt is stable: ρ_max ≤ 1 + the radius tolerance on the
/// measured grid (None when the radius map was not asked for).
pub fn stable(plan: &ProbePlan, r: &ProbeResults) -> Option<bool> {
    let tol = plan.limit.map_or(1e-9, |l| l.radius_tolerance);
    r.radius.as_ref().map(|m| m.max <= 1.0 + tol)
}

/// The cautions every probe report carries, and those of this probe.
pub fn cautions(spec: &ProbeSpec, plan: &ProbePlan, r: &ProbeResults) -> Vec<String> {
    let cells: Vec<String> = spec.cells.iter().map(|n| n.to_string()).collect();
    let mut c = vec![
        "Von Neumann analysis of a linear, constant-coefficient problem on a periodic grid: a necessary condition for the stability of a real solver, not a sufficient one (boundaries, variable coefficients, nonlinearity and filters can each destabilise a scheme that passes here).".to_string(),
        "Use a safety margin on any time step reported here, e.g. 0.8 to 0.9 times dt_max.".to_string(),
        format!(
            "The matrices were measured on the program's own {} grid: only its {} wavevectors are seen, and a finer grid carries shorter waves that may limit the time step further.",
            cells.join(" x "),
            spec.nodes()
        ),
    ];
    let ch = &r.checks;
    if !ch.linearity.passed {
        c.push(format!(
            "LINEARITY CHECK FAILED: an impulse of opposite sign and half the size gives matrices that differ by {:.2e} (relative; tolerance {:.1e}); the program is not linear about the base state and these matrices are not its amplification matrices.",
            ch.linearity.figure, ch.tolerance
        ));
    }
    if !ch.translation.passed {
        c.push(format!(
            "TRANSLATION CHECK FAILED: an impulse at cell {:?} gives matrices that differ by {:.2e} (relative; tolerance {:.1e}); the program's step depends on position (boundaries, variable coefficients, a non-periodic grid) and Fourier modes are not its eigenvectors.",
            ch.second_cell, ch.translation.figure, ch.tolerance
        ));
    }
    if !ch.steady.passed {
        c.push(format!(
            "The base state is not steady: one step moves it by {:.2e} (relative to its largest value); the matrices are those of the step linearised about a moving state.",
            ch.steady.figure
        ));
    }
    if let Some(l) = &r.limit {
        match l.kind {
            ProbeLimitKind::None => c.push(match l.dt_lo {
                Some(lo) => format!(
                    "Unstable at every time step: max |lambda| - 1 falls only in proportion to dt as dt shrinks (a growth rate that does not vanish), and drops under the tolerance only below {lo:.3e}."
                ),
                None => format!(
                    "No time step probed was stable, down to {:.3e}.",
                    l.dt_hi.unwrap_or(f64::NAN)
                ),
            }),
            ProbeLimitKind::NotFound => c.push(format!(
                "Every time step probed was stable, up to {:.3e}; no limit was found.",
                l.dt_lo.unwrap_or(f64::NAN)
            )),
            ProbeLimitKind::Irregular => c.push(
                "The stable time steps found are not an interval: a smaller time step than the limit was unstable; no dt_max is reported.".into(),
            ),
            ProbeLimitKind::Bounded => {}
        }
        if let Some(p) = plan.limit {
            c.push(format!(
                "The limit was found by re-running the program: stable means max |lambda| <= 1 + {:.0e} at the probed time steps (the search's bracket has relative width <= {:.0e}; dt_max is its stable end, also verified at 1/2, 1/4 and 1/8 of it).",
                p.radius_tolerance, p.tolerance
            ));
        }
    }
    if plan.dispersion && plan.exact.is_none() {
        c.push("No [model] was named, so the frequencies are not compared with an exact relation (omega.npy holds them on the principal branch).".into());
    }
    c
}
