//! Time integrators as maps from the spatial symbol to the amplification matrix,
//! and their exact stability regions.
//!
//! * One-step methods (Runge–Kutta, θ-methods, any Butcher tableau) act through
//!   their stability function R(z) = P(z)/Q(z): G = Q(ΔtL)⁻¹P(ΔtL), and the
//!   eigenvalues of G are R(Δt μ) for the eigenvalues μ of L.
//! * Linear multistep methods Σ_j α_j u^{n+j} = Δt Σ_j β_j f^{n+j} act through the
//!   block companion matrix of size m·s; the eigenvalues of G are the roots ζ of
//!   Σ_j (α_j − Δt μ β_j) ζ^j.
//!
//! * Second-order-in-time methods for u_tt = L u (central difference, Newmark)
//!   are two-step recurrences Σ_j ρ_j u^{n+j} = Δt² L Σ_j σ_j u^{n+j}: the
//!   algebra of a multistep method in the variable z = Δt² μ
//!   ([`Method::step_variable`]), with roots taken in ζ − 1
//!   ([`shifted_roots`]); see [`second_order`].
//!
//! `exit` computes the first-exit radius r*(φ) of each region along a ray, the
//! quantity behind the stability limit (README: The largest stable time step).

pub mod butcher;
pub mod composite;
mod exit;
pub mod horner;
pub mod increment;
pub mod lowstorage;
pub mod methods;
pub mod order;
pub mod presets;
pub mod second_order;
pub mod shifted_roots;
pub mod time_filter;

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

pub use methods::{builtin, method_names, MethodError};

/// A one-step method through its stability function R = P/Q (ascending coefficients).
#[derive(Debug, Clone, PartialEq)]
pub struct OneStep {
    /// Numerator coefficients of R.
    pub p: Vec<f64>,
    /// Denominator coefficients of R (q\[0\] = 1).
    pub q: Vec<f64>,
}

/// A linear multistep method Σ_j α_j u^{n+j} = Δt Σ_j β_j f^{n+j}, j = 0..s.
#[derive(Debug, Clone, PartialEq)]
pub struct Multistep {
    /// α_0..α_s.
    pub alpha: Vec<f64>,
    /// β_0..β_s.
    pub beta: Vec<f64>,
}

/// How the method advances a linear system.
#[derive(Debug, Clone, PartialEq)]
pub enum Scheme {
    /// Through a stability function.
    OneStep(OneStep),
    /// Through a companion matrix.
    Multistep(Multistep),
    /// Built from pieces of the symbol (see [`composite`]).
    Composite(composite::Composite),
    /// A second-order-in-time recurrence for u_tt = L u, whose coefficients
    /// (α = ρ, β = σ) act on z = Δt² μ (see [`second_order`]).
    SecondOrder(Multistep),
}

/// A named time integrator.
#[derive(Debug, Clone, PartialEq)]
pub struct Method {
    /// Name, as in case files.
    pub name: String,
    /// Order of accuracy on linear problems.
    pub order: u32,
    /// Whether each step needs no linear solve.
    pub explicit: bool,
    /// The scheme.
    pub scheme: Scheme,
}

impl Method {
    /// Number of time levels the state carries (1 for one-step methods).
    pub fn levels(&self) -> usize {
        match &self.scheme {
            Scheme::OneStep(_) => 1,
            Scheme::Multistep(ms) | Scheme::SecondOrder(ms) => ms.alpha.len() - 1,
            Scheme::Composite(c) => c.levels(),
        }
    }

    /// The spatial filter applied once per step, if any.
    pub fn spatial_filter(&self) -> Option<&crate::stencil::filter::SpatialFilter> {
        match &self.scheme {
            Scheme::Composite(composite::Composite::Filtered { filter, .. }) => Some(filter),
            _ => None,
        }
    }

    /// Whether the method advances u_tt = L u (second order in time).
    pub fn is_second_order(&self) -> bool {
        matches!(self.scheme, Scheme::SecondOrder(_))
    }

    /// The factor s(Δt) in the method's variable z = s(Δt)·μ: Δt for methods
    /// of first-order-in-time systems, Δt² for second-order-in-time ones. Every
    /// analysis forms z (and Z = s(Δt)·L) through it.
    pub fn step_variable(&self, dt: f64) -> f64 {
        match self.scheme {
            Scheme::SecondOrder(_) => dt * dt,
            _ => dt,
        }
    }

    /// The inverse of [`Method::step_variable`] at an eigenvalue of modulus
    /// `mu_norm`: the Δt at which z = s(Δt)·μ has modulus `r` (r/|μ|, or
    /// √(r/|μ|) for second-order-in-time methods); ∞ stays ∞ and 0 stays 0.
    pub fn dt_of_radius(&self, r: f64, mu_norm: f64) -> f64 {
        match self.scheme {
            Scheme::SecondOrder(_) => (r / mu_norm).sqrt(),
            _ => r / mu_norm,
        }
    }

    /// The composite scheme, if this method is one.
    pub fn composite(&self) -> Option<&composite::Composite> {
        match &self.scheme {
            Scheme::Composite(c) => Some(c),
            _ => None,
        }
    }

    /// Largest modulus among the amplification eigenvalues belonging to one
    /// eigenvalue z = Δt μ of the spatial operator.
    pub fn amplification_radius(&self, z: C64) -> f64 {
        match &self.scheme {
            Scheme::OneStep(os) => os.r(z).norm(),
            Scheme::Multistep(ms) if ms.alpha.len() <= 3 => {
                // characteristic polynomial on the stack (hot loop of the sweep)
                let mut c = [C64::new(0.0, 0.0); 3];
                for (cj, (a, b)) in c.iter_mut().zip(ms.alpha.iter().zip(&ms.beta)) {
                    *cj = C64::new(*a, 0.0) - z * b;
                }
                crate::linalg::poly::max_root_modulus(&c[..ms.alpha.len()]).unwrap_or(f64::NAN)
            }
            Scheme::Multistep(ms) => {
                crate::linalg::poly::max_root_modulus(&ms.characteristic(z)).unwrap_or(f64::NAN)
            }
            Scheme::Composite(_) => f64::NAN,
            Scheme::SecondOrder(ms) => shifted_roots::max_modulus(ms, z),
        }
    }

    /// The amplification eigenvalues belonging to z = Δt μ (one for one-step methods,
    /// s for multistep methods).
    pub fn amplification_eigenvalues(&self, z: C64) -> Vec<C64> {
        match &self.scheme {
            Scheme::OneStep(os) => vec![os.r(z)],
            Scheme::Multistep(ms) => {
                let c = ms.characteristic(z);
                let mut r = crate::linalg::poly::roots(&c)
                    .unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); self.levels()]);
                r.resize(self.levels(), C64::new(0.0, 0.0));
                r
            }
            Scheme::Composite(_) => vec![C64::new(f64::NAN, f64::NAN)],
            Scheme::SecondOrder(ms) => shifted_roots::roots(ms, z),
        }
    }

    /// The amplification matrix G for Z = Δt·L (Z = Δt²·L for second-order
    /// methods; size m·levels). Built from the matrices themselves,
    /// independently of any eigenvalue computation. Multistep and second-order
    /// methods act on the stacked levels (u^n, u^{n−1}, …).
    pub fn amplification_matrix(&self, z: &DMatrix<C64>) -> DMatrix<C64> {
        let m = z.nrows();
        let id = DMatrix::<C64>::identity(m, m);
        let poly = |c: &[f64]| {
            // Horner with matrices
            let mut acc = DMatrix::<C64>::zeros(m, m);
            for cj in c.iter().rev() {
                acc = &acc * z + &id * C64::new(*cj, 0.0);
            }
            acc
        };
        match &self.scheme {
            Scheme::OneStep(os) => {
                let p = poly(&os.p);
                if os.q.len() == 1 {
                    return p / C64::new(os.q[0], 0.0);
                }
                let q = poly(&os.q);
                q.lu()
                    .solve(&p)
                    .unwrap_or_else(|| DMatrix::from_element(m, m, C64::new(f64::NAN, f64::NAN)))
            }
            Scheme::Multistep(ms) | Scheme::SecondOrder(ms) => {
                let s = ms.alpha.len() - 1;
                let lead = &id * C64::new(ms.alpha[s], 0.0) - z * C64::new(ms.beta[s], 0.0);
                let lu = lead.lu();
                let mut g = DMatrix::<C64>::zeros(m * s, m * s);
                for c in 0..s {
                    let j = s - 1 - c;
                    let rhs = z * C64::new(ms.beta[j], 0.0) - &id * C64::new(ms.alpha[j], 0.0);
                    let blk = lu.solve(&rhs).unwrap_or_else(|| {
                        DMatrix::from_element(m, m, C64::new(f64::NAN, f64::NAN))
                    });
                    g.view_mut((0, c * m), (m, m)).copy_from(&blk);
                }
                for r in 1..s {
                    g.view_mut((r * m, (r - 1) * m), (m, m)).copy_from(&id);
                }
                g
            }
            Scheme::Composite(_) => DMatrix::from_element(m, m, C64::new(f64::NAN, f64::NAN)),
        }
    }

    /// First-exit radius of the stability region (in z = s(Δt)·μ, see
    /// [`Method::step_variable`]) along the ray t·w, w a unit
    /// complex number: the largest r such that every point t·w, 0 < t < r, is
    /// stable. `f64::INFINITY` when the whole ray is stable, 0 when points
    /// arbitrarily close to the origin are unstable.
    pub fn exit_radius(&self, w: C64) -> f64 {
        match &self.scheme {
            Scheme::OneStep(os) => exit::one_step(os, w),
            Scheme::Multistep(ms) | Scheme::SecondOrder(ms) => exit::multistep(ms, w),
            Scheme::Composite(_) => f64::NAN,
        }
    }

    /// Whether the ray t·w (|w| = 1) is certified to stay in the stability
    /// region for every t ∈ (0, r], so that [`Method::exit_radius`] is at least
    /// r. Only one-step methods give certificates; `false` says nothing.
    pub fn stable_through(&self, w: C64, r: f64) -> bool {
        match &self.scheme {
            Scheme::OneStep(os) => exit::one_step_stable_through(os, w, r),
            _ => false,
        }
    }

    /// [`Method::exit_radius`] with guesses of it (the exits of nearby
    /// directions): one-step methods first try Newton's method from each guess
    /// in turn, with certificates on both sides of the root found, and compute
    /// the exit in full only when every guess fails.
    pub fn exit_radius_near(&self, w: C64, guesses: &[f64]) -> f64 {
        match &self.scheme {
            Scheme::OneStep(os) => exit::one_step_near(os, w, guesses),
            _ => self.exit_radius(w),
        }
    }

    /// Whether [`Method::exit_radius_near`] uses its guesses (one-step methods).
    pub fn takes_exit_guesses(&self) -> bool {
        matches!(self.scheme, Scheme::OneStep(_))
    }

    /// Stability interval on the imaginary axis, [0, y*): r* in direction +i.
    pub fn imaginary_limit(&self) -> f64 {
        self.exit_radius(C64::new(0.0, 1.0))
            .min(self.exit_radius(C64::new(0.0, -1.0)))
    }

    /// Stability interval on the negative real axis, (−x*, 0]: r* in direction −1.
    pub fn real_limit(&self) -> f64 {
        self.exit_radius(C64::new(-1.0, 0.0))
    }
}

impl OneStep {
    /// R(z).
    pub fn r(&self, z: C64) -> C64 {
        let p = self
            .p
            .iter()
            .rev()
            .fold(C64::new(0.0, 0.0), |a, c| a * z + c);
        if self.q.len() == 1 {
            return p / self.q[0];
        }
        let q = self
            .q
            .iter()
            .rev()
            .fold(C64::new(0.0, 0.0), |a, c| a * z + c);
        p / q
    }

    /// R′(z)/R(z) = P′/P − Q′/Q, the derivative of ln R: by Horner's rule with
    /// the derivative carried along. NaN where R(z) = 0 (no logarithm).
    pub fn log_derivative(&self, z: C64) -> C64 {
        let ratio = |c: &[f64]| {
            let zero = C64::new(0.0, 0.0);
            let (value, slope) = c
                .iter()
                .rev()
                .fold((zero, zero), |(v, s), k| (v * z + k, s * z + v));
            slope / value
        };
        let out = if self.q.len() == 1 {
            ratio(&self.p)
        } else {
            ratio(&self.p) - ratio(&self.q)
        };
        if out.is_finite() {
            out
        } else {
            C64::new(f64::NAN, f64::NAN)
        }
    }
}

impl Multistep {
    /// Order of accuracy from the error constants C_q = Σ α_j j^q/q! −
    /// Σ β_j j^{q−1}/(q−1)!: the largest p with C_0 = … = C_p = 0 (to 1e-12
    /// relative to the coefficients), up to 10.
    pub fn order(&self) -> u32 {
        let scale: f64 = self.alpha.iter().chain(&self.beta).map(|c| c.abs()).sum();
        let constant = |q: i32| {
            let fact = |n: i32| (1..=n).fold(1.0, |a, k| a * f64::from(k));
            let mut c = 0.0;
            for (j, (a, b)) in self.alpha.iter().zip(&self.beta).enumerate() {
                let j = j as f64;
                c += a * j.powi(q) / fact(q);
                if q >= 1 {
                    c -= b * j.powi(q - 1) / fact(q - 1);
                }
            }
            c
        };
        let zero = |q: i32| constant(q).abs() <= 1e-12 * scale.max(1.0);
        if !zero(0) {
            return 0;
        }
        (1..=10).take_while(|q| zero(*q)).count() as u32
    }

    /// Coefficients of the characteristic polynomial Σ_j (α_j − z β_j) ζ^j.
    pub fn characteristic(&self, z: C64) -> Vec<C64> {
        self.alpha
            .iter()
            .zip(&self.beta)
            .map(|(a, b)| C64::new(*a, 0.0) - z * b)
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn log_derivative_of_a_rational_function_is_its_closed_form() {
        // R(z) = (1 + z/2)/(1 − z/2) (trapezoidal rule, derived here):
        // ln R = ln(1 + z/2) − ln(1 − z/2), so R′/R = (1/2)/(1 + z/2) + (1/2)/(1 − z/2)
        let trapezoid = OneStep {
            p: vec![1.0, 0.5],
            q: vec![1.0, -0.5],
        };
        // R(z) = 1 + z + z²/2 (Heun): R′/R = (1 + z)/(1 + z + z²/2)
        let heun = OneStep {
            p: vec![1.0, 1.0, 0.5],
            q: vec![1.0],
        };
        for k in 0..20 {
            let z = C64::new(-1.5 + 0.1 * k as f64, 0.3 * k as f64 - 2.0);
            let one = C64::new(1.0, 0.0);
            let want = 0.5 / (one + z * 0.5) + 0.5 / (one - z * 0.5);
            assert!((trapezoid.log_derivative(z) - want).norm() <= 1e-14 * want.norm());
            let want = (one + z) / (one + z + z * z * 0.5);
            assert!((heun.log_derivative(z) - want).norm() <= 1e-14 * want.norm());
        }
    }

    #[test]
    fn log_derivative_is_nan_at_a_zero_of_r() {
        let forward_euler = OneStep {
            p: vec![1.0, 1.0],
            q: vec![1.0],
        };
        assert!(forward_euler.log_derivative(C64::new(-1.0, 0.0)).is_nan());
    }
}
