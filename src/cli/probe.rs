//! `kgain run` on a probe case and `kgain probe compare`: the user's program
//! probed with a progress line (program runs and the limit's bracket), the
//! output folder claimed before any run, nothing written when the program
//! fails.

use super::sweep::{destination, input, Failed};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use kgain::case::probe::ProbeCase;
use kgain::case::Case;
use kgain::destination::{CommitError, Destination};
use kgain::probe::{self, SearchProgress};
use kgain::report::probe::{probe_owner, probe_summary_json, probe_table, write_probe_into};
use std::path::{Path, PathBuf};

fn other(message: impl ToString) -> Failed {
    Failed {
        input: false,
        message: message.to_string(),
    }
}

/// A spinner line on stderr: program runs so far and the limit's bracket.
struct Spinner(ProgressBar);

impl Spinner {
    fn new(show: bool) -> Spinner {
        if !show {
            return Spinner(ProgressBar::hidden());
        }
        let bar = ProgressBar::with_draw_target(None, ProgressDrawTarget::stderr());
        if let Ok(style) = ProgressStyle::with_template("{spinner} probing  {msg}  {elapsed}") {
            bar.set_style(style);
        }
        bar.enable_steady_tick(std::time::Duration::from_millis(120));
        Spinner(bar)
    }
}

impl SearchProgress for Spinner {
    fn update(&self, runs: usize, lo: Option<f64>, hi: Option<f64>) {
        let fmt = |x: Option<f64>| x.map_or("?".to_string(), |v| format!("{v:.6e}"));
        let bracket = if lo.is_some() || hi.is_some() {
            format!(", dt bracket [{}, {}]", fmt(lo), fmt(hi))
        } else {
            String::new()
        };
        self.0.set_message(format!("{runs} program runs{bracket}"));
    }
}

impl Drop for Spinner {
    fn drop(&mut self) {
        self.0.finish_and_clear();
    }
}

/// What `kgain run` on a probe case was asked.
pub struct ProbeRunArgs<'a> {
    /// The loaded case.
    pub case: &'a ProbeCase,
    /// Worker threads for the analyses (0: one per core).
    pub threads: usize,
    /// Output folder.
    pub out: PathBuf,
    /// Print nothing on success.
    pub quiet: bool,
    /// Replace another case's output.
    pub force: bool,
    /// Print summary.json instead of the table.
    pub json: bool,
    /// Exit 3 when unstable at the probe's dt.
    pub require_stable: bool,
    /// Exit 3 unless dt ≤ F·dt_max.
    pub require_margin: Option<f64>,
}

/// What the run ended with beyond success.
pub enum ProbeEnd {
    /// All well.
    Done(String),
    /// A --require-* gate failed (exit 3), with the table and the verdict line.
    Gate(String, String),
    /// The checks failed (exit 1), with the table and the message.
    ChecksFailed(String, String),
}

/// Probes, analyses and writes the output folder.
pub fn run(a: ProbeRunArgs) -> Result<ProbeEnd, Failed> {
    let case = a.case;
    if a.require_margin.is_some() && case.plan.limit.is_none() {
        return Err(input(format!(
            "{}: --require-margin needs the limit analysis; add \"limit\" to scan.analyses",
            case.file.display()
        )));
    }
    let dest = Destination::claim(&a.out, probe_owner(case), a.force).map_err(destination)?;
    let spinner = Spinner::new(!a.quiet && std::io::IsTerminal::is_terminal(&std::io::stderr()));
    let mut program = case.program();
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(a.threads)
        .build()
        .map_err(|e| other(format!("cannot start worker threads: {e}")))?;
    let results = pool.install(|| probe::run(&case.spec, &mut program, &case.plan, &spinner));
    let results = results.map_err(|e| {
        other(format!(
            "{}: {e}\nno result is reported and nothing was written",
            case.file.display()
        ))
    })?;
    drop(spinner);
    let written = dest
        .commit(|dir| write_probe_into(dir, case, &results))
        .map_err(|e| match e {
            CommitError::Write(e) => other(e),
            CommitError::Destination(e) => destination(e),
        })?;
    let text = if a.json {
        serde_json::to_string_pretty(&probe_summary_json(case, &results)).expect("JSON serialises")
            + "\n"
    } else if a.quiet {
        String::new()
    } else {
        probe_table(case, &results, Some(&written))
    };
    if !results.checks.valid() {
        return Ok(ProbeEnd::ChecksFailed(
            text,
            format!(
                "{}: the probed program failed the linearity or translation check (see the cautions); its matrices are not amplification matrices",
                case.file.display()
            ),
        ));
    }
    let stable = probe::cautions::stable(&case.plan, &results);
    if a.require_stable && stable == Some(false) {
        return Ok(ProbeEnd::Gate(
            text,
            format!(
                "kgain: UNSTABLE at dt = {:e} (--require-stable)",
                case.plan.dt
            ),
        ));
    }
    if let Some(f) = a.require_margin {
        let dt_max = results
            .limit
            .as_ref()
            .filter(|l| {
                l.kind == probe::ProbeLimitKind::Bounded
                    || l.kind == probe::ProbeLimitKind::NotFound
            })
            .and_then(|l| l.dt_lo);
        let ok = dt_max.is_some_and(|m| case.plan.dt <= f * m);
        if !ok {
            return Ok(ProbeEnd::Gate(
                text,
                format!(
                    "kgain: dt = {:e} is not within {f} x dt_max = {} (--require-margin)",
                    case.plan.dt,
                    dt_max.map_or("none".into(), |m| format!("{:e}", f * m))
                ),
            ));
        }
    }
    Ok(ProbeEnd::Done(text))
}

/// `kgain probe compare`: the probed G against a case file's G at the probe's
/// wavevectors and Δt. Ok((report, within tolerance)).
pub fn compare(
    probe_path: &Path,
    case_path: &Path,
    set: &[String],
    tolerance: f64,
) -> Result<(String, bool), Failed> {
    if !(tolerance.is_finite() && tolerance >= 0.0) {
        return Err(input(format!(
            "--tolerance {tolerance}: give a number >= 0"
        )));
    }
    let pc = ProbeCase::load(probe_path, set).map_err(input)?;
    let case = Case::load(case_path, &[]).map_err(input)?;
    let described = probe::compare::described(
        &case.problem,
        &pc.spec.variables,
        &pc.spec.cells,
        pc.plan.dt,
    )
    .map_err(|e| {
        input(format!(
            "{} and {}: {}: {}",
            probe_path.display(),
            case_path.display(),
            e.key,
            e.message
        ))
    })?;
    let mut program = pc.program();
    let probed = probe::measure::measure(&pc.spec, &mut program, pc.plan.dt)
        .map_err(|e| other(format!("{}: {e}", probe_path.display())))?;
    let c = probe::compare::compare(&probed, &described, &pc.spec.variables);
    let ok = c.relative <= tolerance;
    let theta: Vec<String> = c.theta.iter().map(|x| format!("{x:+.4}")).collect();
    let text = format!(
        "kgain: probe {} against case {} at dt = {:e} on {} wavevectors\n  largest difference  {:.3e} ({:.3e} relative to max |G|; tolerance {tolerance:.1e})\n  where               theta = ({}), row {} / column {}: probed {:.12} {:+.12}i, case {:.12} {:+.12}i\n  verdict             {}\n",
        probe_path.display(),
        case_path.display(),
        pc.plan.dt,
        probed.nodes(),
        c.largest,
        c.relative,
        theta.join(", "),
        c.row,
        c.column,
        c.probed.re,
        c.probed.im,
        c.described.re,
        c.described.im,
        if ok {
            "SAME: the program implements the case's scheme on these wavevectors"
        } else {
            "DIFFERENT: the program does not implement the case's scheme"
        }
    );
    Ok((text, ok))
}
