//! Identity of a numerical mode by its shape: the eigenvector of L(θ) expanded
//! in the eigenvectors of the continuous system at the same wavevector.
//!
//! A numerical wave and the exact wave it approximates have (nearly) the same
//! eigenvector — which variables move and with what relative phase — even where
//! their frequencies have drifted far apart, so the share of the numerical
//! eigenvector that lies in each exact eigenvector names it. Exact modes of
//! (nearly) equal frequency form a cluster whose shares are pooled: inside a
//! cluster any basis is as good as another, and the pairing inside it does not
//! change the exact frequency a numerical mode is compared with.

use crate::linalg::solve;
use crate::numeric::assignment::optimal_assignment;
use num_complex::Complex64 as C64;

/// A numerical mode is named by shape only when at least this share of its
/// eigenvector lies in the (cluster of the) exact mode it is paired with.
pub const DECISIVE_SHARE: f64 = 0.9;
/// Exact frequencies within this fraction of the largest one form a cluster.
const CLUSTER: f64 = 1e-6;

/// For each entry of `wanted`, a distinct index into `have`, of least total
/// distance (an optimal assignment); None when the lengths differ or a value
/// is not finite.
pub fn nearest_order(wanted: &[C64], have: &[C64]) -> Option<Vec<usize>> {
    let m = wanted.len();
    if have.len() != m || wanted.iter().chain(have).any(|z| !z.is_finite()) {
        return None;
    }
    let cost: Vec<f64> = (0..m * m)
        .map(|ij| (wanted[ij / m] - have[ij % m]).norm())
        .collect();
    let out = optimal_assignment(&cost, m);
    Some(out)
}

/// Pairs numerical modes with exact ones by shape. `exact_vectors` and
/// `numerical_vectors` are row-major m×m with one eigenvector per column;
/// `order[i]` is the column of exact mode i and `exact[i]` its frequency.
/// Returns, for each exact mode i, the column of its numerical mode, or None
/// when the exact eigenvectors are (nearly) dependent or some pair holds less
/// than [`DECISIVE_SHARE`] of its numerical eigenvector.
pub fn pair(
    exact_vectors: &[C64],
    order: &[usize],
    exact: &[C64],
    numerical_vectors: &[C64],
    m: usize,
) -> Option<Vec<usize>> {
    let basis: Vec<C64> = (0..m * m)
        .map(|rc| exact_vectors[(rc / m) * m + order[rc % m]])
        .collect();
    // column j of `coef`: numerical eigenvector j in the exact eigenvectors
    let coef = solve(&basis, numerical_vectors, m, m).ok()?;
    let share = |i: usize, j: usize| -> f64 {
        let total: f64 = (0..m).map(|r| coef[r * m + j].norm_sqr()).sum();
        coef[i * m + j].norm_sqr() / total
    };
    let scale = exact.iter().map(|z| z.norm()).fold(0.0, f64::max);
    let together = |i: usize, k: usize| (exact[i] - exact[k]).norm() <= CLUSTER * scale;
    // the pairing that keeps the largest total share (an optimal assignment)
    let cost: Vec<f64> = (0..m * m).map(|ij| -share(ij / m, ij % m)).collect();
    let out = optimal_assignment(&cost, m);
    let decisive = (0..m).all(|i| {
        let pooled: f64 = (0..m)
            .filter(|&k| together(i, k))
            .map(|k| share(k, out[i]))
            .sum();
        pooled >= DECISIVE_SHARE
    });
    decisive.then_some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(re: f64) -> C64 {
        C64::new(re, 0.0)
    }

    #[test]
    fn shapes_name_modes_whose_frequencies_crossed() {
        // Two decoupled waves: exact modes e₁ (ω = 1) and e₂ (ω = 2); the
        // numerical ones have the same shapes but frequencies 1.9 and 1.1, so
        // nearest frequency would swap them.
        let exact_vectors = [c(1.0), c(0.0), c(0.0), c(1.0)];
        let numerical_vectors = [c(0.0), c(1.0), c(1.0), c(0.0)]; // columns e₂, e₁
        let out = pair(
            &exact_vectors,
            &[0, 1],
            &[c(1.0), c(2.0)],
            &numerical_vectors,
            2,
        );
        assert_eq!(out, Some(vec![1, 0]));
    }

    /// Numerical eigenvectors (e₁ ± e₂)/√2, each split evenly over the exact
    /// modes e₁ and e₂ of frequencies `exact`.
    fn evenly_split(exact: [f64; 2]) -> Option<Vec<usize>> {
        let exact_vectors = [c(1.0), c(0.0), c(0.0), c(1.0)];
        let s = c(0.5f64.sqrt());
        let numerical_vectors = [s, s, s, -s];
        pair(
            &exact_vectors,
            &[0, 1],
            &exact.map(c),
            &numerical_vectors,
            2,
        )
    }

    #[test]
    fn a_vector_spread_over_two_distinct_modes_does_not_decide() {
        assert_eq!(evenly_split([1.0, 2.0]), None);
    }

    #[test]
    fn a_cluster_of_equal_frequencies_pools_its_shares() {
        assert!(evenly_split([1.0, 1.0]).is_some());
    }

    #[test]
    fn nearest_order_is_a_permutation_even_for_repeated_values() {
        let out = nearest_order(&[c(1.0), c(1.0), c(3.0)], &[c(3.0), c(1.0), c(1.0)]).unwrap();
        let mut sorted = out.clone();
        sorted.sort_unstable();
        assert_eq!(sorted, vec![0, 1, 2]);
        assert_eq!(out[2], 0);
    }
}
