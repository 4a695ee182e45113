//! Numbers and lists written as TOML text, including the values TOML spells
//! its own way (`nan`, `inf`, `-inf`), so that fuzzed numbers reach the case
//! reader exactly as a user could have typed them.

/// One float as a TOML value.
pub fn float(x: f64) -> String {
    if x.is_nan() {
        "nan".into()
    } else if x.is_infinite() {
        if x > 0.0 { "inf" } else { "-inf" }.into()
    } else {
        // `{:?}` always keeps a `.` or an exponent (1.0, 1e300), both TOML floats.
        format!("{x:?}")
    }
}

/// A list of floats as a TOML array.
pub fn floats(v: &[f64]) -> String {
    let items: Vec<String> = v.iter().map(|x| float(*x)).collect();
    format!("[{}]", items.join(", "))
}

/// A list of lists of floats (a matrix by rows) as a TOML array.
pub fn rows(m: &[Vec<f64>]) -> String {
    let items: Vec<String> = m.iter().map(|r| floats(r)).collect();
    format!("[{}]", items.join(", "))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn special_values_are_toml() {
        assert_eq!(
            floats(&[1.0, f64::NAN, -f64::INFINITY, 1e300]),
            "[1.0, nan, -inf, 1e300]"
        );
        assert_eq!(rows(&[vec![0.5], vec![]]), "[[0.5], []]");
    }
}
