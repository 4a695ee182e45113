//! The terminal table of a probe.

use crate::case::probe::ProbeCase;
use crate::probe::cautions::{cautions, stable};
use crate::probe::{ProbeLimitKind, ProbeResults};
use crate::report::format::{sig3, theta};
use std::fmt::Write;

fn verdict(passed: bool) -> &'static str {
    if passed {
        "ok"
    } else {
        "FAILED"
    }
}

/// The table: what was probed, the checks, each analysis, the output folder
/// (when written) and the cautions.
pub fn probe_table(case: &ProbeCase, r: &ProbeResults, out: Option<&std::path::Path>) -> String {
    let spec = &case.spec;
    let plan = &case.plan;
    let ch = &r.checks;
    let cells: Vec<String> = spec.cells.iter().map(|n| n.to_string()).collect();
    let mut t = String::new();
    let _ = writeln!(
        t,
        "kgain: {} (probe of `{}`, variables {})",
        case.name,
        case.command.join(" "),
        spec.variables.join(", ")
    );
    let _ = writeln!(
        t,
        "  grid          {} periodic cells, {} program runs",
        cells.join(" x "),
        r.runs
    );
    let courant = case
        .courant
        .map(|(nu, _)| format!(", Courant {nu:.6}"))
        .unwrap_or_default();
    let _ = writeln!(t, "  time step     dt = {:.6e}{courant}", plan.dt);
    let _ = writeln!(
        t,
        "  linearity     {}: opposite impulse differs by {:.2e} (tolerance {:.0e})",
        verdict(ch.linearity.passed),
        ch.linearity.figure,
        ch.tolerance
    );
    let _ = writeln!(
        t,
        "  translation   {}: impulse at cell {:?} differs by {:.2e}",
        verdict(ch.translation.passed),
        ch.second_cell,
        ch.translation.figure
    );
    let _ = writeln!(
        t,
        "  steady base   {}: one step moves the base by {:.2e}",
        verdict(ch.steady.passed),
        ch.steady.figure
    );
    if let Some(rad) = &r.radius {
        let word = if stable(plan, r) == Some(true) {
            "STABLE"
        } else {
            "UNSTABLE"
        };
        let _ = writeln!(
            t,
            "  at this dt    {word}: max |lambda| = {:.12} at theta = {}",
            rad.max,
            theta(&r.field.theta(rad.worst))
        );
    }
    if let Some(l) = &r.limit {
        let h_min = case.spacing.iter().cloned().fold(f64::INFINITY, f64::min);
        let line = match (l.kind, l.dt_lo, l.dt_hi) {
            (ProbeLimitKind::Bounded, Some(lo), Some(hi)) => {
                let c = case
                    .courant
                    .map(|(_, c)| format!(", Courant {:.6}", c * lo / h_min))
                    .unwrap_or_default();
                format!("dt_max = {lo:.6e}{c} (stable at {lo:.6e}, unstable at {hi:.6e})")
            }
            (ProbeLimitKind::NotFound, Some(lo), _) => {
                format!("none found: stable at every dt probed, up to {lo:.3e}")
            }
            (ProbeLimitKind::None, Some(_), _) => {
                "none: unstable at every dt (max |lambda| - 1 shrinks only like dt)".into()
            }
            (ProbeLimitKind::Irregular, _, _) => {
                "not an interval: a smaller dt was unstable (see cautions)".into()
            }
            _ => format!(
                "none: unstable at every dt probed, down to {:.3e}",
                l.dt_hi.unwrap_or(f64::NAN)
            ),
        };
        let _ = writeln!(t, "  largest dt    {line}");
        if let Some(th) = &l.worst_theta {
            let _ = writeln!(
                t,
                "  set by        theta = {} ({} probes, {} runs)",
                theta(th),
                l.evaluations.len(),
                l.runs
            );
        }
    }
    if let Some(g) = &r.growth {
        let _ = writeln!(
            t,
            "  growth        max ||G^n|| = {} at n = {}, theta = {} (n <= {})",
            sig3(g.max),
            g.at_step,
            theta(&r.field.theta(g.worst)),
            g.envelope.len() - 1
        );
    }
    if let Some(d) = &r.dispersion {
        match (&d.worst_phase_error, &case.model) {
            (Some(w), Some(model)) => {
                let parts: Vec<String> = w
                    .iter()
                    .enumerate()
                    .filter(|(_, (ten, five))| !(ten.is_nan() && five.is_nan()))
                    .map(|(i, (ten, five))| {
                        format!(
                            "mode {i}: {} (10 cells), {} (5 cells)",
                            sig3(*ten),
                            sig3(*five)
                        )
                    })
                    .collect();
                let _ = writeln!(
                    t,
                    "  dispersion    largest phase-speed error against {model}: {}",
                    parts.join("; ")
                );
            }
            _ => {
                let _ = writeln!(
                    t,
                    "  dispersion    frequencies written to omega.npy (no [model] to compare with)"
                );
            }
        }
    }
    if let Some(o) = out {
        let _ = writeln!(t, "  output        {}/", o.display());
    }
    for c in cautions(spec, plan, r) {
        let _ = writeln!(t, "  caution       {c}");
    }
    t
}
