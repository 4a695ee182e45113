//! `kgain sweep` and `kgain merge`: argument checks, the memory pre-flight of
//! every combination, a progress bar over combinations, and the output folders
//! written through [`Destination`] (a sweep, a shard, or a merge of shards).

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use kgain::case::case_text;
use kgain::destination::marker::Owner;
use kgain::destination::{CommitError, Destination, DestinationError};
use kgain::study::dataset::{self, Dataset};
use kgain::study::figures;
use kgain::study::plan::{Shard, SweepSpec};
use kgain::study::run::{self, SweepError, SweepInput};
use kgain::study::shard::{self, ShardData};
use kgain::study::vary;
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// What went wrong, and whether the user's input is at fault (exit 2) or not (1).
pub struct Failed {
    /// Exit 2 when true.
    pub input: bool,
    /// The message.
    pub message: String,
}

pub(super) fn input(message: impl ToString) -> Failed {
    Failed {
        input: true,
        message: message.to_string(),
    }
}

pub(super) fn destination(e: DestinationError) -> Failed {
    Failed {
        input: e.is_refusal(),
        message: e.to_string(),
    }
}

/// The options of `kgain sweep`.
pub struct SweepArgs {
    /// The case file.
    pub case: PathBuf,
    /// `--vary` arguments.
    pub vary: Vec<String>,
    /// `--figures` (comma separated; default [`figures::DEFAULT_FIGURES`]).
    pub figures: Option<String>,
    /// `--set` overrides.
    pub set: Vec<String>,
    /// `--shard I/N`.
    pub shard: Option<String>,
    /// Output folder.
    pub out: PathBuf,
    /// Worker threads (0: one per core).
    pub threads: usize,
    /// No progress bar, no table.
    pub quiet: bool,
    /// Replace a kgain output of another case.
    pub force: bool,
}

fn bar(total: usize, show: bool) -> ProgressBar {
    if !show {
        return ProgressBar::hidden();
    }
    let bar = ProgressBar::with_draw_target(Some(total as u64), ProgressDrawTarget::stderr());
    if let Ok(style) = ProgressStyle::with_template("combinations [{bar:36}] {pos}/{len} eta {eta}")
    {
        bar.set_style(style.progress_chars("=> "));
    }
    bar
}

/// Runs `kgain sweep`; returns the text to print.
pub fn sweep(a: SweepArgs) -> Result<String, Failed> {
    let axes = a
        .vary
        .iter()
        .map(|v| vary::parse(v))
        .collect::<Result<Vec<_>, _>>()
        .map_err(input)?;
    let figure_list: Vec<String> = match &a.figures {
        Some(f) => f
            .split(',')
            .map(|s| s.trim().to_string())
            .filter(|s| !s.is_empty())
            .collect(),
        None => figures::DEFAULT_FIGURES
            .iter()
            .map(|s| s.to_string())
            .collect(),
    };
    for f in &figure_list {
        figures::check(f).map_err(input)?;
    }
    let spec = SweepSpec::new(axes, figure_list).map_err(input)?;
    let shard = a
        .shard
        .as_deref()
        .map(Shard::parse)
        .transpose()
        .map_err(input)?;
    let file = a.case.display().to_string();
    let text = case_text(&a.case, &file).map_err(input)?;
    let sin = SweepInput {
        text: &text,
        path: &a.case,
        overrides: &a.set,
        threads: a.threads,
    };
    let range = shard.map_or(0..spec.len(), |s| s.range(spec.len()));
    let cases = run::prepare(&sin, &spec, range.clone()).map_err(sweep_failure)?;
    // name, source and subtitle from the first combination of the whole sweep
    let first = match cases.first() {
        Some(c) if range.start == 0 => c.clone(),
        _ => run::combination_case(&sin, &spec, 0).map_err(sweep_failure)?,
    };
    for case in &cases {
        super::memory::check(&case.problem, &case.plan).map_err(|e| input(case.error_at(e)))?;
    }
    check_concurrent_memory(&cases, a.threads)?;
    let name = first.problem.name.clone();
    let source = kgain::report::case_identity(&first.problem);
    let owner = Owner {
        name: match shard {
            Some(s) => format!("{name} (sweep shard {}/{})", s.index, s.count),
            None => format!("{name} (sweep)"),
        },
        source: source.clone(),
    };
    let dest = Destination::claim(&a.out, owner, a.force).map_err(destination)?;
    let progress = bar(cases.len(), !a.quiet && std::io::stderr().is_terminal());
    let values =
        run::run(&sin, &spec, range.clone(), &cases, &|| progress.inc(1)).map_err(sweep_failure)?;
    progress.finish_and_clear();
    // the case's own value of each key: the text with the user's --set applied
    let base = kgain::case::apply_overrides(&text, "case", &a.set).unwrap_or_else(|_| text.clone());
    let case_values: Vec<Option<String>> = spec
        .axes
        .iter()
        .map(|ax| kgain::study::case_value(&base, &ax.key))
        .collect();
    let fingerprint = spec.fingerprint(&text, &a.set);
    let varied: Vec<&str> = spec.axes.iter().map(|x| x.key.as_str()).collect();
    let subtitle = format!(
        "{}  ·  varied: {}",
        kgain::report::plot::scheme_subtitle(&first.problem),
        varied.join(", ")
    );
    let extremes = dataset::extremes_text(&spec, range.start, &values);
    let written = match shard {
        Some(s) => {
            let data = ShardData {
                spec: spec.clone(),
                shard: s,
                case_name: name.clone(),
                case_source: source.clone(),
                fingerprint: fingerprint.clone(),
                case_values,
                subtitle,
                values,
            };
            commit(dest, &a.out, |dir| shard::write_shard_into(dir, &data))?
        }
        None => {
            let ds = Dataset {
                spec: &spec,
                case_name: &name,
                case_source: &source,
                fingerprint: &fingerprint,
                case_values: &case_values,
                subtitle: &subtitle,
                values: &values,
            };
            commit(dest, &a.out, |dir| dataset::write_into(dir, &ds))?
        }
    };
    Ok(format!(
        "kgain: sweep of {} over {} ({} of {} combinations{}) -> {}\n{extremes}",
        name,
        spec.axes
            .iter()
            .map(|x| x.key.as_str())
            .collect::<Vec<_>>()
            .join(", "),
        range.len(),
        spec.len(),
        shard.map_or(String::new(), |s| format!(
            ", shard {}/{}",
            s.index, s.count
        )),
        written.display()
    ))
}

/// With one combination per thread at a time, the largest combination's
/// single-thread estimate times the threads must fit in 80% of the memory.
fn check_concurrent_memory(cases: &[kgain::case::Case], threads: usize) -> Result<(), Failed> {
    let threads = if threads == 0 {
        super::memory::default_threads()
    } else {
        threads
    };
    if cases.len() < threads || threads < 2 {
        return Ok(()); // one combination at a time: checked one by one above
    }
    let each = cases
        .iter()
        .map(|c| c.plan.memory_estimate(&c.problem, 1))
        .max()
        .unwrap_or(0);
    let need = each * threads as u128;
    let avail = super::memory::available(threads);
    if need > avail.bytes as u128 * 4 / 5 {
        return Err(input(format!(
            "--threads {threads}: {threads} combinations at a time need about {need} bytes ({each} each), more than 80% of the {} bytes this process may use (set by the {}); use fewer threads or a smaller scan.points",
            avail.bytes, avail.source
        )));
    }
    Ok(())
}

fn sweep_failure(e: SweepError) -> Failed {
    Failed {
        input: e.is_input(),
        message: e.to_string(),
    }
}

fn commit<E: std::fmt::Display>(
    dest: Destination,
    out: &Path,
    write: impl FnOnce(&Path) -> Result<serde_json::Value, E>,
) -> Result<PathBuf, Failed> {
    dest.commit(write).map_err(|e| match e {
        CommitError::Write(e) => Failed {
            input: false,
            message: format!("{}: {e} (nothing was written)", out.display()),
        },
        CommitError::Destination(e) => destination(e),
    })
}

/// Runs `kgain merge`; returns the text to print.
pub fn merge(dirs: &[PathBuf], out: &Path, force: bool) -> Result<String, Failed> {
    let whole = shard::merge(dirs).map_err(input)?;
    let owner = Owner {
        name: format!("{} (sweep)", whole.case_name),
        source: whole.case_source.clone(),
    };
    let dest = Destination::claim(out, owner, force).map_err(destination)?;
    let ds = Dataset {
        spec: &whole.spec,
        case_name: &whole.case_name,
        case_source: &whole.case_source,
        fingerprint: &whole.fingerprint,
        case_values: &whole.case_values,
        subtitle: &whole.subtitle,
        values: &whole.values,
    };
    let written = commit(dest, out, |dir| dataset::write_into(dir, &ds))?;
    Ok(format!(
        "kgain: merged {} shard(s) of the sweep of {} ({} combinations) -> {}\n{}",
        dirs.len(),
        whole.case_name,
        whole.spec.len(),
        written.display(),
        dataset::extremes_text(&whole.spec, 0, &whole.values)
    ))
}
