//! What to compute: the wavevector grid, the analyses with one parameter struct
//! each, and how many amplification matrices to keep for external checks.
//!
//! ```
//! use kgain::analysis::{LimitParams, Plan};
//! let plan = Plan::new(&[129, 129]).with_limit(LimitParams { directions: 72 });
//! assert!(plan.radius.is_none() && plan.limit.is_some());
//! ```

use crate::error::InputError;
use crate::problem::Problem;

/// The radius map at the problem's Δt (its verdict uses [`Plan::tolerance`]).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct RadiusParams;

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

impl Default for GrowthParams {
    fn default() -> Self {
        GrowthParams {
            steps: 100,
            epsilon: 1e-3,
            weights: None,
        }
    }
}

/// Dispersion and dissipation.
#[derive(Debug, Clone, PartialEq)]
pub struct DispersionParams {
    /// Phase-error tolerance of the points-per-wavelength requirement.
    pub phase_tolerance: f64,
    /// Directions of the dispersion curves in 3-D (12..60 used).
    pub directions: usize,
}

impl Default for DispersionParams {
    fn default() -> Self {
        DispersionParams {
            phase_tolerance: 0.01,
            directions: 180,
        }
    }
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
                directions,
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
            if *n < 2 {
                return Err(InputError::new(
                    format!("scan.points.{i}"),
                    format!("must be at least 2, got {n}"),
                ));
            }
        }
        if !(0.0..1e-2).contains(&self.tolerance) {
            return Err(InputError::new("scan.tolerance", "must lie in [0, 0.01)"));
        }
        if self.radius.is_none()
            && self.limit.is_none()
            && self.growth.is_none()
            && self.dispersion.is_none()
        {
            return Err(InputError::new("scan.analyses", "names no analysis"));
        }
        if let Some(g) = &self.growth {
            crate::error::positive("scan.epsilon", g.epsilon)?;
            if let Some(w) = &g.weights {
                let m = problem.system.size();
                if w.len() != m {
                    return Err(InputError::new(
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
        }
        if let Some(d) = &self.dispersion {
            crate::error::positive("scan.phase_tolerance", d.phase_tolerance)?;
        }
        Ok(())
    }

    /// Estimated bytes of memory the analyses need: per wavevector, the sweep's
    /// working values and every output array.
    pub fn memory_estimate(&self, problem: &Problem) -> u128 {
        let nodes: u128 = self.points.iter().map(|&n| n as u128).product();
        let m = problem.system.size();
        let levels = problem.method.levels();
        let (m, big_m, d) = (m as u128, (m * levels) as u128, problem.dims() as u128);
        let mut per = 0u128;
        if self.radius.is_some() || self.limit.is_some() {
            per += 24 + 8;
        }
        if self.growth.is_some() {
            per += 48 + 2 * 24;
        }
        if self.dispersion.is_some() {
            // matched ω (3 sets), group velocities (2), then the written copies and maps
            let work = 16 * (2 * m + big_m) + 16 * m * d + 3 * 24;
            per += 2 * work + 6 * 8 * m;
        }
        nodes * per
    }
}
