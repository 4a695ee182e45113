//! kgain: Fourier (von Neumann) stability and dispersion analysis of grid-based
//! PDE discretisations.
//!
//! Data flows one way: **case → problem → sampling → analyses → report**.
//! [`case`] turns a TOML case file into a [`Problem`] and a [`Plan`];
//! [`problem`] validates a discretisation built in Rust or from a case
//! ([`ProblemBuilder`]); [`sample`] sweeps wavevector grids in parallel;
//! [`analysis`] computes the spectral-radius map, the largest stable time step,
//! transient growth and dispersion into typed [`Results`]; [`report`] writes NPY,
//! JSON, PNG and the terminal table from the results; [`destination`] owns the
//! output folder. Underneath: [`physics`] (the continuous models), [`stencil`],
//! [`operator`] (the spatial symbol L(θ)), [`time`] (integrators and their exact
//! stability regions), [`linalg`] (small dense kernels), [`numeric`] (1-D search,
//! bracketing, direction sets) and [`error`].
//!
//! The largest stable Courant number of the linearised 2-D Euler equations with
//! fourth-order central differences and classical RK4, without any file:
//!
//! ```
//! use kgain::{analyse, physics, LimitParams, NoProgress, Par, Plan, Problem};
//!
//! let problem = Problem::builder()
//!     .spacing(&[1.0, 1.0])
//!     .system(physics::euler(1.0, &[0.5, 0.2], 1.0 / 1.4, 1.4)) // ρ, u, p, γ
//!     .first("central4")
//!     .method("rk4")
//!     .courant(1.0)
//!     .build()?;
//! let plan = Plan::new(&[129, 129]).with_limit(LimitParams::default());
//! let results = analyse(&problem, &plan, Par::Seq, &NoProgress)?;
//! let courant_max = results.limit.unwrap().courant_max.unwrap();
//! assert!((courant_max - 1.4999401157).abs() < 1e-9); // 2√2 / max(|u·m| + c|m|)
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```
#![warn(missing_docs)]

pub mod analysis;
pub mod case;
pub mod describe;
pub mod destination;
pub mod error;
pub mod linalg;
pub mod numeric;
pub mod operator;
pub mod physics;
pub mod probe;
pub mod problem;
pub mod report;
pub mod sample;
pub mod stencil;
pub mod study;
pub mod time;

pub use analysis::{analyse, LimitParams, Plan, Results};
pub use problem::{Problem, ProblemBuilder};
pub use sample::{NoProgress, Par, Progress};
