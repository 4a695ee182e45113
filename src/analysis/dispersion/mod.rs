//! Dispersion and dissipation by mode and direction: frequencies matched to the
//! physical modes at every grid node ([`frequencies`]), maps derived from them
//! ([`maps`]), curves along physical directions and the resolution each mode
//! needs ([`curves`]). A fully discrete eigenvalue with no semi-discrete partner —
//! the extra roots of a multistep method — is a computational mode; a numerical
//! mode whose group velocity opposes the physical one is a parasitic
//! (grid-scale) wave.

mod clusters;
pub mod curves;
pub mod frequencies;
pub mod maps;
mod mirror;
pub mod node;
mod ray;
pub mod resolution;
pub mod shape;
pub mod slopes;
pub mod sorted;
pub mod stream;

use super::context::Context;
use frequencies::Frequencies;
use maps::{DerivedMaps, NodeFrequencies};
use num_complex::Complex64 as C64;
use stream::NodeArrays;

/// Dispersion and dissipation.
#[derive(Debug, Clone, PartialEq)]
pub struct DispersionParams {
    /// Phase-error tolerance of the points-per-wavelength requirement.
    pub phase_tolerance: f64,
    /// Physical directions of the dispersion curves (2-D: angles, rounded up to
    /// a multiple of 8 so that axes and diagonals are among them; 3-D: sphere
    /// points; 1-D: always ±x). Case key `scan.dispersion_directions`.
    pub directions: usize,
}

impl DispersionParams {
    /// Checks the parameters.
    pub fn check(&self) -> Result<(), crate::error::InputError> {
        crate::error::positive("scan.phase_tolerance", self.phase_tolerance).map(|_| ())
    }
}

/// Most curve directions a case may ask for.
pub const MAX_CURVE_DIRECTIONS: usize = 4096;

impl DispersionParams {
    /// The default number of curve directions: 36 angles in 2-D (40 after
    /// rounding up to a multiple of 8), in 3-D the limit's direction count
    /// clamped to 12..=60 (60 for the default 400).
    pub fn default_directions(dims: usize, limit_directions: usize) -> usize {
        match dims {
            1 => 2,
            2 => 36,
            _ => limit_directions.clamp(12, 60),
        }
    }
}

impl Default for DispersionParams {
    fn default() -> Self {
        DispersionParams {
            phase_tolerance: 0.01,
            directions: 36,
        }
    }
}

/// Everything the dispersion analysis produces.
#[derive(Debug, Clone)]
pub struct DispersionResult {
    /// Physical mode names (m).
    pub names: Vec<String>,
    /// Number of computational (extra fully discrete) modes.
    pub computational: usize,
    /// Number of axes d.
    pub dims: usize,
    /// Semi-discrete ω, nodes × m (node-major, nodes in C order).
    pub numerical: Vec<C64>,
    /// Exact ω, nodes × m.
    pub exact: Vec<C64>,
    /// Fully discrete ω, nodes × `discrete_modes` (m principal roots, then the
    /// computational modes).
    pub discrete: Vec<C64>,
    /// Fully discrete frequencies per node (m + `computational`).
    pub discrete_modes: usize,
    /// Numerical group velocity, nodes × m × d.
    pub group: Vec<f64>,
    /// Exact group velocity, nodes × m × d.
    pub group_exact: Vec<f64>,
    /// Fully discrete group velocity, nodes × m × d.
    pub group_discrete: Vec<f64>,
    /// Physical directions of the curves (unit vectors in k-space).
    pub directions: Vec<Vec<f64>>,
    /// Points per wavelength 2π/max_d |θ_d| of the curve samples (the same
    /// along every direction).
    pub ppw: Vec<f64>,
    /// Phase-speed ratio c_num/c_exact, semi-discrete \[direction\]\[sample\]\[mode\].
    pub phase_curves: Vec<Vec<Vec<f64>>>,
    /// The same, fully discrete.
    pub phase_curves_discrete: Vec<Vec<Vec<f64>>>,
    /// Group-speed ratio along the physical group velocity, semi-discrete.
    pub group_curves: Vec<Vec<Vec<f64>>>,
    /// Decay-rate ratio Im ω_num / Im ω_exact, semi-discrete \[direction\]\[sample\]\[mode\].
    pub decay_curves: Vec<Vec<Vec<f64>>>,
    /// The same, fully discrete.
    pub decay_curves_discrete: Vec<Vec<Vec<f64>>>,
    /// Per mode: the points per wavelength and the shortest wavelength needed
    /// for |phase error| ≤ tolerance in every direction, semi- and fully discrete.
    pub resolution: Vec<resolution::Resolution>,
    /// Phase tolerance used.
    pub tolerance: f64,
    /// Maps derived from the frequencies at every node.
    pub maps: DerivedMaps,
    /// Per mode: share of grid wavevectors where the numerical group velocity
    /// opposes the exact one (parasitic, grid-scale waves).
    pub parasitic_fraction: Vec<f64>,
}

impl DispersionResult {
    /// Number of physical modes m.
    pub fn modes(&self) -> usize {
        self.names.len()
    }

    /// Everything at grid node `i` (flat C-order index).
    pub fn node(&self, i: usize) -> NodeFrequencies<'_> {
        let (m, d, dm) = (self.modes(), self.dims, self.discrete_modes);
        let (modes, vectors) = (i * m..(i + 1) * m, i * m * d..(i + 1) * m * d);
        NodeFrequencies {
            numerical: &self.numerical[modes.clone()],
            exact: &self.exact[modes],
            discrete: &self.discrete[i * dm..(i + 1) * dm],
            group: &self.group[vectors.clone()],
            group_exact: &self.group_exact[vectors.clone()],
            group_discrete: &self.group_discrete[vectors],
        }
    }
}

/// Phase-speed ratio Re ω_num / Re ω_exact, NaN where the exact mode does not move.
pub fn phase_ratio(num: C64, exact: C64, scale: f64) -> f64 {
    if exact.re.abs() <= 1e-9 * scale {
        f64::NAN
    } else {
        num.re / exact.re
    }
}

/// Decay-rate ratio Im ω_num / Im ω_exact (the numerical over the exact
/// damping rate of a mode e^{i(k·x − ωt)}), NaN where the exact mode is not damped.
pub fn decay_ratio(num: C64, exact: C64, scale: f64) -> f64 {
    if exact.im.abs() <= 1e-9 * scale {
        f64::NAN
    } else {
        num.im / exact.im
    }
}

/// (group-speed ratio along ĉ_exact, angle between the two velocities).
pub fn group_ratio(gn: &[f64], ge: &[f64]) -> (f64, f64) {
    let e2: f64 = ge.iter().map(|x| x * x).sum();
    let n2: f64 = gn.iter().map(|x| x * x).sum();
    if e2 == 0.0 {
        return (f64::NAN, f64::NAN);
    }
    let dot: f64 = gn.iter().zip(ge).map(|(a, b)| a * b).sum();
    let cos = if n2 > 0.0 {
        (dot / (n2 * e2).sqrt()).clamp(-1.0, 1.0)
    } else {
        f64::NAN
    };
    (dot / e2, cos.acos())
}

/// Whether a numerical group velocity opposes the exact one (a parasitic,
/// grid-scale wave): their dot product is negative.
pub(super) fn opposes(gn: &[f64], ge: &[f64]) -> bool {
    gn.iter().zip(ge).map(|(a, b)| a * b).sum::<f64>() < 0.0
}

/// The dispersion analysis.
pub(super) fn analyse(ctx: &Context, p: &DispersionParams) -> DispersionResult {
    let (grid, dt) = (&ctx.grid, ctx.dt);
    let f = Frequencies::new(ctx.problem, &ctx.op);
    // the number of fully discrete roots, from the first node
    let first: Vec<f64> = grid.coords.iter().map(|c| c[0]).collect();
    let (num, _) = f.matched(&first);
    let discrete_modes = f.discrete(&first, &num, dt).len();
    let NodeArrays {
        numerical,
        exact,
        discrete,
        group,
        group_exact,
        group_discrete,
        maps,
        opposed,
    } = stream::sweep(ctx, &f, discrete_modes);
    let dirs = curves::curve_directions(grid.points.len(), p.directions);
    let curves: Vec<_> = ctx.par.run(|| {
        use rayon::prelude::*;
        dirs.par_iter().map(|n| curves::curve(&f, n, dt)).collect()
    });
    let names = ctx.problem.system.mode_names.clone();
    let m = names.len();
    let tol = p.phase_tolerance;
    let resolution = resolution::resolve(&f, &dirs, &curves, dt, tol, m, ctx.par);
    let computational = discrete_modes.saturating_sub(m);
    let ppw = curves::curve_ppw();
    let nodes = grid.len().max(1) as f64;
    let parasitic_fraction = opposed.iter().map(|c| *c as f64 / nodes).collect();
    let mut phase_curves = Vec::new();
    let mut phase_curves_discrete = Vec::new();
    let mut group_curves = Vec::new();
    let mut decay_curves = Vec::new();
    let mut decay_curves_discrete = Vec::new();
    for c in curves {
        phase_curves.push(c.phase);
        phase_curves_discrete.push(c.phase_discrete);
        group_curves.push(c.group);
        decay_curves.push(c.decay);
        decay_curves_discrete.push(c.decay_discrete);
    }
    DispersionResult {
        names,
        computational,
        dims: grid.points.len(),
        numerical,
        exact,
        discrete,
        discrete_modes,
        group,
        group_exact,
        group_discrete,
        directions: dirs,
        ppw,
        phase_curves,
        phase_curves_discrete,
        group_curves,
        decay_curves,
        decay_curves_discrete,
        resolution,
        tolerance: tol,
        maps,
        parasitic_fraction,
    }
}
