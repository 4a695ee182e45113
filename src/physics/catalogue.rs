//! The built-in models, one entry each: the name a case file uses, a one-line
//! description, the keys it accepts and the reader that builds the system.
//!
//! Adding a model: write its constructor and `*_from` reader in a file of its
//! own under `physics/`, and add one variant and one [`Entry`] here.

use super::params::{Params, Reader};
use super::System;
use crate::error::InputError;

/// Which built-in model a system is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ModelKind {
    /// Scalar advection–diffusion.
    Advection,
    /// Linear acoustics.
    Acoustics,
    /// Linearised Euler equations.
    Euler,
    /// Linear shallow water.
    ShallowWater,
    /// Maxwell's equations.
    Maxwell,
    /// A user's own matrices.
    Linear,
    /// The scalar wave equation, second order in time.
    Wave,
}

/// One catalogue entry.
pub struct Entry {
    /// The model.
    pub kind: ModelKind,
    /// Its name in case files.
    pub name: &'static str,
    /// One line for `kgain list models`.
    pub summary: &'static str,
    /// The keys of `[model]` it accepts (besides `kind`).
    pub keys: &'static [&'static str],
    build: fn(&mut Reader, usize) -> Result<System, InputError>,
}

const ENTRIES: &[Entry] = &[
    Entry {
        kind: ModelKind::Advection,
        name: "advection",
        summary: "scalar advection-diffusion q_t + a.grad q = sum D_d q_dd (variable q)",
        keys: &["velocity", "diffusivity"],
        build: super::fluids::advection_from,
    },
    Entry {
        kind: ModelKind::Acoustics,
        name: "acoustics",
        summary: "linear acoustics with mean flow (variables p, u[, v, w])",
        keys: &["sound_speed", "density", "velocity"],
        build: super::fluids::acoustics_from,
    },
    Entry {
        kind: ModelKind::Euler,
        name: "euler",
        summary: "linearised Euler equations, primitive variables (rho, u[, v, w], p)",
        keys: &[
            "density",
            "velocity",
            "pressure",
            "gamma",
            "mach",
            "flow_angle_deg",
        ],
        build: super::fluids::euler_from,
    },
    Entry {
        kind: ModelKind::ShallowWater,
        name: "shallow-water",
        summary: "linear shallow water with Coriolis (h, u[, v]); arrangements a-e",
        keys: &["gravity", "depth", "velocity", "coriolis"],
        build: super::fluids::shallow_water_from,
    },
    Entry {
        kind: ModelKind::Maxwell,
        name: "maxwell",
        summary: "Maxwell's equations (3-D ex..hz; 2-D te or tm); arrangement yee",
        keys: &["speed", "polarization"],
        build: super::maxwell::maxwell_from,
    },
    Entry {
        kind: ModelKind::Linear,
        name: "linear",
        summary: "your own system: variables, flux per axis, optional diffusion and source",
        keys: &["variables", "flux", "diffusion", "source"],
        build: super::linear::linear_from,
    },
    Entry {
        kind: ModelKind::Wave,
        name: "wave",
        summary: "scalar wave equation u_tt = sum c_d^2 u_dd (variable u); methods central-difference, newmark",
        keys: &["speed"],
        build: super::wave::wave_from,
    },
];

impl ModelKind {
    /// Its catalogue entry.
    pub fn entry(self) -> &'static Entry {
        ENTRIES
            .iter()
            .find(|e| e.kind == self)
            .expect("every model kind has an entry")
    }

    /// Its name in case files.
    pub fn name(self) -> &'static str {
        self.entry().name
    }

    /// The model of a case-file name.
    pub fn from_name(name: &str) -> Result<ModelKind, InputError> {
        ENTRIES
            .iter()
            .find(|e| e.name == name)
            .map(|e| e.kind)
            .ok_or_else(|| InputError::unknown("model.kind", "model kind", name, &names()))
    }
}

/// Every entry, in listing order.
pub fn all() -> &'static [Entry] {
    ENTRIES
}

/// The case-file names of every model.
pub fn names() -> Vec<&'static str> {
    ENTRIES.iter().map(|e| e.name).collect()
}

/// Builds a model from its parameters (keys of `[model]` other than `kind`) for
/// `dims` axes; errors name the key.
pub fn build(kind: ModelKind, params: &Params, dims: usize) -> Result<System, InputError> {
    let e = kind.entry();
    let mut r = Reader::new("model", e.name, params, e.keys)?;
    (e.build)(&mut r, dims)
}
