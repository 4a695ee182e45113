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
