//! Built-in continuous models as constant-coefficient linear systems
//!
//!   u_t + Σ_d A_d u_{x_d} = Σ_d K_d u_{x_d x_d} + S u,
//!
//! with the flux matrices A_d, diffusion matrices K_d, source S, the variable
//! names and the reference speed (largest characteristic speed over all
//! directions). The spatial discretisation is applied later by `operator`.
//!
//! Linearisations are the textbook ones (common practice): acoustics about a
//! state at rest or in uniform flow, Euler in primitive variables (ρ, u, v, w, p)
//! about a uniform state with sound speed c = √(γp/ρ).

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// A constant-coefficient linear system of first-order-in-time PDEs.
#[derive(Debug, Clone)]
pub struct System {
    /// Model kind, as in the case file.
    pub kind: String,
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

    /// Σ_d n_d A_d for a direction n.
    pub fn flux_along(&self, n: &[f64]) -> DMatrix<C64> {
        let m = self.size();
        let mut a = DMatrix::zeros(m, m);
        for (ad, nd) in self.flux.iter().zip(n) {
            a += ad * C64::new(*nd, 0.0);
        }
        a
    }

    fn from_parts(
        kind: &str,
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
            kind: kind.to_string(),
            variables,
            flux,
            diffusion,
            source,
            reference_speed: 0.0,
            diffusivity_max: (diffusivity_max > 0.0).then_some(diffusivity_max),
            norm_matrix: DMatrix::identity(m, m),
        };
        s.reference_speed = reference_speed.unwrap_or_else(|| max_speed(&s));
        s
    }
}

fn real(m: usize, f: impl Fn(usize, usize) -> f64) -> DMatrix<C64> {
    DMatrix::from_fn(m, m, |i, j| C64::new(f(i, j), 0.0))
}

/// Scalar advection–diffusion q_t + a·∇q = Σ D_d q_{x_d x_d}.
pub fn advection(velocity: &[f64], diffusivity: &[f64]) -> System {
    let flux = velocity.iter().map(|a| real(1, |_, _| *a)).collect();
    let diffusion = diffusivity.iter().map(|d| real(1, |_, _| *d)).collect();
    let speed = velocity.iter().map(|a| a * a).sum::<f64>().sqrt();
    System::from_parts(
        "advection",
        vec!["q".into()],
        flux,
        diffusion,
        real(1, |_, _| 0.0),
        Some(speed),
    )
}

fn velocity_names(dims: usize) -> Vec<String> {
    ["u", "v", "w"][..dims]
        .iter()
        .map(|s| s.to_string())
        .collect()
}

/// Linear acoustics p_t + U·∇p + ρc²∇·u = 0, u_t + U·∇u + ∇p/ρ = 0.
pub fn acoustics(sound_speed: f64, density: f64, mean_flow: &[f64]) -> System {
    let dims = mean_flow.len();
    let m = dims + 1;
    let flux = (0..dims)
        .map(|d| {
            real(m, |i, j| {
                if i == j {
                    mean_flow[d]
                } else if i == 0 && j == d + 1 {
                    density * sound_speed * sound_speed
                } else if i == d + 1 && j == 0 {
                    1.0 / density
                } else {
                    0.0
                }
            })
        })
        .collect();
    let mut vars = vec!["p".to_string()];
    vars.extend(velocity_names(dims));
    let speed = mean_flow.iter().map(|a| a * a).sum::<f64>().sqrt() + sound_speed;
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts(
        "acoustics",
        vars,
        flux,
        zero,
        real(m, |_, _| 0.0),
        Some(speed),
    );
    s.norm_matrix[(0, 0)] = 1.0 / (density * sound_speed);
    s
}

/// Linearised Euler equations in primitive variables (ρ, u.., p).
pub fn euler(density: f64, velocity: &[f64], pressure: f64, gamma: f64) -> System {
    let dims = velocity.len();
    let m = dims + 2;
    let p_idx = m - 1;
    let flux = (0..dims)
        .map(|d| {
            real(m, |i, j| {
                if i == j {
                    velocity[d]
                } else if i == 0 && j == d + 1 {
                    density
                } else if i == d + 1 && j == p_idx {
                    1.0 / density
                } else if i == p_idx && j == d + 1 {
                    gamma * pressure
                } else {
                    0.0
                }
            })
        })
        .collect();
    let mut vars = vec!["rho".to_string()];
    vars.extend(velocity_names(dims));
    vars.push("p".into());
    let c = (gamma * pressure / density).sqrt();
    let speed = velocity.iter().map(|a| a * a).sum::<f64>().sqrt() + c;
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts("euler", vars, flux, zero, real(m, |_, _| 0.0), Some(speed));
    // entropy c(p′/c² − ρ′)/ρ decouples and the acoustic part becomes symmetric
    s.norm_matrix[(0, 0)] = -c / density;
    s.norm_matrix[(0, p_idx)] = 1.0 / (density * c);
    s.norm_matrix[(p_idx, p_idx)] = 1.0 / (density * c);
    s
}

/// Linear shallow water about depth H and mean flow U with Coriolis parameter f:
/// h_t + U·∇h + H ∇·u = 0, u_t + U·∇u + g ∇h = f ẑ×u (variables h, u[, v]).
pub fn shallow_water(gravity: f64, depth: f64, velocity: &[f64], coriolis: f64) -> System {
    let dims = velocity.len();
    let m = dims + 1;
    let flux = (0..dims)
        .map(|d| {
            real(m, |i, j| {
                if i == j {
                    velocity[d]
                } else if i == 0 && j == d + 1 {
                    depth
                } else if i == d + 1 && j == 0 {
                    gravity
                } else {
                    0.0
                }
            })
        })
        .collect();
    // u_t = +f v, v_t = −f u
    let source = real(m, |i, j| match (i, j) {
        (1, 2) => coriolis,
        (2, 1) => -coriolis,
        _ => 0.0,
    });
    let mut vars = vec!["h".to_string()];
    vars.extend(velocity_names(dims));
    let speed = velocity.iter().map(|a| a * a).sum::<f64>().sqrt() + (gravity * depth).sqrt();
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts("shallow-water", vars, flux, zero, source, Some(speed));
    s.norm_matrix[(0, 0)] = (gravity / depth).sqrt();
    s
}

/// (equation, variable, axis, coefficient) of one curl entry.
type CurlEntry = (usize, usize, usize, f64);

/// Maxwell's equations in normalised form E_t = c ∇×H, H_t = −c ∇×E.
/// 3-D variables ex, ey, ez, hx, hy, hz; 2-D `te` (ex, ey, hz) or `tm` (hx, hy, ez).
pub fn maxwell(speed: f64, dims: usize, tm: bool) -> System {
    // (equation, variable, axis, coefficient) of u_t + Σ A_d u_d = 0, i.e. A = −(curl part).
    let (vars, entries): (Vec<&str>, Vec<CurlEntry>) = match (dims, tm) {
        (3, _) => (
            vec!["ex", "ey", "ez", "hx", "hy", "hz"],
            vec![
                // ex_t = c(hz_y − hy_z)
                (0, 5, 1, -1.0),
                (0, 4, 2, 1.0),
                // ey_t = c(hx_z − hz_x)
                (1, 3, 2, -1.0),
                (1, 5, 0, 1.0),
                // ez_t = c(hy_x − hx_y)
                (2, 4, 0, -1.0),
                (2, 3, 1, 1.0),
                // hx_t = −c(ez_y − ey_z)
                (3, 2, 1, 1.0),
                (3, 1, 2, -1.0),
                // hy_t = −c(ex_z − ez_x)
                (4, 0, 2, 1.0),
                (4, 2, 0, -1.0),
                // hz_t = −c(ey_x − ex_y)
                (5, 1, 0, 1.0),
                (5, 0, 1, -1.0),
            ],
        ),
        (_, false) => (
            vec!["ex", "ey", "hz"],
            vec![
                (0, 2, 1, -1.0), // ex_t = c hz_y
                (1, 2, 0, 1.0),  // ey_t = −c hz_x
                (2, 1, 0, 1.0),  // hz_t = −c(ey_x − ex_y)
                (2, 0, 1, -1.0),
            ],
        ),
        (_, true) => (
            vec!["hx", "hy", "ez"],
            vec![
                (0, 2, 1, 1.0),  // hx_t = −c ez_y
                (1, 2, 0, -1.0), // hy_t = c ez_x
                (2, 1, 0, -1.0), // ez_t = c(hy_x − hx_y)
                (2, 0, 1, 1.0),
            ],
        ),
    };
    let m = vars.len();
    let flux = (0..dims)
        .map(|d| {
            let mut a = real(m, |_, _| 0.0);
            for &(i, j, ax, c) in &entries {
                if ax == d {
                    a[(i, j)] = C64::new(c * speed, 0.0);
                }
            }
            a
        })
        .collect();
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    System::from_parts(
        "maxwell",
        vars.iter().map(|s| s.to_string()).collect(),
        flux,
        zero,
        real(m, |_, _| 0.0),
        Some(speed),
    )
}

/// A user system with given matrices.
pub fn linear(
    variables: Vec<String>,
    flux: Vec<DMatrix<C64>>,
    diffusion: Vec<DMatrix<C64>>,
    source: DMatrix<C64>,
) -> System {
    System::from_parts("linear", variables, flux, diffusion, source, None)
}

/// Speed of sound of the Euler state.
pub fn euler_sound_speed(density: f64, pressure: f64, gamma: f64) -> f64 {
    (gamma * pressure / density).sqrt()
}

/// Largest characteristic speed max over unit directions n of ρ(Σ n_d A_d),
/// by sampling directions and refining the best one.
fn max_speed(s: &System) -> f64 {
    let m = s.size();
    let speed = |n: &[f64]| {
        let a = crate::linalg::from_matrix(&s.flux_along(n));
        crate::linalg::spectral_radius(&a, m).unwrap_or(f64::NAN)
    };
    match s.dims() {
        1 => speed(&[1.0]),
        2 => {
            let f = |t: f64| speed(&[t.cos(), t.sin()]);
            let n = 720;
            let h = std::f64::consts::PI / n as f64;
            let (i_best, _) = (0..n)
                .map(|i| (i, f(i as f64 * h)))
                .fold((0, f64::MIN), |b, x| if x.1 > b.1 { x } else { b });
            let t0 = i_best as f64 * h;
            let (_, v) = crate::stencil::golden_max(&f, t0 - h, t0 + h);
            v.max(f(t0))
        }
        _ => {
            let dirs = crate::sample::sphere_directions(2000);
            let mut best = (0usize, f64::MIN);
            for (i, n) in dirs.iter().enumerate() {
                let v = speed(n);
                if v > best.1 {
                    best = (i, v);
                }
            }
            let to_angles = |n: &[f64; 3]| (n[2].clamp(-1.0, 1.0).acos(), n[1].atan2(n[0]));
            let f = |x: &[f64]| {
                let (st, ct) = x[0].sin_cos();
                let (sp, cp) = x[1].sin_cos();
                -speed(&[st * cp, st * sp, ct])
            };
            let (a, b) = to_angles(&dirs[best.0]);
            let (_, v) = crate::analysis::refine::compass_minimise(&f, &[a, b], 0.05, 1e-9, 400);
            (-v).max(best.1)
        }
    }
}
