//! Pairing two spectra whose values come in clusters of equal eigenvalues.
//!
//! Continuing a spectrum along a ray pairs each predicted value with a newly
//! computed one by the least total distance (an optimal assignment). Where
//! every predicted value's nearest new value is a clear winner the nearest
//! values are that optimum and no assignment is solved
//! ([`pair_into`](super::ray::pair_into)). A repeated eigenvalue — the
//! entropy and vorticity waves of the Euler equations travel at the same
//! speed — defeats that test at every step: its two copies are equally near.
//! Which copy goes to which mode cannot change any frequency beyond the
//! cluster's width (rounding), so the clusters are paired as wholes here:
//! every predicted value's nearest cluster must be a clear winner, and each
//! cluster must receive as many values as it has members. Then every optimal
//! assignment sends each predicted value into its own nearest cluster (moving
//! one elsewhere costs more than all the slack inside clusters, see
//! [`pair_clusters_into`]), and the members are handed out in index order.

use num_complex::Complex64 as C64;

/// Largest spectrum paired by clusters (bit masks of 64).
const MAX: usize = 64;

/// Width of a cluster relative to the spectrum's largest magnitude: distinct
/// eigenvalues closer than this are treated as one repeated value.
const WIDTH: f64 = 64.0 * f64::EPSILON;

/// `new` reordered to follow `target` into `out` (cleared first) when the
/// clusters of `new` decide the optimal assignment up to the order inside each
/// cluster; false (and `out` cleared) when they do not, and the caller solves
/// the assignment.
///
/// Why the result is optimal: let each target t go into its nearest cluster at
/// distance D₁(t), the next cluster being at D₂(t) ≥ 4·D₁(t) and D₂(t) − D₁(t)
/// more than m² cluster widths w. The pairing here costs at most
/// Σ (D₁(t) + m·w). Any assignment that sends some target t′ outside its
/// nearest cluster costs at least Σ_{t≠t′} D₁(t) + D₂(t′), which is more. So
/// every optimum (also one computed with rounding) keeps each target in its
/// nearest cluster, and differs from this pairing only inside clusters, where
/// values differ by at most m·w.
pub(super) fn pair_clusters_into(target: &[C64], new: &[C64], out: &mut Vec<C64>) -> bool {
    out.clear();
    let m = target.len();
    if m > MAX || new.len() != m || !target.iter().chain(new).all(|z| z.is_finite()) {
        return false;
    }
    // squared distances throughout (no hypot); square roots only for the margin
    let scale = target
        .iter()
        .chain(new)
        .map(|z| z.norm_sqr())
        .fold(0.0, f64::max)
        .sqrt();
    let width = WIDTH * scale;
    let width_sqr = width * width;
    // cluster label of each new value: the smallest index it is linked to
    // through a chain of values closer than `width`
    let mut label = [0usize; MAX];
    for (j, l) in label[..m].iter_mut().enumerate() {
        *l = j;
    }
    for j in 0..m {
        for i in 0..j {
            if (new[i] - new[j]).norm_sqr() <= width_sqr && label[i] != label[j] {
                let (keep, drop) = (label[i].min(label[j]), label[i].max(label[j]));
                for l in label[..m].iter_mut() {
                    if *l == drop {
                        *l = keep;
                    }
                }
            }
        }
    }
    let slack = (m * m) as f64 * width;
    let mut wanted = [0usize; MAX];
    let mut nearest = [0usize; MAX];
    for (t, near) in target.iter().zip(nearest.iter_mut()) {
        let (mut best, mut first) = (0, f64::INFINITY);
        for (j, n) in new.iter().enumerate() {
            let d = (t - n).norm_sqr();
            if d < first {
                (first, best) = (d, j);
            }
        }
        let cluster = label[best];
        let second = new
            .iter()
            .zip(&label[..m])
            .filter(|(_, l)| **l != cluster)
            .map(|(n, _)| (t - n).norm_sqr())
            .fold(f64::INFINITY, f64::min);
        // nearer than a quarter of the next cluster (a sixteenth squared), and
        // apart by more than the slack inside clusters
        if !(16.0 * first <= second && second.sqrt() - first.sqrt() > slack) {
            return false;
        }
        *near = cluster;
        wanted[cluster] += 1;
    }
    let members = |c: usize| label[..m].iter().filter(|l| **l == c).count();
    if (0..m).any(|c| wanted[c] > 0 && wanted[c] != members(c)) {
        return false;
    }
    let mut used = 0u64;
    for &cluster in &nearest[..m] {
        let Some(j) = (0..m).find(|&j| label[j] == cluster && used & (1 << j) == 0) else {
            out.clear();
            return false;
        };
        used |= 1 << j;
        out.push(new[j]);
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::assignment::optimal_assignment;

    fn c(re: f64, im: f64) -> C64 {
        C64::new(re, im)
    }

    /// The optimal assignment's total distance, by the general solver.
    fn optimum(target: &[C64], new: &[C64]) -> f64 {
        let m = target.len();
        let cost: Vec<f64> = (0..m * m)
            .map(|ij| (target[ij / m] - new[ij % m]).norm())
            .collect();
        optimal_assignment(&cost, m)
            .iter()
            .enumerate()
            .map(|(i, &j)| cost[i * m + j])
            .sum()
    }

    #[test]
    fn a_repeated_value_is_paired_as_one_cluster() {
        // the Euler pattern: u−c, u (twice, to rounding), u+c
        let target = [c(-1.0, 0.0), c(0.3, 0.0), c(0.3, 1e-17), c(1.6, 0.0)];
        let new = [
            c(1.62, 0.0),
            c(0.31, 0.0),
            c(-1.01, 0.0),
            c(0.31 + 1e-16, 0.0),
        ];
        let mut out = Vec::new();
        assert!(pair_clusters_into(&target, &new, &mut out));
        assert_eq!(out, vec![new[2], new[1], new[3], new[0]]);
        let cost: f64 = target.iter().zip(&out).map(|(t, n)| (t - n).norm()).sum();
        assert!((cost - optimum(&target, &new)).abs() <= 1e-15);
    }

    #[test]
    fn values_equally_near_two_clusters_are_left_to_the_assignment() {
        let target = [c(0.0, 0.0), c(1.0, 0.0)];
        let new = [c(0.5, 0.0), c(2.0, 0.0)];
        let mut out = vec![c(9.0, 9.0)];
        assert!(!pair_clusters_into(&target, &new, &mut out));
        assert!(out.is_empty());
    }

    #[test]
    fn a_cluster_wanted_by_more_values_than_it_has_is_left_to_the_assignment() {
        // both targets nearest the single value 0.0; the optimum sends one to 5.0
        let target = [c(0.0, 0.0), c(0.01, 0.0)];
        let new = [c(0.0, 0.0), c(5.0, 0.0)];
        let mut out = Vec::new();
        assert!(!pair_clusters_into(&target, &new, &mut out));
    }

    #[test]
    fn non_finite_or_mismatched_spectra_are_left_to_the_assignment() {
        let mut out = Vec::new();
        let nan = c(f64::NAN, 0.0);
        assert!(!pair_clusters_into(&[c(0.0, 0.0)], &[nan], &mut out));
        assert!(!pair_clusters_into(
            &[c(0.0, 0.0)],
            &[c(0.0, 0.0), c(1.0, 0.0)],
            &mut out
        ));
    }

    #[test]
    fn where_clusters_decide_the_total_distance_is_the_optimum() {
        // random spectra with repeated values, perturbed: whenever the clusters
        // decide, the pairing's cost equals the general solver's to rounding
        let mut state = 0x2545_f491_4f6c_dd1du64;
        let mut next = move || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state >> 11) as f64 / (1u64 << 53) as f64 - 0.5
        };
        let mut decided = 0;
        for trial in 0..4000 {
            let m = 2 + trial % 5;
            let mut base: Vec<C64> = (0..m).map(|_| c(next(), next())).collect();
            // repeat a value to make a cluster
            base[m - 1] = base[0];
            let target: Vec<C64> = base.iter().map(|z| z + c(next(), next()) * 0.05).collect();
            let mut new: Vec<C64> = base.iter().map(|z| z + c(next(), next()) * 1e-17).collect();
            new.reverse();
            let mut out = Vec::new();
            if pair_clusters_into(&target, &new, &mut out) {
                decided += 1;
                let cost: f64 = target.iter().zip(&out).map(|(t, n)| (t - n).norm()).sum();
                let best = optimum(&target, &new);
                assert!(
                    cost <= best + 1e-12,
                    "trial {trial}: {cost} > optimum {best}"
                );
                let mut sorted = out.clone();
                let mut have = new.clone();
                let key = |a: &C64, b: &C64| a.re.total_cmp(&b.re).then(a.im.total_cmp(&b.im));
                sorted.sort_by(key);
                have.sort_by(key);
                assert_eq!(sorted, have, "trial {trial}: not a permutation");
            }
        }
        assert!(
            decided > 1000,
            "clusters decided only {decided} of 4000 trials"
        );
    }
}
