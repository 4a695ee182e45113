//! Per-wavevector non-normality measures — ‖G‖₂, Henrici's departure from
//! normality, the eigenvector condition number — and the transient-growth
//! envelope max_θ ‖Gⁿ‖₂ (Trefethen & Embree, Spectra and Pseudospectra, 2005).
//!
//! One Schur factorisation G = QTQᴴ per wavevector serves everything:
//! ‖Gⁿ‖₂ = ‖Tⁿ‖₂, and the powers of the triangular T are formed with a running
//! scale so they cannot overflow. The envelope is exact without an SVD at every
//! (θ, n): ‖Tⁿ‖_F bounds ‖Tⁿ‖₂ from above and the largest column norm and ρ(T)ⁿ
//! from below; an exact 2-norm is computed only where the upper bound beats the
//! best lower bound found so far over the whole grid (shared atomically).

use crate::linalg::dense;
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
        if v.is_nan() || v < 0.0 {
            return;
        }
        self.best[n].fetch_max(v.to_bits(), Ordering::Relaxed);
    }

    /// The envelope values.
    pub fn values(&self) -> Vec<f64> {
        (0..self.best.len()).map(|n| self.get(n)).collect()
    }
}

/// Exact ‖Tⁿ‖₂ at the steps `want` (ascending), by scaled powers.
fn exact_norms(
    t: &DMatrix<C64>,
    steps: usize,
    mut want: impl FnMut(usize, f64, f64) -> bool,
) -> Vec<(usize, f64)> {
    let m = t.nrows();
    let mut p = DMatrix::<C64>::identity(m, m);
    let mut log_scale = 0.0f64;
    let mut out = Vec::new();
    let rho = (0..m).map(|i| t[(i, i)].norm()).fold(0.0, f64::max);
    for n in 0..=steps {
        if n > 0 {
            p = &p * t;
            let f = dense::frobenius(&p);
            if f > 1e100 || (f < 1e-100 && f > 0.0) {
                p /= C64::new(f, 0.0);
                log_scale += f.ln();
            }
        }
        let s = log_scale.exp();
        let fro = dense::frobenius(&p) * s;
        let col = (0..m)
            .map(|j| (0..m).map(|i| p[(i, j)].norm_sqr()).sum::<f64>().sqrt())
            .fold(0.0, f64::max)
            * s;
        let lower = col.max(rho.powi(n as i32));
        if want(n, fro, lower) {
            out.push((n, dense::norm2(&p) * s));
        }
    }
    out
}

/// ‖Gⁿ‖₂ for n = 0..=steps of one matrix (exact at every step; for tests and refinement).
pub fn power_norms(g: &DMatrix<C64>, steps: usize) -> Vec<f64> {
    let Some((_, t)) = dense::schur(g) else {
        return vec![f64::NAN; steps + 1];
    };
    exact_norms(&t, steps, |_, _, _| true)
        .into_iter()
        .map(|(_, v)| v)
        .collect()
}

/// Measures at one wavevector, offering its powers to the envelope; returns the
/// measures and this node's own peak (value, step) over the values it knows
/// exactly or as a lower bound — the largest of these over all nodes is the
/// peak of the envelope.
pub fn node(g: &DMatrix<C64>, steps: usize, env: &Envelope) -> (NodeMeasures, (f64, usize)) {
    let Some((_, t)) = dense::schur(g) else {
        let nan = NodeMeasures {
            norm: f64::NAN,
            departure: f64::NAN,
            condition: f64::NAN,
            radius: f64::NAN,
            defective: f64::NAN,
        };
        return (nan, (f64::NAN, 0));
    };
    let m = t.nrows();
    let measures = NodeMeasures {
        norm: dense::norm2(g),
        departure: dense::departure(&t),
        condition: dense::eigvec_condition(g, &t),
        radius: (0..m).map(|i| t[(i, i)].norm()).fold(0.0, f64::max),
        defective: dense::defective_modulus(&t).unwrap_or(f64::NAN),
    };
    let mut peak = (f64::NEG_INFINITY, 0usize);
    let exact = exact_norms(&t, steps, |n, upper, lower| {
        env.offer(n, lower);
        if lower > peak.0 {
            peak = (lower, n);
        }
        upper > env.get(n)
    });
    for (n, v) in &exact {
        env.offer(*n, *v);
        if *v > peak.0 {
            peak = (*v, *n);
        }
    }
    (measures, peak)
}
