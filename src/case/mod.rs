//! Case files: reading, `--set` overrides, and the one conversion from the raw
//! TOML mirror to a validated [`Case`] in which every name is resolved.
//!
//! Errors name the file, the dotted key and, where the key can be found in the
//! text, its line and column; misspelt names get the nearest valid one as a hint.

mod locate;
mod model;
mod raw;
mod scheme;
mod suggest;
mod validate;

use crate::operator::Space;
use crate::physics::System;
use crate::time::Method;
use std::path::{Path, PathBuf};

pub use suggest::nearest;

/// An error in a case file or an override; rendered once by the binary (exit 2).
#[derive(Debug, thiserror::Error)]
pub enum CaseError {
    /// The file could not be read.
    #[error("{file}: cannot read the case file: {source}")]
    Read {
        /// The file.
        file: String,
        /// The cause.
        source: std::io::Error,
    },
    /// TOML syntax, a wrong type or an unknown key, as reported by the parser.
    #[error("{file}:{line}:{col}: {message}")]
    Syntax {
        /// The file.
        file: String,
        /// 1-based line.
        line: usize,
        /// 1-based column.
        col: usize,
        /// The parser's message.
        message: String,
    },
    /// A value that parses but is not valid.
    #[error("{file}{}: key `{key}`: {message}{}", at(.line), hint_text(.hint))]
    Invalid {
        /// The file.
        file: String,
        /// Dotted key.
        key: String,
        /// Line and column where known.
        line: Option<(usize, usize)>,
        /// What is wrong.
        message: String,
        /// How to fix it.
        hint: Option<String>,
    },
    /// A malformed `--set KEY=VALUE`.
    #[error("--set {spec}: {message}")]
    Override {
        /// The argument.
        spec: String,
        /// What is wrong.
        message: String,
    },
}

fn at(line: &Option<(usize, usize)>) -> String {
    line.map(|(l, c)| format!(":{l}:{c}")).unwrap_or_default()
}

fn hint_text(hint: &Option<String>) -> String {
    hint.as_ref()
        .map(|h| format!(" (hint: {h})"))
        .unwrap_or_default()
}

/// The time step as the case gives it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Step {
    /// Δt directly.
    Dt(f64),
    /// The Courant number ν = sΔt/h.
    Courant(f64),
}

/// Analyses a case can ask for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Analysis {
    /// Spectral radius map at the case's Δt.
    Radius,
    /// Largest stable Δt, overall and per direction.
    Limit,
    /// Non-normality and transient growth.
    Growth,
    /// Dispersion and dissipation by mode and direction.
    Dispersion,
}

/// Scan settings.
#[derive(Debug, Clone, PartialEq)]
pub struct Scan {
    /// Wavevector samples per axis.
    pub points: Vec<usize>,
    /// Number of wave directions.
    pub directions: usize,
    /// Transient-growth horizon (kept for later analyses).
    pub steps: usize,
    /// |λ| ≤ 1 + tolerance counts as stable.
    pub tolerance: f64,
    /// What to compute.
    pub analyses: Vec<Analysis>,
    /// How many amplification matrices to write for external cross-checks.
    pub matrices: usize,
    /// ε of the ε-pseudospectral radius.
    pub epsilon: f64,
    /// Norm weights given in the case (None: the model's energy-like defaults).
    pub weights: Option<Vec<f64>>,
    /// Phase-error tolerance of the resolution requirement (default 1%).
    pub phase_tolerance: f64,
}

/// A validated case: everything resolved, nothing left as a string to interpret.
#[derive(Debug, Clone)]
pub struct Case {
    /// Case name (the file stem unless given).
    pub name: String,
    /// Free text.
    pub description: Option<String>,
    /// The case file.
    pub file: PathBuf,
    /// Grid spacing per axis.
    pub spacing: Vec<f64>,
    /// The continuous system.
    pub system: System,
    /// The spatial scheme.
    pub space: Space,
    /// The time method.
    pub method: Method,
    /// The time step as given.
    pub step: Step,
    /// Scan settings.
    pub scan: Scan,
}

impl Case {
    /// Number of axes.
    pub fn dims(&self) -> usize {
        self.spacing.len()
    }

    /// Reference spacing h = min h_d.
    pub fn reference_spacing(&self) -> f64 {
        self.spacing.iter().copied().fold(f64::INFINITY, f64::min)
    }

    /// Δt of the case.
    pub fn dt(&self) -> f64 {
        match self.step {
            Step::Dt(dt) => dt,
            Step::Courant(nu) => nu * self.reference_spacing() / self.system.reference_speed,
        }
    }

    /// Courant number for a Δt (None when the reference speed is zero).
    pub fn courant_of(&self, dt: f64) -> Option<f64> {
        let s = self.system.reference_speed;
        (s > 0.0).then(|| s * dt / self.reference_spacing())
    }

    /// Diffusion number r = Δt D_max/h² for a Δt (None without diffusion).
    pub fn diffusion_number_of(&self, dt: f64) -> Option<f64> {
        let h = self.reference_spacing();
        self.system.diffusivity_max.map(|d| dt * d / (h * h))
    }

    /// Estimated bytes of memory the run needs (working values and outputs).
    pub fn memory_estimate(&self) -> u128 {
        validate::memory_estimate(
            &self.scan,
            self.system.size(),
            self.method.levels(),
            self.dims(),
        )
    }

    /// Reads, overrides and validates a case file.
    pub fn load(path: &Path, overrides: &[String]) -> Result<Case, CaseError> {
        let file = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|source| CaseError::Read {
            file: file.clone(),
            source,
        })?;
        Self::from_str_with(&text, path, overrides)
    }

    /// Validates case text as if read from `path`.
    pub fn from_str_with(text: &str, path: &Path, overrides: &[String]) -> Result<Case, CaseError> {
        let file = path.display().to_string();
        let text = locate::apply_overrides(text, &file, overrides)?;
        let raw: raw::RawCase = toml::from_str(&text).map_err(|e| {
            let (line, col) = e
                .span()
                .map(|s| locate::line_col(&text, s.start))
                .unwrap_or((1, 1));
            let message = e.message().trim().to_string();
            let key = e.span().and_then(|s| locate::key_at(&text, s.start));
            let message = match (key, message.strip_prefix("missing field `")) {
                (Some(k), Some(rest)) => {
                    let field = rest.split('`').next().unwrap_or("");
                    format!("key `{k}.{field}`: is required ({message})")
                }
                (Some(k), None) if message.starts_with("unknown field") => {
                    let parent = k
                        .rsplit_once('.')
                        .map_or("the top level".to_string(), |p| format!("[{}]", p.0));
                    let words: Vec<&str> = message.split('`').skip(1).step_by(2).collect();
                    let hint = words
                        .split_first()
                        .and_then(|(got, valid)| nearest(got, valid.iter().copied()))
                        .map(|n| format!(" (hint: did you mean `{n}`?)"))
                        .unwrap_or_default();
                    format!("key `{k}`: {message} in {parent}{hint}")
                }
                (Some(k), None) => format!("key `{k}`: {message}"),
                (None, _) => message,
            };
            CaseError::Syntax {
                file: file.clone(),
                line,
                col,
                message,
            }
        })?;
        validate::validate(raw, &text, path)
    }
}
