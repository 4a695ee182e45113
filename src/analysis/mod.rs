//! Analyses of a validated case: the spectral-radius map at the case's Δt and the
//! largest stable Δt, overall and per wave direction, from one sweep of the
//! operator's eigenvalues over the wavevector grid.

pub mod composite;
pub mod dispersion;
pub mod first_exit;
pub mod growth;
pub mod limit;
pub mod modes;
pub mod refine;

use crate::case::{Analysis, Case};
use crate::operator::{Operator, OperatorError};
use crate::sample::{self, Grid, Par};
use first_exit::{min_over_modes, ExitTimes};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
pub use limit::{Limit, LimitKind};
use num_complex::Complex64 as C64;

/// How to run.
#[derive(Debug, Clone, Copy)]
pub struct Options {
    /// Parallelism.
    pub par: Par,
    /// Whether progress bars may be shown (they also need a terminal).
    pub progress: bool,
}

impl Default for Options {
    fn default() -> Self {
        Options {
            par: Par::Threads(0),
            progress: false,
        }
    }
}

/// The spectral-radius map and its maximum.
#[derive(Debug, Clone)]
pub struct RadiusResult {
    /// ρ(G) per grid node, C order.
    pub map: Vec<f64>,
    /// Largest value (NaN nodes ignored).
    pub max: f64,
    /// Where it is attained.
    pub wavevector: Vec<f64>,
    /// max ≤ 1 + tolerance.
    pub stable: bool,
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
}

/// Amplification matrices at sample nodes, for external cross-checks.
#[derive(Debug, Clone)]
pub struct Samples {
    /// Flat indices of the nodes.
    pub index: Vec<usize>,
    /// θ at each node.
    pub theta: Vec<Vec<f64>>,
    /// L(θ), row-major m×m each.
    pub symbol: Vec<Vec<C64>>,
    /// G(θ, Δt), row-major M×M each.
    pub amplification: Vec<Vec<C64>>,
    /// M.
    pub size: usize,
}

/// Everything the analyses produced.
#[derive(Debug, Clone)]
pub struct Results {
    /// The wavevector grid.
    pub grid: Grid,
    /// The case's Δt.
    pub dt: f64,
    /// Spectral radius, if asked.
    pub radius: Option<RadiusResult>,
    /// Overall limit, if asked.
    pub limit: Option<Limit>,
    /// Per-direction limit, if asked.
    pub directional: Option<DirectionalLimit>,
    /// Sampled matrices, if asked.
    pub samples: Option<Samples>,
    /// Nodes where the eigenvalue kernel failed (their values are NaN).
    pub failures: usize,
    /// How the limit was found.
    pub limit_found_by: &'static str,
    /// For composite schemes: whether the uniform scan of Δt below the limit
    /// confirmed it, and whether it had to move the limit down.
    pub limit_verified: Option<(bool, bool)>,
    /// Non-normality and transient growth, if asked.
    pub growth: Option<GrowthResult>,
    /// Worst-case modes of each measure computed.
    pub modes: Vec<modes::Mode>,
    /// Dispersion and dissipation, if asked.
    pub dispersion: Option<dispersion::DispersionResult>,
}

/// Non-normality maps, the growth envelope and its headline numbers.
#[derive(Debug, Clone)]
pub struct GrowthResult {
    /// ‖G‖₂ per node.
    pub norm: Vec<f64>,
    /// Relative Henrici departure per node.
    pub departure: Vec<f64>,
    /// Eigenvector condition number per node (inf where defective).
    pub condition: Vec<f64>,
    /// max over the grid of ‖Gⁿ‖₂, n = 0..=steps.
    pub envelope: Vec<f64>,
    /// Peak of the envelope: value, step, wavevector.
    pub peak: (f64, usize, Vec<f64>),
    /// Kreiss-constant lower bound and where (None when ρ > 1: infinite).
    pub kreiss: Option<(f64, Vec<f64>)>,
    /// (ε, ε-pseudospectral radius) at the peak wavevector.
    pub pseudospectral: (f64, f64),
    /// Nodes with a defective eigenvalue on the unit circle.
    pub defective_on_circle: usize,
    /// Verdict.
    pub class: &'static str,
    /// Its explanation.
    pub verdict: String,
}

/// Wavevectors per slab of the main sweep.
const SLAB_NODES: usize = 1 << 18;

/// How the limit of one-step and multistep methods is found.
pub const FOUND_BY_EXIT: &str =
    "first exit from the exact stability region, refined in continuous wavevector space";
/// How the limit of composite schemes is found.
pub const FOUND_BY_SEARCH: &str = "search on dt (bracketing and bisection over the wavevector grid), refined in continuous wavevector space, verified by a uniform dt scan below the limit";

/// A progress bar on stderr, drawn only when allowed and stderr is a terminal.
pub fn progress_bar(len: u64, msg: &str, show: bool) -> ProgressBar {
    if !show {
        return ProgressBar::hidden();
    }
    let bar = ProgressBar::with_draw_target(Some(len), ProgressDrawTarget::stderr());
    if let Ok(style) =
        ProgressStyle::with_template("{msg:>12} [{bar:36}] {percent:>3}% {rate:>10} eta {eta}")
    {
        let style = style.with_key(
            "rate",
            |st: &indicatif::ProgressState, w: &mut dyn std::fmt::Write| {
                let _ = write!(w, "{:.0}/s", st.per_sec());
            },
        );
        bar.set_style(style.progress_chars("=> "));
    }
    bar.set_message(msg.to_string());
    bar
}

/// Wave directions for a dimension: ±x in 1D, angles in 2D, sphere points in 3D.
pub fn directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    match dims {
        1 => vec![vec![1.0], vec![-1.0]],
        2 => sample::circle_directions(count)
            .into_iter()
            .map(|a| vec![a.cos(), a.sin()])
            .collect(),
        _ => sample::sphere_directions(count)
            .into_iter()
            .map(|v| v.to_vec())
            .collect(),
    }
}

/// Runs every analysis the case asks for.
pub fn analyse(case: &Case, opts: &Options) -> Result<Results, OperatorError> {
    let op = Operator::assemble(&case.system, &case.spacing, &case.space)?;
    if let Some(c) = case.method.composite() {
        return Ok(analyse_composite(case, opts, &op, c));
    }
    let grid = Grid::new(&case.scan.points);
    let dt = case.dt();
    let method = &case.method;
    let tol = case.scan.tolerance;
    let exits = ExitTimes::new(method, tol, 1e-13 * op.scale());
    let want_radius = case.scan.analyses.contains(&Analysis::Radius);
    let want_limit = case.scan.analyses.contains(&Analysis::Limit);
    let bar = progress_bar(grid.len() as u64, "wavevectors", opts.progress);
    // Real coefficients: eig L(−θ) = conj eig L(θ), and every method here has a
    // real stability function, so radius and first-exit times are even in θ.
    let symmetry = if op.real_coefficients {
        sample::Symmetry::Even
    } else {
        sample::Symmetry::None
    };
    // The grid is swept in slabs of rows: radius values go straight into the map
    // (the output itself) and first-exit times into a bounded list of the best
    // candidates, so memory stays near the size of the outputs on large 3-D scans.
    let row = grid.points[grid.points.len() - 1];
    let computed = sample::computed_rows(&grid, symmetry);
    let slab = (SLAB_NODES / row).max(1);
    let mut map = if want_radius {
        vec![0.0; grid.len()]
    } else {
        Vec::new()
    };
    let mut screen = limit::Candidates::new(limit::SCREEN_CANDIDATES);
    let mut failures = 0usize;
    for r0 in (0..computed).step_by(slab) {
        let r1 = (r0 + slab).min(computed);
        let part: Vec<(f64, f64, f64)> =
            sample::sweep_rows(&op, &grid, opts.par, r0..r1, Some(&bar), |node| match node
                .eigenvalues
            {
                Err(_) => (f64::NAN, f64::NAN, 0.0),
                Ok(eig) => {
                    let radius = if want_radius {
                        eig.iter()
                            .map(|mu| method.amplification_radius(*mu * dt))
                            .fold(0.0, f64::max)
                    } else {
                        0.0
                    };
                    let (t, w) = if want_limit {
                        let noise = first_exit::noise_level(node.symbol);
                        min_over_modes(eig, |mu| exits.estimate(mu, noise))
                    } else {
                        (0.0, 0.0)
                    };
                    (radius, t, w)
                }
            });
        for (k, (rad, t, w)) in part.into_iter().enumerate() {
            let flat = r0 * row + k;
            if rad.is_nan() {
                failures += 1;
            }
            if want_radius {
                map[flat] = rad;
            }
            if want_limit && !t.is_nan() {
                screen.offer(flat, t, w);
            }
        }
    }
    let total = grid.len();
    let mirrored = total - computed * row;
    bar.inc(mirrored as u64);
    if mirrored > 0 {
        // −θ of flat index f is N−1−f
        for f in computed * row..total {
            let v = if want_radius { map[total - 1 - f] } else { 0.0 };
            if v.is_nan() {
                failures += 1;
            }
            if want_radius {
                map[f] = v;
            }
        }
    }
    bar.finish_and_clear();
    let dims = grid.points.len();
    let radius = want_radius.then(|| radius_result(map, &grid, tol));
    let (limit, directional) = if want_limit {
        let screen = screen.into_sorted();
        let overall = opts.par.run(|| limit::overall(&op, &exits, &grid, &screen));
        let dirs = directions(dims, case.scan.directions);
        let per_ray = (grid.points.iter().max().copied().unwrap_or(2) / 2).max(16);
        let dbar = progress_bar(dirs.len() as u64, "directions", opts.progress);
        let res = opts.par.run(|| {
            limit::by_direction(
                &op,
                &exits,
                &dirs,
                per_ray,
                op.real_coefficients,
                Some(&dbar),
            )
        });
        dbar.finish_and_clear();
        let (dt, wavevector) = res.into_iter().unzip();
        let dl = DirectionalLimit {
            directions: dirs,
            dt,
            wavevector,
        };
        let mut overall = overall;
        reconcile(&mut overall, &dl);
        (Some(overall), Some(dl))
    } else {
        (None, None)
    };
    let samples = (case.scan.matrices > 0).then(|| sample_matrices(case, &op, &grid, dt));
    Ok(Results {
        grid,
        dt,
        radius,
        limit,
        directional,
        samples,
        failures,
        limit_found_by: FOUND_BY_EXIT,
        limit_verified: None,
        growth: None,
        modes: Vec::new(),
        dispersion: None,
    })
    .map(|mut r| {
        finish_growth_and_modes(case, &op, opts, &mut r, &|mu| -exits.exact(mu, 0.0));
        r
    })
}

fn analyse_composite(
    case: &Case,
    opts: &Options,
    op: &Operator,
    scheme: &crate::time::composite::Composite,
) -> Results {
    let grid = Grid::new(&case.scan.points);
    let dt = case.dt();
    let tol = case.scan.tolerance;
    let ev = composite::CompositeEval::new(case, op, scheme);
    let symmetry = if op.real_coefficients {
        sample::Symmetry::Even
    } else {
        sample::Symmetry::None
    };
    let dims = grid.points.len();
    let radius = case.scan.analyses.contains(&Analysis::Radius).then(|| {
        let bar = progress_bar(grid.len() as u64, "wavevectors", opts.progress);
        let map = sample::map(&grid, opts.par, symmetry, Some(&bar), |th| {
            ev.radius(th, dt)
        });
        bar.finish_and_clear();
        radius_result(map, &grid, tol)
    });
    let failures = radius
        .as_ref()
        .map_or(0, |r| r.map.iter().filter(|v| v.is_nan()).count());
    let mut verified = None;
    let (limit, directional) = if case.scan.analyses.contains(&Analysis::Limit) {
        let overall = opts.par.run(|| ev.overall(&grid));
        verified = Some((overall.verified, overall.corrected));
        let dirs = directions(dims, case.scan.directions);
        let per_ray = (grid.points.iter().max().copied().unwrap_or(2) / 4).max(16);
        let dbar = progress_bar(dirs.len() as u64, "directions", opts.progress);
        let start = overall.limit.dt_max;
        let res = opts
            .par
            .run(|| ev.by_direction(&dirs, per_ray, start, Some(&dbar)));
        dbar.finish_and_clear();
        let (dtv, wavevector) = res.into_iter().unzip();
        let dl = DirectionalLimit {
            directions: dirs,
            dt: dtv,
            wavevector,
        };
        let mut lim = overall.limit;
        reconcile(&mut lim, &dl);
        (Some(lim), Some(dl))
    } else {
        (None, None)
    };
    let samples = (case.scan.matrices > 0).then(|| sample_matrices(case, op, &grid, dt));
    let mut r = Results {
        grid,
        dt,
        radius,
        limit,
        directional,
        samples,
        failures,
        limit_found_by: FOUND_BY_SEARCH,
        limit_verified: verified,
        growth: None,
        modes: Vec::new(),
        dispersion: None,
    };
    finish_growth_and_modes(case, op, opts, &mut r, &|mu| mu.norm());
    r
}

/// The overall limit can be no larger than any directional one: on a coarse grid
/// (say every node at θ ∈ {−π, 0, π}) the rays see wavevectors the grid misses.
fn reconcile(overall: &mut Limit, dl: &DirectionalLimit) {
    let best = dl.dt.iter().enumerate().filter(|(_, v)| !v.is_nan()).fold(
        (usize::MAX, f64::INFINITY),
        |b, (i, v)| if *v < b.1 { (i, *v) } else { b },
    );
    if best.0 != usize::MAX && (overall.dt_max.is_nan() || best.1 < overall.dt_max) {
        overall.dt_max = best.1;
        overall.wavevector = dl.wavevector[best.0]
            .iter()
            .map(|x| limit::wrap(*x))
            .collect();
        overall.kind = if best.1 == 0.0 {
            LimitKind::None
        } else {
            LimitKind::Bounded
        };
    }
}

/// G(θ, Δt) for any method.
pub fn amplification_at(
    case: &Case,
    op: &Operator,
    theta: &[f64],
    dt: f64,
) -> nalgebra::DMatrix<C64> {
    match case.method.composite() {
        Some(c) => {
            crate::time::composite::amplification(c, &case.system, op, &case.spacing, theta, dt)
        }
        None => case
            .method
            .amplification_matrix(&(op.symbol_matrix(theta) * C64::new(dt, 0.0))),
    }
}

/// The growth analysis (when asked) and the worst-case modes of every measure.
/// `limit_pick` ranks eigenvalues of L for the limit mode (largest first).
fn finish_growth_and_modes(
    case: &Case,
    op: &Operator,
    opts: &Options,
    r: &mut Results,
    limit_pick: &(dyn Fn(C64) -> f64 + Sync),
) {
    let dt = r.dt;
    let vars = &case.system.variables;
    if case.scan.analyses.contains(&Analysis::Growth) {
        r.growth = Some(growth_analysis(case, op, opts, &r.grid, dt));
    }
    if case.scan.analyses.contains(&Analysis::Dispersion) {
        r.dispersion = Some(dispersion_analysis(case, op, opts, &r.grid, dt));
    }
    let weights = state_transform(case);
    if let Some(rad) = &r.radius {
        let g = amplification_at(case, op, &rad.wavevector, dt);
        if let Some((lam, v)) = modes::eigenpair(&g, |z| z.norm()) {
            let w = -lam.arg() / dt;
            let v = scale_vector(v, &weights);
            let mode = modes::finish("radius", &rad.wavevector, v, vars, lam, Some(w));
            r.modes.push(mode);
        }
    }
    if let Some(gr) = r.growth.as_ref().filter(|g| g.peak.0 > 1.0 + 1e-6) {
        let (_, n, theta) = &gr.peak;
        let g = weighted(amplification_at(case, op, theta, dt), &weights);
        let (factor, v) = growth::optimal_perturbation(&g, *n);
        let lam = modes::eigenpair(&g, |z| z.norm()).map(|p| p.0);
        let w = lam.map(|l| -l.arg() / dt);
        let mode = modes::finish("growth", theta, v, vars, C64::new(factor, 0.0), w);
        r.modes.push(mode);
    }
    if let Some(l) = &r.limit {
        if l.kind == LimitKind::Bounded {
            let pair = match case.method.composite() {
                Some(_) => {
                    let g = amplification_at(case, op, &l.wavevector, l.dt_max * (1.0 + 1e-6));
                    modes::eigenpair(&g, |z| z.norm()).map(|(lam, v)| (lam, v, -lam.arg() / dt))
                }
                None => modes::eigenpair(&op.symbol_matrix(&l.wavevector), limit_pick)
                    .map(|(mu, v)| (mu, v, -mu.im)),
            };
            if let Some((val, v, w)) = pair {
                let v = scale_vector(v, &weights);
                let mode = modes::finish("limit", &l.wavevector, v, vars, val, Some(w));
                r.modes.push(mode);
            }
        }
    }
}

/// W v, normalised: a mode in the weighted (energy-like) variables.
fn scale_vector(v: Vec<C64>, w: &NormTransform) -> Vec<C64> {
    let n = v.len();
    let x = w.w.view((0, 0), (n, n)) * nalgebra::DVector::from_vec(v);
    let n = x.norm();
    if n > 0.0 && n.is_finite() {
        (x / C64::new(n, 0.0)).iter().copied().collect()
    } else {
        x.iter().copied().collect()
    }
}

fn dispersion_analysis(
    case: &Case,
    op: &Operator,
    opts: &Options,
    grid: &Grid,
    dt: f64,
) -> dispersion::DispersionResult {
    type NodeOut = (
        Vec<C64>,
        Vec<C64>,
        Vec<C64>,
        Vec<Vec<f64>>,
        Vec<Vec<f64>>,
        Vec<Vec<f64>>,
    );
    let f = dispersion::Frequencies::new(case, op);
    let bar = progress_bar(grid.len() as u64, "dispersion", opts.progress);
    let nodes: Vec<NodeOut> =
        sample::map(grid, opts.par, sample::Symmetry::None, Some(&bar), |th| {
            let (num, exact) = f.matched(th);
            let disc = f.discrete(th, &num, dt);
            let (gn, ge) = f.group_velocities(th, &num, &exact);
            let gd = f.discrete_group_velocities(th, &num, &disc, dt);
            (num, exact, disc, gn, ge, gd)
        });
    bar.finish_and_clear();
    let dirs = dispersion::curve_directions(grid.points.len(), case.scan.directions);
    let curves: Vec<_> = opts.par.run(|| {
        use rayon::prelude::*;
        dirs.par_iter()
            .map(|n| dispersion::curve(&f, n, dt))
            .collect()
    });
    let names = dispersion::mode_names(&case.system);
    let m = names.len();
    let tol = case.scan.phase_tolerance;
    let resolution = dispersion::worst_resolution(&curves, m, tol);
    let computational = nodes.first().map_or(0, |n| n.2.len().saturating_sub(m));
    let ppw = curves.first().map(|c| c.0.clone()).unwrap_or_default();
    let mut numerical = Vec::with_capacity(nodes.len());
    let mut exact = Vec::with_capacity(nodes.len());
    let mut discrete = Vec::with_capacity(nodes.len());
    let mut group = Vec::with_capacity(nodes.len());
    let mut group_exact = Vec::with_capacity(nodes.len());
    let mut group_discrete = Vec::with_capacity(nodes.len());
    for (a, b, c, d, e, g) in nodes {
        group_discrete.push(g);
        numerical.push(a);
        exact.push(b);
        discrete.push(c);
        group.push(d);
        group_exact.push(e);
    }
    let mut phase_curves = Vec::new();
    let mut phase_curves_discrete = Vec::new();
    let mut group_curves = Vec::new();
    for (_, ps, pd, gr) in curves {
        phase_curves.push(ps);
        phase_curves_discrete.push(pd);
        group_curves.push(gr);
    }
    dispersion::DispersionResult {
        names,
        computational,
        numerical,
        exact,
        discrete,
        group,
        group_exact,
        group_discrete,
        directions: dirs,
        ppw,
        phase_curves,
        phase_curves_discrete,
        group_curves,
        resolution,
        tolerance: tol,
    }
}

/// The norm ‖W u‖ of the growth measures over the whole state (W repeated over
/// the time levels), with W⁻¹.
pub struct NormTransform {
    /// W.
    pub w: nalgebra::DMatrix<C64>,
    /// W⁻¹.
    pub inv: nalgebra::DMatrix<C64>,
    /// Whether W is the identity.
    pub identity: bool,
}

/// The model's W (or diag(`scan.weights`)), block-diagonal over the time levels.
pub fn norm_matrix(case: &Case) -> nalgebra::DMatrix<f64> {
    let m = case.system.size();
    let base = match &case.scan.weights {
        Some(w) => nalgebra::DMatrix::from_diagonal(&nalgebra::DVector::from_vec(w.clone())),
        None => case.system.norm_matrix.clone(),
    };
    let levels = case.method.levels();
    let mut full = nalgebra::DMatrix::zeros(m * levels, m * levels);
    for l in 0..levels {
        full.view_mut((l * m, l * m), (m, m)).copy_from(&base);
    }
    full
}

/// The transform of a case.
pub fn state_transform(case: &Case) -> NormTransform {
    let w = norm_matrix(case);
    let n = w.nrows();
    let identity = w == nalgebra::DMatrix::identity(n, n);
    let wc = w.map(|x| C64::new(x, 0.0));
    let inv = wc
        .clone()
        .try_inverse()
        .unwrap_or_else(|| nalgebra::DMatrix::identity(n, n));
    NormTransform {
        w: wc,
        inv,
        identity,
    }
}

/// W G W⁻¹: G in the weighted norm.
fn weighted(g: nalgebra::DMatrix<C64>, w: &NormTransform) -> nalgebra::DMatrix<C64> {
    if w.identity {
        return g;
    }
    &w.w * g * &w.inv
}

fn growth_analysis(
    case: &Case,
    op: &Operator,
    opts: &Options,
    grid: &Grid,
    dt: f64,
) -> GrowthResult {
    let steps = case.scan.steps;
    let w = state_transform(case);
    let env = growth::Envelope::new(steps);
    let bar = progress_bar(grid.len() as u64, "growth", opts.progress);
    let symmetry = if op.real_coefficients {
        sample::Symmetry::Even
    } else {
        sample::Symmetry::None
    };
    let nodes: Vec<(growth::NodeMeasures, (f64, usize))> =
        sample::map(grid, opts.par, symmetry, Some(&bar), |th| {
            growth::node(
                &weighted(amplification_at(case, op, th, dt), &w),
                steps,
                &env,
            )
        });
    bar.finish_and_clear();
    let envelope = env.values();
    let (ipk, (pv, pn)) = nodes
        .iter()
        .enumerate()
        .map(|(i, n)| (i, n.1))
        .filter(|(_, p)| !p.0.is_nan())
        .fold((0, (f64::NEG_INFINITY, 0)), |b, x| {
            if x.1 .0 > b.1 .0 {
                x
            } else {
                b
            }
        });
    let dims = grid.points.len();
    let mut idx = vec![0usize; dims];
    grid.unravel(ipk, &mut idx);
    let peak_theta = grid.theta(&idx);
    let g_peak = weighted(amplification_at(case, op, &peak_theta, dt), &w);
    let rho_max = nodes
        .iter()
        .map(|n| n.0.radius)
        .filter(|v| !v.is_nan())
        .fold(0.0, f64::max);
    let kreiss = {
        let k = growth::kreiss_lower_bound(&g_peak);
        k.is_finite().then_some((k, peak_theta.clone()))
    };
    let eps = case.scan.epsilon;
    let pseudo = growth::pseudospectral_radius(&g_peak, eps);
    let defective_on_circle = nodes
        .iter()
        .filter(|n| n.0.condition.is_infinite() && n.0.radius >= 1.0 - 1e-6)
        .count();
    let tol = case.scan.tolerance;
    let last = envelope.last().copied().unwrap_or(1.0);
    let mid = envelope.get(steps / 2).copied().unwrap_or(1.0);
    let linear_growth = steps >= 8 && last > 2.0 && last >= 1.5 * mid;
    let (class, verdict) = if rho_max > 1.0 + tol {
        (
            "unstable",
            format!("unstable: spectral radius {rho_max:.6} > 1"),
        )
    } else if defective_on_circle > 0 || linear_growth {
        (
            "weakly-unstable",
            format!(
                "weakly unstable: a defective eigenvalue on the unit circle ({defective_on_circle} wavevectors) gives growth linear in n; max ||G^n|| = {last:.4} at n = {steps}"
            ),
        )
    } else if pv > 1.0 + 1e-6 {
        (
            "stable-transient-growth",
            if pn == steps {
                format!("stable with transient growth: max ||G^n|| = {pv:.6}, still growing at the horizon n = {steps} (raise scan.steps)")
            } else {
                format!("stable with transient growth: max ||G^n|| = {pv:.6} at step {pn}")
            },
        )
    } else {
        (
            "stable-normal",
            "stable without transient growth: ||G^n|| <= 1 for every n and wavevector".to_string(),
        )
    };
    GrowthResult {
        norm: nodes.iter().map(|n| n.0.norm).collect(),
        departure: nodes.iter().map(|n| n.0.departure).collect(),
        condition: nodes.iter().map(|n| n.0.condition).collect(),
        envelope,
        peak: (pv, pn, peak_theta),
        kreiss,
        pseudospectral: (eps, pseudo),
        defective_on_circle,
        class,
        verdict,
    }
}

/// `k` flat indices spread over a grid of `n` nodes (a large stride modulo n, so
/// that samples cover every axis).
fn sample_indices(k: usize, n: usize) -> Vec<usize> {
    (0..k)
        .map(|j| {
            if k == 1 {
                n / 2
            } else {
                ((j as u128 * (n as u128 - 1) * 7919 / (k as u128 - 1)) % n as u128) as usize
            }
        })
        .collect()
}

/// Amplification matrices at `case.scan.matrices` nodes spread evenly over the grid.
/// The radius map with its maximum (NaN nodes ignored), where it is, and the verdict.
fn radius_result(map: Vec<f64>, grid: &Grid, tol: f64) -> RadiusResult {
    let (imax, max) = map.iter().enumerate().filter(|(_, v)| !v.is_nan()).fold(
        (0, f64::NEG_INFINITY),
        |b, (i, v)| if *v > b.1 { (i, *v) } else { b },
    );
    let mut idx = vec![0usize; grid.points.len()];
    grid.unravel(imax, &mut idx);
    RadiusResult {
        max,
        wavevector: grid.theta(&idx),
        stable: max <= 1.0 + tol,
        map,
    }
}

fn sample_matrices(case: &Case, op: &Operator, grid: &Grid, dt: f64) -> Samples {
    let k = case.scan.matrices.min(grid.len());
    let index = sample_indices(k, grid.len());
    let mut idx = vec![0usize; grid.points.len()];
    let mut s = Samples {
        index: index.clone(),
        theta: Vec::new(),
        symbol: Vec::new(),
        amplification: Vec::new(),
        size: op.m * case.method.levels(),
    };
    for &i in &index {
        grid.unravel(i, &mut idx);
        let th = grid.theta(&idx);
        let g = amplification_at(case, op, &th, dt);
        s.symbol.push(op.symbol(&th));
        s.amplification.push(crate::linalg::from_matrix(&g));
        s.theta.push(th);
    }
    s
}
