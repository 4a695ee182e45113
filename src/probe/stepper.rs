//! The time step being probed: anything that maps the state at t to the state
//! at t + Δt. [`Program`] runs the user's own program on NPY files (any
//! language); a Rust closure is a [`Stepper`] too, so the library probes
//! without files.
//!
//! Exchange with a program: the state is a float64 array of shape
//! [m, N1(, N2, N3)] in C order, written to `{input}`; the program writes the
//! state one step later to `{output}` in the same shape. The command is an
//! argument list (no shell) whose `{input}`, `{output}` and `{dt}` are
//! substituted, run in the case file's folder.

use ndarray::{ArrayD, Dimension, IxDyn};
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// Lines of the program's stderr kept for an error message.
const STDERR_TAIL_LINES: usize = 12;

/// Why a step could not be taken.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum StepError {
    /// The program could not be started, failed, timed out or wrote a wrong
    /// state.
    #[error("the probed program {command}: {what}{}", tail(.stderr))]
    Program {
        /// The command line, as run.
        command: String,
        /// What went wrong (with the exit code where there is one).
        what: String,
        /// The last lines of its stderr.
        stderr: String,
    },
}

fn tail(stderr: &str) -> String {
    if stderr.trim().is_empty() {
        " (its stderr was empty)".into()
    } else {
        format!("; the end of its stderr:\n{}", stderr.trim_end())
    }
}

/// One time step of a linear (or linearised) translation-invariant scheme.
pub trait Stepper {
    /// The state `dt` later; `state` has shape [m, N1(, N2, N3)].
    fn step(&mut self, state: &ArrayD<f64>, dt: f64) -> Result<ArrayD<f64>, StepError>;
    /// Steps taken so far.
    fn runs(&self) -> usize;
}

/// A Rust function as a stepper.
pub struct FnStepper<F> {
    f: F,
    runs: usize,
}

impl<F: FnMut(&ArrayD<f64>, f64) -> ArrayD<f64>> FnStepper<F> {
    /// Wraps `f(state, dt)`.
    pub fn new(f: F) -> Self {
        FnStepper { f, runs: 0 }
    }
}

impl<F: FnMut(&ArrayD<f64>, f64) -> ArrayD<f64>> Stepper for FnStepper<F> {
    fn step(&mut self, state: &ArrayD<f64>, dt: f64) -> Result<ArrayD<f64>, StepError> {
        self.runs += 1;
        Ok((self.f)(state, dt))
    }
    fn runs(&self) -> usize {
        self.runs
    }
}

/// The user's program, run once per step.
pub struct Program {
    /// The argument list with placeholders.
    pub command: Vec<String>,
    /// Folder the program runs in (the case file's).
    pub folder: PathBuf,
    /// Longest one run may take.
    pub timeout: Duration,
    /// Private folder for the exchange files (created on first use, removed
    /// on drop).
    scratch: Option<PathBuf>,
    runs: usize,
}

impl Program {
    /// A program run in `folder` with a per-run `timeout`.
    pub fn new(command: Vec<String>, folder: &Path, timeout: Duration) -> Program {
        Program {
            command,
            folder: folder.to_path_buf(),
            timeout,
            scratch: None,
            runs: 0,
        }
    }

    fn scratch(&mut self) -> std::io::Result<PathBuf> {
        if let Some(s) = &self.scratch {
            return Ok(s.clone());
        }
        let nanos = std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map_or(0, |d| d.subsec_nanos());
        let dir =
            std::env::temp_dir().join(format!("kgain-probe-{}-{nanos:09}", std::process::id()));
        std::fs::create_dir(&dir)?;
        self.scratch = Some(dir.clone());
        Ok(dir)
    }

    /// The argument list with `{input}`, `{output}` and `{dt}` substituted.
    pub fn arguments(&self, input: &Path, output: &Path, dt: f64) -> Vec<String> {
        self.command
            .iter()
            .map(|a| {
                a.replace("{input}", &input.display().to_string())
                    .replace("{output}", &output.display().to_string())
                    .replace("{dt}", &format!("{dt:?}"))
            })
            .collect()
    }

    fn fail(&self, args: &[String], what: String, stderr: String) -> StepError {
        StepError::Program {
            command: args.join(" "),
            what,
            stderr,
        }
    }
}

impl Drop for Program {
    fn drop(&mut self) {
        if let Some(dir) = self.scratch.take() {
            // only the two exchange files kgain wrote, then the folder it made
            for f in ["input.npy", "output.npy"] {
                let _ = std::fs::remove_file(dir.join(f));
            }
            let _ = std::fs::remove_dir(&dir);
        }
    }
}

/// The last [`STDERR_TAIL_LINES`] lines of `text`.
fn last_lines(text: &str) -> String {
    let lines: Vec<&str> = text.lines().collect();
    lines[lines.len().saturating_sub(STDERR_TAIL_LINES)..].join("\n")
}

impl Stepper for Program {
    fn step(&mut self, state: &ArrayD<f64>, dt: f64) -> Result<ArrayD<f64>, StepError> {
        self.runs += 1;
        let dir = self.scratch().map_err(|e| {
            self.fail(
                &self.command,
                format!("cannot create a folder for the exchange files: {e}"),
                String::new(),
            )
        })?;
        let (input, output) = (dir.join("input.npy"), dir.join("output.npy"));
        let _ = std::fs::remove_file(&output);
        let args = self.arguments(&input, &output, dt);
        ndarray_npy::write_npy(&input, state).map_err(|e| {
            self.fail(
                &args,
                format!("cannot write its input {}: {e}", input.display()),
                String::new(),
            )
        })?;
        let (program, rest) = args
            .split_first()
            .ok_or_else(|| self.fail(&args, "the command is empty".into(), String::new()))?;
        let mut child = Command::new(program)
            .args(rest)
            .current_dir(&self.folder)
            .stdin(Stdio::null())
            .stdout(Stdio::null())
            .stderr(Stdio::piped())
            .spawn()
            .map_err(|e| self.fail(&args, format!("cannot be started: {e}"), String::new()))?;
        let mut pipe = child.stderr.take().expect("stderr is piped");
        let reader = std::thread::spawn(move || {
            let mut buf = Vec::new();
            let _ = pipe.read_to_end(&mut buf);
            String::from_utf8_lossy(&buf).into_owned()
        });
        let start = Instant::now();
        let status = loop {
            match child.try_wait() {
                Ok(Some(status)) => break Ok(status),
                Ok(None) if start.elapsed() > self.timeout => {
                    let _ = child.kill();
                    let _ = child.wait();
                    break Err(format!(
                        "did not finish within probe.timeout = {} s and was stopped",
                        self.timeout.as_secs_f64()
                    ));
                }
                Ok(None) => std::thread::sleep(Duration::from_millis(2)),
                Err(e) => break Err(format!("could not be waited for: {e}")),
            }
        };
        let stderr = last_lines(&reader.join().unwrap_or_default());
        let status = status.map_err(|what| self.fail(&args, what, stderr.clone()))?;
        if !status.success() {
            let what = match status.code() {
                Some(c) => format!("exited with code {c}"),
                None => "was ended by a signal".into(),
            };
            return Err(self.fail(&args, what, stderr));
        }
        let out: ArrayD<f64> = ndarray_npy::read_npy(&output).map_err(|e| {
            self.fail(
                &args,
                format!(
                    "did not write a float64 NPY array to {{output}} ({}): {e}",
                    output.display()
                ),
                stderr.clone(),
            )
        })?;
        if out.shape() != state.shape() {
            return Err(self.fail(
                &args,
                format!(
                    "wrote an array of shape {:?}; the state has shape {:?} ([variables, cells...])",
                    out.shape(),
                    state.shape()
                ),
                stderr,
            ));
        }
        if let Some(at) = out.indexed_iter().find(|(_, x)| !x.is_finite()) {
            return Err(self.fail(
                &args,
                format!(
                    "wrote a non-finite value {} at index {:?}",
                    at.1,
                    at.0.slice()
                ),
                stderr,
            ));
        }
        Ok(out.into_dyn())
    }

    fn runs(&self) -> usize {
        self.runs
    }
}

/// A uniform state: variable i equal to `base[i]` in every cell.
pub fn uniform(base: &[f64], cells: &[usize]) -> ArrayD<f64> {
    let mut shape = vec![base.len()];
    shape.extend_from_slice(cells);
    let mut a = ArrayD::zeros(IxDyn(&shape));
    for (i, mut row) in a.outer_iter_mut().enumerate() {
        row.fill(base[i]);
    }
    a
}
