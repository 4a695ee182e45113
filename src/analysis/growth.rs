//! Beyond the spectral radius: ‖G‖₂, Henrici's departure from normality, the
//! eigenvector condition number, the transient-growth envelope max_θ ‖Gⁿ‖₂, a
//! Kreiss-constant lower bound and the ε-pseudospectral radius (Trefethen &
//! Embree, Spectra and Pseudospectra, 2005).
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
        };
        return (nan, (f64::NAN, 0));
    };
    let m = t.nrows();
    let measures = NodeMeasures {
        norm: dense::norm2(g),
        departure: dense::departure(&t),
        condition: dense::eigvec_condition(g, &t),
        radius: (0..m).map(|i| t[(i, i)].norm()).fold(0.0, f64::max),
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

/// Kreiss-constant lower bound sup (|z| − 1)‖(zI − G)⁻¹‖₂ over sampled |z| > 1
/// (radii 1 + 10^(−k/4), k = 0..32, 128 angles); infinite when ρ(G) > 1.
pub fn kreiss_lower_bound(g: &DMatrix<C64>) -> f64 {
    let m = g.nrows();
    let id = DMatrix::<C64>::identity(m, m);
    let rho = crate::linalg::spectral_radius(&crate::linalg::from_matrix(g), m).unwrap_or(f64::NAN);
    if rho > 1.0 + 1e-12 {
        return f64::INFINITY;
    }
    let mut best: f64 = 0.0;
    for k in 0..=32 {
        let r = 1.0 + 10f64.powf(-(k as f64) / 4.0);
        for a in 0..128 {
            let z = C64::from_polar(r, std::f64::consts::TAU * a as f64 / 128.0);
            let smin = dense::sigma_min(&(&id * z - g));
            if smin > 0.0 {
                best = best.max((r - 1.0) / smin);
            }
        }
    }
    best
}

/// ε-pseudospectral radius max{|z| : σ_min(zI − G) ≤ ε}: along 128 rays, the
/// outermost boundary point, scanning inward from ‖G‖₂ + ε and bisecting.
pub fn pseudospectral_radius(g: &DMatrix<C64>, eps: f64) -> f64 {
    let m = g.nrows();
    let id = DMatrix::<C64>::identity(m, m);
    let outer = dense::norm2(g) + eps;
    let inside = |z: C64| dense::sigma_min(&(&id * z - g)) <= eps;
    let mut best: f64 = 0.0;
    let samples = 256;
    for a in 0..128 {
        let w = C64::from_polar(1.0, std::f64::consts::TAU * a as f64 / 128.0);
        let mut hi = outer;
        for k in (0..samples).rev() {
            let r = outer * k as f64 / samples as f64;
            if inside(w * r) {
                let mut lo = r;
                for _ in 0..50 {
                    let mid = 0.5 * (lo + hi);
                    if inside(w * mid) {
                        lo = mid;
                    } else {
                        hi = mid;
                    }
                }
                best = best.max(lo);
                break;
            }
            hi = r;
        }
    }
    // σ_min(zI − G) ≤ |z − λ|: the ε-disc around every eigenvalue is inside
    let rho = crate::linalg::spectral_radius(&crate::linalg::from_matrix(g), m).unwrap_or(0.0);
    best.max(rho + eps)
}

/// Right singular vector of the largest singular value of Gⁿ: the initial
/// perturbation that grows most in n steps.
pub fn optimal_perturbation(g: &DMatrix<C64>, n: usize) -> (f64, Vec<C64>) {
    let m = g.nrows();
    let mut p = DMatrix::<C64>::identity(m, m);
    let mut log_scale = 0.0f64;
    for _ in 0..n {
        p = &p * g;
        let f = dense::frobenius(&p);
        if f > 1e100 {
            p /= C64::new(f, 0.0);
            log_scale += f.ln();
        }
    }
    let svd = p.svd(false, true);
    let (imax, smax) =
        svd.singular_values
            .iter()
            .enumerate()
            .fold(
                (0, f64::NEG_INFINITY),
                |b, (i, s)| if *s > b.1 { (i, *s) } else { b },
            );
    let v = svd
        .v_t
        .map(|vt| (0..m).map(|j| vt[(imax, j)].conj()).collect())
        .unwrap_or_else(|| vec![C64::new(f64::NAN, 0.0); m]);
    (smax * log_scale.exp(), v)
}
