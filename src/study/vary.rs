//! One varied case key of a sweep, from its command-line form:
//!
//! * `KEY=v1,v2,...` — the listed values, each a number when it reads as one and
//!   text otherwise (`time.method=rk4,ssprk3`);
//! * `KEY=start:stop:count` — `count` evenly spaced numbers from `start` to
//!   `stop`, both included (`model.mach=0:0.9:10`).
//!
//! KEY is a dotted case key as for `--set`, optionally ending in `[i]` for
//! element i (from 0) of an array the case file already holds
//! (`model.velocity[0]=0:30:7`).

/// Most values one key may take.
pub const MAX_LEVELS: usize = 10_000;

/// One value of a varied key.
#[derive(Debug, Clone, PartialEq)]
pub enum Level {
    /// A number, with the text written into the case (as typed for listed
    /// values, so integers stay integers).
    Number(f64, String),
    /// Text (a name such as a method or stencil).
    Text(String),
}

impl Level {
    /// The value as TOML for the override.
    pub fn toml(&self) -> String {
        match self {
            Level::Number(_, text) => text.clone(),
            Level::Text(t) => toml_edit::Value::from(t.as_str()).to_string(),
        }
    }

    /// The value as shown in tables and coordinates.
    pub fn label(&self) -> String {
        match self {
            Level::Number(_, text) => text.clone(),
            Level::Text(t) => t.clone(),
        }
    }

    /// The number, if it is one.
    pub fn number(&self) -> Option<f64> {
        match self {
            Level::Number(x, _) => Some(*x),
            Level::Text(_) => None,
        }
    }
}

/// A varied key and its values, in the order given.
#[derive(Debug, Clone, PartialEq)]
pub struct Axis {
    /// The dotted key, e.g. `model.velocity[0]`.
    pub key: String,
    /// Its values.
    pub levels: Vec<Level>,
}

impl Axis {
    /// Whether every value is a number.
    pub fn numeric(&self) -> bool {
        self.levels.iter().all(|l| l.number().is_some())
    }
}

/// Why a `--vary` argument was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("--vary '{arg}': {why}")]
pub struct VaryError {
    /// The argument as given.
    pub arg: String,
    /// What is wrong, and the expected form.
    pub why: String,
}

/// Parses one `--vary` argument.
pub fn parse(arg: &str) -> Result<Axis, VaryError> {
    let bad = |why: String| VaryError {
        arg: arg.to_string(),
        why,
    };
    let form = "expected KEY=v1,v2,... or KEY=start:stop:count, e.g. model.mach=0:0.9:10";
    let (key, values) = arg.split_once('=').ok_or_else(|| bad(form.into()))?;
    let key = key.trim();
    check_key(key).map_err(|why| bad(format!("{why}; {form}")))?;
    let values = values.trim();
    if values.is_empty() {
        return Err(bad(format!("no values; {form}")));
    }
    let levels = if values.contains(':') && !values.contains(',') {
        range(values).map_err(bad)?
    } else {
        list(values).map_err(bad)?
    };
    if levels.len() > MAX_LEVELS {
        return Err(bad(format!("at most {MAX_LEVELS} values per key")));
    }
    Ok(Axis {
        key: key.to_string(),
        levels,
    })
}

fn check_key(key: &str) -> Result<(), String> {
    let parts: Vec<&str> = key.split('.').collect();
    if parts.len() < 2 || parts.iter().any(|p| p.is_empty()) {
        return Err(format!(
            "'{key}' is not a dotted case key such as time.courant"
        ));
    }
    for (i, p) in parts.iter().enumerate() {
        let name = match p.split_once('[') {
            Some((name, rest)) => {
                let ok = i == parts.len() - 1
                    && rest
                        .strip_suffix(']')
                        .is_some_and(|n| !n.is_empty() && n.bytes().all(|b| b.is_ascii_digit()));
                if !ok {
                    return Err(format!(
                        "'{p}': an array element is written NAME[i] with i a number from 0, at the end of the key"
                    ));
                }
                name
            }
            None => p,
        };
        if name.is_empty()
            || !name
                .bytes()
                .all(|b| b.is_ascii_alphanumeric() || b == b'_' || b == b'-')
        {
            return Err(format!("'{p}' is not a key name"));
        }
    }
    Ok(())
}

fn finite(text: &str) -> Option<f64> {
    text.parse::<f64>().ok().filter(|x| x.is_finite())
}

fn list(values: &str) -> Result<Vec<Level>, String> {
    let mut out = Vec::new();
    for v in values.split(',') {
        let v = v.trim();
        if v.is_empty() {
            return Err("an empty value in the list (two commas, or a trailing comma)".into());
        }
        let unquoted = v
            .strip_prefix('"')
            .and_then(|t| t.strip_suffix('"'))
            .map(str::to_string);
        out.push(match (unquoted, finite(v)) {
            (Some(t), _) => Level::Text(t),
            (None, Some(x)) => Level::Number(x, v.to_string()),
            (None, None) => Level::Text(v.to_string()),
        });
    }
    let mut seen = std::collections::HashSet::new();
    for l in &out {
        if !seen.insert(l.label()) {
            return Err(format!("'{}' is listed twice", l.label()));
        }
    }
    Ok(out)
}

fn range(values: &str) -> Result<Vec<Level>, String> {
    let parts: Vec<&str> = values.split(':').map(str::trim).collect();
    let [start, stop, count] = parts[..] else {
        return Err("a range is start:stop:count, three fields".into());
    };
    let a = finite(start).ok_or_else(|| format!("start '{start}' is not a finite number"))?;
    let b = finite(stop).ok_or_else(|| format!("stop '{stop}' is not a finite number"))?;
    let n: usize = count
        .parse()
        .ok()
        .filter(|n| *n >= 1)
        .ok_or_else(|| format!("count '{count}' must be a whole number >= 1"))?;
    if n > MAX_LEVELS {
        return Err(format!("at most {MAX_LEVELS} values per key"));
    }
    if n == 1 && a != b {
        return Err("count 1 needs start = stop".into());
    }
    let integers = [start, stop].iter().all(|t| t.parse::<i64>().is_ok());
    let mut out = Vec::with_capacity(n);
    for i in 0..n {
        let x = if n == 1 {
            a
        } else if i == n - 1 {
            b
        } else {
            a + (b - a) * i as f64 / (n - 1) as f64
        };
        let text = if integers && x.fract() == 0.0 && x.abs() < 9.0e15 {
            format!("{}", x as i64)
        } else {
            format!("{x:?}")
        };
        out.push(Level::Number(x, text));
    }
    if integers && out.windows(2).any(|w| w[0].label() == w[1].label()) {
        return Err("the range repeats values".into());
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ranges_include_both_ends_and_lists_keep_their_text() {
        let a = parse("model.mach=0:0.9:10").unwrap();
        assert_eq!(a.levels.len(), 10);
        assert_eq!(a.levels[0].number(), Some(0.0));
        assert_eq!(a.levels[9].number(), Some(0.9));
        assert_eq!(a.levels[1].toml(), "0.1");
        let m = parse("time.method=rk4,ssprk3").unwrap();
        assert_eq!(
            m.levels,
            vec![Level::Text("rk4".into()), Level::Text("ssprk3".into())]
        );
        assert_eq!(m.levels[0].toml(), "\"rk4\"");
        let p = parse("scan.points=33:129:4").unwrap();
        let t: Vec<String> = p.levels.iter().map(Level::toml).collect();
        assert_eq!(t, ["33", "65", "97", "129"]);
        let v = parse("model.velocity[1]=1e-3,2").unwrap();
        assert_eq!(v.levels[0].toml(), "1e-3");
        assert!(v.numeric());
    }

    #[test]
    fn bad_arguments_name_themselves() {
        for bad in [
            "model.mach",
            "mach=0:1:3",
            "model.mach=",
            "model.mach=0:1",
            "model.mach=0:1:0",
            "model.mach=0:x:3",
            "model.mach=1,,2",
            "model.mach=1,1",
            "model.velocity[a]=1",
            "model.velocity[0].x=1",
            "model.mach=0:1:99999999",
        ] {
            let e = parse(bad).unwrap_err();
            assert!(e.to_string().starts_with(&format!("--vary '{bad}'")), "{e}");
        }
    }
}
