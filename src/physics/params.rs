//! Model parameters as given by a user — numbers, texts and nested lists under
//! names — and a reader that turns them into typed values with keyed errors.
//!
//! A model's constructor asks for each key in the shape it needs (a positive
//! number, one number per axis, an m×m matrix, ...); every error names the key
//! as written in a case file (`model.flux.0.1.1`). Keys nobody asked for are
//! refused at the end, with the nearest valid key as a hint.

use crate::error::{finite, nearest, positive, InputError};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A parameter value: a number, a text, or a list of values.
#[derive(Debug, Clone, PartialEq)]
pub enum Value {
    /// A number.
    Number(f64),
    /// A text.
    Text(String),
    /// A list (vectors, matrices, lists of matrices; an entry [re, im] is complex).
    List(Vec<Value>),
}

impl From<f64> for Value {
    fn from(x: f64) -> Self {
        Value::Number(x)
    }
}

impl From<&str> for Value {
    fn from(s: &str) -> Self {
        Value::Text(s.to_string())
    }
}

impl<T: Into<Value>> From<Vec<T>> for Value {
    fn from(v: Vec<T>) -> Self {
        Value::List(v.into_iter().map(Into::into).collect())
    }
}

/// Named parameter values under a table (`model`), read key by key.
#[derive(Debug, Clone, Default)]
pub struct Params {
    entries: Vec<(String, Value)>,
}

impl Params {
    /// No parameters.
    pub fn new() -> Self {
        Params::default()
    }

    /// Adds `key = value`.
    pub fn with(mut self, key: &str, value: impl Into<Value>) -> Self {
        self.entries.push((key.to_string(), value.into()));
        self
    }

    /// The parameters, in the order given.
    pub fn entries(&self) -> &[(String, Value)] {
        &self.entries
    }
}

/// Reads [`Params`] under a table name, consuming each key it is asked for.
pub struct Reader {
    table: &'static str,
    kind: &'static str,
    left: Vec<(String, Value)>,
    allowed: Vec<&'static str>,
}

fn key_of(table: &str, key: &str) -> String {
    format!("{table}.{key}")
}

impl Reader {
    /// A reader of `params` for the model kind `kind`, under the table `table`,
    /// which accepts the keys `allowed`; any other key is refused at once.
    pub fn new(
        table: &'static str,
        kind: &'static str,
        params: &Params,
        allowed: &[&'static str],
    ) -> Result<Self, InputError> {
        let r = Reader {
            table,
            kind,
            left: params.entries.clone(),
            allowed: allowed.to_vec(),
        };
        r.refuse_unknown()?;
        Ok(r)
    }

    fn take(&mut self, key: &'static str) -> Option<Value> {
        debug_assert!(self.allowed.contains(&key), "key {key} not declared");
        let i = self.left.iter().position(|(k, _)| k == key)?;
        Some(self.left.remove(i).1)
    }

    /// An error at this table's `key`.
    pub fn error(&self, key: &str, message: impl Into<String>) -> InputError {
        InputError::new(key_of(self.table, key), message)
    }

    fn missing(&self, key: &str) -> InputError {
        self.error(key, format!("is required for model kind '{}'", self.kind))
    }

    /// A number, if given.
    pub fn number(&mut self, key: &'static str) -> Result<Option<f64>, InputError> {
        match self.take(key) {
            None => Ok(None),
            Some(v) => number(&key_of(self.table, key), &v).map(Some),
        }
    }

    /// A required number.
    pub fn required(&mut self, key: &'static str) -> Result<f64, InputError> {
        self.number(key)?.ok_or_else(|| self.missing(key))
    }

    /// A positive number, with a default.
    pub fn positive_or(&mut self, key: &'static str, default: f64) -> Result<f64, InputError> {
        positive(
            &key_of(self.table, key),
            self.number(key)?.unwrap_or(default),
        )
    }

    /// A required positive number.
    pub fn positive(&mut self, key: &'static str) -> Result<f64, InputError> {
        let x = self.required(key)?;
        positive(&key_of(self.table, key), x)
    }

    /// One finite number per axis, if given.
    pub fn per_axis(
        &mut self,
        key: &'static str,
        dims: usize,
    ) -> Result<Option<Vec<f64>>, InputError> {
        let k = key_of(self.table, key);
        match self.take(key) {
            None => Ok(None),
            Some(v) => numbers(&k, &v, Some(dims)).map(Some),
        }
    }

    /// One number, or one per axis (a single number applies to every axis).
    pub fn one_or_per_axis(
        &mut self,
        key: &'static str,
        dims: usize,
    ) -> Result<Option<Vec<f64>>, InputError> {
        let k = key_of(self.table, key);
        match self.take(key) {
            None => Ok(None),
            Some(Value::Number(x)) => Ok(Some(vec![finite(&k, x)?; dims])),
            Some(v) => numbers(&k, &v, Some(dims)).map(Some),
        }
    }

    /// A text, if given.
    pub fn text(&mut self, key: &'static str) -> Result<Option<String>, InputError> {
        match self.take(key) {
            None => Ok(None),
            Some(Value::Text(s)) => Ok(Some(s)),
            Some(_) => Err(self.error(key, "must be a text (a quoted name)")),
        }
    }

    /// A list of texts, if given.
    pub fn texts(&mut self, key: &'static str) -> Result<Option<Vec<String>>, InputError> {
        let k = key_of(self.table, key);
        match self.take(key) {
            None => Ok(None),
            Some(Value::List(items)) => items
                .into_iter()
                .enumerate()
                .map(|(i, v)| match v {
                    Value::Text(s) => Ok(s),
                    _ => Err(InputError::new(
                        format!("{k}.{i}"),
                        "must be a text (a quoted name)",
                    )),
                })
                .collect::<Result<Vec<_>, _>>()
                .map(Some),
            Some(_) => Err(InputError::new(
                k,
                "must be a list of names, e.g. [\"a\", \"b\"]",
            )),
        }
    }

    /// An n×n matrix of real or [re, im] entries, if given.
    pub fn matrix(
        &mut self,
        key: &'static str,
        n: usize,
    ) -> Result<Option<DMatrix<C64>>, InputError> {
        let k = key_of(self.table, key);
        match self.take(key) {
            None => Ok(None),
            Some(v) => matrix(&k, &v, n).map(Some),
        }
    }

    /// One n×n matrix per axis, if given.
    pub fn matrices(
        &mut self,
        key: &'static str,
        n: usize,
        dims: usize,
    ) -> Result<Option<Vec<DMatrix<C64>>>, InputError> {
        let k = key_of(self.table, key);
        match self.take(key) {
            None => Ok(None),
            Some(Value::List(items)) if items.len() == dims => items
                .iter()
                .enumerate()
                .map(|(d, m)| matrix(&format!("{k}.{d}"), m, n))
                .collect::<Result<Vec<_>, _>>()
                .map(Some),
            Some(Value::List(items)) => Err(InputError::new(
                k,
                format!(
                    "needs one {n}×{n} matrix per axis ({dims}), got {}",
                    items.len()
                ),
            )),
            Some(_) => Err(InputError::new(
                k,
                format!("needs one {n}×{n} matrix per axis ({dims})"),
            )),
        }
    }

    /// Refuses the first key that is not among the allowed ones.
    fn refuse_unknown(&self) -> Result<(), InputError> {
        let Some((key, _)) = self
            .left
            .iter()
            .find(|(k, _)| !self.allowed.contains(&k.as_str()))
        else {
            return Ok(());
        };
        let valid = self.allowed.join(", ");
        let e = self.error(key, format!("is not a key of model kind '{}'", self.kind));
        Err(match nearest(key, self.allowed.iter().copied()) {
            Some(n) => e.hint(format!(
                "did you mean `{n}`? keys of '{}': {valid}",
                self.kind
            )),
            None => e.hint(format!("keys of '{}': {valid}", self.kind)),
        })
    }
}

fn number(key: &str, v: &Value) -> Result<f64, InputError> {
    match v {
        Value::Number(x) => finite(key, *x),
        _ => Err(InputError::new(key, "must be a number")),
    }
}

fn numbers(key: &str, v: &Value, len: Option<usize>) -> Result<Vec<f64>, InputError> {
    let Value::List(items) = v else {
        return Err(InputError::new(key, "must be a list of numbers"));
    };
    if let Some(n) = len {
        if items.len() != n {
            return Err(InputError::new(
                key,
                format!(
                    "needs one value per axis ({n}, the length of grid.spacing), got {}",
                    items.len()
                ),
            ));
        }
    }
    items
        .iter()
        .enumerate()
        .map(|(i, x)| number(&format!("{key}.{i}"), x))
        .collect()
}

fn entry(key: &str, v: &Value) -> Result<C64, InputError> {
    match v {
        Value::Number(x) => Ok(C64::new(finite(key, *x)?, 0.0)),
        Value::List(p) if p.len() == 2 => {
            let re = number(key, &p[0])?;
            let im = number(key, &p[1])?;
            Ok(C64::new(re, im))
        }
        _ => Err(InputError::new(key, "must be a number or [re, im]")),
    }
}

fn matrix(key: &str, v: &Value, n: usize) -> Result<DMatrix<C64>, InputError> {
    let shape = || {
        InputError::new(
            key,
            format!("must be a {n}×{n} matrix (one row per variable)"),
        )
    };
    let Value::List(rows) = v else {
        return Err(shape());
    };
    if rows.len() != n {
        return Err(shape());
    }
    let mut out = DMatrix::zeros(n, n);
    for (i, row) in rows.iter().enumerate() {
        let Value::List(cols) = row else {
            return Err(shape());
        };
        if cols.len() != n {
            return Err(shape());
        }
        for (j, e) in cols.iter().enumerate() {
            out[(i, j)] = entry(&format!("{key}.{i}.{j}"), e)?;
        }
    }
    Ok(out)
}
