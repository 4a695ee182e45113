//! Case files: TOML text → a [`Problem`], a [`Plan`] and the file they came
//! from, and nothing else. The text is read, `--set` overrides are applied to it
//! (format-preserving), the serde mirror checks structure and unknown keys, and
//! the problem builder and the plan check every value. Errors name the file, the
//! dotted key and, where the key can be found in the text, its line and column;
//! misspelt names get the nearest valid one as a hint.

mod convert;
mod keypath;
mod locate;
mod lowstorage;
mod plain;
pub mod probe;
mod rational;
mod raw;
mod read;

pub use locate::apply_overrides;
pub use read::case_text;

pub use read::MAX_BYTES;

use crate::analysis::Plan;
use crate::error::{nearest, InputError};
use crate::problem::Problem;
use std::path::{Path, PathBuf};

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
    /// Not a file one can read a case from: a folder, more than [`MAX_BYTES`],
    /// or nothing at all.
    #[error("{file}: {reason}")]
    Refused {
        /// The file.
        file: String,
        /// Why it is refused.
        reason: String,
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

/// A validated case: the problem, the plan and where they came from.
#[derive(Debug, Clone)]
pub struct Case {
    /// The problem (named after the case).
    pub problem: Problem,
    /// The analyses the case asks for.
    pub plan: Plan,
    /// The case file.
    pub file: PathBuf,
    /// Its text, after `--set` overrides.
    pub text: String,
}

impl Case {
    /// Reads, overrides and validates a case file.
    pub fn load(path: &Path, overrides: &[String]) -> Result<Case, CaseError> {
        let file = path.display().to_string();
        let text = read::case_text(path, &file)?;
        Self::from_str_with(&text, path, overrides)
    }

    /// Validates case text as if read from `path`.
    pub fn from_str_with(text: &str, path: &Path, overrides: &[String]) -> Result<Case, CaseError> {
        let file = path.display().to_string();
        let text = locate::apply_overrides(text, &file, overrides)?;
        let raw: raw::RawCase =
            toml::from_str(&text).map_err(|e| structure_error(&e, &file, &text))?;
        let located = |e: InputError| located(e, &file, &text);
        let problem = convert::builder(&raw, path)
            .and_then(|b| b.build())
            .map_err(located)?;
        let mut plan = convert::plan(&raw.scan, problem.dims()).map_err(located)?;
        if raw.scan.analyses.is_none() && problem.method.is_second_order() {
            // the default list includes dispersion, which second-order-in-time
            // methods do not have (a caution of every run says so)
            plan.dispersion = None;
        }
        plan.check(&problem).map_err(located)?;
        Ok(Case {
            problem,
            plan,
            file: path.to_path_buf(),
            text,
        })
    }

    /// An error about one key of this case (for checks made after loading),
    /// with the key's line and column.
    pub fn error_at(&self, e: InputError) -> CaseError {
        located(e, &self.file.display().to_string(), &self.text)
    }
}

/// A structure error of the reader (syntax, a wrong type, a missing or unknown
/// key) with its line and column, its dotted key and plain words.
fn structure_error(e: &toml::de::Error, file: &str, text: &str) -> CaseError {
    let offset = e.span().map(|s| s.start);
    let (line, col) = offset.map_or((1, 1), |o| locate::line_col(text, o));
    let raw = e.message().trim();
    let key = offset.and_then(|o| {
        keypath::path_at(text, o)
            .or_else(|| locate::open_value_key(text, o, raw))
            .or_else(|| locate::key_at(text, o))
    });
    let message = if let Some(rest) = raw.strip_prefix("missing field `") {
        let field = rest.split('`').next().unwrap_or("");
        // The error points at the table that lacks the field, or at the top.
        let (parent, written) = key
            .and_then(|k| keypath::keys_at(text, &k).map(|w| (k, w)))
            .unwrap_or_else(|| {
                (
                    String::new(),
                    keypath::keys_at(text, "").unwrap_or_default(),
                )
            });
        let full = match parent.as_str() {
            "" => field.to_string(),
            p => format!("{p}.{field}"),
        };
        let hint = written
            .iter()
            .find(|w| 2 * strsim::osa_distance(w, field) < field.len())
            .map(|w| format!(" (hint: `{w}` is written instead; did you mean `{field}`?)"))
            .unwrap_or_default();
        format!("key `{full}`: is required but missing{hint}")
    } else if let (Some(k), true) = (&key, raw.starts_with("unknown field")) {
        let parent = k
            .rsplit_once('.')
            .map_or("at the top level".to_string(), |p| format!("in [{}]", p.0));
        let words: Vec<&str> = raw.split('`').skip(1).step_by(2).collect();
        let (got, valid) = words.split_first().unwrap_or((&"", &[]));
        let hint = nearest(got, valid.iter().copied())
            .map(|n| format!(" (hint: did you mean `{n}`?)"))
            .unwrap_or_default();
        format!(
            "key `{k}`: unknown key {parent}; the keys there are {}{hint}",
            valid.join(", ")
        )
    } else if let Some(k) = &key {
        format!("key `{k}`: {}", plain::plain(raw, k))
    } else {
        raw.to_string()
    };
    CaseError::Syntax {
        file: file.to_string(),
        line,
        col,
        message,
    }
}

/// A keyed input error in the case file: with the key's line and column.
fn located(e: InputError, file: &str, text: &str) -> CaseError {
    CaseError::Invalid {
        file: file.to_string(),
        line: locate::key_position(text, &e.key),
        key: e.key,
        message: e.message,
        hint: e.hint,
    }
}
