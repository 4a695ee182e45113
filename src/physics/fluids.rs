//! Scalar advection–diffusion, linear acoustics, the linearised Euler equations
//! and linear shallow water, each as a constructor and a parameter reader.
//!
//! Linearisations are the textbook ones (common practice): acoustics about a
//! state at rest or in uniform flow, Euler in primitive variables (ρ, u, v, w, p)
//! about a uniform state with sound speed c = √(γp/ρ), shallow water about depth
//! H and mean flow U with Coriolis parameter f.

use super::params::Reader;
use super::{real, velocity_names, ModelKind, System};
use crate::error::InputError;

/// Scalar advection–diffusion q_t + a·∇q = Σ D_d q_{x_d x_d}.
pub fn advection(velocity: &[f64], diffusivity: &[f64]) -> System {
    let flux = velocity.iter().map(|a| real(1, |_, _| *a)).collect();
    let diffusion = diffusivity.iter().map(|d| real(1, |_, _| *d)).collect();
    let speed = super::length(velocity);
    let mut s = System::from_parts(
        ModelKind::Advection,
        vec!["q".into()],
        flux,
        diffusion,
        real(1, |_, _| 0.0),
        Some(speed),
    );
    s.mode_names = vec!["advection".into()];
    s
}

pub(super) fn advection_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    let v = r
        .per_axis("velocity", dims)?
        .ok_or_else(|| r.error("velocity", "is required for model kind 'advection'"))?;
    let d = r
        .one_or_per_axis("diffusivity", dims)?
        .unwrap_or(vec![0.0; dims]);
    for (i, x) in d.iter().enumerate() {
        if *x < 0.0 {
            return Err(r.error(&format!("diffusivity.{i}"), "must not be negative"));
        }
    }
    Ok(advection(&v, &d))
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
    let speed = super::length(mean_flow) + sound_speed;
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts(
        ModelKind::Acoustics,
        vars,
        flux,
        zero,
        real(m, |_, _| 0.0),
        Some(speed),
    );
    s.norm_matrix[(0, 0)] = 1.0 / (density * sound_speed);
    let mut names = vec!["acoustic-".to_string()];
    names.extend((0..dims - 1).map(|k| match dims {
        2 => "vorticity".to_string(),
        _ => format!("vorticity{}", k + 1),
    }));
    names.push("acoustic+".into());
    s.mode_names = names;
    s
}

pub(super) fn acoustics_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    let c = r.positive("sound_speed")?;
    let rho = r.positive_or("density", 1.0)?;
    let u = r.per_axis("velocity", dims)?.unwrap_or(vec![0.0; dims]);
    Ok(acoustics(c, rho, &u))
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
    let speed = super::length(velocity) + c;
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts(
        ModelKind::Euler,
        vars,
        flux,
        zero,
        real(m, |_, _| 0.0),
        Some(speed),
    );
    // entropy c(p′/c² − ρ′)/ρ decouples and the acoustic part becomes symmetric
    s.norm_matrix[(0, 0)] = -c / density;
    s.norm_matrix[(0, p_idx)] = 1.0 / (density * c);
    s.norm_matrix[(p_idx, p_idx)] = 1.0 / (density * c);
    let mut names = vec!["acoustic-".to_string()];
    names.extend((0..dims).map(|k| format!("convected{}", k + 1)));
    names.push("acoustic+".into());
    s.mode_names = names;
    s
}

pub(super) fn euler_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    let rho = r.positive("density")?;
    let velocity = r.per_axis("velocity", dims)?;
    let p = r.positive("pressure")?;
    let g = r.positive_or("gamma", 1.4)?;
    let mach = r.number("mach")?;
    let angle = r.number("flow_angle_deg")?;
    let u = match (velocity, mach) {
        (Some(_), Some(_)) => {
            return Err(r
                .error("mach", "give model.velocity or model.mach, not both")
                .hint("mach (with flow_angle_deg) sets the velocity from the sound speed"))
        }
        (Some(u), None) => {
            if angle.is_some() {
                return Err(r.error("flow_angle_deg", "is only used with model.mach"));
            }
            u
        }
        (None, Some(m)) => mach_velocity(m, angle.unwrap_or(0.0), (g * p / rho).sqrt(), dims)
            .map_err(|(key, why)| r.error(key, why))?,
        (None, None) => {
            if angle.is_some() {
                return Err(r.error("flow_angle_deg", "is only used with model.mach"));
            }
            vec![0.0; dims]
        }
    };
    Ok(euler(rho, &u, p, g))
}

/// The mean velocity of Mach number `mach` at `angle_deg` from the x axis
/// (towards y; 1-D: along x, angle 0 or 180), sound speed `c`.
fn mach_velocity(
    mach: f64,
    angle_deg: f64,
    c: f64,
    dims: usize,
) -> Result<Vec<f64>, (&'static str, String)> {
    if !(mach.is_finite() && mach >= 0.0) {
        return Err(("mach", format!("must be a finite number >= 0, got {mach}")));
    }
    if !angle_deg.is_finite() {
        return Err((
            "flow_angle_deg",
            "must be a finite number of degrees".into(),
        ));
    }
    let a = angle_deg.to_radians();
    let mut u = vec![0.0; dims];
    if dims == 1 {
        let (s, c1) = a.sin_cos();
        if s.abs() > 1e-12 {
            return Err((
                "flow_angle_deg",
                "a 1-D flow runs along x: give 0 or 180".into(),
            ));
        }
        u[0] = mach * c * c1.signum();
    } else {
        u[0] = mach * c * a.cos();
        u[1] = mach * c * a.sin();
    }
    Ok(u)
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
    let speed = super::length(velocity) + (gravity * depth).sqrt();
    let zero = (0..dims).map(|_| real(m, |_, _| 0.0)).collect();
    let mut s = System::from_parts(
        ModelKind::ShallowWater,
        vars,
        flux,
        zero,
        source,
        Some(speed),
    );
    s.norm_matrix[(0, 0)] = (gravity / depth).sqrt();
    s.mode_names = match dims {
        2 => vec!["gravity-".into(), "geostrophic".into(), "gravity+".into()],
        _ => vec!["gravity-".into(), "gravity+".into()],
    };
    s
}

pub(super) fn shallow_water_from(r: &mut Reader, dims: usize) -> Result<System, InputError> {
    if dims == 3 {
        return Err(InputError::new(
            "grid.spacing",
            "the shallow-water model has 1 or 2 axes",
        ));
    }
    let g = r.positive_or("gravity", 9.81)?;
    let depth = r.positive("depth")?;
    let u = r.per_axis("velocity", dims)?.unwrap_or(vec![0.0; dims]);
    let f = r.number("coriolis")?.unwrap_or(0.0);
    if dims == 1 && f != 0.0 {
        return Err(r.error("coriolis", "needs two axes (the rotation couples u and v)"));
    }
    Ok(shallow_water(g, depth, &u, f))
}
