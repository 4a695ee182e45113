//! The command line's own layer: what a terminal program decides and the
//! library does not — progress bars on stderr ([`progress`]) and the memory
//! pre-flight against this machine ([`memory`]), the CI gate with its
//! machine-readable verdict ([`verdict`]), and the sweep and merge commands'
//! folders and progress ([`sweep`]).

pub mod memory;
pub mod probe;
pub mod progress;
pub mod sweep;
pub mod verdict;
