//! Everything an analysis produces, typed: the radius map, the limit (overall and
//! by direction, with how it was found), growth and dispersion results, the worst
//! modes, sampled matrices, failure counts, the verdict at the problem's Δt and
//! the cautions. Every number the report writes is here; the report only formats.

use super::dispersion::DispersionResult;
use super::growth::GrowthResult;
use super::limit::LimitResult;
use super::modes::Mode;
use super::plan::Plan;
use crate::sample::Grid;
use num_complex::Complex64 as C64;

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
    /// Nodes where the eigenvalue kernel failed (their values are NaN).
    pub failures: usize,
    /// Stable or not at the problem's Δt.
    pub verdict: Verdict,
    /// The cautions every report carries, and the case-specific ones.
    pub cautions: Vec<String>,
}
