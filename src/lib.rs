//! kgain: Fourier (von Neumann) stability and dispersion analysis of grid-based
//! PDE discretisations.
//!
//! Data flows one way: **case file → problem → sampling → analyses → report**.
//! [`case`] reads and validates a TOML case; [`physics`] holds the continuous
//! models; [`stencil`] the finite-difference stencils; [`operator`] assembles the
//! spatial symbol L(θ); [`time`] maps it to the amplification matrix G and knows
//! each method's exact stability region; [`linalg`] holds the small dense kernels;
//! [`sample`] sweeps wavevector grids in parallel; [`analysis`] computes spectral
//! radii and the largest stable time step; [`report`] writes NPY, JSON and the
//! human summary; [`describe`] renders `kgain check` and `kgain list`.
#![warn(missing_docs)]

pub mod analysis;
pub mod case;
pub mod describe;
pub mod destination;
pub mod linalg;
pub mod operator;
pub mod physics;
pub mod report;
pub mod sample;
pub mod stencil;
pub mod time;
