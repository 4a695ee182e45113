//! The principal root of a linear multistep method as a power series in z.
//!
//! The root ζ(z) of Σⱼ (αⱼ − z βⱼ) ζʲ = 0 that tends to 1 as z → 0 is analytic
//! there for a consistent method (ρ(1) = 0, ρ'(1) ≠ 0): ζ = Σₙ cₙ zⁿ with
//! c₀ = 1. Collecting zⁿ, the unknown cₙ enters only through the terms j·cₙ of
//! \[ζʲ\]ₙ, so cₙ = −(Σⱼ αⱼ \[ζʲ\]ₙ|_{cₙ=0} − Σⱼ βⱼ \[ζʲ\]ₙ₋₁)/ρ'(1), order by order.
//! On the imaginary axis, with real cₙ, |ζ(iy)|² = Σ_N g_N y^N where
//! g_N = (−1)^{N/2} Σ_{m=0}^{N} (−1)^m c_{N−m} c_m for even N and 0 for odd N:
//! exact coefficients, free of the cancellation in |ζ|² − 1 evaluated at small y.

use crate::time::Multistep;

/// c₀..c_order of the principal root, or None for an inconsistent method
/// (ρ(1) ≠ 0 or ρ'(1) = 0).
pub fn series(ms: &Multistep, order: usize) -> Option<Vec<f64>> {
    let scale = ms.alpha.iter().map(|a| a.abs()).sum::<f64>().max(1e-300);
    let rho_at_one: f64 = ms.alpha.iter().sum();
    let slope: f64 = ms.alpha.iter().enumerate().map(|(j, a)| j as f64 * a).sum();
    if rho_at_one.abs() > 1e-12 * scale || slope.abs() <= 1e-12 * scale {
        return None;
    }
    let steps = ms.alpha.len();
    let mut c = vec![0.0; order + 1];
    c[0] = 1.0;
    for n in 1..=order {
        // powers ζʲ truncated at order n, with cₙ = 0 so far
        let mut power = vec![0.0; n + 1];
        power[0] = 1.0;
        let (mut at_n, mut at_n_minus_1) = (0.0, 0.0);
        for j in 0..steps {
            if j > 0 {
                power = multiply(&power, &c[..=n], n);
            }
            at_n += ms.alpha[j] * power[n];
            at_n_minus_1 += ms.beta.get(j).copied().unwrap_or(0.0) * power[n - 1];
        }
        c[n] = -(at_n - at_n_minus_1) / slope;
    }
    Some(c)
}

/// The product of two power series truncated at `order`.
fn multiply(a: &[f64], b: &[f64], order: usize) -> Vec<f64> {
    let mut out = vec![0.0; order + 1];
    for (i, x) in a.iter().enumerate().take(order + 1) {
        for (j, y) in b.iter().enumerate().take(order + 1 - i) {
            out[i + j] += x * y;
        }
    }
    out
}

/// (k, c): |ζ(iy)|² − 1 = c yᵏ + O(y^{k+2}), the first even order N ≤ 16
/// whose coefficient is clear of the rounding of its sum; None when there is
/// none (the root stays on the unit circle to that order: leapfrog) or the
/// method is inconsistent.
pub fn imaginary_axis(ms: &Multistep) -> Option<(usize, f64)> {
    const ORDER: usize = 16;
    let c = series(ms, ORDER)?;
    for n in (2..=ORDER).step_by(2) {
        let (mut g, mut size) = (0.0, 0.0);
        for m in 0..=n {
            let term = c[n - m] * c[m];
            g += if m % 2 == 0 { term } else { -term };
            size += term.abs();
        }
        if (n / 2) % 2 == 1 {
            g = -g;
        }
        if g.abs() > 1e-12 * size.max(1.0) {
            return Some((n, g));
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    /// AB2's principal root ζ = 1 + z + z²/2 − z³/4 − … (from ζ² − ζ =
    /// z(3ζ − 1)/2 order by order), so |ζ(iy)|² − 1 = y⁴/2 + O(y⁶).
    #[test]
    fn adams_bashforth_2_series_and_growth() {
        let ab2 = Multistep {
            alpha: vec![0.0, -1.0, 1.0],
            beta: vec![-0.5, 1.5, 0.0],
        };
        let c = series(&ab2, 3).unwrap();
        for (got, want) in c.iter().zip([1.0, 1.0, 0.5, -0.25]) {
            assert!((got - want).abs() < 1e-15, "{c:?}");
        }
        assert_eq!(imaginary_axis(&ab2), Some((4, 0.5)));
    }

    /// Leapfrog's principal root e^{i arcsin y} stays on the unit circle.
    #[test]
    fn leapfrog_has_no_growth_on_the_axis() {
        let leapfrog = Multistep {
            alpha: vec![-1.0, 0.0, 1.0],
            beta: vec![0.0, 2.0, 0.0],
        };
        assert_eq!(imaginary_axis(&leapfrog), None);
    }

    /// An inconsistent method has no principal root through 1.
    #[test]
    fn inconsistent_method_has_no_series() {
        let bad = Multistep {
            alpha: vec![0.5, 1.0],
            beta: vec![1.0, 0.0],
        };
        assert!(series(&bad, 4).is_none());
    }
}
