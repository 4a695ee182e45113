//! The continuous models: constant-coefficient linear systems
//!
//!   u_t + Σ_d A_d u_{x_d} = Σ_d K_d u_{x_d x_d} + S u,
//!
//! with flux matrices A_d, diffusion matrices K_d, a source S, variable names, the
//! names of the physical wave families and the reference speed (the largest
//! characteristic speed over all directions). The spatial discretisation is
//! applied later by [`crate::operator`].
//!
//! Each built-in model is a constructor in its own file and one entry of the
//! [`catalogue`] (its name, keys and parameter reader); a user's own matrices are
//! the `linear` model. The `wave` model (u_tt = Σ c_d² u_dd) is second order in
//! time: it keeps c_d² in the diffusion matrices, so that L is assembled as for
//! diffusion, and is advanced only by second-order-in-time methods. Linearisations are the textbook ones (common practice).

pub mod catalogue;
mod fluids;
mod linear;
mod maxwell;
pub mod params;
mod speed;
pub mod symmetriser;
mod wave;

pub use catalogue::ModelKind;
pub use fluids::{acoustics, advection, euler, shallow_water};
pub use linear::linear;
pub use maxwell::maxwell;
pub use wave::wave;

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A constant-coefficient linear system of first-order-in-time PDEs.
#[derive(Debug, Clone)]
pub struct System {
    /// Which model it is.
    pub kind: ModelKind,
    /// Variable names, in matrix order.
    pub variables: Vec<String>,
    /// Flux matrices A_d, one per axis.
    pub flux: Vec<DMatrix<C64>>,
    /// Diffusion matrices K_d, one per axis (zero when absent).
    pub diffusion: Vec<DMatrix<C64>>,
    /// Source matrix S.
    pub source: DMatrix<C64>,
    /// Largest characteristic speed over all directions.
    pub reference_speed: f64,
    /// Largest diffusivity (spectral radius of the K_d), if any diffusion.
    pub diffusivity_max: Option<f64>,
    /// The matrix W of the norm ‖W u‖ used for growth measures: a symmetriser of
    /// the flux matrices where one is known, so that the weighted variables share
    /// one unit and a normal scheme looks normal (acoustics p/(ρc); Euler the
    /// entropy p′/(ρc) − cρ′/ρ, u, p′/(ρc); shallow water h√(g/H)); identity
    /// otherwise.
    pub norm_matrix: DMatrix<f64>,
    /// Where `norm_matrix` comes from.
    pub norm_origin: symmetriser::NormOrigin,
    /// Names of the physical wave families, in ascending order of frequency at
    /// long wavelengths along a direction (ties in the model's own order).
    pub mode_names: Vec<String>,
}

impl System {
    /// Number of variables.
    pub fn size(&self) -> usize {
        self.variables.len()
    }

    /// Number of space dimensions.
    pub fn dims(&self) -> usize {
        self.flux.len()
    }

    /// The continuous symbol at a physical wavevector k:
    /// −i Σ_d k_d A_d − Σ_d k_d² K_d + S; the exact frequencies are ω = i·eig.
    pub fn continuous_symbol(&self, k: &[f64]) -> DMatrix<C64> {
        let mut l = self.source.clone();
        for (d, kd) in k.iter().enumerate() {
            l -= &self.flux[d] * C64::new(0.0, *kd);
            l -= &self.diffusion[d] * C64::new(kd * kd, 0.0);
        }
        l
    }

    /// [`System::continuous_symbol`] into a row-major m×m slice, without
    /// allocating (the same operations in the same order, so the same bits).
    pub fn continuous_symbol_into(&self, k: &[f64], out: &mut [C64]) {
        let m = self.size();
        for r in 0..m {
            for c in 0..m {
                let mut v = self.source[(r, c)];
                for (d, kd) in k.iter().enumerate() {
                    v -= self.flux[d][(r, c)] * C64::new(0.0, *kd);
                    v -= self.diffusion[d][(r, c)] * C64::new(kd * kd, 0.0);
                }
                out[r * m + c] = v;
            }
        }
    }

    /// ∂/∂k_axis of the continuous symbol, −i A_axis − 2 k_axis K_axis, into a
    /// row-major m×m slice.
    pub fn continuous_derivative_into(&self, k: &[f64], axis: usize, out: &mut [C64]) {
        let m = self.size();
        for r in 0..m {
            for c in 0..m {
                out[r * m + c] = -self.flux[axis][(r, c)] * C64::new(0.0, 1.0)
                    - self.diffusion[axis][(r, c)] * C64::new(2.0 * k[axis], 0.0);
            }
        }
    }

    /// Σ_d n_d A_d for a direction n.
    pub fn flux_along(&self, n: &[f64]) -> DMatrix<C64> {
        let m = self.size();
        let mut a = DMatrix::zeros(m, m);
        for (ad, nd) in self.flux.iter().zip(n) {
            a += ad * C64::new(*nd, 0.0);
        }
        a
    }

    /// A system from its matrices; the reference speed is computed when not
    /// given, the largest diffusivity always. Norm: identity; mode names
    /// `mode1..m`.
    pub fn from_parts(
        kind: ModelKind,
        variables: Vec<String>,
        flux: Vec<DMatrix<C64>>,
        diffusion: Vec<DMatrix<C64>>,
        source: DMatrix<C64>,
        reference_speed: Option<f64>,
    ) -> System {
        let m = variables.len();
        let diffusivity_max = diffusion
            .iter()
            .map(|k| crate::linalg::spectral_radius(&crate::linalg::from_matrix(k), k.nrows()))
            .filter_map(Result::ok)
            .fold(0.0, f64::max);
        let mut s = System {
            kind,
            variables,
            flux,
            diffusion,
            source,
            reference_speed: 0.0,
            diffusivity_max: (diffusivity_max > 0.0).then_some(diffusivity_max),
            norm_matrix: DMatrix::identity(m, m),
            norm_origin: symmetriser::NormOrigin::Model,
            mode_names: (0..m).map(|k| format!("mode{}", k + 1)).collect(),
        };
        s.reference_speed = reference_speed.unwrap_or_else(|| speed::max_speed(&s));
        s
    }

    /// The same 2-D system on axes turned by 45 degrees (x′ along (1, 1)/√2, y′
    /// along (−1, 1)/√2), with the velocity variables at `velocity` (indices of
    /// u and v) turned into the new frame: A′_1 = T(A_x + A_y)T⁻¹/√2,
    /// A′_2 = T(A_y − A_x)T⁻¹/√2, S′ = TST⁻¹, T the rotation of (u, v).
    pub fn rotated_45(&self, velocity: [usize; 2], names: [&str; 2]) -> System {
        let m = self.size();
        let r = std::f64::consts::FRAC_1_SQRT_2;
        let mut t = DMatrix::<C64>::identity(m, m);
        let (u, v) = (velocity[0], velocity[1]);
        t[(u, u)] = C64::new(r, 0.0);
        t[(u, v)] = C64::new(r, 0.0);
        t[(v, u)] = C64::new(-r, 0.0);
        t[(v, v)] = C64::new(r, 0.0);
        let t_inv = t.adjoint();
        let turn = |a: &DMatrix<C64>| &t * a * &t_inv;
        let rc = C64::new(r, 0.0);
        let mut s = self.clone();
        s.flux = vec![
            turn(&((&self.flux[0] + &self.flux[1]) * rc)),
            turn(&((&self.flux[1] - &self.flux[0]) * rc)),
        ];
        s.diffusion = vec![
            turn(&((&self.diffusion[0] + &self.diffusion[1]) * C64::new(0.5, 0.0))),
            turn(&((&self.diffusion[0] + &self.diffusion[1]) * C64::new(0.5, 0.0))),
        ];
        s.source = turn(&self.source);
        s.variables[u] = names[0].to_string();
        s.variables[v] = names[1].to_string();
        s
    }
}

pub(crate) fn real(m: usize, f: impl Fn(usize, usize) -> f64) -> DMatrix<C64> {
    DMatrix::from_fn(m, m, |i, j| C64::new(f(i, j), 0.0))
}

pub(crate) fn velocity_names(dims: usize) -> Vec<String> {
    ["u", "v", "w"][..dims]
        .iter()
        .map(|s| s.to_string())
        .collect()
}

/// |v|, without overflow of the squares for entries near the top of the range
/// (the plain sum of squares where it is representable, so results are unchanged).
pub(crate) fn length(v: &[f64]) -> f64 {
    let plain = v.iter().map(|a| a * a).sum::<f64>().sqrt();
    if plain.is_finite() && plain > 1e-150 {
        return plain;
    }
    let big = v.iter().fold(0.0f64, |m, a| m.max(a.abs()));
    if big == 0.0 || !big.is_finite() {
        return big;
    }
    big * v.iter().map(|a| (a / big) * (a / big)).sum::<f64>().sqrt()
}
