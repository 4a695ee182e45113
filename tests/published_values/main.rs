//! Published and closed-form check values, reproduced by running the engine.
//!
//! Each expected value comes from a formula (re-derived here) or a published
//! source, named in a comment beside it: modified wavenumbers of the built-in
//! stencils (common practice; Lele, J. Comput. Phys. 103, 1992; Tam & Webb,
//! J. Comput. Phys. 107, 1993), stability intervals of the time methods (Hairer &
//! Wanner, Solving ODEs II; Gottlieb & Shu, Math. Comp. 67, 1998), and stability
//! limits of classic schemes (Strikwerda, Finite Difference Schemes and PDEs;
//! LeVeque, Finite Volume Methods for Hyperbolic Problems, 2002). Most checks go
//! the whole way: case text → validation → analysis → limit or radius. The
//! `brute_force` module cross-checks the first-exit limit against a scan in Δt.
//!
//! Not yet applicable (the engine refuses these analyses or models for now):
//! Lax–Wendroff and Lax–Friedrichs (Strikwerda), Yee/Maxwell (Taflove & Hagness),
//! C-grid shallow water (Mesinger & Arakawa), transient growth and dispersion.

#[path = "../support/mod.rs"]
mod support;

mod brute_force;
mod methods;
mod schemes;
mod stencils;
mod systems;

use kgain::analysis::LimitKind;
use num_complex::Complex64 as C64;
use support::{toml_list, EPS};

/// Scalar advection (optionally with diffusion) with one first-derivative stencil.
fn advection(
    spacing: &[f64],
    velocity: &[f64],
    first: &str,
    method: &str,
    step: &str,
    points: &[usize],
) -> String {
    format!(
        r#"
[grid]
spacing = {spacing}

[model]
kind = "advection"
velocity = {velocity}

[space]
first = "{first}"

[time]
method = "{method}"
{step}

[scan]
analyses = ["radius", "limit"]
points = {points:?}
directions = 72
"#,
        spacing = toml_list(spacing),
        velocity = toml_list(velocity),
    )
}

/// Pure diffusion q_t = Σ D_d q_{x_d x_d} with the second-order central difference.
fn diffusion(
    spacing: &[f64],
    diffusivity: &str,
    method: &str,
    dt: f64,
    points: &[usize],
) -> String {
    format!(
        r#"
[grid]
spacing = {spacing}

[model]
kind = "advection"
velocity = {velocity}
diffusivity = {diffusivity}

[space]
second = "central2"

[time]
method = "{method}"
dt = {dt:?}

[scan]
analyses = ["radius", "limit"]
points = {points:?}
"#,
        spacing = toml_list(spacing),
        velocity = toml_list(&vec![0.0; spacing.len()]),
    )
}

/// The linearised 2-D Euler case of the benchmark peer: ρ = 1, p = 1/γ (so c = 1),
/// γ = 1.4, velocity (0.5, 0.2), h = 1, fourth-order central differences, RK4.
const PEER_EULER: &str = r#"
name = "peer-euler2d"

[grid]
spacing = [1.0, 1.0]

[model]
kind = "euler"
density = 1.0
pressure = 0.7142857142857143
gamma = 1.4
velocity = [0.5, 0.2]

[space]
first = "central4"

[time]
method = "rk4"
courant = 1.0

[scan]
analyses = ["radius", "limit"]
points = [129, 129]
"#;

/// Limit kind of a result.
fn kind(r: &kgain::analysis::Results) -> LimitKind {
    r.limit.as_ref().expect("the limit analysis ran").kind
}

/// Modified wavenumber of the fourth-order central difference,
/// (8 sin θ − sin 2θ)/6 (common practice).
fn c4(theta: f64) -> f64 {
    (8.0 * theta.sin() - (2.0 * theta).sin()) / 6.0
}

/// Closed-form maximum of the C4 modified wavenumber: d/dθ = 0 gives
/// 2cos²θ − 4cosθ − 1 = 0, cos θ* = 1 − √6/2, and the value sin θ*(4 − cos θ*)/3.
fn c4_max() -> (f64, f64) {
    let c = 1.0 - 6f64.sqrt() / 2.0;
    let s = (1.0 - c * c).sqrt();
    (s * (4.0 - c) / 3.0, c.acos())
}

/// Tam & Webb (1993) DRP coefficients a_1..a_3 as commonly quoted (8 digits).
const DRP_QUOTED: [f64; 3] = [0.79926643, -0.18941314, 0.02651995];

/// The DRP modified wavenumber 2 Σ a_j sin jθ (Tam & Webb 1993).
fn drp(theta: f64, a: &[f64; 3]) -> f64 {
    2.0 * (1..=3)
        .map(|j| a[j - 1] * (j as f64 * theta).sin())
        .sum::<f64>()
}

/// Tolerance for a position found at a smooth extremum where the value is resolved
/// to ε: the position is then resolved to about √ε.
fn extremum_position_tol() -> f64 {
    16.0 * EPS.sqrt()
}

/// R(z) = Σ_{j≤s} z^j/j!, the stability polynomial of an s-stage, order-s explicit
/// Runge–Kutta method (Hairer & Wanner II).
fn taylor_r(s: usize, z: f64) -> f64 {
    let mut term = 1.0;
    let mut sum = 1.0;
    for j in 1..=s {
        term *= z / j as f64;
        sum += term;
    }
    sum
}

/// Boundary locus z(ω) = ρ(e^{iω})/σ(e^{iω}) of a linear multistep method with
/// ascending coefficients α, β (Hairer & Wanner I and II).
fn locus(alpha: &[f64], beta: &[f64], omega: f64) -> C64 {
    let zeta = C64::from_polar(1.0, omega);
    let ev = |c: &[f64]| {
        c.iter()
            .rev()
            .fold(C64::new(0.0, 0.0), |acc, x| acc * zeta + x)
    };
    ev(alpha) / ev(beta)
}
