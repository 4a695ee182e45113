//! The cautions every result carries — what von Neumann analysis does and does
//! not establish, and the margin to keep — and those particular to a run.

use super::limit::LimitKind;
use super::Results;
use crate::problem::Problem;

/// The cautions of a run.
pub(super) fn cautions(problem: &Problem, r: &Results) -> Vec<String> {
    let mut c = vec![
        "Von Neumann analysis of a linear, constant-coefficient problem on a periodic grid: a necessary condition for the stability of a real solver, not a sufficient one (boundaries, variable coefficients, nonlinearity and filters can each destabilise a scheme that passes here).".to_string(),
        "Use a safety margin on any time step reported here, e.g. 0.8 to 0.9 times dt_max.".to_string(),
    ];
    if r.failures > 0 {
        c.push(format!(
            "the eigenvalue kernel did not converge at {} wavevector(s); their values are NaN and they were skipped",
            r.failures
        ));
    }
    if let Some(l) = &r.limit {
        if let Some((found, resolved)) = l.below_resolution {
            c.push(format!(
                "no usable time step: the {} method loses stability at dt = {found:.3e}, below {resolved:.3e} (1e-7 of the time scale 1/||L||), where stability cannot be verified against rounding; reported as none",
                problem.method.name
            ));
        } else if l.kind == LimitKind::None {
            c.push(format!(
                "no time step is stable: the {} method amplifies some wavevector for every dt > 0",
                problem.method.name
            ));
        }
        if let Some((lo, hi)) = l.bracket {
            if (hi - lo) / hi > 1e-6 {
                c.push(format!(
                    "the limit is certified only to a relative width of {:.1e} (stable up to {lo:.6e}, unstable above {hi:.6e}): a long-wave limit whose extrapolation is uncertain; dt_max is the lower end",
                    (hi - lo) / hi
                ));
            }
        }
    }
    if problem.method.is_second_order() {
        c.extend(second_order_cautions(problem, r));
    }
    if let Some(rad) = &r.radius {
        if !rad.stable {
            c.push(format!(
                "unstable at the case time step: max |lambda| = {:.6} exceeds 1 + tolerance",
                rad.max
            ));
        }
    }
    c
}

/// What the analyses mean for a second-order-in-time method (u_tt = L u).
fn second_order_cautions(problem: &Problem, r: &Results) -> Vec<String> {
    let mut c = vec![format!(
        "second order in time: the {} method is analysed as a two-step recurrence in z = dt^2 mu; dispersion is not computed for it",
        problem.method.name
    )];
    if r.growth.is_some() {
        c.push("growth of a second-order-in-time method is measured in the discrete wave energy (not on the raw levels (u^n, u^(n-1)), where a slow oscillation shows a growth of about 1/(omega dt) from the basis alone); wavevectors where L = 0 (theta = 0), whose mode a + b t grows linearly for the equation u_tt = 0 itself, are kept out of the envelope and the verdict".to_string());
    }
    c
}
