//! Worst-case modes: the eigenvector or optimal perturbation behind the worst
//! wavevector of each measure, with its make-up by variable and a one-line
//! description (direction of travel, dominant variables).

use crate::linalg::dense;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// The measure a worst-case mode explains.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Measure {
    /// The largest |λ| of G at the problem's Δt.
    Radius,
    /// The largest transient growth.
    Growth,
    /// The first mode to go unstable as Δt grows.
    Limit,
}

impl Measure {
    /// The name used in summary.json and file names.
    pub fn as_str(self) -> &'static str {
        match self {
            Measure::Radius => "radius",
            Measure::Growth => "growth",
            Measure::Limit => "limit",
        }
    }
}

/// A worst-case mode.
#[derive(Debug, Clone)]
pub struct Mode {
    /// Which measure it explains.
    pub kind: Measure,
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
            "travelling at {:.1} deg in theta-space",
            (theta[1].atan2(theta[0]).to_degrees() + flip).rem_euclid(360.0)
        ),
        _ => {
            let r = theta.iter().map(|x| x * x).sum::<f64>().sqrt().max(1e-300);
            let s = if forward { 1.0 } else { -1.0 };
            format!(
                "travelling at azimuth {:.1} deg, elevation {:.1} deg in theta-space",
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
    kind: Measure,
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
        Measure::Radius => "largest amplification",
        Measure::Growth => "largest transient growth (optimal initial perturbation)",
        Measure::Limit => "first mode to go unstable",
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

/// The worst-case mode of every measure that ran: the eigenvector of G for the
/// largest |λ| at the worst radius node, the optimal perturbation at the growth
/// peak, the eigenvector of the first mode to leave the stability region at the
/// limit wavevector. `limit_pick` ranks eigenvalues of L for the last (largest first).
pub(super) fn worst_modes(
    ctx: &super::context::Context,
    r: &super::Results,
    weights: Option<&[f64]>,
    limit_pick: &dyn Fn(C64) -> f64,
) -> Vec<Mode> {
    let dt = r.dt;
    let vars = &ctx.problem.system.variables;
    let w = super::norm::NormTransform::new(ctx.problem, weights);
    let mut modes = Vec::new();
    if let Some(rad) = &r.radius {
        let g = ctx.amplification(&rad.wavevector, dt);
        if let Some((lam, v)) = eigenpair(&g, |z| z.norm()) {
            let om = -lam.arg() / dt;
            let v = w.scale_vector(v);
            modes.push(finish(
                Measure::Radius,
                &rad.wavevector,
                v,
                vars,
                lam,
                Some(om),
            ));
        }
    }
    if let Some(gr) = r.growth.as_ref().filter(|g| g.peak.0 > 1.0 + 1e-6) {
        let (_, n, theta) = &gr.peak;
        let g = w.weighted(ctx.amplification(theta, dt));
        let (factor, v) = super::growth::optimal_perturbation(&g, *n);
        let lam = eigenpair(&g, |z| z.norm()).map(|p| p.0);
        let om = lam.map(|l| -l.arg() / dt);
        modes.push(finish(
            Measure::Growth,
            theta,
            v,
            vars,
            C64::new(factor, 0.0),
            om,
        ));
    }
    if let Some(l) = r
        .limit
        .as_ref()
        .filter(|l| l.kind == super::limit::LimitKind::Bounded)
    {
        let pair = if ctx.is_composite() {
            let g = ctx.amplification(&l.wavevector, l.dt_max * (1.0 + 1e-6));
            eigenpair(&g, |z| z.norm()).map(|(lam, v)| (lam, v, -lam.arg() / dt))
        } else {
            eigenpair(&ctx.op.symbol_matrix(&l.wavevector), limit_pick)
                .map(|(mu, v)| (mu, v, -mu.im))
        };
        if let Some((val, v, om)) = pair {
            let v = w.scale_vector(v);
            modes.push(finish(
                Measure::Limit,
                &l.wavevector,
                v,
                vars,
                val,
                Some(om),
            ));
        }
    }
    modes
}
