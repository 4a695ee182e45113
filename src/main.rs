//! The `kgain` command line: parses arguments, calls the library, renders errors
//! once and maps them to exit codes (0 ok, 1 other failure, 2 invalid case or
//! arguments, 3 unstable with --require-stable or short of --require-margin, with
//! a one-line JSON verdict on stderr). Progress bars, the memory
//! pre-flight and the thread policy live here ([`cli`]), not in the library.

mod cli;

use clap::{Parser, Subcommand, ValueEnum};
use kgain::analysis::analyse;
use kgain::case::Case;
use kgain::destination::{CommitError, Destination, DestinationError};
use kgain::report;
use kgain::sample::Par;
use std::io::{IsTerminal, Write};
use std::path::PathBuf;
use std::process::ExitCode;

#[derive(Parser, Debug)]
#[command(
    name = "kgain",
    version,
    about = "Fourier stability and dispersion analysis of grid-based PDE schemes"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Run every analysis the case asks for and write the output folder.
    Run {
        /// The case file (TOML).
        case: PathBuf,
        /// Output folder (default: output/<name>/).
        #[arg(long)]
        out: Option<PathBuf>,
        /// Override a key by its dotted path, e.g. --set time.courant=0.9 (repeatable).
        #[arg(long = "set", value_name = "KEY=VALUE")]
        set: Vec<String>,
        /// Worker threads (default: one per core).
        #[arg(long)]
        threads: Option<usize>,
        /// Print nothing on success, show no progress.
        #[arg(long)]
        quiet: bool,
        /// Replace an existing output folder.
        #[arg(long)]
        force: bool,
        /// Exit with status 3 when the scheme is unstable at the case's time step.
        #[arg(long)]
        require_stable: bool,
        /// Exit with status 3 unless dt <= F x dt_max (F in (0, 1], e.g. 0.8);
        /// needs the limit analysis.
        #[arg(long, value_name = "F", value_parser = cli::verdict::parse_margin)]
        require_margin: Option<f64>,
        /// Print summary.json on stdout instead of the table.
        #[arg(long)]
        json: bool,
    },
    /// Validate a case and print the assembled problem; compute nothing heavy.
    Check {
        /// The case file (TOML).
        case: PathBuf,
        /// Override a key by its dotted path (repeatable).
        #[arg(long = "set", value_name = "KEY=VALUE")]
        set: Vec<String>,
    },
    /// Sweep case keys over values (a Cartesian product) and record summary
    /// figures per combination as NPY arrays, a CSV table and charts.
    Sweep {
        /// The case file (TOML).
        case: PathBuf,
        /// A varied key: KEY=v1,v2,... or KEY=start:stop:count; KEY may end in [i]
        /// for element i of an array (repeatable; the product of all is run).
        #[arg(long, value_name = "KEY=VALUES", required = true)]
        vary: Vec<String>,
        /// Summary keys recorded per combination, comma separated (default:
        /// limit.courant_max,limit.dt_max,radius.max,growth.max_norm,limit.physical_direction_deg).
        #[arg(long, value_name = "KEYS")]
        figures: Option<String>,
        /// Override a key for every combination (repeatable).
        #[arg(long = "set", value_name = "KEY=VALUE")]
        set: Vec<String>,
        /// Run only the I-th of N slices and write a shard folder for `kgain merge`.
        #[arg(long, value_name = "I/N")]
        shard: Option<String>,
        /// Output folder.
        #[arg(long)]
        out: PathBuf,
        /// Worker threads (default: one per core).
        #[arg(long)]
        threads: Option<usize>,
        /// Print nothing on success, show no progress.
        #[arg(long)]
        quiet: bool,
        /// Replace a kgain output folder of another case.
        #[arg(long)]
        force: bool,
    },
    /// Merge the shard folders of one sweep into the whole sweep's output.
    Merge {
        /// The shard folders (every shard of the sweep, any order).
        #[arg(required = true)]
        shards: Vec<PathBuf>,
        /// Output folder.
        #[arg(long)]
        out: PathBuf,
        /// Print nothing on success.
        #[arg(long)]
        quiet: bool,
        /// Replace a kgain output folder of another case.
        #[arg(long)]
        force: bool,
    },
    /// Probe a real solver's time-step program (see `kgain run` on a case with a
    /// [probe] table).
    Probe {
        #[command(subcommand)]
        what: ProbeCommand,
    },
    /// List built-in models, stencils and time methods.
    List {
        /// What to list (default: everything).
        what: Option<ListWhat>,
    },
}

#[derive(Subcommand, Debug)]
enum ProbeCommand {
    /// Compare the probed amplification matrices with those of a case file
    /// describing the intended scheme, on the probe's wavevectors and dt; exit 0
    /// when they agree within the tolerance, 1 when they do not.
    Compare {
        /// The probe case (TOML with a [probe] table).
        probe_case: PathBuf,
        /// The case file of the intended scheme.
        case: PathBuf,
        /// Largest difference accepted, relative to max |G|.
        #[arg(long, default_value_t = 1e-8)]
        tolerance: f64,
        /// Override a key of the probe case (repeatable).
        #[arg(long = "set", value_name = "KEY=VALUE")]
        set: Vec<String>,
    },
}

#[derive(ValueEnum, Clone, Copy, Debug)]
enum ListWhat {
    Models,
    Stencils,
    Methods,
}

/// More worker threads than this are refused: they only cost start-up time.
const MAX_THREADS: usize = 1024;

enum Failure {
    Input(String),
    Other(String),
    /// A failed --require-stable or --require-margin, with its verdict line.
    Unstable(String),
}

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    match run(cli) {
        Ok(()) => ExitCode::SUCCESS,
        Err(Failure::Unstable(line)) => {
            say(&line);
            ExitCode::from(3)
        }
        Err(Failure::Input(m)) => {
            say(&format!("kgain: error: {m}"));
            ExitCode::from(2)
        }
        Err(Failure::Other(m)) => {
            say(&format!("kgain: error: {m}"));
            ExitCode::from(1)
        }
    }
}

/// One line on stderr; a closed or full stderr is ignored (the exit code still
/// tells), never a panic.
fn say(line: &str) {
    let _ = writeln!(std::io::stderr(), "{line}");
}

/// A refused destination is the user's to fix (exit 2); anything else exit 1.
fn destination(e: DestinationError) -> Failure {
    if e.is_refusal() {
        Failure::Input(e.to_string())
    } else {
        Failure::Other(e.to_string())
    }
}

/// `--threads`: at least 1 and at most [`MAX_THREADS`]; 0 (one per core) when
/// not given.
fn thread_count(threads: Option<usize>) -> Result<usize, Failure> {
    match threads {
        Some(0) => Err(Failure::Input("--threads must be at least 1".into())),
        Some(n) if n > MAX_THREADS => Err(Failure::Input(format!(
            "--threads {n}: at most {MAX_THREADS} worker threads"
        ))),
        Some(n) => Ok(n),
        None => Ok(0),
    }
}

fn failed(f: cli::sweep::Failed) -> Failure {
    if f.input {
        Failure::Input(f.message)
    } else {
        Failure::Other(f.message)
    }
}

/// Writes to stdout; a closed pipe is a normal end.
fn emit(text: &str) {
    let mut out = std::io::stdout().lock();
    let _ = out.write_all(text.as_bytes());
    let _ = out.flush();
}

fn run(cli: Cli) -> Result<(), Failure> {
    match cli.command {
        Command::List { what } => {
            let text = match what {
                Some(ListWhat::Models) => kgain::describe::list_models(),
                Some(ListWhat::Stencils) => kgain::describe::list_stencils(),
                Some(ListWhat::Methods) => kgain::describe::list_methods(),
                None => format!(
                    "{}\n{}\n{}",
                    kgain::describe::list_models(),
                    kgain::describe::list_stencils(),
                    kgain::describe::list_methods()
                ),
            };
            emit(&text);
            Ok(())
        }
        Command::Sweep {
            case,
            vary,
            figures,
            set,
            shard,
            out,
            threads,
            quiet,
            force,
        } => {
            let threads = thread_count(threads)?;
            let text = cli::sweep::sweep(cli::sweep::SweepArgs {
                case,
                vary,
                figures,
                set,
                shard,
                out,
                threads,
                quiet,
                force,
            })
            .map_err(failed)?;
            if !quiet {
                emit(&text);
            }
            Ok(())
        }
        Command::Merge {
            shards,
            out,
            quiet,
            force,
        } => {
            let text = cli::sweep::merge(&shards, &out, force).map_err(failed)?;
            if !quiet {
                emit(&text);
            }
            Ok(())
        }
        Command::Probe {
            what:
                ProbeCommand::Compare {
                    probe_case,
                    case,
                    tolerance,
                    set,
                },
        } => {
            let (text, same) =
                cli::probe::compare(&probe_case, &case, &set, tolerance).map_err(failed)?;
            emit(&text);
            if same {
                Ok(())
            } else {
                Err(Failure::Other(format!(
                    "{}: the probed matrices differ from those of {}",
                    probe_case.display(),
                    case.display()
                )))
            }
        }
        Command::Check { case, set } => {
            let text = kgain::case::case_text(&case, &case.display().to_string())
                .map_err(|e| Failure::Input(e.to_string()))?;
            if kgain::case::probe::is_probe(&text) {
                let pc = kgain::case::probe::ProbeCase::from_str_with(&text, &case, &set)
                    .map_err(|e| Failure::Input(e.to_string()))?;
                emit(&kgain::describe::check_probe(&pc));
                return Ok(());
            }
            let case = Case::from_str_with(&text, &case, &set)
                .map_err(|e| Failure::Input(e.to_string()))?;
            emit(&kgain::describe::check(&case));
            Ok(())
        }
        Command::Run {
            case,
            out,
            set,
            threads,
            quiet,
            force,
            require_stable,
            require_margin,
            json,
        } => {
            let text = kgain::case::case_text(&case, &case.display().to_string())
                .map_err(|e| Failure::Input(e.to_string()))?;
            if kgain::case::probe::is_probe(&text) {
                let pc = kgain::case::probe::ProbeCase::from_str_with(&text, &case, &set)
                    .map_err(|e| Failure::Input(e.to_string()))?;
                let threads = thread_count(threads)?;
                let out = out.unwrap_or_else(|| PathBuf::from("output").join(&pc.name));
                let end = cli::probe::run(cli::probe::ProbeRunArgs {
                    case: &pc,
                    threads,
                    out,
                    quiet,
                    force,
                    json,
                    require_stable,
                    require_margin,
                })
                .map_err(failed)?;
                return match end {
                    cli::probe::ProbeEnd::Done(t) => {
                        emit(&t);
                        Ok(())
                    }
                    cli::probe::ProbeEnd::Gate(t, line) => {
                        emit(&t);
                        Err(Failure::Unstable(line))
                    }
                    cli::probe::ProbeEnd::ChecksFailed(t, m) => {
                        emit(&t);
                        Err(Failure::Other(m))
                    }
                };
            }
            let case = Case::from_str_with(&text, &case, &set)
                .map_err(|e| Failure::Input(e.to_string()))?;
            let gate = cli::verdict::Gate {
                stable: require_stable,
                margin: require_margin,
            };
            if gate.margin.is_some() && case.plan.limit.is_none() {
                return Err(Failure::Input(format!(
                    "{}: --require-margin needs the limit analysis; add \"limit\" to scan.analyses",
                    case.file.display()
                )));
            }
            let par = Par::Threads(thread_count(threads)?);
            let need = cli::memory::check(&case.problem, &case.plan)
                .map_err(|e| Failure::Input(case.error_at(e).to_string()))?;
            let out = out.unwrap_or_else(|| PathBuf::from("output").join(&case.problem.name));
            let dest = Destination::claim(&out, report::owner(&case.problem), force)
                .map_err(destination)?;
            if !quiet && need > 512 << 20 {
                say(&format!(
                    "kgain: this scan needs about {:.1} GiB of memory",
                    need as f64 / (1u64 << 30) as f64
                ));
            }
            let bars = cli::progress::Bars::new(!quiet && std::io::stderr().is_terminal());
            let results = analyse(&case.problem, &case.plan, par, &bars)
                .map_err(|e| Failure::Input(format!("{}: {e}", case.file.display())))?;
            if let Some(bad) = results.non_finite.first() {
                let theta: Vec<String> =
                    bad.wavevector.iter().map(|x| format!("{x:+.6}")).collect();
                return Err(Failure::Other(format!(
                    "{}: the {} could not be computed at {} wavevector(s), the first at theta = ({}); no result is reported and nothing was written",
                    case.file.display(),
                    bad.quantity,
                    bad.count,
                    theta.join(", ")
                )));
            }
            // the table's results go out while the arrays and pictures are
            // written; the output row and the cautions once the folder is in place
            let table = !json && !quiet;
            if table {
                emit(&report::human_summary_parts(&case.problem, &results, None).0);
            }
            // the writing runs on the same number of threads as the analyses
            let written = par
                .run(|| dest.commit(|dir| report::write_into(dir, &case.problem, &results)))
                .map_err(|e| match e {
                    CommitError::Write(e) => Failure::Other(e.to_string()),
                    CommitError::Destination(e) => destination(e),
                })?;
            if json {
                let s = report::summary_json(&case.problem, &results);
                emit(&(serde_json::to_string_pretty(&s).expect("JSON serialises") + "\n"));
            } else if table {
                emit(&report::human_summary_parts(&case.problem, &results, Some(&written)).1);
            }
            if let Some(line) = gate
                .active()
                .then(|| cli::verdict::failure(gate, &results))
                .flatten()
            {
                return Err(Failure::Unstable(line));
            }
            Ok(())
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    #[test]
    fn command_definition_is_valid() {
        Cli::command().debug_assert();
    }
}
