//! Positions of keys in the case text, and `--set` overrides applied to the text
//! itself (format-preserving), so that line numbers of untouched keys still hold.

use super::CaseError;
use toml_edit::{DocumentMut, Item, Value};

/// 1-based line and column of a byte offset.
pub fn line_col(text: &str, offset: usize) -> (usize, usize) {
    let before = &text[..offset.min(text.len())];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
    (line, col)
}

/// Line and column of the value at a dotted key (or of its nearest present parent).
pub fn key_position(text: &str, dotted: &str) -> Option<(usize, usize)> {
    let doc = toml_edit::Document::parse(text).ok()?;
    let mut item: &Item = doc.as_item();
    let mut best = None;
    for part in dotted.split('.') {
        let next = match part.parse::<usize>() {
            Ok(i) => item.get(i),
            Err(_) => item.get(part),
        };
        let Some(next) = next else { break };
        item = next;
        if let Some(span) = item.span() {
            best = Some(span.start);
        } else if let Some(t) = item.as_table() {
            best = t.span().map(|s| s.start).or(best);
        }
    }
    best.map(|o| line_col(text, o))
}

/// The dotted key written on the line holding byte `offset`: the `key =` at the
/// start of that line under the nearest `[table]` header above it, or the header
/// itself when the line is one.
pub fn key_at(text: &str, offset: usize) -> Option<String> {
    let offset = offset.min(text.len());
    let start = text[..offset].rfind('\n').map_or(0, |i| i + 1);
    let line = text[start..].lines().next().unwrap_or("");
    let header = |l: &str| {
        let t = l.trim();
        (t.starts_with('[') && !t.starts_with("[[")).then(|| {
            t.trim_start_matches('[')
                .split(']')
                .next()
                .unwrap_or("")
                .trim()
                .to_string()
        })
    };
    if let Some(h) = header(line) {
        return Some(h);
    }
    // `key = value`, or a key whose `=` is missing (`courant 1.2`).
    let key = match line.split_once('=') {
        Some((k, _)) => k.trim().trim_matches('"').to_string(),
        None => line
            .split_whitespace()
            .next()
            .filter(|w| w.starts_with(|c: char| c.is_alphabetic()))
            .unwrap_or("")
            .to_string(),
    };
    let key = Some(key)
        .filter(|k| !k.is_empty() && k.chars().all(|c| c.is_alphanumeric() || "_-.".contains(c)))?;
    let table = text[..start].lines().rev().find_map(header);
    Some(match table {
        Some(t) => format!("{t}.{key}"),
        None => key,
    })
}

/// The key of a list or inline table left open: for a syntax error about one
/// that is found at the start of a line, the last `key =` line above it.
pub fn open_value_key(text: &str, offset: usize, message: &str) -> Option<String> {
    let offset = offset.min(text.len());
    let start = text[..offset].rfind('\n').map_or(0, |i| i + 1);
    let about_value = message.contains("array") || message.contains("inline table");
    if !about_value || !text[start..offset].trim().is_empty() {
        return None;
    }
    let mut end = start;
    while end > 0 {
        let line_start = text[..end - 1].rfind('\n').map_or(0, |i| i + 1);
        let line = &text[line_start..end];
        let assigns = line.contains('=') && !line.trim_start().starts_with(['#', '[']);
        if assigns {
            return key_at(text, line_start);
        }
        end = line_start;
    }
    None
}

/// Applies `KEY=VALUE` overrides; VALUE is parsed as a TOML value, or taken as a
/// plain string when it is not one (so `--set time.method=rk4` works unquoted).
/// Setting one of `time.dt` / `time.courant` removes the other.
pub fn apply_overrides(text: &str, file: &str, overrides: &[String]) -> Result<String, CaseError> {
    if overrides.is_empty() {
        return Ok(text.to_string());
    }
    let mut doc: DocumentMut = text.parse().map_err(|e: toml_edit::TomlError| {
        let (line, col) = e.span().map(|s| line_col(text, s.start)).unwrap_or((1, 1));
        CaseError::Syntax {
            file: file.to_string(),
            line,
            col,
            message: e.message().trim().to_string(),
        }
    })?;
    for spec in overrides {
        let bad = |message: &str| CaseError::Override {
            spec: spec.clone(),
            message: message.to_string(),
        };
        let (key, value) = spec
            .split_once('=')
            .ok_or_else(|| bad("expected KEY=VALUE, e.g. time.courant=0.9"))?;
        let key = key.trim();
        let parts: Vec<&str> = key.split('.').collect();
        if parts.iter().any(|p| p.is_empty()) {
            return Err(bad("the key must be a dotted path such as time.courant"));
        }
        let value: Value = match format!("v = {value}").parse::<DocumentMut>() {
            Ok(d) => d
                .get("v")
                .and_then(|i| i.as_value())
                .cloned()
                .ok_or_else(|| bad("cannot parse the value"))?,
            Err(_) => Value::from(value.trim()),
        };
        let mut item: &mut Item = doc.as_item_mut();
        for part in &parts[..parts.len() - 1] {
            if item.get(part).is_none() {
                if let Some(t) = item.as_table_like_mut() {
                    t.insert(part, Item::Table(toml_edit::Table::new()));
                } else {
                    return Err(bad(&format!("`{part}` is not a table")));
                }
            }
            item = item
                .get_mut(part)
                .ok_or_else(|| bad(&format!("`{part}` is not a table")))?;
        }
        let last = parts[parts.len() - 1];
        let table = item
            .as_table_like_mut()
            .ok_or_else(|| bad("the parent of the key is not a table"))?;
        if let Some((name, index)) = element(last) {
            // KEY[i]=VALUE: element i of an existing array
            let index = index.ok_or_else(|| {
                bad("the index in KEY[i] must be a number, e.g. model.velocity[0]")
            })?;
            let array = table
                .get_mut(name)
                .and_then(|i| i.as_array_mut())
                .ok_or_else(|| {
                    bad(&format!(
                        "`{name}` is not an array in the case file, so it has no element {index}"
                    ))
                })?;
            if index >= array.len() {
                return Err(bad(&format!(
                    "`{name}` has {} element(s); indices start at 0",
                    array.len()
                )));
            }
            array.replace(index, value);
            continue;
        }
        table.insert(last, Item::Value(value));
        if parts.len() == 2 && parts[0] == "time" {
            let other = match last {
                "dt" => Some("courant"),
                "courant" => Some("dt"),
                _ => None,
            };
            if let Some(o) = other {
                table.remove(o);
            }
        }
    }
    Ok(doc.to_string())
}

/// `name[i]`: the array name and the index (None when it is not a number).
fn element(part: &str) -> Option<(&str, Option<usize>)> {
    let (name, rest) = part.split_once('[')?;
    let index = rest.strip_suffix(']').and_then(|i| i.trim().parse().ok());
    Some((name, index))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn key_position_finds_nested_value() {
        let t = "[grid]\nspacing = [1.0]\n\n[time]\nmethod = \"rk4\"\n";
        assert_eq!(key_position(t, "time.method"), Some((5, 10)));
        assert_eq!(key_position(t, "grid.spacing.0"), Some((2, 12)));
    }

    #[test]
    fn open_list_is_named_by_its_key() {
        let t = "[grid]\nspacing = [1.0,\n  2.0\n\n[model]\n";
        let at = t.find("[model]").unwrap();
        assert_eq!(
            open_value_key(t, at, "missing comma between array elements").as_deref(),
            Some("grid.spacing")
        );
        assert_eq!(open_value_key(t, at, "duplicate key"), None);
        let t = "[time]\ncourant 1.2\n";
        assert_eq!(
            key_at(t, t.find("1.2").unwrap()).as_deref(),
            Some("time.courant")
        );
    }

    #[test]
    fn override_sets_one_array_element() {
        let t = "[model]\nvelocity = [1.0, 2.0]\n";
        let out = apply_overrides(t, "f", &["model.velocity[1]=0.5".into()]).unwrap();
        assert!(out.contains("velocity = [1.0, 0.5]"), "{out}");
        for bad in [
            "model.velocity[2]=1",
            "model.velocity[x]=1",
            "model.speed[0]=1",
        ] {
            assert!(apply_overrides(t, "f", &[bad.into()]).is_err(), "{bad}");
        }
    }

    #[test]
    fn override_replaces_courant_and_drops_dt() {
        let t = "[time]\nmethod = \"rk4\"\ndt = 0.1\n";
        let out = apply_overrides(t, "f", &["time.courant=0.5".into()]).unwrap();
        assert!(out.contains("courant = 0.5") && !out.contains("dt ="));
        let out = apply_overrides(t, "f", &["time.method=heun".into()]).unwrap();
        assert!(out.contains("method = \"heun\""));
    }
}
