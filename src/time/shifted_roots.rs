//! Roots of the characteristic polynomial of a second-order-in-time method,
//! Σ_j (ρ_j − z σ_j) ζ^j, computed in the shifted variable e = ζ − 1.
//!
//! At z = 0 the polynomial (ζ − 1)² has a double root at ζ = 1, so roots taken
//! from the raw coefficients (or as eigenvalues of the companion matrix) sit
//! next to an ill-conditioned double root for long waves: a perturbation of ε
//! in a coefficient moves them by √ε ≈ 1e-8, enough to show |ζ| = 1 + 1e-8, a
//! false instability, wherever the rounding is not symmetric. In e the
//! polynomial is e² − z σ(1 + e) + O(z e²): its roots e ≈ ±√z keep their
//! relative accuracy however small z is, and |ζ| = |1 + e| is then accurate to
//! rounding.

use super::Multistep;
use crate::linalg::poly;
use num_complex::Complex64 as C64;

/// p(1 + e) of a quadratic p(ζ), exactly as far as rounding allows.
fn shift3(p: &[f64]) -> [f64; 3] {
    [p[0] + p[1] + p[2], p[1] + 2.0 * p[2], p[2]]
}

/// The roots e = ζ − 1 for z (as many as the polynomial's degree after
/// trimming; NaN when the root finder fails).
pub fn shifted(ms: &Multistep, z: C64) -> Vec<C64> {
    let c: Vec<C64> = if ms.alpha.len() == 3 {
        let (a, b) = (shift3(&ms.alpha), shift3(&ms.beta));
        (0..3).map(|j| C64::new(a[j], 0.0) - z * b[j]).collect()
    } else {
        let (a, b) = (
            super::exit::taylor_shift(&ms.alpha),
            super::exit::taylor_shift(&ms.beta),
        );
        a.iter()
            .zip(&b)
            .map(|(x, y)| C64::new(*x, 0.0) - z * y)
            .collect()
    };
    poly::roots(&c).unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); ms.alpha.len() - 1])
}

/// The roots ζ = 1 + e for z.
pub fn roots(ms: &Multistep, z: C64) -> Vec<C64> {
    shifted(ms, z)
        .into_iter()
        .map(|e| C64::new(1.0, 0.0) + e)
        .collect()
}

/// max |ζ| over the roots for z, without allocating for two-step methods (the
/// per-mode radius of the main sweep). A vanishing leading coefficient
/// 1 − zβ sends a root to infinity.
pub fn max_modulus(ms: &Multistep, z: C64) -> f64 {
    if ms.alpha.len() != 3 {
        return roots(ms, z).iter().map(|r| r.norm()).fold(0.0, f64::max);
    }
    let (a, b) = (shift3(&ms.alpha), shift3(&ms.beta));
    let c: [C64; 3] = [0, 1, 2].map(|j| C64::new(a[j], 0.0) - z * b[j]);
    let t = poly::trim(&c);
    let one = C64::new(1.0, 0.0);
    match t.len() {
        3 => {
            let (e1, e2) = poly::quadratic(t[2], t[1], t[0]);
            (one + e1).norm().max((one + e2).norm())
        }
        _ if z.norm() == 0.0 => 1.0,
        _ => f64::INFINITY,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn central() -> Multistep {
        Multistep {
            alpha: vec![1.0, -2.0, 1.0],
            beta: vec![0.0, 1.0, 0.0],
        }
    }

    #[test]
    fn long_waves_of_central_difference_stay_on_the_unit_circle() {
        // ζ² − (2 + z)ζ + 1 = 0 has |ζ| = 1 for every z in [−4, 0] (product of
        // the roots 1, discriminant ≤ 0: closed form)
        for z in [-1e-30, -1e-16, -1e-12, -1e-8, -1e-3, -0.5, -2.0, -3.9] {
            let r = max_modulus(&central(), C64::new(z, 0.0));
            assert!((r - 1.0).abs() <= 4.0 * f64::EPSILON, "z {z}: {r}");
        }
    }

    #[test]
    fn shifted_roots_keep_their_relative_accuracy_for_long_waves() {
        // central difference: e² − z e − z = 0, so e = (z ± √(z² + 4z))/2; for
        // z = −δ < 0, e = −δ/2 ± i √(δ − δ²/4) (closed form)
        for delta in [1e-30, 1e-20, 1e-12, 1e-6] {
            let mut e = shifted(&central(), C64::new(-delta, 0.0));
            e.sort_by(|a, b| a.im.total_cmp(&b.im));
            let im = (delta - delta * delta / 4.0).sqrt();
            assert!(
                (e[1].im - im).abs() <= 4.0 * f64::EPSILON * im,
                "{delta}: {e:?}"
            );
            assert!(
                (e[0].im + im).abs() <= 4.0 * f64::EPSILON * im,
                "{delta}: {e:?}"
            );
            assert!(
                (e[1].re + delta / 2.0).abs() <= 1e-15 * delta,
                "{delta}: {e:?}"
            );
        }
    }

    #[test]
    fn roots_satisfy_the_unshifted_polynomial() {
        let ms = Multistep {
            alpha: vec![1.0, -2.0, 1.0],
            beta: vec![0.35, 0.3, 0.35],
        };
        for z in [
            C64::new(-0.7, 0.0),
            C64::new(-3.0, 0.2),
            C64::new(-50.0, 0.0),
        ] {
            for zeta in roots(&ms, z) {
                let p: C64 = (0..3)
                    .map(|j| (C64::new(ms.alpha[j], 0.0) - z * ms.beta[j]) * zeta.powi(j as i32))
                    .sum();
                assert!(p.norm() < 1e-12 * (1.0 + z.norm()), "{z}: {p}");
            }
        }
    }
}
