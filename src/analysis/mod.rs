//! The analyses of a [`Problem`] under a [`Plan`]: the spectral-radius map at the
//! problem's Δt, the largest stable Δt (overall and by direction), non-normality
//! and transient growth, dispersion and dissipation, the worst-case modes — all
//! into one typed [`Results`].
//!
//! This file is the register of the analyses: the [`Plan`] (one optional
//! parameter struct per analysis), the [`Results`] (one optional result per
//! analysis) and [`analyse`], the one entry point. It assembles the operator,
//! sweeps the grid once (`sweep`: radius map and first-exit screening for
//! one-step and multistep methods, ρ(G) for composite schemes), then runs each
//! analysis the plan asks for. Each analysis's parameters, result type and
//! computation live in its own module. Parallelism and progress are passed in;
//! the library never prints.
//!
//! ```
//! use kgain::analysis::{LimitParams, Plan};
//! let plan = Plan::new(&[129, 129]).with_limit(LimitParams { directions: 72 });
//! assert!(plan.radius.is_none() && plan.limit.is_some());
//! ```

pub mod cautions;
pub mod context;
pub mod dispersion;
pub mod footprint;
pub mod fourier_footprint;
pub mod growth;
pub mod limit;
pub mod modes;
pub mod norm;
pub mod radius;
pub mod samples;
mod sweep;

pub use context::amplification_at;
pub use dispersion::{DispersionParams, DispersionResult};
pub use growth::{GrowthParams, GrowthResult};
pub use limit::{
    DirectionalLimit, FoundBy, Limit, LimitKind, LimitParams, LimitResult, Verification,
};
pub use radius::{RadiusParams, RadiusResult};
pub use samples::Samples;

use crate::error::InputError;
use crate::problem::Problem;
use crate::sample::{Grid, Par, Progress};
use context::Context;
use limit::first_exit::ExitTimes;
use limit::search::CompositeEval;
use modes::Mode;

/// Largest number of points per axis.
pub const MAX_POINTS: usize = 1 << 20;
/// Largest number of wavevectors in one run.
pub const MAX_NODES: usize = 1 << 31;
/// Largest number of wave directions.
pub const MAX_DIRECTIONS: usize = 1 << 17;
/// Largest growth horizon.
pub const MAX_STEPS: usize = 1 << 20;
/// Largest number of sampled matrices.
pub const MAX_MATRICES: usize = 1 << 16;

/// A quantity that could not be computed at some wavevectors.
#[derive(Debug, Clone, PartialEq)]
pub struct NonFinite {
    /// What it is.
    pub quantity: &'static str,
    /// At how many wavevectors.
    pub count: usize,
    /// The first such wavevector.
    pub wavevector: Vec<f64>,
}

/// The analyses to run and how.
#[derive(Debug, Clone, PartialEq)]
pub struct Plan {
    /// Wavevector samples per axis over [−π, π] (both ends included).
    pub points: Vec<usize>,
    /// The radius map, if asked.
    pub radius: Option<RadiusParams>,
    /// The limit, if asked.
    pub limit: Option<LimitParams>,
    /// Growth, if asked.
    pub growth: Option<GrowthParams>,
    /// Dispersion, if asked.
    pub dispersion: Option<DispersionParams>,
    /// |λ| ≤ 1 + tolerance counts as stable (shared by every analysis).
    pub tolerance: f64,
    /// How many amplification matrices to keep for external cross-checks.
    pub matrices: usize,
}

impl Plan {
    /// A plan on a grid of `points` per axis, with no analysis yet.
    pub fn new(points: &[usize]) -> Plan {
        Plan {
            points: points.to_vec(),
            radius: None,
            limit: None,
            growth: None,
            dispersion: None,
            tolerance: 1e-12,
            matrices: 0,
        }
    }

    /// Every analysis with its defaults on the default grid of `dims` axes
    /// (129 points per axis in 1-D and 2-D, 33 in 3-D; 400 directions in 3-D).
    pub fn all(dims: usize) -> Plan {
        let n = if dims == 3 { 33 } else { 129 };
        let directions = match dims {
            1 => 2,
            2 => 180,
            _ => 400,
        };
        Plan::new(&vec![n; dims])
            .with_radius()
            .with_limit(LimitParams { directions })
            .with_growth(GrowthParams::default())
            .with_dispersion(DispersionParams {
                directions: DispersionParams::default_directions(dims, directions),
                ..Default::default()
            })
    }

    /// Adds the radius map.
    pub fn with_radius(mut self) -> Self {
        self.radius = Some(RadiusParams);
        self
    }

    /// Adds the limit.
    pub fn with_limit(mut self, p: LimitParams) -> Self {
        self.limit = Some(p);
        self
    }

    /// Adds growth.
    pub fn with_growth(mut self, p: GrowthParams) -> Self {
        self.growth = Some(p);
        self
    }

    /// Adds dispersion.
    pub fn with_dispersion(mut self, p: DispersionParams) -> Self {
        self.dispersion = Some(p);
        self
    }

    /// Sets the stability tolerance (of every analysis).
    pub fn with_tolerance(mut self, tolerance: f64) -> Self {
        self.tolerance = tolerance;
        self
    }

    /// Checks the plan against a problem; errors name the case-file key.
    pub fn check(&self, problem: &Problem) -> Result<(), InputError> {
        let dims = problem.dims();
        if self.points.len() != dims {
            return Err(InputError::new(
                "scan.points",
                format!(
                    "needs one count per axis ({dims}), got {}",
                    self.points.len()
                ),
            ));
        }
        for (i, n) in self.points.iter().enumerate() {
            if *n < 2 || *n > MAX_POINTS {
                return Err(InputError::new(
                    format!("scan.points.{i}"),
                    format!("must lie between 2 and {MAX_POINTS}, got {n}"),
                ));
            }
        }
        let nodes = self.points.iter().fold(1u128, |p, &n| p * n as u128);
        if nodes > MAX_NODES as u128 {
            return Err(InputError::new(
                "scan.points",
                format!(
                    "asks for {nodes} wavevectors; at most {MAX_NODES} are analysed in one run"
                ),
            ));
        }
        let cap = |key: &str, v: usize, max: usize| match v > max {
            true => Err(InputError::new(
                key,
                format!("must be at most {max}, got {v}"),
            )),
            false => Ok(()),
        };
        cap("scan.matrices", self.matrices, MAX_MATRICES)?;
        if let Some(l) = &self.limit {
            cap("scan.directions", l.directions, MAX_DIRECTIONS)?;
        }
        if let Some(g) = &self.growth {
            cap("scan.steps", g.steps, MAX_STEPS)?;
        }
        if let Some(d) = &self.dispersion {
            cap(
                "scan.dispersion_directions",
                d.directions,
                dispersion::MAX_CURVE_DIRECTIONS,
            )?;
        }
        if !(0.0..1e-2).contains(&self.tolerance) {
            return Err(InputError::new("scan.tolerance", "must lie in [0, 0.01)"));
        }
        let none = self.radius.is_none() && self.limit.is_none();
        if none && self.growth.is_none() && self.dispersion.is_none() {
            return Err(InputError::new("scan.analyses", "names no analysis"));
        }
        if let Some(g) = &self.growth {
            g.check(problem)?;
        }
        if let Some(d) = &self.dispersion {
            d.check()?;
            if problem.method.is_second_order() {
                return Err(InputError::new(
                    "scan.analyses",
                    format!(
                        "the dispersion analysis is not available for the second-order-in-time method '{}' (its frequencies come in +-omega pairs from z = dt^2 mu, which the first-order dispersion analysis does not model)",
                        problem.method.name
                    ),
                )
                .hint("list the other analyses, e.g. analyses = [\"radius\", \"limit\", \"growth\"]"));
            }
        }
        Ok(())
    }
}

/// Whether the scheme is stable at the problem's Δt.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Verdict {
    /// Stable by every analysis that ran.
    Stable,
    /// Unstable: the radius exceeds 1 + tolerance, no Δt is stable, or Δt is
    /// above the limit.
    Unstable,
}

/// Everything the analyses produced.
#[derive(Debug, Clone)]
pub struct Results {
    /// The plan that was run.
    pub plan: Plan,
    /// The wavevector grid.
    pub grid: Grid,
    /// The problem's Δt.
    pub dt: f64,
    /// Its Courant number (None without a wave speed).
    pub courant: Option<f64>,
    /// Its diffusion number (None without diffusion).
    pub diffusion_number: Option<f64>,
    /// Spectral radius, if asked.
    pub radius: Option<RadiusResult>,
    /// The limit, if asked.
    pub limit: Option<LimitResult>,
    /// Non-normality and transient growth, if asked.
    pub growth: Option<GrowthResult>,
    /// Dispersion and dissipation, if asked.
    pub dispersion: Option<DispersionResult>,
    /// Worst-case modes of each measure computed.
    pub modes: Vec<Mode>,
    /// Sampled matrices, if asked.
    pub samples: Option<Samples>,
    /// Δt·eig L(θ) at sampled wavevectors (with the radius map; one-step and
    /// multistep methods only).
    pub footprint: Option<fourier_footprint::FourierFootprint>,
    /// Nodes where the eigenvalue kernel failed (their values are NaN).
    pub failures: usize,
    /// Quantities that came out NaN at some wavevectors (a failure, not a result).
    pub non_finite: Vec<NonFinite>,
    /// Stable or not at the problem's Δt.
    pub verdict: Verdict,
    /// The cautions every report carries, and the case-specific ones.
    pub cautions: Vec<String>,
}

/// Why an analysis could not run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum AnalysisError {
    /// The plan does not fit the problem.
    #[error(transparent)]
    Plan(#[from] InputError),
}

/// Runs every analysis `plan` asks for on `problem`.
pub fn analyse(
    problem: &Problem,
    plan: &Plan,
    par: Par,
    progress: &dyn Progress,
) -> Result<Results, AnalysisError> {
    plan.check(problem)?;
    let ctx = Context::new(problem, plan, par, progress);
    let tol = plan.tolerance;
    let want_radius = plan.radius.is_some();
    let (radius_map, limit, (failures, first_failure), pick): (_, _, _, Box<dyn Fn(_) -> f64>) =
        match problem.method.composite() {
            Some(scheme) => {
                let ev = CompositeEval::new(problem, &ctx.op, scheme);
                let swept = want_radius.then(|| sweep::composite(&ctx, &ev));
                let limit = plan
                    .limit
                    .as_ref()
                    .map(|p| limit::by_search(&ctx, &ev, p.directions));
                let failures = swept
                    .as_ref()
                    .map_or((0, None), |s| (s.failures, s.first_failure));
                (
                    swept.map(|s| s.map),
                    limit,
                    failures,
                    Box::new(|mu: num_complex::Complex64| mu.norm()),
                )
            }
            None => {
                let exits = ExitTimes::new(&problem.method);
                // growth and dispersion sweep the grid themselves (and note
                // their own kernel failures): without a radius map or a limit
                // there is nothing to sweep for here
                let swept = if want_radius || plan.limit.is_some() {
                    sweep::spectral(&ctx, &exits, want_radius, plan.limit.is_some())
                } else {
                    sweep::Swept::default()
                };
                let limit = plan
                    .limit
                    .as_ref()
                    .map(|p| limit::by_first_exit(&ctx, &exits, &swept.screen, p.directions));
                let exact = move |mu| -exits.exact(mu);
                let map = want_radius.then_some(swept.map);
                let failures = (swept.failures, swept.first_failure);
                (map, limit, failures, Box::new(exact))
            }
        };
    let radius = radius_map.map(|map| radius::result(map, &ctx.grid, tol));
    let samples = (plan.matrices > 0).then(|| samples::sample(&ctx, plan.matrices));
    let footprint = plan
        .radius
        .as_ref()
        .and_then(|_| fourier_footprint::footprint(&ctx));
    let growth = plan.growth.as_ref().map(|p| growth::analyse(&ctx, p));
    let dispersion = plan
        .dispersion
        .as_ref()
        .map(|p| dispersion::analyse(&ctx, p));
    let dt = ctx.dt;
    let unstable = radius.as_ref().is_some_and(|r| !r.stable)
        || limit.as_ref().is_some_and(|l| {
            l.kind == LimitKind::None || (l.kind == LimitKind::Bounded && dt > l.dt_max)
        });
    let mut r = Results {
        plan: plan.clone(),
        grid: ctx.grid.clone(),
        dt,
        courant: problem.courant_of(dt),
        diffusion_number: problem.diffusion_number_of(dt),
        radius,
        limit,
        growth,
        dispersion,
        modes: Vec::new(),
        samples,
        footprint,
        failures,
        non_finite: Vec::new(),
        verdict: if unstable {
            Verdict::Unstable
        } else {
            Verdict::Stable
        },
        cautions: Vec::new(),
    };
    let weights = plan.growth.as_ref().and_then(|g| g.weights.as_deref());
    r.modes = modes::worst_modes(&ctx, &r, weights, &*pick);
    r.non_finite = non_finite(&r, first_failure);
    r.cautions = cautions::cautions(problem, &r);
    Ok(r)
}

/// The quantities that are NaN somewhere: eigenvalues of L (the main sweep), the
/// limit, ‖G‖₂ and the departure, the semi-discrete frequencies.
fn non_finite(r: &Results, first_failure: Option<usize>) -> Vec<NonFinite> {
    let at = |flat: usize| {
        let mut idx = vec![0usize; r.grid.points.len()];
        r.grid.unravel(flat, &mut idx);
        r.grid.theta(&idx)
    };
    let mut out = Vec::new();
    let mut note = |quantity, count: usize, first: Option<usize>| {
        if let (true, Some(f)) = (count > 0, first) {
            out.push(NonFinite {
                quantity,
                count,
                wavevector: at(f),
            });
        }
    };
    note(
        "eigenvalues of L and spectral radius of G",
        r.failures,
        first_failure,
    );
    if let Some(g) = &r.growth {
        let bad = |v: &f64| v.is_nan();
        let count = g.norm.iter().filter(|v| bad(v)).count();
        note(
            "||G||_2 and the departure from normality",
            count,
            g.norm.iter().position(bad),
        );
        // a Schur form that converged but a departure or an eigenvector
        // condition number that did not (NaN; infinite is a defective G, a value)
        let count = g.departure.iter().filter(|v| bad(v)).count();
        if g.norm.iter().all(|v| !bad(v)) {
            note(
                "departure from normality",
                count,
                g.departure.iter().position(bad),
            );
        }
        let count = g.condition.iter().filter(|v| bad(v)).count();
        note(
            "eigenvector condition number",
            count,
            g.condition.iter().position(bad),
        );
    }
    if let Some(d) = &r.dispersion {
        let bad = |n: &[num_complex::Complex64]| n.iter().any(|w| w.re.is_nan() || w.im.is_nan());
        let nodes = || d.numerical.chunks(d.modes().max(1));
        note(
            "semi-discrete frequencies",
            nodes().filter(|n| bad(n)).count(),
            nodes().position(bad),
        );
    }
    if let Some(l) = r.limit.as_ref().filter(|l| l.dt_max.is_nan()) {
        out.push(NonFinite {
            quantity: "largest stable dt",
            count: 1,
            wavevector: l.wavevector.clone(),
        });
    }
    out
}
