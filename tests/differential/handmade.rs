//! Hand-built schemes for the closed-form tests: the same description the
//! generator produces, with chosen numbers instead of random ones.

use crate::scheme::{Dissipation, Mat, Method, Scheme, System, Upwind};
use crate::stencils::{catalogue_first, catalogue_second};

/// Scalar advection(–diffusion), optionally with a source rate (then rendered
/// as a one-variable `linear` system, since `advection` has no source key).
pub struct Scalar<'a> {
    /// Grid spacings.
    pub spacing: &'a [f64],
    /// Velocity per axis.
    pub velocity: &'a [f64],
    /// Diffusivity per axis.
    pub diffusivity: &'a [f64],
    /// Source rate (0: none).
    pub source: f64,
    /// First-derivative catalogue stencil.
    pub first: &'a str,
    /// Second-derivative catalogue stencil.
    pub second: &'a str,
    /// Optional dissipation.
    pub dissipation: Option<Dissipation>,
    /// `scan.points` per axis.
    pub points: usize,
    /// `scan.directions`.
    pub directions: usize,
}

impl Scalar<'_> {
    /// The scheme with the given time method.
    pub fn with(&self, method: Method) -> Scheme {
        let one = |x: f64| Mat::from_element(1, 1, x);
        let speed = self.velocity.iter().map(|a| a * a).sum::<f64>().sqrt();
        let dims = self.spacing.len();
        let system = System {
            variables: vec!["q".into()],
            scalar_advection: self.source == 0.0,
            flux: self.velocity.iter().map(|a| one(*a)).collect(),
            flux_vectors: vec![one(1.0); dims],
            flux_speeds: self.velocity.iter().map(|a| vec![*a]).collect(),
            diffusion: self.diffusivity.iter().map(|d| one(*d)).collect(),
            source: one(self.source),
            reference_speed: speed,
        };
        Scheme {
            seed: 0,
            spacing: self.spacing.to_vec(),
            system,
            first: vec![catalogue_first(self.first); dims],
            second: vec![catalogue_second(self.second); dims],
            upwind: Upwind::Characteristic,
            dissipation: self.dissipation,
            method,
            points: self.points,
            directions: self.directions,
            symbol_bound: 0.0,
        }
        .finished()
    }
}

/// Forward Euler.
pub fn euler() -> Method {
    Method::Polynomial {
        name: "euler",
        coeffs: vec![1.0, 1.0],
    }
}

/// Heun's method (R = 1 + z + z²/2).
pub fn heun() -> Method {
    Method::Polynomial {
        name: "heun",
        coeffs: vec![1.0, 1.0, 0.5],
    }
}

/// Classical RK4.
pub fn rk4() -> Method {
    Method::Polynomial {
        name: "rk4",
        coeffs: vec![1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0],
    }
}

/// Leapfrog (explicit midpoint).
pub fn leapfrog() -> Method {
    Method::Multistep {
        name: "leapfrog",
        alpha: vec![-1.0, 0.0, 1.0],
        beta: vec![0.0, 2.0, 0.0],
    }
}
