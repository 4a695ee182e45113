//! The largest stable Δt, overall and along each wave direction.
//!
//! For one-step and linear multistep methods the limit comes from the exact
//! first exit of each eigenvalue of L from the method's stability region
//! ([`first_exit`], [`overall`]); for composite schemes from a verified search on
//! Δt ([`search`]). Both give a [`LimitResult`] of the same shape.

pub mod abscissa;
pub mod certify;
pub mod closed_form;
pub mod composite;
pub mod eigenpairs;
pub mod first_exit;
pub mod forward_backward;
pub mod growth_orders;
pub mod imex_euler;
pub mod lax_friedrichs;
pub mod lax_wendroff;
pub mod longwave;
pub mod loss;
pub mod overall;
pub mod per_theta;
pub mod principal_root;
pub mod rays;
pub mod search;
pub mod split;

use super::context::Context;
use crate::numeric::directions;
use crate::sample::Stage;
use first_exit::ExitTimes;
use search::CompositeEval;

pub use overall::wrap;

/// The largest stable Δt, overall and by wave direction.
#[derive(Debug, Clone, PartialEq)]
pub struct LimitParams {
    /// Wave directions (2-D angles, 3-D sphere points; 1-D always ±x).
    pub directions: usize,
}

impl Default for LimitParams {
    fn default() -> Self {
        LimitParams { directions: 180 }
    }
}

/// What kind of limit the scheme has.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LimitKind {
    /// A finite largest stable Δt.
    Bounded,
    /// Stable for every Δt > 0.
    Unconditional,
    /// Unstable for every Δt > 0.
    None,
}

impl LimitKind {
    /// The name used in summary.json.
    pub fn as_str(&self) -> &'static str {
        match self {
            LimitKind::Bounded => "bounded",
            LimitKind::Unconditional => "unconditional",
            LimitKind::None => "none",
        }
    }
}

/// A limit and the wavevector that sets it.
#[derive(Debug, Clone)]
pub struct Limit {
    /// Kind.
    pub kind: LimitKind,
    /// Largest stable Δt (∞ for unconditional, 0 for none).
    pub dt_max: f64,
    /// The wavevector that sets it, wrapped into [−π, π]^d.
    pub wavevector: Vec<f64>,
    /// A certified lower bound of the first loss of stability near the points
    /// where limits are approached but not attained (θ = 0, corners, faces),
    /// over every direction: the smallest long-wave limit less its uncertainty
    /// (∞ when no such point needed one). The floor of a ray whose own
    /// long-wave extrapolation is inconclusive.
    pub long_wave_floor: f64,
}

/// How a limit was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FoundBy {
    /// First exit from the exact stability region (one-step, multistep).
    FirstExit,
    /// A search on Δt (composite schemes).
    Search,
}

impl FoundBy {
    /// A sentence for summaries.
    pub fn describe(self) -> &'static str {
        match self {
            FoundBy::FirstExit => "first exit from the exact stability region, refined in continuous wavevector space",
            FoundBy::Search => "search on dt (bracketing and bisection over the wavevector grid), refined in continuous wavevector space, verified by a uniform dt scan below the limit",
        }
    }
}

/// What the uniform Δt scan below a searched limit found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Verification {
    /// How many Δt values below the limit were scanned.
    pub steps_scanned: usize,
    /// Whether every one was stable everywhere (after any correction).
    pub stable_below: bool,
    /// Whether the scan found an earlier loss of stability and moved the limit down.
    pub moved_down: bool,
}

/// Wave directions and the limit along each.
#[derive(Debug, Clone)]
pub struct DirectionalLimit {
    /// Unit vectors in θ-space.
    pub directions: Vec<Vec<f64>>,
    /// Largest stable Δt along each.
    pub dt: Vec<f64>,
    /// The wavevector setting each.
    pub wavevector: Vec<Vec<f64>>,
    /// Courant number of each Δt (empty without a wave speed).
    pub courant: Vec<f64>,
    /// Index of the direction with the smallest Δt.
    pub worst: usize,
}

impl DirectionalLimit {
    /// The smallest Δt over the directions (that of [`DirectionalLimit::worst`]).
    pub fn smallest(&self) -> f64 {
        self.dt.get(self.worst).copied().unwrap_or(f64::INFINITY)
    }

    /// The largest finite-or-infinite Δt over the directions (NaN ignored).
    pub fn largest(&self) -> f64 {
        self.dt.iter().copied().fold(0.0, f64::max)
    }

    /// The directions as angles in [0, 2π) (1-D and 2-D: the angle of the unit vector).
    pub fn angles(&self) -> Vec<f64> {
        self.directions
            .iter()
            .map(|v| {
                v.get(1)
                    .copied()
                    .unwrap_or(0.0)
                    .atan2(v[0])
                    .rem_euclid(std::f64::consts::TAU)
            })
            .collect()
    }
}

/// The limit analysis.
#[derive(Debug, Clone)]
pub struct LimitResult {
    /// Kind.
    pub kind: LimitKind,
    /// Largest stable Δt (∞ for unconditional, 0 for none).
    pub dt_max: f64,
    /// The wavevector that sets it, wrapped into [−π, π]^d.
    pub wavevector: Vec<f64>,
    /// dt_max as a Courant number (None without a wave speed or when unbounded).
    pub courant_max: Option<f64>,
    /// dt_max as a diffusion number (None without diffusion or when unbounded).
    pub diffusion_number_max: Option<f64>,
    /// Whether the problem's Δt is within the limit.
    pub stable_at_dt: bool,
    /// A certified bracket [dt_lo, dt_hi] of a bounded limit: stable on
    /// (0, dt_lo], unstable just above dt_hi; dt_max = dt_lo.
    pub bracket: Option<(f64, f64)>,
    /// How it was found.
    pub found_by: FoundBy,
    /// For searched limits: the scan below it.
    pub verification: Option<Verification>,
    /// The limit by wave direction.
    pub by_direction: DirectionalLimit,
    /// Set when a bounded limit was found below [`RESOLVED`] times the time
    /// scale 1/‖L‖ and is reported as kind none: (the limit found, the
    /// smallest Δt resolved).
    pub below_resolution: Option<(f64, f64)>,
}

/// The smallest limit reported as bounded, as a fraction of the time scale
/// 1/‖L‖ of the fastest wave. Below it ρ(G) − 1 of a growth that follows a
/// power Δtᵖ (p ≥ 2: a scheme unstable at every Δt, forward Euler with central
/// differences) is beneath the rounding of G, so stability there cannot be
/// verified; such a limit is of no practical use, and a scheme whose first loss
/// falls to 0 towards long waves as a high power of |θ| (weak high-order
/// dissipation against a growth of lower order) shows one there when its true
/// limit is 0. Such limits, overall or per direction, are reported as none,
/// the safe side.
pub const RESOLVED: f64 = 1e-7;

/// Wave directions for the limit: ±x in 1-D, angles in 2-D, sphere points in 3-D.
pub fn limit_directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    directions::unit_vectors(dims, count)
}

/// The limit of a one-step or multistep method from the screened candidates.
pub(super) fn by_first_exit(
    ctx: &Context,
    exits: &ExitTimes,
    screen: &[(usize, f64, f64)],
    count: usize,
) -> LimitResult {
    let (op, tol) = (&ctx.op, ctx.plan.tolerance);
    let (overall, bracket) = ctx
        .par
        .run(|| overall::overall(op, exits, tol, &ctx.grid, screen));
    let dirs = limit_directions(ctx.problem.dims(), count);
    let per_ray = (ctx.grid.points.iter().max().copied().unwrap_or(2) / 2).max(32);
    let certified = certified_floor(&overall);
    let res = along_rays(ctx, &dirs, |n| {
        if let Some(theta) = abscissa::unstable_on_ray(op, tol, n, per_ray) {
            return (0.0, theta);
        }
        rays::ray_limit(&loss::Exact::new(op, exits, tol), n, per_ray, certified)
    });
    finish(ctx, overall, bracket, dirs, res, FoundBy::FirstExit, None)
}

/// The limit of a composite scheme by the verified search.
pub(super) fn by_search(ctx: &Context, ev: &CompositeEval, count: usize) -> LimitResult {
    let (overall, bracket, verification) = ctx
        .par
        .run(|| composite::overall(ev, &ctx.op, ctx.plan.tolerance, &ctx.grid));
    let dirs = limit_directions(ctx.problem.dims(), count);
    let per_ray = (ctx.grid.points.iter().max().copied().unwrap_or(2) / 2).max(48);
    let floor = match overall.kind {
        LimitKind::Bounded => 0.5 * overall.dt_max,
        _ => ev.scale(),
    };
    let certified = certified_floor(&overall);
    // θ = 0 lies on every ray: when it is itself unstable at every Δt (AB2 on
    // a source with imaginary eigenvalues, seed 5990) every direction is none.
    // An overall none set only by the approach to θ = 0 along some directions
    // leaves the others their own limits (seed 2231: IMEX Euler with
    // fourth-order dissipation is none along θ_x = 0 only, where its upwind
    // term vanishes).
    let origin_unstable = overall.kind == LimitKind::None
        && overall.wavevector.iter().all(|x| *x == 0.0)
        && loss::FirstLoss::at(
            &per_theta::PerTheta::new(ev, floor, ctx.plan.tolerance),
            &vec![0.0; ctx.problem.dims()],
        )
        .dt == 0.0;
    let res = along_rays(ctx, &dirs, |n| {
        if origin_unstable {
            return (0.0, vec![0.0; n.len()]);
        }
        // an unstable L sinks every scheme whose G tends to I + ΔtL; not
        // Lax–Wendroff, Lax–Friedrichs or a filtered step, whose G is built
        // otherwise (seed 1235: Lax–Wendroff with an upwind-biased stencil
        // its G does not use was reported none)
        if ev.tends_to_identity() {
            if let Some(theta) = abscissa::unstable_on_ray(&ctx.op, ctx.plan.tolerance, n, per_ray)
            {
                return (0.0, theta);
            }
        }
        rays::ray_limit(
            &per_theta::PerTheta::new(ev, floor, ctx.plan.tolerance),
            n,
            per_ray,
            certified,
        )
    });
    finish(
        ctx,
        overall,
        bracket,
        dirs,
        res,
        FoundBy::Search,
        Some(verification),
    )
}

/// The floor of the long-wave part of a ray whose own extrapolation is
/// inconclusive: the overall long-wave floor (certified over all directions),
/// never below the overall limit itself (stable up to it at every wavevector;
/// 0 when there is no limit).
fn certified_floor(overall: &Limit) -> f64 {
    match overall.kind {
        LimitKind::None => 0.0,
        _ => overall.long_wave_floor.max(overall.dt_max),
    }
}

/// `ray` over every direction in parallel, each direction whose opposite came
/// earlier mirrored from it (real schemes: the limit is even in θ).
fn along_rays(
    ctx: &Context,
    dirs: &[Vec<f64>],
    ray: impl Fn(&[f64]) -> (f64, Vec<f64>) + Sync,
) -> Vec<(f64, Vec<f64>)> {
    use rayon::prelude::*;
    let opposite = overall::opposites(dirs, ctx.op.real_coefficients);
    ctx.progress.start(Stage::Directions, dirs.len() as u64);
    let computed: Vec<(f64, Vec<f64>)> = ctx.par.run(|| {
        dirs.par_iter()
            .zip(&opposite)
            .map(|(n, opp)| {
                let r = match opp {
                    Some(_) => (f64::NAN, Vec::new()),
                    None => ray(n),
                };
                ctx.progress.advance(1);
                r
            })
            .collect()
    });
    ctx.progress.finish();
    overall::mirror_fill(computed, &opposite)
}

fn finish(
    ctx: &Context,
    mut overall: Limit,
    bracket: Option<(f64, f64)>,
    dirs: Vec<Vec<f64>>,
    res: Vec<(f64, Vec<f64>)>,
    found_by: FoundBy,
    verification: Option<Verification>,
) -> LimitResult {
    let (mut dt, mut wavevector): (Vec<f64>, Vec<Vec<f64>>) = res.into_iter().unzip();
    let resolved = RESOLVED / ctx.op.scale().max(1e-300);
    let mut below_resolution = None;
    if overall.kind == LimitKind::Bounded && overall.dt_max < resolved {
        below_resolution = Some((overall.dt_max, resolved));
        overall.kind = LimitKind::None;
        overall.dt_max = 0.0;
    }
    for d in dt.iter_mut() {
        if *d > 0.0 && *d < resolved {
            *d = 0.0;
        }
    }
    // a ray through the wavevector that sets the overall limit is never above it
    let w = &overall.wavevector;
    let wn = w.iter().map(|x| x * x).sum::<f64>().sqrt();
    if wn > 0.0 && overall.dt_max.is_finite() {
        for (k, n) in dirs.iter().enumerate() {
            let cos = n.iter().zip(w).map(|(a, b)| a * b).sum::<f64>() / wn;
            if cos >= 1.0 - 1e-12 && (dt[k] > overall.dt_max || dt[k].is_nan()) {
                dt[k] = overall.dt_max;
                wavevector[k] = w.clone();
            }
        }
    }
    let p = ctx.problem;
    let courant = match p.system.reference_speed > 0.0 {
        true => dt
            .iter()
            .map(|d| p.courant_of(*d).unwrap_or(f64::NAN))
            .collect(),
        false => Vec::new(),
    };
    let worst = dt
        .iter()
        .enumerate()
        .fold(
            (0, f64::INFINITY),
            |b, (i, v)| if *v < b.1 { (i, *v) } else { b },
        )
        .0;
    let by_direction = DirectionalLimit {
        directions: dirs,
        dt,
        wavevector,
        courant,
        worst,
    };
    reconcile(&mut overall, &by_direction);
    let scaled = |f: Option<f64>| match overall.kind {
        LimitKind::Bounded => f,
        LimitKind::None => f.map(|_| 0.0),
        LimitKind::Unconditional => None,
    };
    LimitResult {
        kind: overall.kind,
        courant_max: scaled(p.courant_of(overall.dt_max)),
        diffusion_number_max: scaled(p.diffusion_number_of(overall.dt_max)),
        stable_at_dt: match overall.kind {
            LimitKind::Bounded => ctx.dt <= overall.dt_max,
            LimitKind::Unconditional => true,
            LimitKind::None => false,
        },
        dt_max: overall.dt_max,
        wavevector: overall.wavevector,
        bracket: match overall.kind {
            LimitKind::Bounded => {
                bracket.map(|(lo, hi)| (overall.dt_max.min(lo), hi.max(overall.dt_max)))
            }
            _ => None,
        },
        found_by,
        verification,
        by_direction,
        below_resolution,
    }
}

/// The overall limit can be no larger than any directional one: on a coarse grid
/// (say every node at θ ∈ {−π, 0, π}) the rays see wavevectors the grid misses.
fn reconcile(overall: &mut Limit, dl: &DirectionalLimit) {
    let best = dl.dt.iter().enumerate().filter(|(_, v)| !v.is_nan()).fold(
        (usize::MAX, f64::INFINITY),
        |b, (i, v)| if *v < b.1 { (i, *v) } else { b },
    );
    // a direction lower only by rounding lowers the value, not the witness
    if best.0 != usize::MAX && best.1 < overall.dt_max && best.1 >= overall.dt_max * (1.0 - 1e-12) {
        overall.dt_max = best.1;
        return;
    }
    if best.0 != usize::MAX && (overall.dt_max.is_nan() || best.1 < overall.dt_max) {
        overall.dt_max = best.1;
        overall.wavevector = dl.wavevector[best.0].iter().map(|x| wrap(*x)).collect();
        overall.kind = if best.1 == 0.0 {
            LimitKind::None
        } else {
            LimitKind::Bounded
        };
    }
}
