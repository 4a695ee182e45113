//! The figures a sweep records per combination: any number in summary.json,
//! named by its dotted path (`limit.courant_max`, `dispersion.modes[0].ppw_required`),
//! the analyses each needs, and their long names and units.

use serde_json::Value;

/// The figures recorded when `--figures` is not given.
pub const DEFAULT_FIGURES: [&str; 5] = [
    "limit.courant_max",
    "limit.dt_max",
    "radius.max",
    "growth.max_norm",
    "limit.physical_direction_deg",
];

/// Why a figure could not be read.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FigureError {
    /// The path does not exist in summary.json.
    #[error("figure '{0}': summary.json has no such key (see the keys of summary.json, e.g. limit.courant_max)")]
    Missing(String),
    /// The value is not a number.
    #[error("figure '{0}': the value is {1}, not a number; choose a numeric key")]
    NotNumber(String, &'static str),
    /// The path is malformed.
    #[error("figure '{0}': expected a dotted path such as limit.courant_max or dispersion.modes[0].ppw_required")]
    Syntax(String),
}

/// The analyses (`scan.analyses` names) the figures need.
pub fn analyses_for(figures: &[String]) -> Vec<&'static str> {
    let mut out = Vec::new();
    for f in figures {
        let head = f.split(['.', '[']).next().unwrap_or("");
        let need = match head {
            "radius" => "radius",
            "limit" | "limit_by_direction" => "limit",
            "growth" => "growth",
            "dispersion" | "modes" => "dispersion",
            _ => continue,
        };
        if !out.contains(&need) {
            out.push(need);
        }
    }
    if out.is_empty() {
        out.push("radius");
    }
    out
}

/// Checks the syntax of a figure path.
pub fn check(figure: &str) -> Result<(), FigureError> {
    steps(figure).map(|_| ())
}

enum Step<'a> {
    Key(&'a str),
    Index(usize),
}

fn steps(figure: &str) -> Result<Vec<Step<'_>>, FigureError> {
    let bad = || FigureError::Syntax(figure.to_string());
    let mut out = Vec::new();
    for part in figure.split('.') {
        let (name, mut rest) = match part.find('[') {
            Some(i) => (&part[..i], &part[i..]),
            None => (part, ""),
        };
        if name.is_empty() {
            return Err(bad());
        }
        out.push(Step::Key(name));
        while !rest.is_empty() {
            let close = rest.find(']').ok_or_else(bad)?;
            let index = rest[1..close].parse().map_err(|_| bad())?;
            out.push(Step::Index(index));
            rest = &rest[close + 1..];
            if !rest.is_empty() && !rest.starts_with('[') {
                return Err(bad());
            }
        }
    }
    Ok(out)
}

/// The figure's value in a summary. A null is NaN, except the limits of an
/// unconditionally stable scheme, which are +∞; true and false are 1 and 0.
pub fn extract(summary: &Value, figure: &str) -> Result<f64, FigureError> {
    let mut v = summary;
    for s in steps(figure)? {
        v = match s {
            Step::Key(k) => v.get(k),
            Step::Index(i) => v.get(i),
        }
        .ok_or_else(|| FigureError::Missing(figure.to_string()))?;
    }
    match v {
        Value::Number(n) => Ok(n.as_f64().unwrap_or(f64::NAN)),
        Value::Bool(b) => Ok(f64::from(u8::from(*b))),
        Value::Null => {
            let unconditional = summary["limit"]["kind"] == "unconditional";
            let limit = matches!(
                figure,
                "limit.dt_max" | "limit.courant_max" | "limit.diffusion_number_max"
            ) || figure.starts_with("limit.bracket.dt_");
            Ok(if unconditional && limit {
                f64::INFINITY
            } else {
                f64::NAN
            })
        }
        Value::String(_) => Err(FigureError::NotNumber(figure.to_string(), "text")),
        Value::Array(_) => Err(FigureError::NotNumber(figure.to_string(), "a list")),
        Value::Object(_) => Err(FigureError::NotNumber(figure.to_string(), "a table")),
    }
}

/// Long name and unit of a figure ("" when dimensionless or in the case's
/// own units).
pub fn describe(figure: &str) -> (String, String) {
    let (name, unit) = match figure {
        "limit.courant_max" => ("largest stable Courant number", "1"),
        "limit.dt_max" => ("largest stable time step", "time unit of the case"),
        "limit.diffusion_number_max" => ("largest stable diffusion number", "1"),
        "radius.max" => ("largest spectral radius at the case's dt", "1"),
        "growth.max_norm" => ("largest transient growth max ||G^n||", "1"),
        "limit.physical_direction_deg" => ("direction of the limiting wave", "degree"),
        "limit_by_direction.worst_physical_direction_deg" => ("worst wave direction", "degree"),
        _ => ("", ""),
    };
    if name.is_empty() {
        (figure.to_string(), String::new())
    } else {
        (name.to_string(), unit.to_string())
    }
}

/// The file stem of a figure's array: its path with `.` and brackets as `_`.
pub fn file_stem(figure: &str) -> String {
    let mut s: String = figure
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '_' })
        .collect();
    while s.contains("__") {
        s = s.replace("__", "_");
    }
    s.trim_matches('_').to_string()
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn figures_are_read_by_path_with_indices() {
        let s = json!({"limit": {"kind": "bounded", "courant_max": 1.5, "dt_max": null},
                       "dispersion": {"modes": [{"ppw": 4.0}]}, "radius": {"stable": true}});
        assert_eq!(extract(&s, "limit.courant_max"), Ok(1.5));
        assert!(extract(&s, "limit.dt_max").unwrap().is_nan());
        assert_eq!(extract(&s, "dispersion.modes[0].ppw"), Ok(4.0));
        assert_eq!(extract(&s, "radius.stable"), Ok(1.0));
        assert!(matches!(
            extract(&s, "limit.kind"),
            Err(FigureError::NotNumber(..))
        ));
        assert!(matches!(
            extract(&s, "limit.nope"),
            Err(FigureError::Missing(_))
        ));
        assert!(matches!(
            extract(&s, "limit..x"),
            Err(FigureError::Syntax(_))
        ));
        let u = json!({"limit": {"kind": "unconditional", "dt_max": null}});
        assert_eq!(extract(&u, "limit.dt_max"), Ok(f64::INFINITY));
        assert_eq!(
            file_stem("dispersion.modes[0].ppw"),
            "dispersion_modes_0_ppw"
        );
        assert_eq!(
            analyses_for(&["limit.dt_max".into(), "radius.max".into()]),
            ["limit", "radius"]
        );
    }
}
