//! Composite time schemes, whose amplification matrix is not a function of the
//! eigenvalues of L alone: it is built from pieces of the symbol.
//!
//! * forward–backward: variables are updated in rank order, each using the newest
//!   values of lower-ranked ones: (I − Δt N) u^{n+1} = (I + Δt (L − N)) u^n with N
//!   the part of L coupling a variable to lower-ranked ones. With E first (or H
//!   first) this is the Yee leapfrog; with h first, the forward–backward scheme of
//!   shallow-water models (Mesinger & Arakawa, GARP Publ. 17, 1976).
//! * dimension splitting: L = Σ_k L_k (one part per axis, plus the source); Lie
//!   G = R(ΔtL_n)⋯R(ΔtL_1); Strang G = R(½ΔtL_1)⋯R(ΔtL_n)⋯R(½ΔtL_1), R the
//!   chosen one-step method.
//! * IMEX: diffusion implicit, everything else explicit. IMEX Euler
//!   (I − ΔtL_I)u^{n+1} = (I + ΔtL_E)u^n; CNAB2 (Crank–Nicolson on L_I,
//!   Adams–Bashforth 2 on L_E) through its 2m×2m companion matrix.
//! * two-level fully discrete schemes on the flux matrices A_d (ν_d = Δt/h_d):
//!   Lax–Friedrichs G = (1/d)Σ cos θ_d I − iΣ ν_d A_d sin θ_d, and the unsplit
//!   Lax–Wendroff G = I − iΣ ν_d A_d sin θ_d − 2Σ ν_d² A_d² sin²(θ_d/2)
//!   − ½Σ_{d≠e} ν_d ν_e A_d A_e sin θ_d sin θ_e (the second-order Taylor series in
//!   Δt with central first differences, the three-point second difference and
//!   products of central differences for the cross derivatives). Diffusion and
//!   source terms, if any, are added explicitly (forward Euler) with the case's
//!   second-derivative stencil.
//! * a spatial filter applied once per step after a one-level scheme (a one-step
//!   method or any of the above but CNAB2): G = F(θ)·G_step with the filter's
//!   scalar transfer function F(θ) = Π_d T(θ_d) ([`crate::stencil::filter`]).

use super::Method;
use crate::operator::Operator;
use crate::physics::System;
use crate::stencil::filter::SpatialFilter;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Lie or Strang splitting.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Splitting {
    /// First order: one sweep of sub-steps.
    Lie,
    /// Second order: symmetric half steps.
    Strang,
}

/// IMEX pairs.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Imex {
    /// Backward Euler on diffusion, forward Euler on the rest.
    Euler,
    /// Crank–Nicolson on diffusion, Adams–Bashforth 2 on the rest.
    Cnab2,
}

/// A composite scheme.
#[derive(Debug, Clone, PartialEq)]
pub enum Composite {
    /// Partitioned forward–backward stepping; `rank[i]` orders the updates.
    ForwardBackward {
        /// Update rank of each variable (lower first).
        rank: Vec<usize>,
    },
    /// Dimension splitting with a one-step method per sub-step.
    Split {
        /// Lie or Strang.
        kind: Splitting,
        /// The sub-step method.
        inner: Box<Method>,
    },
    /// An IMEX pair.
    Imex(Imex),
    /// Lax–Wendroff.
    LaxWendroff,
    /// Lax–Friedrichs.
    LaxFriedrichs,
    /// A one-level scheme followed by a spatial filter.
    Filtered {
        /// The filter applied after each step.
        filter: SpatialFilter,
        /// The step (a one-step method or a one-level composite scheme).
        inner: Box<Method>,
    },
}

impl Composite {
    /// Number of time levels the state carries.
    pub fn levels(&self) -> usize {
        match self {
            Composite::Imex(Imex::Cnab2) => 2,
            _ => 1,
        }
    }

    /// Whether diffusion is treated implicitly.
    pub fn description(&self) -> String {
        match self {
            Composite::ForwardBackward { .. } => "forward-backward (partitioned)".into(),
            Composite::Split { kind, inner } => format!(
                "{} dimension splitting of {}",
                if *kind == Splitting::Lie {
                    "Lie"
                } else {
                    "Strang"
                },
                inner.name
            ),
            Composite::Imex(Imex::Euler) => "IMEX Euler (implicit diffusion)".into(),
            Composite::Imex(Imex::Cnab2) => "IMEX Crank-Nicolson/Adams-Bashforth 2".into(),
            Composite::LaxWendroff => "Lax-Wendroff (two-level, unsplit)".into(),
            Composite::LaxFriedrichs => "Lax-Friedrichs (two-level)".into(),
            Composite::Filtered { filter, inner } => {
                let step = match inner.composite() {
                    Some(c) => c.description(),
                    None => inner.name.clone(),
                };
                format!("{step}, then a {} once per step", filter.label())
            }
        }
    }
}

/// G(θ, Δt) of a composite scheme: I + [`increment`](super::increment) for one-level schemes, the
/// companion matrix for CNAB2.
pub fn amplification(
    c: &Composite,
    sys: &System,
    op: &Operator,
    h: &[f64],
    theta: &[f64],
    dt: f64,
) -> DMatrix<C64> {
    match super::increment::increment(c, sys, op, h, theta, dt) {
        Some(e) => DMatrix::<C64>::identity(op.m, op.m) + e,
        None => super::increment::cnab2(op, theta, dt),
    }
}
