//! Parameter sweeps over any case key (`kgain sweep`): the Cartesian product of
//! varied keys ([`vary`], [`plan`]), run in parallel over combinations or
//! wavevectors ([`run`]), recorded as chosen summary figures ([`figures`]) and
//! written as NPY arrays with one axis per key, a CSV table and charts
//! ([`dataset`]). A sweep splits into deterministic shards for a scheduler and
//! merges back into exactly the unsharded output ([`shard`]).
//!
//! Usable without files: [`vary::parse`] and [`plan::SweepSpec`] build a plan,
//! [`run::prepare`] and [`run::run`] return the figures in memory.

pub mod dataset;
pub mod figures;
pub mod plan;
pub mod run;
pub mod shard;
pub mod vary;

/// The case's own value of `key` (dotted, optionally ending in `[i]`) in the
/// case text, as written (numbers in their shortest form, text without quotes);
/// None when the case does not set it or the text does not parse.
pub fn case_value(text: &str, key: &str) -> Option<String> {
    let doc: toml::Table = toml::from_str(text).ok()?;
    let mut item = toml::Value::Table(doc);
    for part in key.split('.') {
        let (name, index) = match part.split_once('[') {
            Some((n, rest)) => (n, Some(rest.strip_suffix(']')?.parse::<usize>().ok()?)),
            None => (part, None),
        };
        item = item.get(name)?.clone();
        if let Some(i) = index {
            item = item.get(i)?.clone();
        }
    }
    match item {
        toml::Value::Float(x) => Some(format!("{x}")),
        toml::Value::Integer(i) => Some(i.to_string()),
        toml::Value::String(s) => Some(s),
        toml::Value::Boolean(b) => Some(b.to_string()),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn case_values_are_read_by_dotted_key_and_index() {
        let t = "[model]\nvelocity = [30.0, 2]\n[time]\nmethod = \"rk4\"\n";
        assert_eq!(
            super::case_value(t, "model.velocity[0]").as_deref(),
            Some("30")
        );
        assert_eq!(
            super::case_value(t, "model.velocity[1]").as_deref(),
            Some("2")
        );
        assert_eq!(super::case_value(t, "time.method").as_deref(), Some("rk4"));
        assert_eq!(super::case_value(t, "time.dt"), None);
    }
}
