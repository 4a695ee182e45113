//! The inputs of a problem as given, before validation: the model choice, the
//! stencil choice per key, a user stencil, a Butcher tableau and the time
//! method's options. [`super::ProblemBuilder`] collects them; `space` and
//! `method` resolve them.

use crate::physics::{params::Params, System};

/// The model of a problem: a ready system, or a built-in model by name with
/// its parameters (validated like the `[model]` table of a case file).
#[derive(Debug, Clone)]
pub enum ModelChoice {
    /// A system built in Rust (e.g. [`crate::physics::euler`]).
    System(System),
    /// A catalogue model by name, with its parameters.
    Named(String, Params),
}

/// The stencils of `space.first` or `space.second`.
#[derive(Debug, Clone, Default)]
pub enum StencilChoice {
    /// `central2` on every axis.
    #[default]
    Default,
    /// One name for every axis.
    One(String),
    /// One name per axis.
    PerAxis(Vec<String>),
}

/// A user stencil as given: derivative, offsets, weights, optional compact
/// left-hand side (offsets, weights).
#[derive(Debug, Clone)]
pub struct UserStencil {
    /// 1 or 2.
    pub derivative: i64,
    /// Right-hand offsets, in cells.
    pub offsets: Vec<f64>,
    /// Right-hand weights.
    pub weights: Vec<f64>,
    /// Compact left-hand side.
    pub implicit: Option<(Vec<f64>, Vec<f64>)>,
}

/// A Butcher tableau as given.
#[derive(Debug, Clone)]
pub struct TableauSpec {
    /// The matrix a (s×s).
    pub a: Vec<Vec<f64>>,
    /// The weights b.
    pub b: Vec<f64>,
    /// The nodes c (optional; must be the row sums of a).
    pub c: Option<Vec<f64>>,
}

/// A spatial filter as given (`[space.filter]`).
#[derive(Debug, Clone)]
pub struct FilterSpec {
    /// "explicit" or "compact".
    pub kind: String,
    /// Even order 2..10.
    pub order: i64,
    /// σ of the explicit filter.
    pub strength: Option<f64>,
    /// α_f of the compact filter.
    pub alpha: Option<f64>,
}

/// A leapfrog time filter as given (`time.filter`, `time.filter_strength`,
/// `time.filter_alpha`).
#[derive(Debug, Clone, Default)]
pub struct TimeFilterSpec {
    /// "robert-asselin" or "raw".
    pub kind: Option<String>,
    /// The displacement strength γ.
    pub strength: Option<f64>,
    /// The RAW weight a.
    pub alpha: Option<f64>,
}

/// The time method as given.
#[derive(Debug, Clone, Default)]
pub(super) struct MethodSpec {
    pub name: Option<String>,
    pub filter: Option<FilterSpec>,
    pub time_filter: Option<TimeFilterSpec>,
    pub theta: Option<f64>,
    pub tableau: Option<TableauSpec>,
    pub first: Option<Vec<String>>,
    pub sequence: Option<Vec<String>>,
    pub splitting: Option<String>,
    pub beta: Option<f64>,
    pub gamma: Option<f64>,
}
