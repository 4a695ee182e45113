//! The dotted key path of whatever sits at a byte offset of the case text, found
//! from the spans of the parsed document, so that a value inside an inline
//! table or a list gets its whole path (`space.dissipation.order`,
//! `grid.spacing.1`) rather than the key that starts its line.

use std::ops::Range;
use toml_edit::{Item, Value};

/// The deepest key, list entry or table header whose text holds `offset`.
pub fn path_at(text: &str, offset: usize) -> Option<String> {
    let doc = toml_edit::Document::parse(text).ok()?;
    let mut path = Vec::new();
    in_item(doc.as_item(), offset, &mut path).then(|| path.join("."))
}

/// The keys written in the table at the dotted `path` ("" for the top level),
/// or `None` when there is no table there.
pub fn keys_at(text: &str, path: &str) -> Option<Vec<String>> {
    let doc = toml_edit::Document::parse(text).ok()?;
    let mut item = doc.as_item();
    for part in path.split('.').filter(|p| !p.is_empty()) {
        item = item.get(part)?;
    }
    let table = item.as_table_like()?;
    Some(table.iter().map(|(k, _)| k.to_string()).collect())
}

fn holds(span: Option<Range<usize>>, offset: usize) -> bool {
    span.is_some_and(|s| s.start <= offset && offset < s.end.max(s.start + 1))
}

fn in_item(item: &Item, offset: usize, path: &mut Vec<String>) -> bool {
    match item {
        Item::Table(t) => {
            for (k, child) in t.iter() {
                path.push(k.to_string());
                let on_key = t.key(k).is_some_and(|key| holds(key.span(), offset));
                if on_key || in_item(child, offset, path) {
                    return true;
                }
                path.pop();
            }
            !path.is_empty() && holds(t.span(), offset)
        }
        Item::Value(v) => in_value(v, offset, path),
        Item::ArrayOfTables(a) => {
            for (i, t) in a.iter().enumerate() {
                path.push(i.to_string());
                if in_item(&Item::Table(t.clone()), offset, path) {
                    return true;
                }
                path.pop();
            }
            false
        }
        Item::None => false,
    }
}

fn in_value(v: &Value, offset: usize, path: &mut Vec<String>) -> bool {
    match v {
        Value::Array(a) => {
            for (i, e) in a.iter().enumerate() {
                path.push(i.to_string());
                if in_value(e, offset, path) {
                    return true;
                }
                path.pop();
            }
        }
        Value::InlineTable(t) => {
            for (k, e) in t.iter() {
                path.push(k.to_string());
                let on_key = t.key(k).is_some_and(|key| holds(key.span(), offset));
                if on_key || in_value(e, offset, path) {
                    return true;
                }
                path.pop();
            }
        }
        _ => {}
    }
    holds(v.span(), offset)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_entries_of_inline_tables_and_lists() {
        let t = "[grid]\nspacing = [1.0, \"a\"]\n\n[space]\ndissipation = { order = 6.5, strength = 1 }\n";
        assert_eq!(
            path_at(t, t.find("\"a\"").unwrap()).as_deref(),
            Some("grid.spacing.1")
        );
        assert_eq!(
            path_at(t, t.find("6.5").unwrap()).as_deref(),
            Some("space.dissipation.order")
        );
        assert_eq!(
            path_at(t, t.find("[space]").unwrap()).as_deref(),
            Some("space")
        );
        assert_eq!(path_at(t, 0).as_deref(), Some("grid"));
        assert_eq!(
            keys_at(t, "space.dissipation").unwrap(),
            ["order", "strength"]
        );
        assert_eq!(keys_at(t, "").unwrap(), ["grid", "space"]);
        assert_eq!(keys_at(t, "grid.spacing"), None);
    }
}
