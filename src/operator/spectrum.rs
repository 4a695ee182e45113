//! The eigenvalues of L(θ), with the imaginary-axis rule applied only where it
//! holds by construction ([`super::classes`]).
//!
//! When L splits into a neutral part N(θ) and a scalar real part r(θ)·I, the
//! eigenvalues are eig N + r: the real parts of eig N are roundoff and are set to
//! zero where they are within the stability tolerance of |μ| or within the
//! roundoff level 64ε‖N‖_F, and r — dissipation, scalar diffusion — is added
//! exactly, however small (a dissipation of 1e-6 at long wavelengths is kept to
//! full relative accuracy). Otherwise the eigenvalues of the whole L are used,
//! and only real parts within its roundoff level 64ε‖L‖_F are set to zero
//! (backward-stable eigenvalue algorithms perturb each eigenvalue by about
//! ε‖L‖, so a smaller real part cannot be told from zero). In both cases an
//! eigenvalue within the roundoff level of zero is exactly zero. Where a real
//! part of a system's eigenvalue is too small to be trusted this way, it may
//! still be certified from a similarity that keeps it apart from the
//! imaginary parts (`super::perturbed`: hyperbolic long waves with biased
//! stencils, whose real parts vanish like θ⁴ or θ⁶).

use super::classes::TermClass;
use super::perturbed;
use super::Operator;
use crate::linalg::{EigSolver, LinalgError};
use num_complex::Complex64 as C64;

/// A reusable eigenvalue evaluator for one operator (one per worker).
pub struct Spectrum<'a> {
    op: &'a Operator,
    /// The operator's term classes ([`Operator::term_classes`]).
    classes: &'a [TermClass],
    split: bool,
    constant_ok: bool,
    factors: Vec<C64>,
    tolerance: f64,
    solver: EigSolver,
    sym: Vec<C64>,
}

impl<'a> Spectrum<'a> {
    /// For `op`, with the stability tolerance of the imaginary-axis rule.
    pub fn new(op: &'a Operator, tolerance: f64) -> Self {
        let m = op.m;
        Spectrum {
            op,
            classes: op.term_classes(),
            split: op.splits(),
            constant_ok: op.constant_splits(),
            factors: Vec::with_capacity(op.terms.len()),
            tolerance,
            solver: EigSolver::new(m),
            sym: vec![C64::new(0.0, 0.0); m * m],
        }
    }

    /// Whether the imaginary-axis rule applies (L splits).
    pub fn splits(&self) -> bool {
        self.split
    }

    /// The eigenvalues at θ into `out`; returns whether they can be trusted
    /// (see `Spectrum::finish`).
    pub fn at(&mut self, theta: &[f64], out: &mut [C64]) -> Result<bool, LinalgError> {
        let op = self.op;
        self.finish(|t| op.terms[t].factor_at(theta), Some(theta), out)
    }

    /// The eigenvalues at the grid node `idx`, from tabulated factors.
    pub fn at_tables(
        &mut self,
        tables: &[Vec<Vec<C64>>],
        idx: &[usize],
        out: &mut [C64],
    ) -> Result<bool, LinalgError> {
        let op = self.op;
        self.finish(
            |t| {
                op.terms[t]
                    .factors
                    .iter()
                    .zip(&tables[t])
                    .fold(C64::new(1.0, 0.0), |acc, ((d, _), col)| acc * col[idx[*d]])
            },
            None,
            out,
        )
    }

    /// Assembles the part of L to decompose, takes its eigenvalues, applies the
    /// axis rule and adds the scalar real part. The result is *untrusted* when L
    /// does not split and either has more than one variable and some eigenvalue
    /// with a real part within 10⁴ times the roundoff level (its sign may then be
    /// an artefact of the eigenvalue computation: eigenvalues of non-normal
    /// matrices carry errors larger than ε‖L‖), or has one variable and a real
    /// part within 10³ times the rounding of the stencil sums behind it.
    fn finish(
        &mut self,
        factor: impl Fn(usize) -> C64,
        theta: Option<&[f64]>,
        out: &mut [C64],
    ) -> Result<bool, LinalgError> {
        let op = self.op;
        self.sym.copy_from_slice(&op.constant);
        self.factors.clear();
        self.factors.extend((0..op.terms.len()).map(&factor));
        // L splits here if it splits everywhere, or if every term of class
        // *other* vanishes exactly at this θ (a biased stencil along θ_d = 0:
        // the x-axis ray of a scheme upwinded in y is neutral by construction)
        let split = self.split
            || (self.constant_ok
                && self
                    .classes
                    .iter()
                    .zip(&self.factors)
                    .all(|(c, f)| *c != TermClass::Other || *f == C64::new(0.0, 0.0)));
        let mut shift = 0.0;
        for (t, term) in op.terms.iter().enumerate() {
            let f = self.factors[t];
            if f == C64::new(0.0, 0.0) {
                continue;
            }
            match (split, self.classes[t]) {
                (true, TermClass::ScalarReal(c)) => shift += c * f.re,
                _ => {
                    for (o, a) in self.sym.iter_mut().zip(&term.matrix) {
                        *o += a * f;
                    }
                }
            }
        }
        self.solver.eigenvalues(&self.sym, out)?;
        // a 1×1 symbol is its own eigenvalue, exactly
        let noise = match op.m {
            1 => 0.0,
            _ => {
                64.0 * f64::EPSILON * crate::linalg::nonnormal::frobenius(self.sym.iter().copied())
            }
        };
        let axis = |mu: C64| {
            if split {
                (self.tolerance * mu.norm()).max(noise)
            } else {
                noise
            }
        };
        let mut trusted = true;
        for mu in out.iter_mut() {
            if !split && op.m > 1 && mu.norm() > noise && mu.re.abs() <= 1e4 * noise {
                trusted = false;
            }
            if mu.norm() <= noise {
                *mu = C64::new(0.0, 0.0);
            } else if mu.re.abs() <= axis(*mu) {
                mu.re = 0.0;
            }
            mu.re += shift;
        }
        // real parts below the eigenvalue computation's rounding, read off a
        // similarity that keeps them apart from the imaginary parts
        if let (false, false, Some(theta)) = (trusted, split, theta) {
            if let Some(refined) = perturbed::certified(&self.sym, op.m, op.real_noise(theta), out)
            {
                out.copy_from_slice(&refined);
                return Ok(true);
            }
        }
        // A 1×1 symbol is its own eigenvalue, but its real part carries the
        // rounding of the stencil sums behind it: a biased stencil's real part
        // vanishes as θ⁴ while its rounding only as θ².
        if let (1, false, Some(theta)) = (op.m, split, theta) {
            let noise: f64 = op
                .terms
                .iter()
                .map(|t| {
                    let a = t.matrix[0];
                    let mut n = a.norm() * t.factor_real_noise(theta);
                    if a.im != 0.0 {
                        n += 4.0 * f64::EPSILON * a.norm() * t.factor_at(theta).norm();
                    }
                    n
                })
                .sum();
            if noise > 0.0 && out[0].re.abs() <= 1e3 * noise {
                trusted = false;
            }
        }
        Ok(trusted)
    }
}
