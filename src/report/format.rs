//! Small formatting helpers shared by the exporters: strict-JSON numbers (a
//! non-finite number becomes null) and the direction of a wavevector in degrees.

use serde_json::{json, Value};

/// A finite number, or null.
pub fn num(x: f64) -> Value {
    if x.is_finite() {
        json!(x)
    } else {
        Value::Null
    }
}

/// A list of numbers, each finite or null.
pub fn vec_num(v: &[f64]) -> Value {
    Value::Array(v.iter().map(|x| num(*x)).collect())
}

/// Direction of a wavevector in degrees: the angle in 1D/2D, (azimuth, elevation) in 3D.
pub fn direction_deg(theta: &[f64]) -> (f64, Option<f64>) {
    match theta.len() {
        1 => (if theta[0] < 0.0 { 180.0 } else { 0.0 }, None),
        2 => (
            theta[1].atan2(theta[0]).to_degrees().rem_euclid(360.0),
            None,
        ),
        _ => {
            let r = theta.iter().map(|x| x * x).sum::<f64>().sqrt();
            let az = theta[1].atan2(theta[0]).to_degrees().rem_euclid(360.0);
            let el = if r > 0.0 {
                (theta[2] / r).asin().to_degrees()
            } else {
                0.0
            };
            (az, Some(el))
        }
    }
}

/// The physical wavevector k_d = θ_d/h_d of a θ-space vector (its direction
/// differs from θ's on a grid with unequal spacings).
pub fn physical(theta: &[f64], spacing: &[f64]) -> Vec<f64> {
    theta.iter().zip(spacing).map(|(t, h)| t / h).collect()
}

/// θ as "(+0.1234, -1.2000)".
pub fn theta(v: &[f64]) -> String {
    let parts: Vec<String> = v.iter().map(|x| format!("{x:+.4}")).collect();
    format!("({})", parts.join(", "))
}

/// A direction as "12.3 deg" or "azimuth .. deg, elevation .. deg".
pub fn dir(v: &[f64]) -> String {
    match direction_deg(v) {
        (az, Some(el)) => format!("azimuth {az:.1} deg, elevation {el:.1} deg"),
        (a, None) => format!("{a:.1} deg"),
    }
}

/// A number with three significant digits ("8.83", "25.6", "0.0412", "1.23e+06").
pub fn sig3(x: f64) -> String {
    if !x.is_finite() || x == 0.0 {
        return format!("{x}");
    }
    let exponent = x.abs().log10().floor() as i32;
    if !(-3..6).contains(&exponent) {
        return format!("{x:.2e}");
    }
    // rounding can carry into the next decade (9.996 -> "10.0"): decide on the rounded value
    let decimals = (2 - exponent).max(0) as usize;
    let rounded: f64 = format!("{x:.decimals$}").parse().unwrap_or(x);
    let exponent = rounded.abs().log10().floor() as i32;
    if exponent >= 3 {
        // whole numbers: round to three significant digits too (41390 -> 41400)
        let unit = 10f64.powi(exponent - 2);
        return format!("{:.0}", (rounded / unit).round() * unit);
    }
    let decimals = (2 - exponent) as usize;
    format!("{rounded:.decimals$}")
}

#[cfg(test)]
mod tests {
    use super::sig3;

    #[test]
    fn three_significant_digits() {
        assert_eq!(sig3(8.8312), "8.83");
        assert_eq!(sig3(25.65), "25.6");
        assert_eq!(sig3(0.041234), "0.0412");
        assert_eq!(sig3(9.996), "10.0");
        assert_eq!(sig3(123456.0), "123000");
        assert_eq!(sig3(41390.0), "41400");
        assert_eq!(sig3(1.234e7), "1.23e7");
        assert_eq!(sig3(-2.0), "-2.00");
    }
}
