//! A Butcher tableau (a, b, c) as a value, and the one-step method it defines.
//!
//! Presets and low-storage conversions produce a [`Tableau`]; its stability
//! function is found by the general tableau path ([`super::methods::tableau`]),
//! so a preset can never disagree with the same tableau written in a case file.

use super::methods::{tableau, MethodError};
use super::Method;

/// An s-stage Runge–Kutta method: stage matrix `a` (s×s), weights `b`, nodes `c`.
#[derive(Debug, Clone, PartialEq)]
pub struct Tableau {
    /// Stage coefficients a_ij (row i is stage i).
    pub a: Vec<Vec<f64>>,
    /// Weights b_j.
    pub b: Vec<f64>,
    /// Nodes c_i (the row sums of `a`).
    pub c: Vec<f64>,
}

impl Tableau {
    /// A tableau from a and b, with c taken as the row sums of a.
    pub fn new(a: Vec<Vec<f64>>, b: Vec<f64>) -> Tableau {
        let c = a.iter().map(|row| row.iter().sum()).collect();
        Tableau { a, b, c }
    }

    /// Number of stages s.
    pub fn stages(&self) -> usize {
        self.b.len()
    }

    /// The method with this tableau, named `name`, its order that of its
    /// stability function (the linear order).
    pub fn method(&self, name: &str) -> Result<Method, MethodError> {
        let mut m = tableau(&self.a, &self.b)?;
        m.name = name.to_string();
        Ok(m)
    }
}
