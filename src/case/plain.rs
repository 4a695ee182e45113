//! The structure errors of the case-file reader in plain words: serde's
//! "invalid type: sequence, expected f64" becomes "must be a number, not a
//! list", and so on, so that no type name of the program reaches the user.

/// `message` (a reader error at `key`) in plain words.
pub fn plain(message: &str, key: &str) -> String {
    if let Some(rest) = message.strip_prefix("invalid type: ") {
        if let Some((got, expected)) = rest.rsplit_once(", expected ") {
            return format!(
                "must be {}, not {}",
                expected_words(expected),
                got_words(got)
            );
        }
    }
    if let Some(rest) = message.strip_prefix("invalid value: ") {
        if let Some((got, expected)) = rest.rsplit_once(", expected ") {
            return format!(
                "must be {}, not {}",
                expected_words(expected),
                got_words(got)
            );
        }
    }
    if message.starts_with("invalid length") && message.contains("expected struct") {
        return "must be a table, not a list".to_string();
    }
    if message.starts_with("data did not match any variant") {
        return one_or_many(key).to_string();
    }
    message.replace(", expected nothing", "")
}

/// What a one-value-or-one-per-axis key accepts.
fn one_or_many(key: &str) -> &'static str {
    if key.starts_with("scan.") {
        "must be a whole number, or a list of whole numbers with one per axis"
    } else if key.starts_with("space.") {
        "must be a stencil name in quotes, or a list of names with one per axis"
    } else {
        "must be one value, or a list with one value per axis"
    }
}

fn expected_words(expected: &str) -> &str {
    match expected {
        "f64" | "f32" => "a number",
        "i64" | "i32" | "u64" | "u32" | "usize" | "isize" => "a whole number",
        "a string" | "string" => "text in quotes",
        "a sequence" | "sequence" => "a list",
        "a boolean" | "bool" => "true or false",
        e if e.starts_with("struct ") || e.contains("map") => "a table",
        e => e,
    }
}

fn got_words(got: &str) -> String {
    let quoted = |prefix: &str| {
        got.strip_prefix(prefix)
            .map(|v| v.trim_matches('`').to_string())
    };
    match got {
        "sequence" => "a list".into(),
        "map" => "a table".into(),
        "unit value" => "nothing".into(),
        _ => {
            if let Some(v) =
                quoted("integer ").and_then(|v| v.split_once("` as ").map(|(n, _)| n.to_string()))
            {
                format!("{v}, which is too large")
            } else if let Some(v) = quoted("string ") {
                format!("the text {v}")
            } else if let Some(v) = quoted("integer ") {
                format!("the whole number {v}")
            } else if let Some(v) = quoted("floating point ") {
                format!("the number {v}")
            } else if let Some(v) = quoted("boolean ") {
                format!("the value {v}")
            } else {
                got.to_string()
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn serde_words_become_plain_words() {
        assert_eq!(
            plain("invalid type: sequence, expected f64", "time.courant"),
            "must be a number, not a list"
        );
        assert_eq!(
            plain("invalid type: string \"a\", expected i64", "scan.steps"),
            "must be a whole number, not the text \"a\""
        );
        assert_eq!(
            plain(
                "invalid type: integer `3`, expected struct RawTableau",
                "time.tableau"
            ),
            "must be a table, not the whole number 3"
        );
        assert_eq!(
            plain(
                "invalid type: integer `99999999999999999999` as i128, expected i64",
                "scan.steps"
            ),
            "must be a whole number, not 99999999999999999999, which is too large"
        );
        assert_eq!(
            plain(
                "data did not match any variant of untagged enum OneOrMany",
                "scan.points"
            ),
            "must be a whole number, or a list of whole numbers with one per axis"
        );
    }
}
