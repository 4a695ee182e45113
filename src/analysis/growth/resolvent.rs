//! Resolvent-based measures of one amplification matrix: a Kreiss-constant lower
//! bound, the ε-pseudospectral radius, and the optimal initial perturbation of
//! the largest growth (Trefethen & Embree, Spectra and Pseudospectra, 2005).

use crate::linalg::dense;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Kreiss-constant lower bound K ≥ sup (|z| − 1)‖(zI − G)⁻¹‖₂ over sampled
/// |z| > 1; infinite when ρ(G) > 1.
///
/// The samples: radii 1 + 10^(−k/4), k = 0..32, at 128 angles, and at the angle
/// of every eigenvalue; then a compass search in (angle, log₁₀(|z| − 1)) from
/// the best sample and from each eigenvalue's angle (the supremum sits close
/// to an eigenvalue near the unit circle, often between the radii of a fixed
/// grid). The bound is at least 1, the value as |z| → ∞, so K ≥ 1 for every
/// matrix, as it must be (Trefethen & Embree, Spectra and Pseudospectra, §18).
pub fn kreiss_lower_bound(g: &DMatrix<C64>) -> f64 {
    let m = g.nrows();
    let id = DMatrix::<C64>::identity(m, m);
    let flat = crate::linalg::from_matrix(g);
    let rho = crate::linalg::spectral_radius(&flat, m).unwrap_or(f64::NAN);
    if rho > 1.0 + 1e-12 {
        return f64::INFINITY;
    }
    let value = |angle: f64, log_gap: f64| -> f64 {
        let gap = 10f64.powf(log_gap.clamp(-12.0, 2.0));
        let z = C64::from_polar(1.0 + gap, angle);
        let smin = dense::sigma_min(&(&id * z - g));
        if smin > 0.0 {
            gap / smin
        } else {
            0.0
        }
    };
    let eig_angles: Vec<f64> = crate::linalg::eigenvalues(&flat, m)
        .map(|e| e.iter().map(|l| l.arg()).collect())
        .unwrap_or_default();
    let mut best = (1.0f64, 0.0f64, 0.0f64);
    let angles = (0..128)
        .map(|a| std::f64::consts::TAU * a as f64 / 128.0)
        .chain(eig_angles.iter().copied());
    for a in angles {
        for k in 0..=32 {
            let lg = -(k as f64) / 4.0;
            let v = value(a, lg);
            if v > best.0 {
                best = (v, a, lg);
            }
        }
    }
    let starts = std::iter::once((best.1, best.2)).chain(eig_angles.iter().map(|&a| (a, -3.0)));
    for (a, lg) in starts.collect::<Vec<_>>() {
        let minus = |x: &[f64]| -value(x[0], x[1]);
        let (_, v) = crate::numeric::minimise::compass_min(&minus, &[a, lg], 0.05, 1e-10, 400);
        best.0 = best.0.max(-v);
    }
    best.0
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
                let (lo, _) = crate::numeric::bracket::bisect(|x| inside(w * x), r, hi, 0.0, 50);
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
    match dense::dominant_right_singular_vector(&p) {
        Some((smax, v)) => (smax * log_scale.exp(), v),
        None => (f64::NAN, vec![C64::new(f64::NAN, 0.0); m]),
    }
}
