//! The largest stable Δt of a probed program, by re-running it: ρ_max(Δt) =
//! max over the grid's wavevectors of ρ(G(θ, Δt)), each evaluation a fresh
//! probe (1 + m runs). From the probe's Δt the search doubles or halves until
//! the stability changes, then bisects the bracket to a relative width; the
//! reported limit is the bracket's stable end (the safe side), verified
//! stable also at ½, ¼ and ⅛ of it.
//!
//! "Stable" means ρ_max ≤ 1 + `radius_tolerance` on the program's own grid:
//! the measurement cannot resolve growth below its rounding level, and modes
//! the grid does not carry are not seen (a finer grid can have a smaller
//! limit).

use super::analyses::radius;
use super::measure::measure;
use super::spec::ProbeSpec;
use super::stepper::{StepError, Stepper};

/// Most doublings or halvings before the search gives up.
const MAX_SCALINGS: usize = 30;
/// Most bisection steps.
const MAX_BISECTIONS: usize = 60;

/// What the search found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ProbeLimitKind {
    /// Stable up to `dt_lo`, unstable at `dt_hi`.
    Bounded,
    /// Unstable at every Δt probed (down to `dt_hi`).
    None,
    /// Stable at every Δt probed (up to `dt_lo`).
    NotFound,
    /// The stable Δt found are not an interval: unstable at a smaller Δt.
    Irregular,
}

impl ProbeLimitKind {
    /// Its name in summary.json.
    pub fn name(self) -> &'static str {
        match self {
            ProbeLimitKind::Bounded => "bounded",
            ProbeLimitKind::None => "none",
            ProbeLimitKind::NotFound => "not_found",
            ProbeLimitKind::Irregular => "irregular",
        }
    }
}

/// Parameters of the search.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ProbeLimitParams {
    /// Relative width of the final bracket.
    pub tolerance: f64,
    /// ρ_max ≤ 1 + this counts as stable.
    pub radius_tolerance: f64,
}

/// The search's result.
#[derive(Debug, Clone, PartialEq)]
pub struct ProbeLimit {
    /// What was found.
    pub kind: ProbeLimitKind,
    /// The largest Δt verified stable (the reported limit when bounded).
    pub dt_lo: Option<f64>,
    /// The smallest Δt found unstable.
    pub dt_hi: Option<f64>,
    /// The wavevector of ρ_max at `dt_hi`.
    pub worst_theta: Option<Vec<f64>>,
    /// Every (Δt, ρ_max) evaluated, in order.
    pub evaluations: Vec<(f64, f64)>,
    /// Program runs the search took.
    pub runs: usize,
}

/// Whether a bracket far below the probe's Δt only marks where the excess
/// ρ_max − 1 of a scheme unstable at every Δt drops under the tolerance: the
/// limit is below 10⁻³ of the start and, over the unstable evaluations
/// nearest it, ρ_max − 1 falls in proportion to Δt (order between 0.7 and 1.5
/// in a log–log fit), as a growth rate that does not vanish as Δt → 0 does.
fn growth_like_dt(evaluations: &[(f64, f64)], lo: f64, dt0: f64, params: ProbeLimitParams) -> bool {
    if lo >= 1e-3 * dt0 {
        return false;
    }
    let mut unstable: Vec<(f64, f64)> = evaluations
        .iter()
        .filter(|&&(t, r)| t > lo && r > 1.0 + params.radius_tolerance)
        .copied()
        .collect();
    unstable.sort_by(|a, b| a.0.total_cmp(&b.0));
    if unstable.len() < 3 {
        return false;
    }
    // the smallest unstable Δt and one at least 8 times larger
    let (t0, r0) = unstable[0];
    let Some(&(t1, r1)) = unstable.iter().find(|(t, _)| *t >= 8.0 * t0) else {
        return false;
    };
    let order = ((r1 - 1.0) / (r0 - 1.0)).ln() / (t1 / t0).ln();
    (0.7..=1.5).contains(&order)
}

/// Reports the search as it goes: runs so far and the bracket.
pub trait SearchProgress {
    /// After each evaluation.
    fn update(&self, runs: usize, lo: Option<f64>, hi: Option<f64>);
}

/// No reporting.
pub struct Silent;

impl SearchProgress for Silent {
    fn update(&self, _: usize, _: Option<f64>, _: Option<f64>) {}
}

/// Searches the largest stable Δt from `dt0`.
pub fn search(
    spec: &ProbeSpec,
    stepper: &mut dyn Stepper,
    dt0: f64,
    params: ProbeLimitParams,
    progress: &dyn SearchProgress,
) -> Result<ProbeLimit, StepError> {
    let start_runs = stepper.runs();
    let mut evaluations: Vec<(f64, f64)> = Vec::new();
    let mut worst_at_hi = None;
    let (mut lo, mut hi): (Option<f64>, Option<f64>) = (None, None);
    let eval = |dt: f64,
                stepper: &mut dyn Stepper,
                evaluations: &mut Vec<(f64, f64)>,
                lo: Option<f64>,
                hi: Option<f64>|
     -> Result<(bool, Vec<f64>), StepError> {
        let g = measure(spec, stepper, dt)?;
        let r = radius(&g);
        evaluations.push((dt, r.max));
        progress.update(stepper.runs() - start_runs, lo, hi);
        Ok((r.max <= 1.0 + params.radius_tolerance, g.theta(r.worst)))
    };
    let (stable0, theta0) = eval(dt0, stepper, &mut evaluations, lo, hi)?;
    if stable0 {
        lo = Some(dt0);
        let mut dt = dt0;
        for _ in 0..MAX_SCALINGS {
            dt *= 2.0;
            let (s, th) = eval(dt, stepper, &mut evaluations, lo, hi)?;
            if s {
                lo = Some(dt);
            } else {
                hi = Some(dt);
                worst_at_hi = Some(th);
                break;
            }
        }
    } else {
        hi = Some(dt0);
        worst_at_hi = Some(theta0);
        let mut dt = dt0;
        for _ in 0..MAX_SCALINGS {
            dt *= 0.5;
            let (s, th) = eval(dt, stepper, &mut evaluations, lo, hi)?;
            if s {
                lo = Some(dt);
                break;
            }
            hi = Some(dt);
            worst_at_hi = Some(th);
        }
    }
    let kind = match (lo, hi) {
        (Some(mut a), Some(mut b)) => {
            for _ in 0..MAX_BISECTIONS {
                if (b - a) <= params.tolerance * b {
                    break;
                }
                let mid = 0.5 * (a + b);
                let (s, th) = eval(mid, stepper, &mut evaluations, Some(a), Some(b))?;
                if s {
                    a = mid;
                } else {
                    b = mid;
                    worst_at_hi = Some(th);
                }
            }
            (lo, hi) = (Some(a), Some(b));
            let mut kind = ProbeLimitKind::Bounded;
            for f in [0.5, 0.25, 0.125] {
                let dt = a * f;
                if evaluations.iter().any(|&(t, _)| t == dt) {
                    continue;
                }
                if !eval(dt, stepper, &mut evaluations, lo, hi)?.0 {
                    kind = ProbeLimitKind::Irregular;
                }
            }
            if kind == ProbeLimitKind::Bounded && growth_like_dt(&evaluations, a, dt0, params) {
                kind = ProbeLimitKind::None;
            }
            // an evaluation below the limit that was unstable also breaks it
            if evaluations
                .iter()
                .any(|&(t, r)| t <= a && r > 1.0 + params.radius_tolerance)
            {
                kind = ProbeLimitKind::Irregular;
            }
            kind
        }
        (Some(_), None) => ProbeLimitKind::NotFound,
        _ => ProbeLimitKind::None,
    };
    Ok(ProbeLimit {
        kind,
        dt_lo: lo,
        dt_hi: hi,
        worst_theta: worst_at_hi,
        evaluations,
        runs: stepper.runs() - start_runs,
    })
}
