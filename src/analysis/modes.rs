//! Worst-case modes: the eigenvector or optimal perturbation behind the worst
//! wavevector of each measure, with its make-up by variable and a one-line
//! description (direction of travel, dominant variables).

use crate::linalg::dense;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A worst-case mode.
#[derive(Debug, Clone)]
pub struct Mode {
    /// Which measure it explains: "radius", "growth" or "limit".
    pub kind: &'static str,
    /// The wavevector θ.
    pub wavevector: Vec<f64>,
    /// Unit vector over the state (all time levels for multistep methods).
    pub vector: Vec<C64>,
    /// One label per component.
    pub labels: Vec<String>,
    /// The eigenvalue (of G for radius, of L for limit) or growth factor.
    pub value: C64,
    /// Angular frequency ω of the mode (e^{i(k·x − ωt)}), where meaningful.
    pub frequency: Option<f64>,
    /// Share of |v|² per model variable, largest first.
    pub composition: Vec<(String, f64)>,
    /// One-line description.
    pub description: String,
}

/// Component labels: the variables, then `v[n-k]` for older time levels.
pub fn labels(vars: &[String], size: usize) -> Vec<String> {
    let m = vars.len();
    (0..size)
        .map(|i| {
            let (level, v) = (i / m, &vars[i % m]);
            if level == 0 {
                v.clone()
            } else {
                format!("{v}[n-{level}]")
            }
        })
        .collect()
}

/// Share of |v|² per variable (summed over time levels), largest first.
pub fn composition(vars: &[String], v: &[C64]) -> Vec<(String, f64)> {
    let m = vars.len();
    let total: f64 = v.iter().map(|z| z.norm_sqr()).sum::<f64>().max(1e-300);
    let mut out: Vec<(String, f64)> = vars
        .iter()
        .enumerate()
        .map(|(i, name)| {
            let s: f64 = v.iter().skip(i).step_by(m).map(|z| z.norm_sqr()).sum();
            (name.clone(), s / total)
        })
        .collect();
    out.sort_by(|a, b| b.1.total_cmp(&a.1));
    out
}

fn direction_text(theta: &[f64], forward: bool) -> String {
    let flip = if forward { 0.0 } else { 180.0 };
    match theta.len() {
        1 => {
            let positive = (theta[0] >= 0.0) == forward;
            if positive {
                "travelling towards +x".into()
            } else {
                "travelling towards -x".into()
            }
        }
        2 => format!(
            "travelling at {:.1} deg",
            (theta[1].atan2(theta[0]).to_degrees() + flip).rem_euclid(360.0)
        ),
        _ => {
            let r = theta.iter().map(|x| x * x).sum::<f64>().sqrt().max(1e-300);
            let s = if forward { 1.0 } else { -1.0 };
            format!(
                "travelling at azimuth {:.1} deg, elevation {:.1} deg",
                (theta[1] * s)
                    .atan2(theta[0] * s)
                    .to_degrees()
                    .rem_euclid(360.0),
                (s * theta[2] / r).asin().to_degrees()
            )
        }
    }
}

/// Builds the description and composition of a mode.
pub fn finish(
    kind: &'static str,
    theta: &[f64],
    vector: Vec<C64>,
    vars: &[String],
    value: C64,
    frequency: Option<f64>,
) -> Mode {
    let comp = composition(vars, &vector);
    let main: Vec<String> = comp
        .iter()
        .filter(|(_, s)| *s >= 0.1)
        .take(3)
        .map(|(n, s)| format!("{n} ({:.0}%)", 100.0 * s))
        .collect();
    let at_origin = theta.iter().all(|x| x.abs() < 1e-12);
    let motion = match frequency {
        _ if at_origin => "uniform (theta = 0)".to_string(),
        Some(w) if w.abs() > 1e-12 => direction_text(theta, w > 0.0),
        _ => "standing (zero frequency)".to_string(),
    };
    let what = match kind {
        "radius" => "largest amplification",
        "growth" => "largest transient growth (optimal initial perturbation)",
        _ => "first mode to go unstable",
    };
    let description = format!("{what}: mode {motion}, mostly {}", main.join(" and "));
    Mode {
        kind,
        wavevector: theta.to_vec(),
        vector: vector.clone(),
        labels: labels(vars, vector.len()),
        value,
        frequency,
        composition: comp,
        description,
    }
}

/// The eigenpair of largest modulus (or selected by `pick` over the Schur
/// diagonal), with a unit eigenvector.
pub fn eigenpair(a: &DMatrix<C64>, pick: impl Fn(C64) -> f64) -> Option<(C64, Vec<C64>)> {
    let (q, t) = dense::schur(a)?;
    let m = t.nrows();
    let k = (0..m).max_by(|i, j| pick(t[(*i, *i)]).total_cmp(&pick(t[(*j, *j)])))?;
    let y = dense::triangular_eigenvectors(&t);
    let v = &q * y.column(k);
    Some((t[(k, k)], v.iter().copied().collect()))
}
