//! Probing a real solver: the amplification matrices measured from the user's
//! own time-step program rather than derived from a symbol.
//!
//! A linear, translation-invariant step on a periodic grid (or one linearised
//! about a uniform state) is a convolution, so one impulse per variable is
//! enough: the discrete Fourier transform of the response to a unit impulse in
//! variable j is column j of G(θ) at every wavevector the grid carries. The
//! probe steps the base state once, then one perturbed state per variable
//! ([`measure`]), checks that the program is linear, translation-invariant and
//! steady about the base ([`checks`]), and runs the analyses on the measured
//! field ([`analyses`]): the spectral-radius map, transient growth, fully
//! discrete dispersion against a named model, and the largest stable Δt by a
//! search that re-runs the program ([`limit`]). [`compare`] sets the probed G
//! beside the G of a case-file description of the intended scheme.
//!
//! The program is any [`Stepper`]: [`Program`] runs an external command on NPY
//! files, [`FnStepper`] wraps a Rust function (no files).
//!
//! ```
//! use kgain::probe::{self, FnStepper, ProbePlan, ProbeSpec};
//! use ndarray::{ArrayD, Axis};
//!
//! // first-order upwind advection at Courant number 0.5, written as a step
//! let mut step = FnStepper::new(|u: &ArrayD<f64>, dt: f64| {
//!     let q = u.index_axis(Axis(0), 0);
//!     let n = q.len();
//!     let mut out = u.clone();
//!     for i in 0..n {
//!         out[[0, i]] = q[i] - dt * (q[i] - q[(i + n - 1) % n]);
//!     }
//!     out
//! });
//! let spec = ProbeSpec::new(&["q"], &[32]);
//! let plan = ProbePlan::new(0.5).with_limit();
//! let r = probe::run(&spec, &mut step, &plan, &probe::Silent)?;
//! assert!(r.radius.unwrap().max <= 1.0 + 1e-12);
//! let limit = r.limit.unwrap();
//! assert!(limit.dt_lo.unwrap() <= 1.0 && limit.dt_lo.unwrap() > 1.0 - 1e-4);
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```

pub mod analyses;
pub mod cautions;
pub mod checks;
pub mod compare;
pub mod field;
pub mod limit;
pub mod measure;
pub mod spec;
pub mod stepper;

pub use analyses::{Dispersion, Exact, Growth, RadiusMap};
pub use checks::Checks;
pub use field::GField;
pub use limit::{ProbeLimit, ProbeLimitKind, ProbeLimitParams, SearchProgress, Silent};
pub use spec::ProbeSpec;
pub use stepper::{FnStepper, Program, StepError, Stepper};

use crate::linalg::LinalgError;
use crate::physics::System;

/// What to compute from a probe, and how.
#[derive(Debug, Clone)]
pub struct ProbePlan {
    /// The time step of the measured matrices.
    pub dt: f64,
    /// The radius map.
    pub radius: bool,
    /// The limit search, if asked.
    pub limit: Option<ProbeLimitParams>,
    /// The growth horizon, if asked.
    pub growth_steps: Option<usize>,
    /// Diagonal weights W of the growth norm ‖W u‖ (identity when empty).
    pub weights: Vec<f64>,
    /// Fully discrete dispersion.
    pub dispersion: bool,
    /// A built-in model to compare frequencies with, its grid spacing and the
    /// model's index of each probed variable.
    pub exact: Option<(System, Vec<f64>, Vec<usize>)>,
    /// Tolerance of the linearity, translation and steady checks.
    pub check_tolerance: f64,
}

impl ProbePlan {
    /// The radius map and the checks at `dt`.
    pub fn new(dt: f64) -> ProbePlan {
        ProbePlan {
            dt,
            radius: true,
            limit: None,
            growth_steps: None,
            weights: Vec::new(),
            dispersion: false,
            exact: None,
            check_tolerance: 1e-6,
        }
    }

    /// The matrix W of the growth norm ‖W u‖ and its inverse, row-major:
    /// diag(`weights`) when given, else the named model's symmetriser in the
    /// probe's variable order, else the identity.
    pub fn norm_matrix(&self, m: usize) -> (Vec<f64>, Vec<f64>) {
        let mut w = vec![0.0; m * m];
        let mut w_inv = vec![0.0; m * m];
        if !self.weights.is_empty() || self.exact.is_none() {
            for i in 0..m {
                let d = self.weights.get(i).copied().unwrap_or(1.0);
                w[i * m + i] = d;
                w_inv[i * m + i] = 1.0 / d;
            }
            return (w, w_inv);
        }
        let (system, _, order) = self.exact.as_ref().expect("a model");
        let full =
            nalgebra::DMatrix::from_fn(m, m, |i, j| system.norm_matrix[(order[i], order[j])]);
        let inv = full
            .clone()
            .try_inverse()
            .unwrap_or_else(|| nalgebra::DMatrix::identity(m, m));
        for i in 0..m {
            for j in 0..m {
                w[i * m + j] = full[(i, j)];
                w_inv[i * m + j] = inv[(i, j)];
            }
        }
        (w, w_inv)
    }

    /// Where the growth norm comes from.
    pub fn norm_origin(&self) -> &'static str {
        if !self.weights.is_empty() {
            "scan.weights"
        } else if self.exact.is_some() {
            "the named model's symmetriser"
        } else {
            "identity"
        }
    }

    /// With the limit search (relative bracket width 1e-4, ρ ≤ 1 + 1e-9).
    pub fn with_limit(mut self) -> ProbePlan {
        self.limit = Some(ProbeLimitParams {
            tolerance: 1e-4,
            radius_tolerance: 1e-9,
        });
        self
    }
}

/// Everything a probe measured and computed.
#[derive(Debug, Clone)]
pub struct ProbeResults {
    /// G(θ) at the plan's Δt.
    pub field: GField,
    /// The checks at that Δt.
    pub checks: Checks,
    /// Spectral radius map.
    pub radius: Option<RadiusMap>,
    /// Growth.
    pub growth: Option<Growth>,
    /// Dispersion.
    pub dispersion: Option<Dispersion>,
    /// The largest stable Δt.
    pub limit: Option<ProbeLimit>,
    /// Program runs in all.
    pub runs: usize,
}

/// Why a probe failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ProbeError {
    /// The program failed.
    #[error(transparent)]
    Step(#[from] StepError),
    /// A matrix kernel did not converge.
    #[error("the growth of the probed matrices could not be computed: {0}")]
    Linalg(#[from] LinalgError),
}

/// Measures G at the plan's Δt, checks the program and runs the analyses.
pub fn run(
    spec: &ProbeSpec,
    stepper: &mut dyn Stepper,
    plan: &ProbePlan,
    progress: &dyn SearchProgress,
) -> Result<ProbeResults, ProbeError> {
    let dt = plan.dt;
    let base = measure::Base::step(spec, stepper, dt)?;
    let zero = vec![0; spec.dims()];
    let field = measure::field(spec, stepper, dt, &base, &zero, 1.0)?;
    let checks = checks::run(spec, stepper, dt, &base, &field, plan.check_tolerance)?;
    progress.update(stepper.runs(), None, None);
    let radius = plan.radius.then(|| analyses::radius(&field));
    let growth = match plan.growth_steps {
        Some(steps) => {
            let (w, w_inv) = plan.norm_matrix(spec.m());
            Some(analyses::growth(&field, &w, &w_inv, steps)?)
        }
        None => None,
    };
    let dispersion = plan.dispersion.then(|| {
        let exact = plan.exact.as_ref().map(|(system, spacing, order)| Exact {
            system,
            spacing,
            order: order.clone(),
        });
        analyses::dispersion(&field, dt, exact.as_ref())
    });
    let limit = match plan.limit {
        Some(p) => Some(limit::search(spec, stepper, dt, p, progress)?),
        None => None,
    };
    Ok(ProbeResults {
        field,
        checks,
        radius,
        growth,
        dispersion,
        limit,
        runs: stepper.runs(),
    })
}
