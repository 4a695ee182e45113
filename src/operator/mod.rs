//! The spatial symbol L(θ) of a discretised system: model × stencils × upwinding
//! × grid arrangement.
//!
//! For u_t + Σ A_d u_{x_d} = Σ K_d u_{x_d x_d} + S u discretised with first- and
//! second-derivative stencils of symbols S¹_d(θ_d), S²_d(θ_d) (unit grid),
//!
//!   L(θ) = S − Σ_d [A⁺_d S¹_d(θ_d) + A⁻_d S¹*_d(θ_d)]/h_d + Σ_d K_d S²_d(θ_d)/h_d²
//!          − Σ_d σ (s/h_d) sin^p(θ_d/2) I,
//!
//! where a central stencil uses A⁺ = A, A⁻ = 0 and a biased stencil uses the split
//! A = A⁺ + A⁻ with the mirrored stencil S¹* for A⁻: characteristic
//! (A± = V Λ± V⁻¹) or Rusanov (A± = (A ± ρ(A) I)/2).
//!
//! On a staggered arrangement each variable sits at its own offset in the cell
//! (0 or ½ per axis). The coupling of variable j into the equation of variable i
//! then uses, along the derivative axis, the staggered difference when the two
//! are half a cell apart (offsets ±½: symbol 2i sin(θ/2) for `central2`) and
//! the ordinary one otherwise, and a two-point average (symbol cos(θ/2)) along
//! every other axis where they are half a cell apart. Each variable's Fourier
//! amplitude is taken at its own location, so staggering is a phase and L is
//! unitarily similar to the matrix with all amplitudes at the cell centre.
//! Every term is a constant matrix times a product of one-axis factors, so the
//! symbol on a grid is assembled from per-axis tables.

pub mod classes;
mod collocated;
mod perturbed;
mod space;
pub mod spectrum;
mod staggered;

pub use space::{Arrangement, Dissipation, Space, Upwind};
pub use spectrum::Spectrum;

use crate::physics::System;
use crate::stencil::Stencil;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// The one-axis scalar factor of a term.
#[derive(Debug, Clone)]
pub enum Factor {
    /// `scale` × symbol of a stencil.
    Stencil {
        /// The stencil.
        stencil: Stencil,
        /// Multiplier (−1/h for fluxes, 1/h² for diffusion).
        scale: f64,
    },
    /// −coeff · sin^order(θ/2).
    Dissipation {
        /// σ s / h_d.
        coeff: f64,
        /// Even power.
        order: u32,
    },
    /// Two-point average across half a cell: cos(θ/2).
    Average,
}

impl Factor {
    /// The factor at θ_d.
    pub fn eval(&self, theta: f64) -> C64 {
        match self {
            Factor::Stencil { stencil, scale } => stencil.symbol(theta) * *scale,
            Factor::Dissipation { coeff, order } => {
                C64::new(-coeff * (0.5 * theta).sin().powi(*order as i32), 0.0)
            }
            Factor::Average => C64::new((0.5 * theta).cos(), 0.0),
        }
    }

    /// d/dθ of [`Factor::eval`].
    pub fn derivative(&self, theta: f64) -> C64 {
        match self {
            Factor::Stencil { stencil, scale } => stencil.symbol_derivative(theta) * *scale,
            Factor::Dissipation { coeff, order } => {
                let (sin, cos) = (0.5 * theta).sin_cos();
                let p = *order as i32;
                C64::new(-coeff * 0.5 * f64::from(p) * sin.powi(p - 1) * cos, 0.0)
            }
            Factor::Average => C64::new(-0.5 * (0.5 * theta).sin(), 0.0),
        }
    }

    /// The rounding level of the real part of [`Factor::eval`] (real factors
    /// carry only a relative rounding, which does not blur a sign).
    pub fn real_noise(&self, theta: f64) -> f64 {
        match self {
            Factor::Stencil { stencil, scale } => scale.abs() * stencil.real_noise(theta),
            _ => 0.0,
        }
    }
}

/// What a term discretises (used to split L for IMEX and splitting schemes).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TermKind {
    /// −A_d ∂_d.
    Flux,
    /// K_d ∂_d².
    Diffusion,
    /// Added dissipation.
    Dissipation,
    /// Source S (with averages on a staggered arrangement).
    Source,
}

/// One term: a constant matrix times a product of one-axis factors.
#[derive(Debug, Clone)]
pub struct Term {
    /// What it discretises.
    pub kind: TermKind,
    /// The axis it belongs to (its derivative axis; 0 for sources).
    pub axis: usize,
    /// Row-major m×m matrix.
    pub matrix: Vec<C64>,
    /// The factors and the axis each depends on.
    pub factors: Vec<(usize, Factor)>,
    /// Human description for `kgain check`.
    pub label: String,
}

impl Term {
    /// The product of the factors at θ.
    pub fn factor_at(&self, theta: &[f64]) -> C64 {
        self.factors
            .iter()
            .fold(C64::new(1.0, 0.0), |acc, (d, f)| acc * f.eval(theta[*d]))
    }

    /// ∂/∂θ_axis of [`Term::factor_at`] (the product rule over the factors on
    /// that axis).
    pub fn factor_derivative(&self, theta: &[f64], axis: usize) -> C64 {
        let mut total = C64::new(0.0, 0.0);
        for (k, (d, f)) in self.factors.iter().enumerate() {
            if *d != axis {
                continue;
            }
            let others = self
                .factors
                .iter()
                .enumerate()
                .filter(|(j, _)| *j != k)
                .fold(C64::new(1.0, 0.0), |acc, (_, (e, g))| {
                    acc * g.eval(theta[*e])
                });
            total += f.derivative(theta[*d]) * others;
        }
        total
    }

    /// The rounding level of the real part of [`Term::factor_at`] times a real
    /// coefficient: the real-part rounding of each factor times the moduli of
    /// the others, plus 4ε|value| when two or more factors are complex (then the
    /// rounding of an imaginary part reaches the real part of the product).
    pub fn factor_real_noise(&self, theta: &[f64]) -> f64 {
        let values: Vec<C64> = self
            .factors
            .iter()
            .map(|(d, f)| f.eval(theta[*d]))
            .collect();
        let mut noise = 0.0;
        for (k, (d, f)) in self.factors.iter().enumerate() {
            let rn = f.real_noise(theta[*d]);
            if rn > 0.0 {
                let others: f64 = values
                    .iter()
                    .enumerate()
                    .filter(|(j, _)| *j != k)
                    .map(|(_, v)| v.norm())
                    .product();
                noise += rn * others;
            }
        }
        let complex = values.iter().filter(|v| v.im != 0.0).count();
        if complex >= 2 {
            noise += 4.0 * f64::EPSILON * values.iter().map(|v| v.norm()).product::<f64>();
        }
        noise
    }
}

/// The assembled spatial operator.
#[derive(Debug, Clone)]
pub struct Operator {
    /// Number of variables.
    pub m: usize,
    /// Number of axes.
    pub dims: usize,
    /// Row-major constant part (source on a collocated arrangement).
    pub constant: Vec<C64>,
    /// θ-dependent terms. Their classes are cached on first use
    /// ([`Operator::term_classes`]): change the terms only before the operator
    /// is first evaluated, or assemble a new one.
    pub terms: Vec<Term>,
    /// Whether every coefficient is real in physical space, so L(−θ) = conj L(θ).
    pub real_coefficients: bool,
    /// The class of each term ([`classes::classify`]), computed on first use:
    /// it does not depend on θ, and classifying a stencil evaluates its symbol
    /// dozens of times, so every evaluator of this operator shares it.
    term_classes: std::sync::OnceLock<Vec<classes::TermClass>>,
}

/// Why the operator could not be assembled.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum OperatorError {
    /// A flux matrix that cannot be split into characteristic parts.
    #[error("the flux matrix along axis {axis} is not diagonalisable, so characteristic upwinding is undefined; use space.upwind = \"rusanov\" or a central stencil")]
    NotDiagonalisable {
        /// The axis.
        axis: usize,
    },
    /// A stencil whose offsets do not fit the staggering it is asked to bridge.
    #[error("stencil '{stencil}' cannot couple variables {shift} cell apart along axis {axis} on the '{arrangement}' arrangement: its offsets must be {need}")]
    Staggering {
        /// Stencil name.
        stencil: String,
        /// The axis.
        axis: usize,
        /// "half a" or "no".
        shift: &'static str,
        /// The arrangement.
        arrangement: String,
        /// What the offsets must be.
        need: &'static str,
    },
}

pub(crate) fn flat(a: &DMatrix<C64>) -> Vec<C64> {
    crate::linalg::from_matrix(a)
}

pub(crate) const AXIS: [&str; 3] = ["x", "y", "z"];

impl Operator {
    /// Assembles L(θ) for a system on a grid of spacings `h` with a spatial scheme.
    pub fn assemble(sys: &System, h: &[f64], space: &Space) -> Result<Operator, OperatorError> {
        let real_coefficients = sys
            .flux
            .iter()
            .chain(&sys.diffusion)
            .chain(std::iter::once(&sys.source))
            .all(|a| a.iter().all(|z| z.im == 0.0));
        if space.locations.is_empty() {
            collocated::assemble(sys, h, space, real_coefficients)
        } else {
            staggered::assemble(sys, h, space, real_coefficients)
        }
    }

    /// L(θ) into a row-major m×m slice.
    pub fn symbol_into(&self, theta: &[f64], out: &mut [C64]) {
        self.symbol_filtered_into(theta, |_| true, true, out)
    }

    /// The part of L(θ) made of the terms `keep` selects (and of the constant part
    /// when `constant`), into `out`.
    pub fn symbol_filtered_into(
        &self,
        theta: &[f64],
        keep: impl Fn(&Term) -> bool,
        constant: bool,
        out: &mut [C64],
    ) {
        if constant {
            out.copy_from_slice(&self.constant);
        } else {
            out.fill(C64::new(0.0, 0.0));
        }
        for t in self.terms.iter().filter(|t| keep(t)) {
            let f = t.factor_at(theta);
            for (o, a) in out.iter_mut().zip(&t.matrix) {
                *o += a * f;
            }
        }
    }

    /// ∂L/∂θ_axis at θ into a row-major m×m slice.
    pub fn derivative_into(&self, theta: &[f64], axis: usize, out: &mut [C64]) {
        out.fill(C64::new(0.0, 0.0));
        for t in &self.terms {
            if !t.factors.iter().any(|(d, _)| *d == axis) {
                continue;
            }
            let f = t.factor_derivative(theta, axis);
            for (o, a) in out.iter_mut().zip(&t.matrix) {
                *o += a * f;
            }
        }
    }

    /// L(θ) as a new row-major vector.
    pub fn symbol(&self, theta: &[f64]) -> Vec<C64> {
        let mut out = vec![C64::new(0.0, 0.0); self.m * self.m];
        self.symbol_into(theta, &mut out);
        out
    }

    /// The rounding level of the real parts of the entries of L(θ): each term's
    /// [`Term::factor_real_noise`] times its coefficient, plus 4ε|a f| for a
    /// complex coefficient. It is far below ε‖L(θ)‖ where biased stencils leave
    /// a real part of high order in θ.
    pub fn real_noise(&self, theta: &[f64]) -> f64 {
        self.terms
            .iter()
            .map(|t| {
                let a = t.matrix.iter().map(|z| z.norm()).fold(0.0, f64::max);
                let complex = t.matrix.iter().any(|z| z.im != 0.0);
                let mut n = a * t.factor_real_noise(theta);
                if complex {
                    n += 4.0 * f64::EPSILON * a * t.factor_at(theta).norm();
                }
                n
            })
            .sum()
    }

    /// L(θ) as an nalgebra matrix.
    pub fn symbol_matrix(&self, theta: &[f64]) -> DMatrix<C64> {
        crate::linalg::to_matrix(&self.symbol(theta), self.m)
    }

    /// Whether every diffusion term's factor is real at θ (central second
    /// differences are; a biased or odd stencil gives an imaginary part).
    pub fn diffusion_is_real_at(&self, theta: &[f64]) -> bool {
        self.terms
            .iter()
            .filter(|t| t.kind == TermKind::Diffusion)
            .all(|t| t.factor_at(theta).im == 0.0)
    }

    /// A part of L(θ) as an nalgebra matrix.
    pub fn part_matrix(
        &self,
        theta: &[f64],
        keep: impl Fn(&Term) -> bool,
        constant: bool,
    ) -> DMatrix<C64> {
        let mut out = vec![C64::new(0.0, 0.0); self.m * self.m];
        self.symbol_filtered_into(theta, keep, constant, &mut out);
        crate::linalg::to_matrix(&out, self.m)
    }

    /// Each term's factors tabulated on the per-axis coordinates
    /// (`tables[t][k][i]`: term t, factor k, grid index i along that factor's axis).
    pub fn tabulate(&self, coords: &[Vec<f64>]) -> Vec<Vec<Vec<C64>>> {
        self.terms
            .iter()
            .map(|t| {
                t.factors
                    .iter()
                    .map(|(d, f)| coords[*d].iter().map(|&th| f.eval(th)).collect())
                    .collect()
            })
            .collect()
    }

    /// L at the grid node with per-axis indices `idx`, from tabulated factors.
    pub fn symbol_from_tables(&self, tables: &[Vec<Vec<C64>>], idx: &[usize], out: &mut [C64]) {
        out.copy_from_slice(&self.constant);
        for (t, tab) in self.terms.iter().zip(tables) {
            let f = t
                .factors
                .iter()
                .zip(tab)
                .fold(C64::new(1.0, 0.0), |acc, ((d, _), col)| acc * col[idx[*d]]);
            for (o, a) in out.iter_mut().zip(&t.matrix) {
                *o += a * f;
            }
        }
    }

    /// Largest |factor product| × ‖matrix‖_F summed over terms, plus ‖constant‖_F:
    /// a size scale of L(θ) over all θ.
    pub fn scale(&self) -> f64 {
        // scaled by the largest entry, so that entries near 1e200 do not overflow the sum
        let norm = |v: &[C64]| {
            let big = v
                .iter()
                .map(|z| z.re.abs().max(z.im.abs()))
                .fold(0.0, f64::max);
            if big == 0.0 || !big.is_finite() {
                return big;
            }
            big * v.iter().map(|z| (z / big).norm_sqr()).sum::<f64>().sqrt()
        };
        let probe: Vec<f64> = (0..64)
            .map(|k| std::f64::consts::PI * k as f64 / 63.0)
            .collect();
        let terms: f64 = self
            .terms
            .iter()
            .map(|t| {
                let f: f64 = t
                    .factors
                    .iter()
                    .map(|(_, f)| {
                        probe
                            .iter()
                            .map(|&th| f.eval(th).norm())
                            .fold(0.0, f64::max)
                    })
                    .product();
                norm(&t.matrix) * f
            })
            .sum();
        norm(&self.constant) + terms
    }
}
