//! Mirror images: the dispersion arrays at −θ copied from those at θ.
//!
//! With real stencil coefficients and real system matrices, L(−θ) is the
//! complex conjugate of L(θ), and the continuous symbol at −k of the one at k.
//! Every eigenvalue μ at −θ is then conj μ at θ, so every frequency ω = iμ
//! becomes −conj ω: the phase part Re ω changes sign, the damping Im ω does
//! not, and a fully discrete λ = e^{−iωΔt} becomes conj λ. Where every mode
//! order is ascending Re ω (a homogeneous system named by kgain's models, see
//! [`stream::mirrors`](super::stream::mirrors)) the order is reversed: mode j
//! at −θ is mode m−1−j at θ (acoustic− there is acoustic+ here). Its group
//! velocity ∇_θ Re ω is the same vector (the wave at −θ runs the same way as
//! its image at θ), and so is every derived map — ratios of numerical to exact
//! phase and decay, group-speed ratios and angles.
//!
//! The flat C-order index of −θ is N−1−f on kgain's grids (as for the radius
//! map), so the second half of the arrays is the first half read backwards,
//! modes reversed.

use super::opposes;
use super::stream::NodeArrays;
use num_complex::Complex64 as C64;
use rayon::prelude::*;

/// Fills nodes `computed..N` of `out` from their mirror images (which must lie
/// in `0..computed`); returns the count of mirrored nodes per mode whose
/// numerical group velocity opposes the exact one.
pub(super) fn mirror(out: &mut NodeArrays, computed: usize, m: usize, d: usize) -> Vec<usize> {
    let n = out.numerical.len() / m;
    assert!(
        2 * computed + 1 >= n,
        "every mirrored node needs its image computed"
    );
    let reflect = |z: &C64| -z.conj();
    mirror_array(&mut out.numerical, n, computed, m, 1, reflect);
    mirror_array(&mut out.exact, n, computed, m, 1, reflect);
    mirror_array(&mut out.discrete, n, computed, m, 1, reflect);
    let same = |v: &f64| *v;
    mirror_array(&mut out.group, n, computed, m, d, same);
    mirror_array(&mut out.group_exact, n, computed, m, d, same);
    mirror_array(&mut out.group_discrete, n, computed, m, d, same);
    for column in out.maps.columns_mut() {
        mirror_array(column, n, computed, m, 1, same);
    }
    // parasitic waves among the mirrored nodes, as the sweep counts them
    let (group, group_exact) = (&out.group, &out.group_exact);
    (0..m)
        .map(|j| {
            (computed..n)
                .filter(|f| {
                    let at = (f * m + j) * d;
                    opposes(&group[at..at + d], &group_exact[at..at + d])
                })
                .count()
        })
        .collect()
}

/// One node-major array of `n` nodes × `m` modes × `inner` values: node f ≥
/// `computed` gets, for mode j, `map` of node N−1−f's mode m−1−j.
fn mirror_array<T: Copy + Send + Sync>(
    values: &mut [T],
    n: usize,
    computed: usize,
    m: usize,
    inner: usize,
    map: impl Fn(&T) -> T + Sync,
) {
    let stride = m * inner;
    let (head, tail) = values.split_at_mut(computed * stride);
    tail.par_chunks_mut(stride)
        .enumerate()
        .for_each(|(k, node)| {
            let image = n - 1 - (computed + k);
            let from = &head[image * stride..(image + 1) * stride];
            for j in 0..m {
                let (to, src) = (j * inner, (m - 1 - j) * inner);
                for a in 0..inner {
                    node[to + a] = map(&from[src + a]);
                }
            }
        });
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_second_half_is_the_first_read_backwards_with_modes_reversed() {
        // 5 nodes, 2 modes: nodes 3 and 4 are the images of nodes 1 and 0
        let mut values: Vec<f64> = (0..10).map(f64::from).collect();
        mirror_array(&mut values, 5, 3, 2, 1, |v| *v);
        assert_eq!(
            values,
            vec![0.0, 1.0, 2.0, 3.0, 4.0, 5.0, 3.0, 2.0, 1.0, 0.0]
        );
    }

    #[test]
    fn frequencies_become_minus_their_conjugates() {
        let mut values = vec![
            C64::new(-1.0, -0.1),
            C64::new(2.0, -0.2),
            C64::new(0.0, 0.0),
            C64::new(0.0, 0.0),
        ];
        mirror_array(&mut values, 2, 1, 2, 1, |z| -z.conj());
        assert_eq!(values[2], C64::new(-2.0, -0.2));
        assert_eq!(values[3], C64::new(1.0, -0.1));
    }
}
