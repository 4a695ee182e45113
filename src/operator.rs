//! The spatial symbol L(θ) of a discretised system: model × stencils × upwinding.
//!
//! For u_t + Σ A_d u_{x_d} = Σ K_d u_{x_d x_d} + S u discretised with first- and
//! second-derivative stencils of symbols S¹_d(θ_d), S²_d(θ_d) (unit grid),
//!
//!   L(θ) = S − Σ_d [A⁺_d S¹_d(θ_d) + A⁻_d S¹*_d(θ_d)]/h_d + Σ_d K_d S²_d(θ_d)/h_d²
//!          − Σ_d σ (s/h_d) sin^p(θ_d/2) I,
//!
//! where a central stencil uses A⁺ = A, A⁻ = 0 and a biased stencil uses the split
//! A = A⁺ + A⁻ with the mirrored stencil S¹* for A⁻: characteristic
//! (A± = V Λ± V⁻¹) or Rusanov (A± = (A ± ρ(A) I)/2). Every term depends on one
//! axis only, so the symbol on a grid is a sum of matrices times per-axis tables.

use crate::physics::System;
use crate::stencil::Stencil;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// How a biased stencil is applied to a system.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Upwind {
    /// Split by characteristic speeds: A± = V Λ± V⁻¹.
    Characteristic,
    /// Split by the spectral radius: A± = (A ± ρ(A) I)/2.
    Rusanov,
}

/// Artificial dissipation −σ (s/h_d) sin^p(θ_d/2) per axis.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Dissipation {
    /// Even power p.
    pub order: u32,
    /// Strength σ.
    pub strength: f64,
}

/// The spatial discretisation chosen in a case.
#[derive(Debug, Clone)]
pub struct Space {
    /// First-derivative stencil per axis.
    pub first: Vec<Stencil>,
    /// Second-derivative stencil per axis.
    pub second: Vec<Stencil>,
    /// Splitting used with biased stencils.
    pub upwind: Upwind,
    /// Optional added dissipation.
    pub dissipation: Option<Dissipation>,
}

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
}

impl Factor {
    /// The factor at θ_d.
    pub fn eval(&self, theta: f64) -> C64 {
        match self {
            Factor::Stencil { stencil, scale } => stencil.symbol(theta) * *scale,
            Factor::Dissipation { coeff, order } => {
                C64::new(-coeff * (0.5 * theta).sin().powi(*order as i32), 0.0)
            }
        }
    }
}

/// One term: a constant matrix times a one-axis factor.
#[derive(Debug, Clone)]
pub struct Term {
    /// Axis the factor depends on.
    pub axis: usize,
    /// Row-major m×m matrix.
    pub matrix: Vec<C64>,
    /// The factor.
    pub factor: Factor,
    /// Human description for `kgain check`.
    pub label: String,
}

/// The assembled spatial operator.
#[derive(Debug, Clone)]
pub struct Operator {
    /// Number of variables.
    pub m: usize,
    /// Number of axes.
    pub dims: usize,
    /// Row-major constant part (source).
    pub constant: Vec<C64>,
    /// θ-dependent terms.
    pub terms: Vec<Term>,
    /// Whether every coefficient is real in physical space, so L(−θ) = conj L(θ).
    pub real_coefficients: bool,
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
}

fn flat(a: &DMatrix<C64>) -> Vec<C64> {
    crate::linalg::from_matrix(a)
}

impl Operator {
    /// Assembles L(θ) for a system on a grid of spacings `h` with a spatial scheme.
    #[allow(clippy::needless_range_loop)]
    pub fn assemble(sys: &System, h: &[f64], space: &Space) -> Result<Operator, OperatorError> {
        let m = sys.size();
        let dims = h.len();
        let mut terms = Vec::new();
        let mut push = |axis: usize, a: DMatrix<C64>, factor: Factor, label: String| {
            if a.iter().any(|z| z.norm() != 0.0) {
                terms.push(Term {
                    axis,
                    matrix: flat(&a),
                    factor,
                    label,
                });
            }
        };
        let axis_name = |d: usize| ["x", "y", "z"][d];
        for d in 0..dims {
            let a = &sys.flux[d];
            let st = &space.first[d];
            let scale = -1.0 / h[d];
            if st.is_central() {
                push(
                    d,
                    a.clone(),
                    Factor::Stencil {
                        stencil: st.clone(),
                        scale,
                    },
                    format!("-A_{} d/d{} ({})", axis_name(d), axis_name(d), st.name),
                );
            } else {
                let (ap, am) = split_flux(a, space.upwind).ok_or(OperatorError::NotDiagonalisable { axis: d })?;
                push(
                    d,
                    ap,
                    Factor::Stencil {
                        stencil: st.clone(),
                        scale,
                    },
                    format!("-A+_{} d/d{} ({})", axis_name(d), axis_name(d), st.name),
                );
                let mir = st.mirror();
                push(
                    d,
                    am,
                    Factor::Stencil {
                        stencil: mir.clone(),
                        scale,
                    },
                    format!("-A-_{} d/d{} ({})", axis_name(d), axis_name(d), mir.name),
                );
            }
            let k = &sys.diffusion[d];
            let st2 = &space.second[d];
            push(
                d,
                k.clone(),
                Factor::Stencil {
                    stencil: st2.clone(),
                    scale: 1.0 / (h[d] * h[d]),
                },
                format!("K_{} d2/d{}2 ({})", axis_name(d), axis_name(d), st2.name),
            );
            if let Some(dis) = space.dissipation {
                push(
                    d,
                    DMatrix::identity(m, m),
                    Factor::Dissipation {
                        coeff: dis.strength * sys.reference_speed / h[d],
                        order: dis.order,
                    },
                    format!(
                        "-sigma s/h_{} sin^{}(theta_{}/2) I",
                        axis_name(d),
                        dis.order,
                        axis_name(d)
                    ),
                );
            }
        }
        let real_coefficients = sys
            .flux
            .iter()
            .chain(&sys.diffusion)
            .chain(std::iter::once(&sys.source))
            .all(|a| a.iter().all(|z| z.im == 0.0));
        Ok(Operator {
            m,
            dims,
            constant: flat(&sys.source),
            terms,
            real_coefficients,
        })
    }

    /// L(θ) into a row-major m×m slice.
    pub fn symbol_into(&self, theta: &[f64], out: &mut [C64]) {
        out.copy_from_slice(&self.constant);
        for t in &self.terms {
            let f = t.factor.eval(theta[t.axis]);
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

    /// L(θ) as an nalgebra matrix.
    pub fn symbol_matrix(&self, theta: &[f64]) -> DMatrix<C64> {
        crate::linalg::to_matrix(&self.symbol(theta), self.m)
    }

    /// Each term's factor tabulated on the per-axis coordinates (`tables[t][i]`).
    pub fn tabulate(&self, coords: &[Vec<f64>]) -> Vec<Vec<C64>> {
        self.terms
            .iter()
            .map(|t| coords[t.axis].iter().map(|&th| t.factor.eval(th)).collect())
            .collect()
    }

    /// L at the grid node with per-axis indices `idx`, from tabulated factors.
    pub fn symbol_from_tables(&self, tables: &[Vec<C64>], idx: &[usize], out: &mut [C64]) {
        out.copy_from_slice(&self.constant);
        for (t, tab) in self.terms.iter().zip(tables) {
            let f = tab[idx[t.axis]];
            for (o, a) in out.iter_mut().zip(&t.matrix) {
                *o += a * f;
            }
        }
    }
}

/// Splits a flux matrix into right- and left-going parts.
fn split_flux(a: &DMatrix<C64>, how: Upwind) -> Option<(DMatrix<C64>, DMatrix<C64>)> {
    let m = a.nrows();
    let half = C64::new(0.5, 0.0);
    let abs_a = match how {
        Upwind::Rusanov => {
            let rho = crate::linalg::spectral_radius(&flat(a), m).ok()?;
            DMatrix::identity(m, m) * C64::new(rho, 0.0)
        }
        Upwind::Characteristic => {
            let cluster = 1e-9 * a.norm().max(1e-300);
            crate::linalg::diagonalisable_function(a, cluster, |l| {
                if l.re >= 0.0 {
                    l
                } else {
                    -l
                }
            })?
        }
    };
    Some(((a + &abs_a) * half, (a - &abs_a) * half))
}
