//! The memory a run needs, estimated from what the code allocates: the plan and
//! the problem in, bytes of peak resident memory out.
//!
//! Every term below names the allocation it stands for. Sizes of small heap
//! blocks are rounded as the system allocator does (a 16-byte-aligned chunk
//! with an 8-byte header, 32 bytes at least), because the dispersion analysis
//! holds several small vectors per wavevector and the rounding is a third of
//! its memory. The fixed part (program, embedded font, runtime, one picture's
//! RGB buffer) was measured as the peak of a run on a tiny grid.
//!
//! The peak is reached while the report writes: every result is resident and
//! the exporters hold their flattened copies of the per-node arrays. The main
//! sweep's slab buffer and the growth analysis's per-node records are freed by
//! then, so the estimate takes the larger of those two moments.

use super::Plan;
use crate::problem::Problem;

/// Program, runtime, embedded font, thread pools and the bookkeeping of a
/// small run: the measured peak of radius-only runs on small 1-D to 3-D grids
/// less the other terms, about 6 MiB.
const PROCESS: u128 = 6 << 20;
/// One picture's RGB buffer (1000 × 800 × 3) plus the PNG encoder's and the
/// text renderer's buffers (measured: about 1.5 MiB); pictures are drawn in
/// parallel, one per worker thread at most (seven pictures at most).
const PICTURE: u128 = 1000 * 800 * 3 + (1536 << 10);
/// Most pictures one run draws.
const PICTURES_MAX: u128 = 7;
/// Touched stack and per-worker workspace of one worker thread.
const PER_THREAD: u128 = 256 << 10;
/// Wavevectors per slab of the main sweep (as in `sweep.rs`).
const SLAB_NODES: u128 = 1 << 18;
/// Samples per dispersion curve (as in `dispersion/curves.rs`).
const CURVE_SAMPLES: u128 = 48;
/// A `Vec` header (pointer, capacity, length).
const VEC: u128 = 24;

/// Bytes the allocator takes for a heap block of `bytes` (0 when nothing is
/// allocated): header added, rounded up to 16, at least 32.
pub fn heap(bytes: u128) -> u128 {
    if bytes == 0 {
        0
    } else {
        ((bytes + 8).div_ceil(16) * 16).max(32)
    }
}

/// A vector of `n` elements of `size` bytes: header and block.
fn vec_of(n: u128, size: u128) -> u128 {
    VEC + heap(n * size)
}

/// The sizes that drive memory.
struct Sizes {
    nodes: u128,
    axis_points: u128,
    rows: u128,
    row: u128,
    m: u128,
    big_m: u128,
    d: u128,
}

impl Sizes {
    fn of(plan: &Plan, problem: &Problem) -> Sizes {
        let nodes = plan.points.iter().map(|&n| n as u128).product::<u128>();
        let row = plan.points.last().map_or(1, |&n| n as u128).max(1);
        let m = problem.system.size() as u128;
        Sizes {
            nodes,
            axis_points: plan.points.iter().map(|&n| n as u128).sum(),
            rows: nodes / row,
            row,
            m,
            big_m: m * problem.method.levels() as u128,
            d: problem.dims() as u128,
        }
    }
}

/// Bytes held per wavevector by the dispersion results, node-major arrays
/// allocated once at their final size and written from borrowed views: the
/// matched ω (semi-discrete, exact: m; fully discrete: M), three group
/// velocities (m × d) and the twelve derived maps (m each).
fn dispersion_resident(s: &Sizes) -> u128 {
    16 * (2 * s.m + s.big_m) + 3 * 8 * s.m * s.d + 12 * 8 * s.m
}

/// Bytes of the dispersion curves: per direction, 48 samples of the points per
/// wavelength and five ratio curves of m modes (phase, fully discrete phase,
/// group, decay, fully discrete decay), their flattened copies and the
/// direction itself.
fn dispersion_curves(s: &Sizes, directions: u128) -> u128 {
    let ppw = vec_of(CURVE_SAMPLES, 8);
    let curves = 5 * (VEC + heap(VEC * CURVE_SAMPLES) + CURVE_SAMPLES * vec_of(s.m, 8));
    let copies = 5 * CURVE_SAMPLES * s.m * 8;
    directions * (ppw + curves + copies + vec_of(s.d, 8) + 8 * s.d)
}

/// Bytes per direction of the directional limit: direction and wavevector
/// vectors, the per-direction figures, and the exporter's copies.
fn directional_limit(s: &Sizes, directions: u128) -> u128 {
    directions * (2 * vec_of(s.d, 8) + 64 + 2 * 8 * s.d + 3 * 8)
}

/// Bytes of the kept amplification matrices: θ, L (m×m), G (M×M) per sample,
/// and their flattened copies.
fn matrices(s: &Sizes, count: u128) -> u128 {
    let count = count.min(s.nodes);
    let kept = vec_of(s.d, 8) + vec_of(s.m * s.m, 16) + vec_of(s.big_m * s.big_m, 16);
    let copies = 8 + 8 * s.d + 16 * (s.m * s.m + s.big_m * s.big_m);
    count * (kept + copies)
}

/// Bytes of the growth envelope over `steps`: the shared atomic maxima, the
/// values and the exporter's copy (8 bytes each), and the picture's curve as
/// (n, value) points with their pixel copies (about 5 words per step; the
/// measured peak of a 400,000-step run is 0.92 of this estimate).
fn envelope(steps: u128) -> u128 {
    8 * 8 * (steps + 1)
}

impl Plan {
    /// Estimated peak resident bytes of `kgain run` for this plan on `problem`
    /// with `threads` worker threads: every analysis's results and transient
    /// buffers, the report's copies and picture buffer, and each worker's
    /// work space. Measured peaks lie within 10 % of it on 1-D to 3-D grids,
    /// each analysis alone and together (tests/memory_estimate.rs).
    pub fn memory_estimate(&self, problem: &Problem, threads: usize) -> u128 {
        let s = Sizes::of(self, problem);
        let threads = threads.max(1) as u128;
        let per_thread = PER_THREAD;
        // Resident at the report: results and the exporters' copies, from the
        // grid's coordinates (8 bytes) and the operator's tabulated per-axis
        // factors (16 bytes each) on.
        let mut resident = 24 * s.axis_points;
        // Transient during an analysis, on top of what earlier ones left.
        let mut transient = 0u128;
        let sweep = self.radius.is_some() || self.limit.is_some();
        if sweep {
            // The sweep's slab of (radius, first exit, |μ|) per wavevector.
            let slab_rows = (SLAB_NODES / s.row).max(1).min(s.rows);
            transient = transient.max(24 * slab_rows * s.row);
        }
        if self.radius.is_some() {
            resident += 8 * s.nodes;
        }
        if let Some(l) = &self.limit {
            // The spectral-abscissa scan scores every wavevector (16 bytes)
            // when it runs; counted always.
            transient = transient.max(16 * s.nodes);
            resident += directional_limit(&s, l.directions as u128);
        }
        if let Some(g) = &self.growth {
            // Per-node measures and peak (56 bytes) while the analysis runs,
            // three maps (24 bytes) kept.
            transient = transient.max(resident + 56 * s.nodes);
            // the powers of each worker's triangular factor are formed in
            // place: no per-step memory besides the envelope
            resident += 3 * 8 * s.nodes + envelope(g.steps as u128);
        }
        if let Some(p) = &self.dispersion {
            resident += dispersion_resident(&s) * s.nodes;
            // The curves' directions are fixed in 1-D and 2-D, capped in 3-D.
            let curves = super::dispersion::curves::curve_directions(problem.dims(), p.directions);
            resident += dispersion_curves(&s, curves.len() as u128);
        }
        resident += matrices(&s, self.matrices as u128);
        PROCESS
            + PICTURE * threads.min(PICTURES_MAX)
            + threads * per_thread
            + resident.max(transient)
    }
}
