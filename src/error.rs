//! The error of an invalid input value, named by its dotted key.
//!
//! Every layer that checks what a user gave — model parameters, stencils, the
//! time method, the scan — reports a bad value as an [`InputError`]: the dotted
//! key as it would be written in a case file (`model.velocity.1`,
//! `space.first`), what is wrong, and how to fix it. The case-file layer adds
//! the file name and the key's line and column; a library caller sees the key.

/// An invalid input value.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("key `{key}`: {message}{}", hint.as_ref().map(|h| format!(" (hint: {h})")).unwrap_or_default())]
pub struct InputError {
    /// Dotted key, as in a case file.
    pub key: String,
    /// What is wrong.
    pub message: String,
    /// How to fix it.
    pub hint: Option<String>,
}

impl InputError {
    /// An error at `key`.
    pub fn new(key: impl Into<String>, message: impl Into<String>) -> Self {
        InputError {
            key: key.into(),
            message: message.into(),
            hint: None,
        }
    }

    /// The same error with a hint.
    pub fn hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }

    /// An unknown name among `valid`, with the nearest valid one as a hint.
    pub fn unknown(key: &str, what: &str, got: &str, valid: &[&str]) -> Self {
        let list = valid.join(", ");
        let e = InputError::new(key, format!("unknown {what} '{got}'"));
        match nearest(got, valid.iter().copied()) {
            Some(n) => e.hint(format!("did you mean '{n}'? valid: {list}")),
            None => e.hint(format!("valid: {list}")),
        }
    }
}

/// The candidate closest to `name` (optimal string alignment distance via
/// `strsim`, so a swap of two letters counts once), if it is close enough to be
/// a likely typo, or shares a long stem with it (`matrix` for `matrices`).
pub fn nearest<'a>(name: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    let lower = name.to_lowercase();
    candidates
        .into_iter()
        .map(|c| (strsim::osa_distance(&lower, c), c))
        .filter(|(d, c)| *d <= 2.max(c.len() / 3) || shares_stem(&lower, c))
        .min_by_key(|(d, _)| *d)
        .map(|(_, c)| c)
}

/// Whether `a` and `b` begin with the same five or more characters, making up
/// at least half of `b`.
fn shares_stem(a: &str, b: &str) -> bool {
    let common = a.chars().zip(b.chars()).take_while(|(x, y)| x == y).count();
    common >= 5 && 2 * common >= b.chars().count()
}

/// A finite number, or an error at `key`.
pub fn finite(key: &str, x: f64) -> Result<f64, InputError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(InputError::new(
            key,
            format!("must be a finite number, got {x}"),
        ))
    }
}

/// A positive finite number, or an error at `key`.
pub fn positive(key: &str, x: f64) -> Result<f64, InputError> {
    finite(key, x)?;
    if x > 0.0 {
        Ok(x)
    } else {
        Err(InputError::new(key, format!("must be positive, got {x}")))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn suggests_the_closest_name() {
        assert_eq!(nearest("rk5", ["rk4", "heun", "euler"]), Some("rk4"));
        assert_eq!(nearest("xyzzy", ["rk4", "heun"]), None);
        assert_eq!(nearest("sacn", ["space", "scan"]), Some("scan"));
        assert_eq!(nearest("matrix", ["steps", "matrices"]), Some("matrices"));
    }
}
