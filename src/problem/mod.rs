//! The problem stage: a validated discretisation, ready to analyse.
//!
//! A [`Problem`] is a grid (spacing per axis), a continuous system, a spatial
//! scheme (stencils, upwinding, dissipation, arrangement), a time method and the
//! time step — every name resolved and every cross-key rule checked. It is built
//! in Rust through [`ProblemBuilder`], with the same validation a case file gets
//! (the case layer calls the builder); errors are [`InputError`]s naming the key
//! as a case file would write it.
//!
//! ```
//! use kgain::physics::euler;
//! use kgain::problem::Problem;
//!
//! let problem = Problem::builder()
//!     .spacing(&[1.0, 1.0])
//!     .system(euler(1.0, &[0.5, 0.2], 1.0 / 1.4, 1.4))
//!     .first("central4")
//!     .method("rk4")
//!     .courant(1.0)
//!     .build()
//!     .unwrap();
//! assert_eq!(problem.system.variables, ["rho", "u", "v", "p"]);
//! ```

mod builder;
mod magnitudes;
mod method;
mod space;
mod spec;

pub use crate::error::InputError;
pub use builder::ProblemBuilder;
pub use spec::{FilterSpec, ModelChoice, StencilChoice, TableauSpec, TimeFilterSpec, UserStencil};

use crate::operator::{Operator, Space};
use crate::physics::System;
use crate::time::Method;

/// The time step as given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Step {
    /// Δt directly.
    Dt(f64),
    /// The Courant number ν = sΔt/h.
    Courant(f64),
}

/// A validated problem: everything resolved, nothing left as a string to interpret.
#[derive(Debug, Clone)]
pub struct Problem {
    /// Name (for reports and output folders).
    pub name: String,
    /// Free text.
    pub description: Option<String>,
    /// Where it came from (a case file's canonical path), if anywhere.
    pub source: Option<String>,
    /// Grid spacing per axis.
    pub spacing: Vec<f64>,
    /// The continuous system.
    pub system: System,
    /// The spatial scheme.
    pub space: Space,
    /// The time method.
    pub method: Method,
    /// The time step as given.
    pub step: Step,
}

impl Problem {
    /// A builder, with the defaults of a case file.
    pub fn builder() -> ProblemBuilder {
        ProblemBuilder::default()
    }

    /// Number of axes.
    pub fn dims(&self) -> usize {
        self.spacing.len()
    }

    /// Reference spacing h = min h_d.
    pub fn reference_spacing(&self) -> f64 {
        self.spacing.iter().copied().fold(f64::INFINITY, f64::min)
    }

    /// Δt of the problem.
    pub fn dt(&self) -> f64 {
        match self.step {
            Step::Dt(dt) => dt,
            Step::Courant(nu) => nu * self.reference_spacing() / self.system.reference_speed,
        }
    }

    /// Courant number ν = sΔt/h for a Δt (None when the reference speed is zero).
    pub fn courant_of(&self, dt: f64) -> Option<f64> {
        let s = self.system.reference_speed;
        (s > 0.0).then(|| s * dt / self.reference_spacing())
    }

    /// Diffusion number r = Δt D_max/h² for a Δt (None without diffusion).
    pub fn diffusion_number_of(&self, dt: f64) -> Option<f64> {
        let h = self.reference_spacing();
        self.system.diffusivity_max.map(|d| dt * d / (h * h))
    }

    /// The spatial operator L(θ).
    pub fn operator(&self) -> Operator {
        Operator::assemble(&self.system, &self.spacing, &self.space)
            .expect("a validated problem assembles")
    }
}
