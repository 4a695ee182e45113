//! The command line's own layer: what a terminal program decides and the
//! library does not — progress bars on stderr ([`progress`]) and the memory
//! pre-flight against this machine ([`memory`]) and the CI gate with its
//! machine-readable verdict ([`verdict`]).

pub mod memory;
pub mod progress;
pub mod verdict;
