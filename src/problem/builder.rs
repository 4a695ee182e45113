//! [`ProblemBuilder`]: a problem from typed values or names, validated once.
//!
//! Defaults are those of a case file (`central2` stencils, characteristic
//! upwinding, collocated arrangement, no dissipation). [`ProblemBuilder::build`]
//! checks, in order, the grid, the model, the spatial scheme, the arrangement, the
//! time method, the time step and finally that the operator can be assembled;
//! the first failure is returned as an [`InputError`] naming its key.

use super::spec::{
    FilterSpec, MethodSpec, ModelChoice, StencilChoice, TableauSpec, TimeFilterSpec, UserStencil,
};
use super::{method, space, Problem, Step};
use crate::error::{positive, InputError};
use crate::operator::{Arrangement, Operator, OperatorError};
use crate::physics::{catalogue, params::Params, ModelKind, System};
use std::collections::BTreeMap;

/// Builds a [`Problem`]; every setter may be called in any order.
#[derive(Debug, Clone, Default)]
pub struct ProblemBuilder {
    name: Option<String>,
    description: Option<String>,
    source: Option<String>,
    spacing: Vec<f64>,
    model: Option<ModelChoice>,
    first: StencilChoice,
    second: StencilChoice,
    stencils: BTreeMap<String, UserStencil>,
    upwind: Option<String>,
    dissipation: Option<(i64, f64)>,
    arrangement: Option<String>,
    method: MethodSpec,
    dt: Option<f64>,
    courant: Option<f64>,
}

impl ProblemBuilder {
    /// The problem's name (default "problem").
    pub fn name(mut self, name: &str) -> Self {
        self.name = Some(name.to_string());
        self
    }

    /// Free text.
    pub fn description(mut self, text: &str) -> Self {
        self.description = Some(text.to_string());
        self
    }

    /// Where the problem came from (recorded in reports).
    pub fn source(mut self, source: &str) -> Self {
        self.source = Some(source.to_string());
        self
    }

    /// Grid spacing per axis; its length (1, 2 or 3) is the dimension.
    pub fn spacing(mut self, h: &[f64]) -> Self {
        self.spacing = h.to_vec();
        self
    }

    /// A system built in Rust.
    pub fn system(mut self, system: System) -> Self {
        self.model = Some(ModelChoice::System(system));
        self
    }

    /// A built-in model by name (`kgain list models`) with its parameters.
    pub fn model(mut self, kind: &str, params: Params) -> Self {
        self.model = Some(ModelChoice::Named(kind.to_string(), params));
        self
    }

    /// The first-derivative stencil on every axis.
    pub fn first(mut self, name: &str) -> Self {
        self.first = StencilChoice::One(name.to_string());
        self
    }

    /// The first-derivative stencils, one choice for all axes or one per axis.
    pub fn first_stencils(mut self, choice: StencilChoice) -> Self {
        self.first = choice;
        self
    }

    /// The second-derivative stencil on every axis.
    pub fn second(mut self, name: &str) -> Self {
        self.second = StencilChoice::One(name.to_string());
        self
    }

    /// The second-derivative stencils, one choice for all axes or one per axis.
    pub fn second_stencils(mut self, choice: StencilChoice) -> Self {
        self.second = choice;
        self
    }

    /// A user stencil, usable by `name` in `first` and `second`.
    pub fn stencil(mut self, name: &str, stencil: UserStencil) -> Self {
        self.stencils.insert(name.to_string(), stencil);
        self
    }

    /// How biased stencils act on systems: "characteristic" or "rusanov".
    pub fn upwind(mut self, name: &str) -> Self {
        self.upwind = Some(name.to_string());
        self
    }

    /// Added dissipation −σ (s/h_d) sin^p(θ_d/2): even order p, strength σ.
    pub fn dissipation(mut self, order: i64, strength: f64) -> Self {
        self.dissipation = Some((order, strength));
        self
    }

    /// The grid arrangement by name ("collocated", "a".."e", "yee").
    pub fn arrangement(mut self, name: &str) -> Self {
        self.arrangement = Some(name.to_string());
        self
    }

    /// The time method by name (`kgain list methods`).
    pub fn method(mut self, name: &str) -> Self {
        self.method.name = Some(name.to_string());
        self
    }

    /// θ of `method("theta")`.
    pub fn theta(mut self, theta: f64) -> Self {
        self.method.theta = Some(theta);
        self
    }

    /// The tableau of `method("tableau")`.
    pub fn tableau(mut self, tableau: TableauSpec) -> Self {
        self.method.tableau = Some(tableau);
        self
    }

    /// Forward–backward: the variables updated first.
    pub fn updated_first(mut self, variables: &[&str]) -> Self {
        self.method.first = Some(variables.iter().map(|s| s.to_string()).collect());
        self
    }

    /// Forward–backward: every variable in update order.
    pub fn update_sequence(mut self, variables: &[&str]) -> Self {
        self.method.sequence = Some(variables.iter().map(|s| s.to_string()).collect());
        self
    }

    /// Newmark's β (`time.beta`, default 1/4).
    pub fn newmark_beta(mut self, beta: f64) -> Self {
        self.method.beta = Some(beta);
        self
    }

    /// Newmark's γ (`time.gamma`, default 1/2).
    pub fn newmark_gamma(mut self, gamma: f64) -> Self {
        self.method.gamma = Some(gamma);
        self
    }

    /// Dimension splitting: "none", "lie" or "strang".
    pub fn splitting(mut self, name: &str) -> Self {
        self.method.splitting = Some(name.to_string());
        self
    }

    /// A spatial filter applied once per time step (`[space.filter]`).
    pub fn spatial_filter(mut self, filter: FilterSpec) -> Self {
        self.method.filter = Some(filter);
        self
    }

    /// A time filter for leapfrog (`time.filter`).
    pub fn time_filter(mut self, filter: TimeFilterSpec) -> Self {
        self.method.time_filter = Some(filter);
        self
    }

    /// The time step Δt.
    pub fn dt(mut self, dt: f64) -> Self {
        self.dt = Some(dt);
        self
    }

    /// The time step as a Courant number ν = sΔt/h.
    pub fn courant(mut self, nu: f64) -> Self {
        self.courant = Some(nu);
        self
    }

    /// Validates everything and builds the problem.
    pub fn build(self) -> Result<Problem, InputError> {
        let dims = self.spacing.len();
        if !(1..=3).contains(&dims) {
            return Err(InputError::new(
                "grid.spacing",
                format!("needs 1, 2 or 3 spacings (one per axis), got {dims}"),
            ));
        }
        for (i, h) in self.spacing.iter().enumerate() {
            positive(&format!("grid.spacing.{i}"), *h)?;
        }
        let mut spacing = self.spacing.clone();
        let mut system = match &self.model {
            None => return Err(InputError::new("model", "is required")),
            Some(ModelChoice::System(s)) => {
                check_system(s, dims)?;
                s.clone()
            }
            Some(ModelChoice::Named(kind, params)) => {
                catalogue::build(ModelKind::from_name(kind)?, params, dims)?
            }
        };
        let user = space::user_stencils(&self.stencils)?;
        let first = space::stencils("space.first", &self.first, 1, dims, &user)?;
        let second = space::stencils("space.second", &self.second, 2, dims, &user)?;
        let upwind = space::upwind(self.upwind.as_deref())?;
        let dissipation = space::dissipation(self.dissipation)?;
        let arrangement = space::arrangement(self.arrangement.as_deref())?;
        let locations = space::locations(arrangement, &system, dims)?;
        if arrangement == Arrangement::E {
            (spacing, system) = e_grid_as_rotated_b(spacing, system)?;
        }
        let space = space::space(first, second, upwind, dissipation, arrangement, locations);
        let method = method::method(&self.method, &system, &space)?;
        let step = step(self.dt, self.courant, &system)?;
        let op = Operator::assemble(&system, &spacing, &space).map_err(|e| match e {
            OperatorError::NotDiagonalisable { .. } => {
                InputError::new("space.upwind", e.to_string())
            }
            OperatorError::Staggering { .. } => InputError::new("space.first", e.to_string()),
        })?;
        super::magnitudes::check(
            &system,
            &spacing,
            &op,
            step,
            space.dissipation.map(|d| d.strength),
        )?;
        let name = self.name.unwrap_or_else(|| "problem".into());
        if name.is_empty() || name.contains(['/', '\\']) || name == "." || name == ".." {
            return Err(InputError::new(
                "name",
                "must be a non-empty name without path separators",
            ));
        }
        Ok(Problem {
            name,
            description: self.description,
            source: self.source,
            spacing,
            system,
            space,
            method,
            step,
        })
    }
}

/// A system given in Rust: one matrix per axis, every entry finite.
fn check_system(s: &System, dims: usize) -> Result<(), InputError> {
    let m = s.size();
    if s.flux.len() != dims || s.diffusion.len() != dims {
        return Err(InputError::new(
            "model.flux",
            format!("needs one matrix per axis ({dims}, the length of grid.spacing)"),
        ));
    }
    let all = s
        .flux
        .iter()
        .chain(&s.diffusion)
        .chain(std::iter::once(&s.source));
    for a in all {
        if a.nrows() != m || a.ncols() != m {
            return Err(InputError::new(
                "model.flux",
                format!("every matrix must be {m}×{m}"),
            ));
        }
        if a.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
            return Err(InputError::new(
                "model.flux",
                "has an entry that is not a finite number",
            ));
        }
    }
    Ok(())
}

/// The E-grid (h and u, v alternating at distance d along both axes) is the
/// B-grid on axes turned by 45 degrees with spacing d√2 (Arakawa & Lamb 1977):
/// the system is turned into the diagonal frame and the spacing scaled.
fn e_grid_as_rotated_b(
    spacing: Vec<f64>,
    system: System,
) -> Result<(Vec<f64>, System), InputError> {
    if (spacing[0] - spacing[1]).abs() > 1e-12 * spacing[0] {
        return Err(InputError::new(
            "grid.spacing",
            "the E-grid needs equal spacings on both axes",
        ));
    }
    let s2 = std::f64::consts::SQRT_2;
    let sys = system.rotated_45([1, 2], ["u_diag", "v_diag"]);
    Ok((vec![spacing[0] * s2, spacing[1] * s2], sys))
}

fn step(dt: Option<f64>, courant: Option<f64>, sys: &System) -> Result<Step, InputError> {
    match (dt, courant) {
        (Some(_), Some(_)) => Err(InputError::new(
            "time.dt",
            "both time.dt and time.courant are given",
        )
        .hint("give exactly one of them")),
        (None, None) => Err(
            InputError::new("time", "neither time.dt nor time.courant is given")
                .hint("give exactly one of them, e.g. courant = 0.5"),
        ),
        (Some(dt), None) => Ok(Step::Dt(positive("time.dt", dt)?)),
        (None, Some(nu)) => {
            let nu = positive("time.courant", nu)?;
            if sys.reference_speed <= 0.0 {
                return Err(InputError::new(
                    "time.courant",
                    "the model has no wave speed, so a Courant number does not define a time step",
                )
                .hint("give time.dt instead"));
            }
            Ok(Step::Courant(nu))
        }
    }
}
