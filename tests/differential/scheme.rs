//! The plain description of one generated scheme, shared by the case-text
//! renderer and the independent reference: matrices of the continuous system,
//! stencil weights, dissipation and the time method, with nothing taken from the
//! engine.

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A real matrix of the continuous system.
pub type Mat = DMatrix<f64>;
/// A complex matrix (symbols, amplification matrices).
pub type CMat = DMatrix<C64>;

/// A finite-difference stencil on a unit grid:
/// Σ_k a_k f^{(d)}(x + p_k) ≈ Σ_j w_j f(x + o_j).
#[derive(Debug, Clone)]
pub struct Stencil {
    /// Name in the case file (a catalogue name, or a user stencil's name).
    pub name: String,
    /// Whether the name is a catalogue stencil (else it is rendered as a user stencil).
    pub builtin: bool,
    /// Derivative order (1 or 2).
    pub derivative: u32,
    /// Right-hand-side offsets o_j.
    pub offsets: Vec<f64>,
    /// Right-hand-side weights w_j.
    pub weights: Vec<f64>,
    /// Left-hand-side offsets p_k (`[0]` when explicit).
    pub lhs_offsets: Vec<f64>,
    /// Left-hand-side weights a_k (`[1]` when explicit).
    pub lhs_weights: Vec<f64>,
}

impl Stencil {
    /// Whether there is a compact left-hand side.
    pub fn is_compact(&self) -> bool {
        !(self.lhs_offsets == [0.0] && self.lhs_weights == [1.0])
    }

    /// S(θ) = Σ w_j e^{iθo_j} / Σ a_k e^{iθp_k}. The numerator is summed as
    /// −2Σ w_j sin²(θo_j/2) + iΣ w_j sin(θo_j), which equals it because every
    /// stencil here is consistent (Σ w_j = 0), and keeps full relative accuracy
    /// as θ → 0, where long-wave limits are decided.
    pub fn symbol(&self, theta: f64) -> C64 {
        let (mut re, mut im) = (0.0, 0.0);
        for (o, w) in self.offsets.iter().zip(&self.weights) {
            re -= 2.0 * w * (0.5 * theta * o).sin().powi(2);
            im += w * (theta * o).sin();
        }
        let den: C64 = self
            .lhs_offsets
            .iter()
            .zip(&self.lhs_weights)
            .map(|(o, w)| C64::from_polar(*w, theta * o))
            .sum();
        let s = C64::new(re, im) / den;
        if self.is_central() {
            // exactly imaginary (first derivative) or real (second derivative)
            match self.derivative {
                1 => C64::new(0.0, s.im),
                _ => C64::new(s.re, 0.0),
            }
        } else {
            s
        }
    }

    /// The symbol of the mirror image (offsets negated, odd-derivative weights
    /// negated): −conj S(θ) for a first derivative with real weights.
    pub fn mirror_symbol(&self, theta: f64) -> C64 {
        -self.symbol(theta).conj()
    }

    /// Whether the stencil is its own mirror image: offsets symmetric and weights
    /// antisymmetric (first derivative) or symmetric (second), both sides.
    pub fn is_central(&self) -> bool {
        let odd = self.derivative % 2 == 1;
        let mirrored = |o: &[f64], w: &[f64], sign: f64| {
            o.iter().zip(w).all(|(oj, wj)| {
                o.iter()
                    .zip(w)
                    .any(|(ok, wk)| *ok == -oj && (*wk - sign * wj).abs() <= 1e-14 * wj.abs())
            })
        };
        mirrored(&self.offsets, &self.weights, if odd { -1.0 } else { 1.0 })
            && mirrored(&self.lhs_offsets, &self.lhs_weights, 1.0)
    }
}

/// How biased stencils act on a system.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Upwind {
    /// A± = V Λ± V⁻¹.
    Characteristic,
    /// A± = (A ± ρ(A) I)/2.
    Rusanov,
}

/// Added dissipation −σ (s/h_d) sin^p(θ_d/2) per axis.
#[derive(Debug, Clone, Copy)]
pub struct Dissipation {
    /// Even power p.
    pub order: u32,
    /// Strength σ.
    pub strength: f64,
}

/// The continuous system u_t + Σ A_d u_{x_d} = Σ K_d u_{x_d x_d} + S u.
#[derive(Debug, Clone)]
pub struct System {
    /// Variable names.
    pub variables: Vec<String>,
    /// Whether it is rendered as the scalar `advection` model.
    pub scalar_advection: bool,
    /// Flux matrices A_d.
    pub flux: Vec<Mat>,
    /// Eigenvector matrices V_d with A_d = V_d Λ_d V_d⁻¹.
    pub flux_vectors: Vec<Mat>,
    /// Eigenvalues Λ_d.
    pub flux_speeds: Vec<Vec<f64>>,
    /// Diffusion matrices K_d.
    pub diffusion: Vec<Mat>,
    /// Source S.
    pub source: Mat,
    /// Largest characteristic speed over unit directions, max_n ρ(Σ n_d A_d).
    pub reference_speed: f64,
}

impl System {
    /// Number of variables.
    pub fn size(&self) -> usize {
        self.variables.len()
    }
}

/// A time method as the case file names it.
#[derive(Debug, Clone)]
pub enum Method {
    /// Explicit Runge–Kutta with a polynomial stability function (ascending
    /// coefficients): euler, heun, ssprk3, rk4.
    Polynomial {
        /// Case name.
        name: &'static str,
        /// Coefficients of R(z).
        coeffs: Vec<f64>,
    },
    /// θ-method (backward-euler θ = 1, crank-nicolson θ = ½, or `theta`).
    Theta {
        /// Case name.
        name: &'static str,
        /// θ.
        theta: f64,
    },
    /// Explicit Runge–Kutta from a Butcher tableau.
    Tableau {
        /// Strictly lower-triangular a.
        a: Vec<Vec<f64>>,
        /// Weights b.
        b: Vec<f64>,
    },
    /// Σ_j α_j u^{n+j} = Δt Σ_j β_j f^{n+j}.
    Multistep {
        /// Case name.
        name: &'static str,
        /// α_0..α_s.
        alpha: Vec<f64>,
        /// β_0..β_s.
        beta: Vec<f64>,
    },
    /// Variables in `first` updated first, the others with their new values.
    ForwardBackward {
        /// Indices of the variables updated first.
        first: Vec<usize>,
    },
    /// Backward Euler on diffusion, forward Euler on the rest.
    ImexEuler,
    /// Crank–Nicolson on diffusion, Adams–Bashforth 2 on the rest.
    ImexCnab2,
    /// Unsplit Lax–Wendroff on the flux matrices.
    LaxWendroff,
    /// Lax–Friedrichs on the flux matrices.
    LaxFriedrichs,
    /// Dimension splitting of a one-step method.
    Split {
        /// Strang (else Lie).
        strang: bool,
        /// The one-step method of each sub-step.
        inner: Box<Method>,
    },
}

/// One generated scheme.
#[derive(Debug, Clone)]
pub struct Scheme {
    /// The seed it came from.
    pub seed: u64,
    /// Grid spacings h_d.
    pub spacing: Vec<f64>,
    /// The continuous system.
    pub system: System,
    /// First-derivative stencil per axis.
    pub first: Vec<Stencil>,
    /// Second-derivative stencil per axis.
    pub second: Vec<Stencil>,
    /// Upwinding of biased stencils.
    pub upwind: Upwind,
    /// Optional dissipation.
    pub dissipation: Option<Dissipation>,
    /// The time method.
    pub method: Method,
    /// `scan.points` per axis.
    pub points: usize,
    /// `scan.directions`.
    pub directions: usize,
    /// A bound of ‖L(θ)‖_F over all θ (the scale of roundoff in L), set by
    /// [`Scheme::finished`].
    pub symbol_bound: f64,
}

impl Scheme {
    /// The scheme with its derived scale filled in.
    pub fn finished(mut self) -> Scheme {
        self.symbol_bound = crate::symbol::symbol_bound(&self);
        self
    }

    /// Number of axes.
    pub fn dims(&self) -> usize {
        self.spacing.len()
    }
}
