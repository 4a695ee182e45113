//! The independent reference of a scheme: the overall first loss of stability
//! over the whole wavevector box, and the first loss along one wave direction.

use crate::domain::Domain;
use crate::scheme::Scheme;
use crate::search::{search, Kind, Reference};

/// Grid points per axis of the overall search (the box is halved by symmetry).
fn grid_points(dims: usize) -> usize {
    match dims {
        1 => 1025,
        2 => 65,
        _ => 13,
    }
}

/// Long-wave directions of the overall search.
fn long_wave_directions(dims: usize) -> usize {
    match dims {
        1 => 1,
        2 => 12,
        _ => 12,
    }
}

/// Uniform samples along a ray.
pub const RAY_SAMPLES: usize = 96;

/// The overall reference stable bound.
pub fn overall(s: &Scheme) -> Reference {
    let dims = s.dims();
    let dom = Domain::whole(dims, grid_points(dims), long_wave_directions(dims));
    search(s, &dom, None)
}

/// The reference along the ray θ = s·n, knowing the overall answer (every ray
/// is at least as stable as the whole box).
pub fn along_ray(s: &Scheme, direction: &[f64], overall: &Reference) -> Reference {
    let dom = Domain::ray(direction, RAY_SAMPLES);
    match overall.kind {
        Kind::Unconditional => overall.clone(),
        Kind::None => search(s, &dom, None),
        Kind::Bounded => search(s, &dom, Some(overall.dt * (1.0 - 1e-7))),
    }
}
