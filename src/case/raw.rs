//! The serde mirror of the case file: every table refuses unknown keys, so a
//! misspelt key is an error that names it, with its line and column.

use super::rational::Coefficient;
use serde::Deserialize;
use std::collections::BTreeMap;

/// The whole case file as written.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCase {
    pub name: Option<String>,
    pub description: Option<String>,
    pub grid: RawGrid,
    pub model: RawModel,
    #[serde(default)]
    pub space: RawSpace,
    pub time: RawTime,
    #[serde(default)]
    pub scan: RawScan,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawGrid {
    pub spacing: Vec<f64>,
}

/// A number or one number per axis.
#[derive(Debug, Clone, Deserialize)]
#[serde(untagged)]
pub enum OneOrMany<T> {
    One(T),
    Many(Vec<T>),
}

/// The `[model]` table: its kind, and the model's own keys, which the model
/// catalogue reads and checks.
#[derive(Debug, Clone, Deserialize)]
pub struct RawModel {
    pub kind: String,
    #[serde(flatten)]
    pub rest: toml::Table,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSpace {
    pub first: Option<OneOrMany<String>>,
    pub second: Option<OneOrMany<String>>,
    pub upwind: Option<String>,
    pub dissipation: Option<RawDissipation>,
    pub arrangement: Option<String>,
    #[serde(default)]
    pub stencils: BTreeMap<String, RawStencil>,
    pub filter: Option<RawFilter>,
}

/// `[space.filter]`: a spatial filter applied once per time step.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawFilter {
    pub kind: String,
    pub order: i64,
    pub strength: Option<f64>,
    pub alpha: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawDissipation {
    pub order: i64,
    pub strength: f64,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStencil {
    pub derivative: i64,
    pub offsets: Vec<f64>,
    pub weights: Vec<f64>,
    pub implicit_offsets: Option<Vec<f64>>,
    pub implicit_weights: Option<Vec<f64>>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawTime {
    pub method: String,
    pub courant: Option<f64>,
    pub dt: Option<f64>,
    pub theta: Option<f64>,
    pub tableau: Option<RawTableau>,
    pub low_storage: Option<RawLowStorage>,
    pub first: Option<Vec<String>>,
    pub sequence: Option<Vec<String>>,
    pub splitting: Option<String>,
    pub filter: Option<String>,
    pub filter_strength: Option<f64>,
    pub filter_alpha: Option<f64>,
    pub beta: Option<f64>,
    pub gamma: Option<f64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawTableau {
    pub a: Vec<Vec<Coefficient>>,
    pub b: Vec<Coefficient>,
    pub c: Option<Vec<Coefficient>>,
}

/// A 2N low-storage scheme by its coefficients A_1..A_s and B_1..B_s.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawLowStorage {
    pub a: Vec<Coefficient>,
    pub b: Vec<Coefficient>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawScan {
    pub points: Option<OneOrMany<i64>>,
    pub directions: Option<i64>,
    pub steps: Option<i64>,
    pub tolerance: Option<f64>,
    pub analyses: Option<Vec<String>>,
    pub matrices: Option<i64>,
    pub epsilon: Option<f64>,
    pub weights: Option<Vec<f64>>,
    pub phase_tolerance: Option<f64>,
    pub dispersion_directions: Option<i64>,
}
