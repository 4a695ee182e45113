//! Sampling the wavevector space: grids ([`grid`]), the parallel sweep over a
//! grid ([`sweep`](mod@sweep)), the degree of parallelism a caller passes in ([`Par`]) and
//! how long work reports its progress ([`Progress`]).
//!
//! A sequential and a parallel sweep give bit-identical results. The library
//! never draws anything itself: progress goes to a [`Progress`] the caller
//! supplies (the command line draws bars; [`NoProgress`] ignores it).

pub mod grid;
pub mod sweep;

pub use grid::{axis_coords, ray_length, Grid};
pub use sweep::{computed_rows, map, map_with, sweep, sweep_rows, Node, Symmetry};

/// Degree of parallelism.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Par {
    /// On the calling thread.
    Seq,
    /// On a local pool of this many threads (0: one per core).
    Threads(usize),
}

impl Par {
    /// Runs `f` under this parallelism (a local rayon pool, never the global one).
    pub fn run<R: Send>(&self, f: impl FnOnce() -> R + Send) -> R {
        match self {
            Par::Seq => f(),
            Par::Threads(n) => match rayon::ThreadPoolBuilder::new().num_threads(*n).build() {
                Ok(pool) => pool.install(f),
                Err(_) => f(),
            },
        }
    }
}

/// A stage of long work whose progress is reported.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Stage {
    /// The sweep of the wavevector grid (radius map and limit screening).
    Sweep,
    /// The limit along each wave direction.
    Directions,
    /// The search on dt of a composite scheme.
    Search,
    /// Non-normality and transient growth.
    Growth,
    /// Dispersion maps and curves.
    Dispersion,
}

impl Stage {
    /// A short label.
    pub fn label(self) -> &'static str {
        match self {
            Stage::Sweep => "radius",
            Stage::Directions => "directions",
            Stage::Search => "dt search",
            Stage::Growth => "growth",
            Stage::Dispersion => "dispersion",
        }
    }
}

/// Where long work reports how far it has come. Calls may come from several
/// worker threads at once.
pub trait Progress: Sync {
    /// A stage of `total` units begins.
    fn start(&self, stage: Stage, total: u64);
    /// `n` more units of the current stage are done.
    fn advance(&self, n: u64);
    /// The current stage is done.
    fn finish(&self);
}

/// Progress that goes nowhere.
#[derive(Debug, Clone, Copy, Default)]
pub struct NoProgress;

impl Progress for NoProgress {
    fn start(&self, _: Stage, _: u64) {}
    fn advance(&self, _: u64) {}
    fn finish(&self) {}
}
