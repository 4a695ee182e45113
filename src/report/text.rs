//! The short aligned table `kgain run` prints on stdout.

use super::summary::direction_deg;
use crate::analysis::{LimitKind, Results};
use crate::problem::Problem;
use std::fmt::Write;

fn theta(v: &[f64]) -> String {
    let parts: Vec<String> = v.iter().map(|x| format!("{x:+.4}")).collect();
    format!("({})", parts.join(", "))
}

fn dir(v: &[f64]) -> String {
    match direction_deg(v) {
        (az, Some(el)) => format!("azimuth {az:.1} deg, elevation {el:.1} deg"),
        (a, None) => format!("{a:.1} deg"),
    }
}

/// The human summary of a run.
pub fn human_summary(problem: &Problem, r: &Results, out: Option<&std::path::Path>) -> String {
    let mut s = String::new();
    let row = |s: &mut String, k: &str, v: String| {
        let _ = writeln!(s, "  {k:<14}{v}");
    };
    let _ = writeln!(
        s,
        "kgain: {} ({}-D {}, variables {})",
        problem.name,
        problem.dims(),
        problem.system.kind.name(),
        problem.system.variables.join(" ")
    );
    let names: Vec<&str> = problem
        .space
        .first
        .iter()
        .map(|s| s.name.as_str())
        .collect();
    row(
        &mut s,
        "scheme",
        format!(
            "{} in space, {} in time",
            names.join("/"),
            problem.method.name
        ),
    );
    let courant = problem
        .courant_of(r.dt)
        .map(|c| format!(", Courant {c:.6}"))
        .unwrap_or_default();
    let diffn = problem
        .diffusion_number_of(r.dt)
        .map(|d| format!(", diffusion number {d:.6}"))
        .unwrap_or_default();
    row(
        &mut s,
        "time step",
        format!("dt = {:.6e}{courant}{diffn}", r.dt),
    );
    if let Some(rad) = &r.radius {
        let verdict = if rad.stable { "STABLE" } else { "UNSTABLE" };
        row(
            &mut s,
            "at this dt",
            format!(
                "{verdict}: max |lambda| = {:.12} at theta = {}",
                rad.max,
                theta(&rad.wavevector)
            ),
        );
    }
    if let Some(l) = &r.limit {
        let v = match l.kind {
            LimitKind::Unconditional => "unconditional: stable for every dt > 0".to_string(),
            LimitKind::None => format!(
                "none: unstable for every dt > 0 (e.g. at theta = {})",
                theta(&l.wavevector)
            ),
            LimitKind::Bounded => {
                let c = problem
                    .courant_of(l.dt_max)
                    .map(|c| format!(", Courant {c:.10}"))
                    .unwrap_or_default();
                let d = problem
                    .diffusion_number_of(l.dt_max)
                    .map(|d| format!(", diffusion number {d:.10}"))
                    .unwrap_or_default();
                format!("dt_max = {:.10e}{c}{d}", l.dt_max)
            }
        };
        row(&mut s, "largest dt", v);
        if l.kind == LimitKind::Bounded {
            row(
                &mut s,
                "set by",
                format!(
                    "theta = {}, direction {}",
                    theta(&l.wavevector),
                    dir(&l.wavevector)
                ),
            );
        }
    }
    if let Some(d) = r.limit.as_ref().map(|l| &l.by_direction) {
        let (imin, vmin) = (d.worst, d.dt.get(d.worst).copied().unwrap_or(f64::INFINITY));
        let vmax = d.dt.iter().copied().fold(0.0, f64::max);
        if vmin.is_finite() {
            row(
                &mut s,
                "by direction",
                format!(
                    "{} directions: dt from {vmin:.6e} ({}) to {vmax:.6e}",
                    d.directions.len(),
                    dir(&d.directions[imin])
                ),
            );
        }
    }
    if let Some(g) = &r.growth {
        row(&mut s, "growth", g.verdict.clone());
        if let Some(k) = &g.kreiss {
            row(
                &mut s,
                "kreiss",
                format!(
                    "K >= {:.6} (sampled), eps-pseudospectral radius {:.6} (eps = {:e})",
                    k.lower_bound, g.pseudospectral.1, g.pseudospectral.0
                ),
            );
        }
    }
    if let Some(d) = &r.dispersion {
        let parts: Vec<String> = d
            .names
            .iter()
            .zip(&d.resolution)
            .filter_map(|(n, (semi, disc, _))| {
                semi.map(|a| match disc {
                    Some(b) => format!("{n} {a:.1} ({b:.1} with time stepping)"),
                    None => format!("{n} {a:.1}"),
                })
            })
            .collect();
        if !parts.is_empty() {
            row(
                &mut s,
                "resolution",
                format!(
                    "points per wavelength for {:.1}% phase error: {}",
                    100.0 * d.tolerance,
                    parts.join(", ")
                ),
            );
        }
        if d.computational > 0 {
            row(
                &mut s,
                "spurious",
                format!(
                    "{} computational mode(s) of the time method",
                    d.computational
                ),
            );
        }
    }
    for m in &r.modes {
        row(
            &mut s,
            &format!("{} mode", m.kind.as_str()),
            m.description.clone(),
        );
    }
    if let Some(o) = out {
        row(&mut s, "output", format!("{}/", o.display()));
    }
    for c in &r.cautions {
        row(&mut s, "caution", c.clone());
    }
    s
}
