//! Beyond the spectral radius: non-normality maps (‖G‖₂, departure from
//! normality, eigenvector condition number), the transient-growth envelope
//! max_θ ‖Gⁿ‖₂, a Kreiss-constant lower bound, the ε-pseudospectral radius and
//! a verdict (Trefethen & Embree, Spectra and Pseudospectra, 2005).
//!
//! Norms are ‖W u‖₂ ([`super::norm`]). [`measures`] holds the per-wavevector
//! work, [`resolvent`] the measures of one matrix.

mod energy;
pub mod measures;
pub mod powers;
pub mod resolvent;

use super::context::Context;
use super::norm::NormTransform;
use crate::sample::{self, Stage};
use measures::{Envelope, NodeMeasures, NodeWorkspace};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

pub use measures::power_norms;
pub use resolvent::{kreiss_lower_bound, optimal_perturbation, pseudospectral_radius};

/// Non-normality and transient growth.
#[derive(Debug, Clone, PartialEq)]
pub struct GrowthParams {
    /// Horizon N of the envelope max ‖Gⁿ‖, n = 0..N.
    pub steps: usize,
    /// ε of the ε-pseudospectral radius.
    pub epsilon: f64,
    /// Diagonal norm weights per variable (None: the model's symmetriser).
    pub weights: Option<Vec<f64>>,
}

impl GrowthParams {
    /// Checks the parameters against a problem.
    pub fn check(&self, problem: &crate::problem::Problem) -> Result<(), crate::error::InputError> {
        crate::error::positive("scan.epsilon", self.epsilon)?;
        if let Some(w) = &self.weights {
            let m = problem.system.size();
            if w.len() != m {
                return Err(crate::error::InputError::new(
                    "scan.weights",
                    format!(
                        "needs one weight per variable ({m}: {}), got {}",
                        problem.system.variables.join(", "),
                        w.len()
                    ),
                ));
            }
            for (i, x) in w.iter().enumerate() {
                crate::error::positive(&format!("scan.weights.{i}"), *x)?;
            }
        }
        Ok(())
    }
}

impl Default for GrowthParams {
    fn default() -> Self {
        GrowthParams {
            steps: 100,
            epsilon: 1e-3,
            weights: None,
        }
    }
}

/// How the growth analysis classifies a scheme.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum GrowthClass {
    /// ρ(G) > 1 + tolerance somewhere.
    Unstable,
    /// A defective eigenvalue on the unit circle, or growth linear in n.
    WeaklyUnstable,
    /// Stable, with max ‖Gⁿ‖ > 1.
    StableTransientGrowth,
    /// ‖Gⁿ‖ ≤ 1 for every n and wavevector.
    StableNormal,
}

impl GrowthClass {
    /// The name used in summary.json.
    pub fn as_str(self) -> &'static str {
        match self {
            GrowthClass::Unstable => "unstable",
            GrowthClass::WeaklyUnstable => "weakly-unstable",
            GrowthClass::StableTransientGrowth => "stable-transient-growth",
            GrowthClass::StableNormal => "stable-normal",
        }
    }
}

/// A Kreiss-constant bound and where it was found.
#[derive(Debug, Clone)]
pub struct Kreiss {
    /// Sampled lower bound on K.
    pub lower_bound: f64,
    /// The wavevector.
    pub wavevector: Vec<f64>,
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
    /// Largest ‖G‖₂ over the grid.
    pub max_norm_one_step: f64,
    /// Largest departure over the grid.
    pub max_departure: f64,
    /// Kreiss-constant lower bound and where (None when ρ > 1: infinite).
    pub kreiss: Option<Kreiss>,
    /// (ε, ε-pseudospectral radius) at the peak wavevector.
    pub pseudospectral: (f64, f64),
    /// Nodes with a defective eigenvalue on the unit circle.
    pub defective_on_circle: usize,
    /// The W of the norm (one block per variable).
    pub norm_matrix: Vec<Vec<f64>>,
    /// Horizon N.
    pub steps: usize,
    /// Verdict.
    pub class: GrowthClass,
    /// Its explanation.
    pub verdict: String,
}

/// The growth analysis.
pub(super) fn analyse(ctx: &Context, p: &GrowthParams) -> GrowthResult {
    let (grid, dt, steps) = (&ctx.grid, ctx.dt, p.steps);
    let w = NormTransform::new(ctx.problem, p.weights.as_deref());
    let env = Envelope::new(steps);
    let size = ctx.problem.system.size() * ctx.problem.method.levels();
    // The long-wave node first: there G ≈ I, so the envelope starts near 1 and
    // the other nodes' powers can stop as soon as they provably stay below it.
    // Second-order-in-time methods: growth in the discrete wave energy, and
    // the secular node(s) where L = 0 kept out of the envelope ([`energy`]).
    let second = ctx.problem.method.is_second_order();
    let matrix = |th: &[f64]| -> (DMatrix<C64>, bool) {
        let g = w.weighted(ctx.amplification(th, dt));
        if !second {
            return (g, false);
        }
        let l = ctx.op.symbol_matrix(th);
        let rho = crate::linalg::spectral_radius(&crate::linalg::from_matrix(&l), l.nrows())
            .unwrap_or(f64::NAN);
        let c = energy::frequency_scale(rho, dt);
        (energy::to_energy(&g, c), energy::is_secular(&l))
    };
    let origin: Vec<f64> = grid.coords.iter().map(|c| nearest_to_zero(c)).collect();
    if !second {
        NodeWorkspace::new(size).node(&matrix(&origin).0, steps, &env);
    }
    ctx.progress.start(Stage::Growth, grid.len() as u64);
    let nodes: Vec<(NodeMeasures, (f64, usize))> = sample::map_with(
        grid,
        ctx.par,
        ctx.symmetry(),
        ctx.progress,
        || NodeWorkspace::new(size),
        |ws, th| {
            let (g, secular) = matrix(th);
            if !secular {
                return ws.node(&g, steps, &env);
            }
            let (m, _) = ws.node(&g, steps, &Envelope::new(steps));
            let kept_out = NodeMeasures {
                defective: f64::NAN,
                ..m
            };
            (kept_out, (f64::NAN, 0))
        },
    );
    ctx.progress.finish();
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
    let mut idx = vec![0usize; grid.points.len()];
    grid.unravel(ipk, &mut idx);
    let peak_theta = grid.theta(&idx);
    let g_peak = matrix(&peak_theta).0;
    let rho_max = nodes
        .iter()
        .map(|n| n.0.radius)
        .filter(|v| !v.is_nan())
        .fold(0.0, f64::max);
    let kreiss = {
        let k = resolvent::kreiss_lower_bound(&g_peak);
        k.is_finite().then(|| Kreiss {
            lower_bound: k,
            wavevector: peak_theta.clone(),
        })
    };
    let pseudo = resolvent::pseudospectral_radius(&g_peak, p.epsilon);
    let defective_on_circle = nodes.iter().filter(|n| n.0.defective >= 1.0 - 1e-6).count();
    let (class, verdict) = classify(
        &envelope,
        steps,
        rho_max,
        ctx.plan.tolerance,
        defective_on_circle,
        (pv, pn),
    );
    let nw = super::norm::norm_matrix(ctx.problem, p.weights.as_deref());
    let m = ctx.problem.system.size();
    let norm: Vec<f64> = nodes.iter().map(|n| n.0.norm).collect();
    let departure: Vec<f64> = nodes.iter().map(|n| n.0.departure).collect();
    GrowthResult {
        max_norm_one_step: norm
            .iter()
            .copied()
            .filter(|v| !v.is_nan())
            .fold(0.0, f64::max),
        max_departure: departure
            .iter()
            .copied()
            .filter(|v| !v.is_nan())
            .fold(0.0, f64::max),
        norm,
        departure,
        condition: nodes.iter().map(|n| n.0.condition).collect(),
        envelope,
        peak: (pv, pn, peak_theta),
        kreiss,
        pseudospectral: (p.epsilon, pseudo),
        defective_on_circle,
        norm_matrix: (0..m)
            .map(|i| (0..m).map(|j| nw[(i, j)]).collect())
            .collect(),
        steps,
        class,
        verdict,
    }
}

/// The grid coordinate nearest to 0 on one axis.
fn nearest_to_zero(coords: &[f64]) -> f64 {
    coords
        .iter()
        .copied()
        .min_by(|a, b| a.abs().total_cmp(&b.abs()))
        .unwrap_or(0.0)
}

/// The verdict from the envelope, the largest radius and the defective count.
fn classify(
    envelope: &[f64],
    steps: usize,
    rho_max: f64,
    tol: f64,
    defective_on_circle: usize,
    (pv, pn): (f64, usize),
) -> (GrowthClass, String) {
    let last = envelope.last().copied().unwrap_or(1.0);
    let mid = envelope.get(steps / 2).copied().unwrap_or(1.0);
    let linear_growth = steps >= 8 && last > 2.0 && last >= 1.5 * mid;
    if rho_max > 1.0 + tol {
        (
            GrowthClass::Unstable,
            format!("unstable: spectral radius {rho_max:.6} > 1"),
        )
    } else if defective_on_circle > 0 || linear_growth {
        (
            GrowthClass::WeaklyUnstable,
            format!(
                "weakly unstable: a defective eigenvalue on the unit circle ({defective_on_circle} wavevectors) gives growth linear in n; max ||G^n|| = {last:.4} at n = {steps}"
            ),
        )
    } else if pv > 1.0 + 1e-6 {
        (
            GrowthClass::StableTransientGrowth,
            if pn == steps {
                format!("stable with transient growth: max ||G^n|| = {pv:.6}, still growing at the horizon n = {steps} (raise scan.steps)")
            } else {
                format!("stable with transient growth: max ||G^n|| = {pv:.6} at step {pn}")
            },
        )
    } else {
        (
            GrowthClass::StableNormal,
            "stable without transient growth: ||G^n|| <= 1 for every n and wavevector".to_string(),
        )
    }
}
