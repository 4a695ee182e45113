//! The spatial symbol L(θ), assembled independently from the scheme description:
//!
//!   L(θ) = S − Σ_d [A⁺_d S¹_d(θ_d) + A⁻_d S¹*_d(θ_d)]/h_d + Σ_d K_d S²_d(θ_d)/h_d²
//!          − Σ_d σ (s/h_d) sin^p(θ_d/2) I,
//!
//! central stencils with A⁺ = A, A⁻ = 0; biased ones with the characteristic split
//! A± = V Λ± V⁻¹ (from the generator's own eigenvectors) or the Rusanov split
//! A± = (A ± ρ(A) I)/2, the mirror-image stencil acting on A⁻. The pieces are kept
//! apart because IMEX, splitting and Lax–Wendroff/Friedrichs use them separately.

use crate::scheme::{CMat, Mat, Scheme, Upwind};
use num_complex::Complex64 as C64;

/// The pieces of L(θ) at one wavevector.
#[derive(Debug, Clone)]
pub struct Parts {
    /// Flux part per axis.
    pub flux: Vec<CMat>,
    /// Diffusion part per axis.
    pub diffusion: Vec<CMat>,
    /// Dissipation part per axis.
    pub dissipation: Vec<CMat>,
    /// The source.
    pub source: CMat,
}

fn complex(a: &Mat) -> CMat {
    a.map(|x| C64::new(x, 0.0))
}

/// (A⁺, A⁻) of axis d.
fn split(s: &Scheme, d: usize) -> (Mat, Mat) {
    let sys = &s.system;
    let a = &sys.flux[d];
    let m = a.nrows();
    let abs_a = match s.upwind {
        Upwind::Rusanov => {
            let rho = sys.flux_speeds[d]
                .iter()
                .map(|x| x.abs())
                .fold(0.0, f64::max);
            Mat::identity(m, m) * rho
        }
        Upwind::Characteristic => {
            let v = &sys.flux_vectors[d];
            let v_inv = v
                .clone()
                .try_inverse()
                .unwrap_or_else(|| Mat::identity(m, m));
            let lam: Vec<f64> = sys.flux_speeds[d].iter().map(|x| x.abs()).collect();
            v * Mat::from_diagonal(&lam.into()) * v_inv
        }
    };
    ((a + &abs_a) * 0.5, (a - &abs_a) * 0.5)
}

impl Parts {
    /// The pieces at θ.
    pub fn at(s: &Scheme, theta: &[f64]) -> Parts {
        let sys = &s.system;
        let m = sys.size();
        let mut flux = Vec::new();
        let mut diffusion = Vec::new();
        let mut dissipation = Vec::new();
        for (d, (&h, &th)) in s.spacing.iter().zip(theta).enumerate() {
            let st = &s.first[d];
            let f = if st.is_central() {
                complex(&sys.flux[d]) * (-st.symbol(th) / h)
            } else {
                let (ap, am) = split(s, d);
                complex(&ap) * (-st.symbol(th) / h) + complex(&am) * (-st.mirror_symbol(th) / h)
            };
            flux.push(f);
            diffusion.push(complex(&sys.diffusion[d]) * (s.second[d].symbol(th) / (h * h)));
            let diss = match s.dissipation {
                Some(dis) => {
                    let c = dis.strength * sys.reference_speed / h;
                    -c * (0.5 * th).sin().powi(dis.order as i32)
                }
                None => 0.0,
            };
            dissipation.push(CMat::identity(m, m) * C64::new(diss, 0.0));
        }
        Parts {
            flux,
            diffusion,
            dissipation,
            source: complex(&sys.source),
        }
    }

    /// The whole symbol L(θ).
    pub fn total(&self) -> CMat {
        self.explicit_part() + self.diffusion_part()
    }

    /// Σ_d diffusion parts (the implicit part of IMEX schemes).
    pub fn diffusion_part(&self) -> CMat {
        self.diffusion.iter().fold(
            CMat::zeros(self.source.nrows(), self.source.ncols()),
            |a, b| a + b,
        )
    }

    /// Everything but diffusion: source, fluxes, dissipation.
    pub fn explicit_part(&self) -> CMat {
        let mut l = self.source.clone();
        for (f, d) in self.flux.iter().zip(&self.dissipation) {
            l += f + d;
        }
        l
    }

    /// Diffusion, dissipation and source: what Lax–Wendroff and Lax–Friedrichs
    /// add explicitly to their own flux differences.
    pub fn non_flux_part(&self) -> CMat {
        let mut l = self.source.clone() + self.diffusion_part();
        for d in &self.dissipation {
            l += d;
        }
        l
    }

    /// The sub-operator of axis d for dimension splitting (flux, diffusion and
    /// dissipation of that axis).
    pub fn axis_part(&self, d: usize) -> CMat {
        &self.flux[d] + &self.diffusion[d] + &self.dissipation[d]
    }
}

/// An upper bound of ‖L(θ)‖_F over all θ from the sizes of its terms (weights
/// summed in absolute value, left-hand sides bounded below by their smallest
/// value on a fine grid): the scale of the roundoff in any entry of L.
pub fn symbol_bound(s: &Scheme) -> f64 {
    let sys = &s.system;
    let stencil_bound = |st: &crate::scheme::Stencil| {
        let top: f64 = st.weights.iter().map(|w| w.abs()).sum();
        let low = (0..=256)
            .map(|k| {
                let th = std::f64::consts::PI * k as f64 / 256.0;
                st.lhs_offsets
                    .iter()
                    .zip(&st.lhs_weights)
                    .map(|(o, w)| C64::from_polar(*w, th * o))
                    .sum::<C64>()
                    .norm()
            })
            .fold(f64::INFINITY, f64::min);
        top / low.max(1e-300)
    };
    let mut total = sys.source.norm();
    for (d, h) in s.spacing.iter().enumerate() {
        let speed = sys.flux_speeds[d]
            .iter()
            .map(|x| x.abs())
            .fold(0.0, f64::max);
        total += 2.0 * sys.flux[d].norm().max(speed) * stencil_bound(&s.first[d]) / h;
        total += sys.diffusion[d].norm() * stencil_bound(&s.second[d]) / (h * h);
        if let Some(dis) = s.dissipation {
            total += dis.strength * sys.reference_speed / h * (sys.size() as f64).sqrt();
        }
    }
    total
}
