//! The terminal exporter: the short aligned table `kgain run` prints on stdout —
//! the problem in one line, the time step, each section's rows, the output
//! folder and the cautions.

use super::sections::ALL;
use crate::analysis::Results;
use crate::problem::Problem;
use std::fmt::Write;

/// The human summary of a run.
pub fn human_summary(problem: &Problem, r: &Results, out: Option<&std::path::Path>) -> String {
    let (head, tail) = human_summary_parts(problem, r, out);
    head + &tail
}

/// The human summary in two parts: the results (everything above the output
/// row), which `kgain run` prints while the files are written, and the output
/// row with the cautions, printed once the folder is in place.
pub fn human_summary_parts(
    problem: &Problem,
    r: &Results,
    out: Option<&std::path::Path>,
) -> (String, String) {
    let mut s = String::new();
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
    let mut rows: Vec<(String, String)> = vec![(
        "scheme".into(),
        format!(
            "{} in space, {} in time{}",
            names.join("/"),
            problem.method.name,
            problem
                .method
                .spatial_filter()
                .map(|f| format!(", {} once per step", f.label()))
                .unwrap_or_default()
        ),
    )];
    let courant = r
        .courant
        .map(|c| format!(", Courant {c:.6}"))
        .unwrap_or_default();
    let diffn = r
        .diffusion_number
        .map(|d| format!(", diffusion number {d:.6}"))
        .unwrap_or_default();
    rows.push((
        "time step".into(),
        format!("dt = {:.6e}{courant}{diffn}", r.dt),
    ));
    for section in ALL {
        section.rows(problem, r, &mut rows);
    }
    for (k, v) in rows {
        let _ = writeln!(s, "  {k:<14}{v}");
    }
    let mut tail = String::new();
    if let Some(o) = out {
        let _ = writeln!(tail, "  {:<14}{}/", "output", o.display());
    }
    for c in &r.cautions {
        let _ = writeln!(tail, "  {:<14}{c}", "caution");
    }
    (s, tail)
}
