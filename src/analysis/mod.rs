//! The analyses of a [`Problem`] under a [`Plan`]: the spectral-radius map at the
//! problem's Δt, the largest stable Δt (overall and by direction), non-normality
//! and transient growth, dispersion and dissipation, the worst-case modes — all
//! into one typed [`Results`].
//!
//! [`analyse`] is the one entry point. It assembles the operator, sweeps the
//! grid once ([`sweep`]: radius map and first-exit screening for one-step and
//! multistep methods, ρ(G) for composite schemes), then runs each analysis the
//! plan asks for. Parallelism and progress are passed in; the library never
//! prints.

pub mod cautions;
pub mod context;
pub mod dispersion;
pub mod growth;
pub mod limit;
pub mod modes;
pub mod norm;
pub mod plan;
pub mod results;
pub mod samples;
mod sweep;

pub use context::amplification_at;
pub use limit::{DirectionalLimit, FoundBy, Limit, LimitKind, LimitResult, Verification};
pub use plan::{DispersionParams, GrowthParams, LimitParams, Plan, RadiusParams};
pub use results::{RadiusResult, Results, Samples, Verdict};

use crate::error::InputError;
use crate::problem::Problem;
use crate::sample::{Par, Progress};
use context::Context;
use limit::first_exit::ExitTimes;
use limit::search::CompositeEval;

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
    let (radius_map, limit, failures, pick): (_, _, _, Box<dyn Fn(_) -> f64>) =
        match problem.method.composite() {
            Some(scheme) => {
                let ev = CompositeEval::new(problem, &ctx.op, scheme, tol);
                let swept = want_radius.then(|| sweep::composite(&ctx, &ev));
                let limit = plan
                    .limit
                    .as_ref()
                    .map(|p| limit::by_search(&ctx, &ev, p.directions));
                let failures = swept.as_ref().map_or(0, |s| s.failures);
                (
                    swept.map(|s| s.map),
                    limit,
                    failures,
                    Box::new(|mu: num_complex::Complex64| mu.norm()),
                )
            }
            None => {
                let exits = ExitTimes::new(&problem.method, tol, 1e-13 * ctx.op.scale());
                let swept = sweep::spectral(&ctx, &exits, want_radius, plan.limit.is_some());
                let limit = plan
                    .limit
                    .as_ref()
                    .map(|p| limit::by_first_exit(&ctx, &exits, &swept.screen, p.directions));
                let exact = move |mu| -exits.exact(mu, 0.0);
                let map = want_radius.then_some(swept.map);
                (map, limit, swept.failures, Box::new(exact))
            }
        };
    let radius = radius_map.map(|map| sweep::radius_result(map, &ctx.grid, tol));
    let samples = (plan.matrices > 0).then(|| samples::sample(&ctx, plan.matrices));
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
        failures,
        verdict: if unstable {
            Verdict::Unstable
        } else {
            Verdict::Stable
        },
        cautions: Vec::new(),
    };
    let weights = plan.growth.as_ref().and_then(|g| g.weights.as_deref());
    r.modes = modes::worst_modes(&ctx, &r, weights, &*pick);
    r.cautions = cautions::cautions(problem, &r);
    Ok(r)
}
