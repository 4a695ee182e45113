//! Numbers of the case file that may also be written as exact fractions in
//! quotes ("1/6", "-5/9", "2"): tableau and low-storage coefficients. A
//! fraction of whole numbers up to 2^53 gives the correctly rounded value of
//! the quotient; anything else in quotes is an error the reader reports with
//! the key, line and column.

use serde::de::{self, Deserialize, Deserializer, Visitor};
use std::fmt;

/// Largest whole number every f64 holds exactly.
const EXACT: u64 = 1 << 53;

/// A coefficient written as a number or as a fraction in quotes.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Coefficient(pub f64);

/// The value of `text`, a whole number or a fraction p/q of whole numbers.
pub fn parse(text: &str) -> Result<f64, String> {
    let whole = |part: &str| -> Result<f64, String> {
        let t = part.trim();
        let (neg, digits) = match t.strip_prefix('-') {
            Some(d) => (true, d),
            None => (false, t.strip_prefix('+').unwrap_or(t)),
        };
        if digits.is_empty() || !digits.chars().all(|c| c.is_ascii_digit()) {
            return Err(format!(
                "\"{text}\" is not a fraction: write whole numbers p/q such as \"1/6\" or \"-5/9\", or a number without quotes"
            ));
        }
        let n: u64 = digits.parse().ok().filter(|n| *n <= EXACT).ok_or_else(|| {
            format!("\"{text}\": {digits} is too large to be exact (at most 2^53 = {EXACT})")
        })?;
        Ok(if neg { -(n as f64) } else { n as f64 })
    };
    match text.split_once('/') {
        None => whole(text),
        Some((p, q)) => {
            let (p, q) = (whole(p)?, whole(q)?);
            if q == 0.0 {
                return Err(format!("\"{text}\" divides by zero"));
            }
            Ok(p / q)
        }
    }
}

impl<'de> Deserialize<'de> for Coefficient {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = Coefficient;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a number, or a fraction in quotes such as \"1/6\"")
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Coefficient, E> {
                Ok(Coefficient(v))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Coefficient, E> {
                Ok(Coefficient(v as f64))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Coefficient, E> {
                Ok(Coefficient(v as f64))
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Coefficient, E> {
                parse(v).map(Coefficient).map_err(E::custom)
            }
        }
        d.deserialize_any(V)
    }
}

/// The values of a list of coefficients.
pub fn values(v: &[Coefficient]) -> Vec<f64> {
    v.iter().map(|c| c.0).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fractions_and_whole_numbers() {
        assert_eq!(parse("1/6"), Ok(1.0 / 6.0));
        assert_eq!(parse("-5/9"), Ok(-5.0 / 9.0));
        assert_eq!(parse(" 2 "), Ok(2.0));
        assert_eq!(parse("-153 / 128"), Ok(-153.0 / 128.0));
        assert_eq!(
            parse("2277821191437/14882151754819"),
            Ok(2277821191437.0 / 14882151754819.0)
        );
    }

    #[test]
    fn malformed_fractions_are_refused() {
        for bad in [
            "",
            "1/",
            "/6",
            "1/6/7",
            "0.5",
            "one",
            "1e3",
            "1/0",
            "--1",
            "99999999999999999999",
        ] {
            assert!(parse(bad).is_err(), "{bad:?} accepted");
        }
        assert!(parse("1/0").unwrap_err().contains("divides by zero"));
    }
}
