//! The main sweep of the wavevector grid: the spectral-radius map at the
//! problem's Δt and, for one-step and multistep methods, the screening of
//! first-exit times for the limit — both from one eigenvalue computation per
//! wavevector. Composite schemes get their radius map from G itself.
//!
//! The grid is swept in slabs of rows: radius values go straight into the map
//! (the output itself) and first-exit times into a bounded list of the best
//! candidates, so memory stays near the size of the outputs on large 3-D scans.

use super::context::Context;
use super::limit::first_exit::{min_over_modes, ExitTimes};
use super::limit::overall::{Candidates, SCREEN_CANDIDATES};
use super::limit::search::CompositeEval;
use crate::sample::{self, Stage};

/// Wavevectors per slab of the main sweep.
const SLAB_NODES: usize = 1 << 18;

/// What the sweep found.
#[derive(Default)]
pub(super) struct Swept {
    /// ρ(G) per node (empty when the radius was not asked for).
    pub map: Vec<f64>,
    /// The best screened wavevectors (flat index, t*, |μ|), best first.
    pub screen: Vec<(usize, f64, f64)>,
    /// Nodes where the kernel failed.
    pub failures: usize,
    /// The first of them (flat index).
    pub first_failure: Option<usize>,
}

/// One sweep for a method whose G is a function of eig L.
pub(super) fn spectral(
    ctx: &Context,
    exits: &ExitTimes,
    want_radius: bool,
    want_limit: bool,
) -> Swept {
    let (grid, op, dt) = (&ctx.grid, &ctx.op, ctx.dt);
    let method = &ctx.problem.method;
    // z = s(Δt)·μ: Δt·μ, or Δt²·μ for second-order-in-time methods
    let step = method.step_variable(dt);
    ctx.progress.start(Stage::Sweep, grid.len() as u64);
    let symmetry = ctx.symmetry();
    let row = grid.points[grid.points.len() - 1];
    let computed = sample::computed_rows(grid, symmetry);
    let slab = (SLAB_NODES / row).max(1);
    let mut map = if want_radius {
        vec![0.0; grid.len()]
    } else {
        Vec::new()
    };
    let mut screen = Candidates::new(SCREEN_CANDIDATES);
    let mut failures = 0usize;
    let mut first_failure = None;
    for r0 in (0..computed).step_by(slab) {
        let r1 = (r0 + slab).min(computed);
        let part: Vec<(f64, f64, f64)> = sample::sweep_rows(
            op,
            ctx.plan.tolerance,
            grid,
            ctx.par,
            r0..r1,
            ctx.progress,
            |node| match node.eigenvalues {
                Err(_) => (f64::NAN, f64::NAN, 0.0),
                Ok(eig) => {
                    let radius = if want_radius {
                        eig.iter()
                            .map(|mu| method.amplification_radius(*mu * step))
                            .fold(0.0, f64::max)
                    } else {
                        0.0
                    };
                    let (t, w) = if want_limit {
                        min_over_modes(eig, |mu| exits.estimate(mu))
                    } else {
                        (0.0, 0.0)
                    };
                    (radius, t, w)
                }
            },
        );
        for (k, (rad, t, w)) in part.into_iter().enumerate() {
            let flat = r0 * row + k;
            if rad.is_nan() {
                failures += 1;
                first_failure.get_or_insert(flat);
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
    ctx.progress.advance(mirrored as u64);
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
    ctx.progress.finish();
    Swept {
        map,
        screen: screen.into_sorted(),
        failures,
        first_failure,
    }
}

/// The radius map of a composite scheme, from ρ(G(θ, Δt)) at every node.
pub(super) fn composite(ctx: &Context, ev: &CompositeEval) -> Swept {
    ctx.progress.start(Stage::Sweep, ctx.grid.len() as u64);
    let map = sample::map(&ctx.grid, ctx.par, ctx.symmetry(), ctx.progress, |th| {
        ev.radius(th, ctx.dt)
    });
    ctx.progress.finish();
    let failures = map.iter().filter(|v| v.is_nan()).count();
    let first_failure = map.iter().position(|v| v.is_nan());
    Swept {
        map,
        screen: Vec::new(),
        failures,
        first_failure,
    }
}
