//! Certified real parts of the eigenvalues of L(θ) where they are far below
//! the rounding of an eigenvalue computation.
//!
//! Write L = iB + C entrywise (B = Im L, C = Re L, both real). Near θ = 0 a
//! hyperbolic system has B of order |θ| with real, distinct eigenvalues, while
//! C — the real parts of biased or compact stencils — is of order |θ|ʳ with r
//! up to 6 or more. A backward-stable eigenvalue algorithm perturbs every
//! eigenvalue by about ε‖L‖, far more than C's contribution, so the sign of a
//! real part cannot be read off the computed eigenvalues. It can be read off
//! the similarity M = V⁻¹LV = iV⁻¹BV + V⁻¹CV with V the (real) eigenvectors of
//! B: the first product is purely imaginary in real arithmetic, so every real
//! part of M is a real part of V⁻¹CV, computed to relative accuracy ε·κ(V)
//! against ‖C‖ rather than ‖L‖. Gershgorin's theorem, with row k scaled by a δ
//! that shrinks its disc to second order in C against the gap between k and
//! the other diagonal entries, then places exactly one eigenvalue within
//! r_k = δ Σ_{j≠k} |M_kj| of M_kk whenever that disc is isolated from the
//! others; its real part is Re M_kk within r_k plus the rounding of V⁻¹CV and
//! of C's entries. Where every real part is told from zero this way, the
//! eigenvalues are trusted with these real parts.

use crate::linalg::eigenvalues_and_vectors;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// The eigenvalues of the row-major m×m `sym` with real parts certified as
/// described above, in the order of `computed` (the eigenvalues as computed
/// from `sym`, whose imaginary parts are kept); `real_noise` bounds the
/// rounding of the real parts of `sym`'s entries. None when B's eigenvalues
/// are not real and separated, a disc is not isolated, or some real part is
/// not told from zero.
pub fn certified(sym: &[C64], m: usize, real_noise: f64, computed: &[C64]) -> Option<Vec<C64>> {
    let b: Vec<f64> = sym.iter().map(|z| z.im).collect();
    let c: Vec<f64> = sym.iter().map(|z| z.re).collect();
    let embedded: Vec<C64> = b.iter().map(|x| C64::new(*x, 0.0)).collect();
    let (values, vectors) = eigenvalues_and_vectors(&embedded, m).ok()?;
    let scale_b = b.iter().fold(0.0_f64, |a, x| a.max(x.abs()));
    // real eigenvalues and real eigenvectors (B is real: a simple real
    // eigenvalue has a real eigenvector, returned with its largest entry real)
    if values.iter().any(|v| v.im.abs() > 1e-10 * scale_b) {
        return None;
    }
    if vectors
        .iter()
        .any(|z| !(z.im.abs() <= 1e-10 && z.re.is_finite()))
    {
        return None;
    }
    let v = DMatrix::from_row_slice(m, m, &vectors.iter().map(|z| z.re).collect::<Vec<_>>());
    let w = v.clone().try_inverse()?;
    let bm = DMatrix::from_row_slice(m, m, &b);
    let cm = DMatrix::from_row_slice(m, m, &c);
    let p = &w * &bm * &v;
    let q = &w * &cm * &v;
    let kappa = w.norm() * v.norm();
    // the rounding of C's entries carried through V⁻¹·V, and that of the
    // products and of V⁻¹ (the computed M is exactly similar to L(I + E) with
    // ‖E‖ ≲ ε κ, which moves the real parts by about ε κ² ‖C‖)
    let rounding =
        kappa * m as f64 * real_noise + 8.0 * m as f64 * f64::EPSILON * kappa * kappa * cm.norm();
    if !(rounding.is_finite() && p.iter().chain(q.iter()).all(|x| x.is_finite())) {
        return None;
    }
    // M = iP + Q with every entry known to within `rounding` in its real part
    let entry = |i: usize, j: usize| C64::new(q[(i, j)], p[(i, j)]).norm() + rounding;
    let centre = |i: usize| C64::new(q[(i, i)], p[(i, i)]);
    let mut parts: Vec<(f64, f64)> = Vec::with_capacity(m);
    for k in 0..m {
        let gap = (0..m)
            .filter(|j| *j != k)
            .map(|j| (centre(k) - centre(j)).norm())
            .fold(f64::INFINITY, f64::min);
        let column = (0..m)
            .filter(|j| *j != k)
            .map(|j| entry(j, k))
            .fold(0.0_f64, f64::max);
        let row: f64 = (0..m).filter(|j| *j != k).map(|j| entry(k, j)).sum();
        let (delta, radius) = if m == 1 {
            (1.0, 0.0)
        } else {
            let delta = 4.0 * column / gap;
            (delta, delta * row)
        };
        if !(gap > 0.0 && delta > 0.0 || m == 1) {
            return None;
        }
        // the other discs after the scaling: column k grows by 1/δ (to at
        // most gap/4), the rest of each row unchanged
        for j in (0..m).filter(|j| *j != k) {
            let others: f64 = (0..m)
                .filter(|l| *l != j && *l != k)
                .map(|l| entry(j, l))
                .sum();
            let radius_j = entry(j, k) / delta + others;
            if radius + radius_j >= (centre(k) - centre(j)).norm() {
                return None;
            }
        }
        let error = radius + rounding;
        let re = q[(k, k)];
        if re.abs() <= error {
            return None;
        }
        parts.push((p[(k, k)], re));
    }
    // each computed eigenvalue takes the real part of the disc nearest to it
    // along the imaginary axis (the discs are disjoint)
    let mut out = Vec::with_capacity(m);
    for mu in computed {
        let (_, re) = parts
            .iter()
            .min_by(|x, y| (x.0 - mu.im).abs().total_cmp(&(y.0 - mu.im).abs()))?;
        out.push(C64::new(*re, mu.im));
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A 2×2 hyperbolic symbol iθA with a damping −θ⁶|A| far below ε‖L‖: the
    /// real parts come out as −θ⁶ times the (positive) eigenvalues of |A|,
    /// derived by hand: A = diag(2, −1) conjugated by a shear, |A| = the same
    /// shear of diag(2, 1).
    #[test]
    fn tiny_damping_of_a_hyperbolic_system_is_resolved() {
        let s = 0.05_f64;
        let damp = s.powi(6);
        // A = X diag(2, -1) X^-1 with X = [[1, 0.5], [0, 1]]
        let x = DMatrix::from_row_slice(2, 2, &[1.0, 0.5, 0.0, 1.0]);
        let xi = x.clone().try_inverse().unwrap();
        let a = &x * DMatrix::from_diagonal(&nalgebra::dvector![2.0, -1.0]) * &xi;
        let abs = &x * DMatrix::from_diagonal(&nalgebra::dvector![2.0, 1.0]) * &xi;
        let sym: Vec<C64> = (0..2)
            .flat_map(|i| (0..2).map(move |j| (i, j)))
            .map(|(i, j)| C64::new(-damp * abs[(i, j)], s * a[(i, j)]))
            .collect();
        let computed = crate::linalg::eigenvalues(&sym, 2).unwrap();
        let out = certified(&sym, 2, 0.0, &computed).expect("certified");
        for mu in out {
            let expected = if mu.im > 0.0 { -2.0 * damp } else { -damp };
            assert!(
                (mu.re - expected).abs() <= 1e-9 * damp,
                "{mu} vs {expected}"
            );
        }
    }

    /// A real part within the rounding of the entries is not told from zero.
    #[test]
    fn a_real_part_inside_the_entry_noise_is_not_certified() {
        let sym = [
            C64::new(-1e-20, 0.3),
            C64::new(0.0, 0.1),
            C64::new(0.0, 0.0),
            C64::new(-1e-20, -0.2),
        ];
        let computed = crate::linalg::eigenvalues(&sym, 2).unwrap();
        assert!(certified(&sym, 2, 1e-18, &computed).is_none());
        assert!(certified(&sym, 2, 0.0, &computed).is_some());
    }

    /// Equal speeds in a Jordan block of B: a real coupling of 1e-9 splits the
    /// pair by ±√(i·1e-9), real parts of ±2.2e-5 (one of them unstable) that
    /// no first-order reading of the diagonal of C sees; not certified.
    #[test]
    fn a_jordan_block_of_speeds_is_not_certified() {
        let sym = [
            C64::new(-1e-9, 0.3),
            C64::new(0.0, 1.0),
            C64::new(1e-9, 0.0),
            C64::new(-2e-9, 0.3),
        ];
        let computed = crate::linalg::eigenvalues(&sym, 2).unwrap();
        assert!(computed.iter().any(|z| z.re > 1e-5), "{computed:?}");
        assert!(certified(&sym, 2, 0.0, &computed).is_none());
    }

    /// A complex pair of B (an elliptic part) is outside the method.
    #[test]
    fn complex_eigenvalues_of_b_are_not_certified() {
        let sym = [
            C64::new(-1e-9, 0.0),
            C64::new(0.0, 1.0),
            C64::new(0.0, -1.0),
            C64::new(-1e-9, 0.0),
        ];
        let computed = crate::linalg::eigenvalues(&sym, 2).unwrap();
        assert!(certified(&sym, 2, 0.0, &computed).is_none());
    }
}
