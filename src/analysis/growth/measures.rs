//! Per-wavevector non-normality measures — ‖G‖₂, Henrici's departure from
//! normality, the eigenvector condition number — and the transient-growth
//! envelope max_θ ‖Gⁿ‖₂ (Trefethen & Embree, Spectra and Pseudospectra, 2005).
//!
//! One Schur factorisation G = QTQᴴ per wavevector serves everything:
//! ‖Gⁿ‖₂ = ‖Tⁿ‖₂, and the powers of the triangular T are formed with a running
//! scale so they cannot overflow ([`super::powers`]). The envelope is exact
//! without an SVD at every (θ, n): cheap certified bounds bracket ‖Tⁿ‖₂, a
//! Cholesky test proves most of the rest below the best value found so far
//! over the whole grid (shared atomically), and an exact 2-norm is computed
//! only where neither rules out that the node beats it. The per-wavevector
//! work runs in a [`NodeWorkspace`] and allocates nothing.

use super::powers::PowerWorkspace;
use crate::linalg::nonnormal::{self, ConditionWorkspace};
use crate::linalg::{dense, from_matrix, SchurSolver, SvdSolver};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use std::sync::atomic::{AtomicU64, Ordering};

/// Per-wavevector non-normality measures.
#[derive(Debug, Clone, Copy, Default)]
pub struct NodeMeasures {
    /// ‖G‖₂.
    pub norm: f64,
    /// Relative Henrici departure.
    pub departure: f64,
    /// κ₂ of the eigenvector matrix (inf when defective).
    pub condition: f64,
    /// ρ(G).
    pub radius: f64,
    /// Largest modulus of a defective eigenvalue of G (NaN when none).
    pub defective: f64,
}

/// Shared running maxima of the envelope: bits of non-negative f64 compare like
/// the numbers, so `fetch_max` on the bits is a max on the values.
pub struct Envelope {
    best: Vec<AtomicU64>,
}

impl Envelope {
    /// An envelope for n = 0..=steps.
    pub fn new(steps: usize) -> Self {
        Self {
            best: (0..=steps).map(|_| AtomicU64::new(0)).collect(),
        }
    }

    fn get(&self, n: usize) -> f64 {
        f64::from_bits(self.best[n].load(Ordering::Relaxed))
    }

    fn offer(&self, n: usize, v: f64) {
        // a plain load first: most offers do not raise the maximum, and a
        // read-modify-write on every one would bounce the cache line between
        // the workers
        if v.is_nan() || v < 0.0 || v <= self.get(n) {
            return;
        }
        self.best[n].fetch_max(v.to_bits(), Ordering::Relaxed);
    }

    /// The smallest envelope value over the steps after n (∞ when none).
    pub fn smallest_after(&self, n: usize) -> f64 {
        (n + 1..self.best.len())
            .map(|k| self.get(k))
            .fold(f64::INFINITY, f64::min)
    }

    /// The envelope values.
    pub fn values(&self) -> Vec<f64> {
        (0..self.best.len()).map(|n| self.get(n)).collect()
    }
}

/// ‖Gⁿ‖₂ for n = 0..=steps of one matrix (exact at every step; for tests and refinement).
pub fn power_norms(g: &DMatrix<C64>, steps: usize) -> Vec<f64> {
    let Some((_, t)) = dense::schur(g) else {
        return vec![f64::NAN; steps + 1];
    };
    let mut out = vec![f64::NAN; steps + 1];
    PowerWorkspace::new(t.nrows().max(1)).walk(
        &from_matrix(&t),
        steps,
        |_, _| Some(0.0),
        |n, v| out[n] = v,
        |_| f64::INFINITY,
    );
    out
}

/// Reusable kernels and buffers for [`NodeWorkspace::node`]: one per worker,
/// so the per-wavevector work allocates nothing.
pub struct NodeWorkspace {
    m: usize,
    g: Vec<C64>,
    t: Vec<C64>,
    q: Vec<C64>,
    schur: SchurSolver,
    svd: SvdSolver,
    condition: ConditionWorkspace,
    powers: PowerWorkspace,
}

impl NodeWorkspace {
    /// A workspace for m×m amplification matrices (m ≥ 1).
    pub fn new(m: usize) -> Self {
        let zero = C64::new(0.0, 0.0);
        Self {
            m,
            g: vec![zero; m * m],
            t: vec![zero; m * m],
            q: vec![zero; m * m],
            schur: SchurSolver::new(m),
            svd: SvdSolver::new(m),
            condition: ConditionWorkspace::new(m),
            powers: PowerWorkspace::new(m),
        }
    }

    /// Measures at one wavevector, offering its powers to the envelope; returns
    /// the measures and this node's own peak (value, step) over the values it
    /// knows exactly or as a lower bound — the largest of these over all nodes
    /// is the peak of the envelope. An exact ‖Tⁿ‖₂ is computed only where
    /// neither the node's certified upper bound nor the Cholesky test proves
    /// it at most the envelope found so far.
    pub fn node(
        &mut self,
        g: &DMatrix<C64>,
        steps: usize,
        env: &Envelope,
    ) -> (NodeMeasures, (f64, usize)) {
        let m = self.m;
        assert_eq!(g.shape(), (m, m), "amplification matrix has the wrong size");
        for i in 0..m {
            for j in 0..m {
                self.g[i * m + j] = g[(i, j)];
            }
        }
        if self
            .schur
            .decompose(&self.g, &mut self.t, &mut self.q)
            .is_err()
        {
            let nan = NodeMeasures {
                norm: f64::NAN,
                departure: f64::NAN,
                condition: f64::NAN,
                radius: f64::NAN,
                defective: f64::NAN,
            };
            return (nan, (f64::NAN, 0));
        }
        let t = &self.t;
        let condition = nonnormal::eigvec_condition(t, &mut self.condition).unwrap_or(f64::NAN);
        let defective = if condition.is_infinite() {
            nonnormal::defective_modulus(t, &mut self.condition)
                .ok()
                .flatten()
                .unwrap_or(f64::NAN)
        } else {
            f64::NAN
        };
        let measures = NodeMeasures {
            norm: self.svd.norm2(&self.g).unwrap_or(f64::NAN),
            departure: nonnormal::departure(t, m),
            condition,
            radius: (0..m).map(|i| t[i * m + i].norm()).fold(0.0, f64::max),
            defective,
        };
        let mut peak = (f64::NEG_INFINITY, 0usize);
        let peak_cell = std::cell::Cell::new(peak);
        self.powers.walk(
            t,
            steps,
            |n, b| {
                env.offer(n, b.lower);
                let mut p = peak_cell.get();
                if b.lower > p.0 {
                    p = (b.lower, n);
                    peak_cell.set(p);
                }
                let best = env.get(n);
                (b.upper > best).then_some(best)
            },
            |n, v| {
                env.offer(n, v);
                let p = peak_cell.get();
                if v > p.0 {
                    peak_cell.set((v, n));
                }
            },
            |n| env.smallest_after(n),
        );
        peak = peak_cell.get();
        (measures, peak)
    }
}
