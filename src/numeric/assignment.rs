//! The optimal assignment: a one-to-one pairing of n rows with n columns of
//! least total cost, by the Hungarian method with potentials and shortest
//! augmenting paths (Kuhn 1955, Munkres 1957; the O(n³) form of Jonker &
//! Volgenant 1987, as in Burkard, Dell'Amico & Martello, Assignment Problems,
//! 2009, §4.4).
//!
//! Used to pair eigenvalues or eigenvectors of one spectrum with another: unlike
//! enumerating permutations it stays cheap for any n, and unlike taking the
//! closest pair first it cannot be trapped by one good pair that forces two bad
//! ones.

/// For a row-major n×n `cost` (finite entries), the column assigned to each
/// row in a pairing of least total cost. Non-finite costs count as a very large
/// finite cost.
pub fn optimal_assignment(cost: &[f64], n: usize) -> Vec<usize> {
    let mut out = vec![0usize; n];
    optimal_assignment_into(cost, n, &mut out);
    out
}

/// Largest size solved on the stack, without allocating.
const ON_STACK: usize = 15;

/// [`optimal_assignment`] into `out` (length n); allocation-free for n ≤ 15.
pub fn optimal_assignment_into(cost: &[f64], n: usize, out: &mut [usize]) {
    assert_eq!(cost.len(), n * n, "cost matrix has the wrong length");
    assert_eq!(out.len(), n, "output has the wrong length");
    if n == 0 {
        return;
    }
    if n <= ON_STACK {
        let (mut u, mut v, mut minv) = (
            [0.0; ON_STACK + 1],
            [0.0; ON_STACK + 1],
            [0.0; ON_STACK + 1],
        );
        let (mut row_of, mut way) = ([0usize; ON_STACK + 1], [0usize; ON_STACK + 1]);
        let mut used = [false; ON_STACK + 1];
        let k = n + 1;
        let scratch = Scratch {
            u: &mut u[..k],
            v: &mut v[..k],
            minv: &mut minv[..k],
            row_of: &mut row_of[..k],
            way: &mut way[..k],
            used: &mut used[..k],
        };
        hungarian(cost, n, scratch, out);
    } else {
        let k = n + 1;
        let (mut u, mut v, mut minv) = (vec![0.0; k], vec![0.0; k], vec![0.0; k]);
        let (mut row_of, mut way, mut used) = (vec![0usize; k], vec![0usize; k], vec![false; k]);
        let scratch = Scratch {
            u: &mut u,
            v: &mut v,
            minv: &mut minv,
            row_of: &mut row_of,
            way: &mut way,
            used: &mut used,
        };
        hungarian(cost, n, scratch, out);
    }
}

/// The working arrays of [`hungarian`], each of length n + 1.
struct Scratch<'a> {
    u: &'a mut [f64],
    v: &'a mut [f64],
    minv: &'a mut [f64],
    row_of: &'a mut [usize],
    way: &'a mut [usize],
    used: &'a mut [bool],
}

/// The Hungarian method with potentials and shortest augmenting paths.
fn hungarian(cost: &[f64], n: usize, s: Scratch, out: &mut [usize]) {
    let Scratch {
        u,
        v,
        minv,
        row_of,
        way,
        used,
    } = s;
    let big = cost
        .iter()
        .filter(|c| c.is_finite())
        .fold(0.0f64, |a, c| a.max(c.abs()))
        .max(1.0)
        * 1e6;
    let c = |i: usize, j: usize| {
        let v = cost[i * n + j];
        if v.is_finite() {
            v
        } else {
            big
        }
    };
    // 1-based arrays with a virtual column 0 (the classic formulation)
    for i in 1..=n {
        row_of[0] = i;
        let mut j0 = 0usize;
        minv.fill(f64::INFINITY);
        used.fill(false);
        loop {
            used[j0] = true;
            let i0 = row_of[j0];
            let mut delta = f64::INFINITY;
            let mut j1 = 0usize;
            for j in 1..=n {
                if !used[j] {
                    let cur = c(i0 - 1, j - 1) - u[i0] - v[j];
                    if cur < minv[j] {
                        minv[j] = cur;
                        way[j] = j0;
                    }
                    if minv[j] < delta {
                        delta = minv[j];
                        j1 = j;
                    }
                }
            }
            for j in 0..=n {
                if used[j] {
                    u[row_of[j]] += delta;
                    v[j] -= delta;
                } else {
                    minv[j] -= delta;
                }
            }
            j0 = j1;
            if row_of[j0] == 0 {
                break;
            }
        }
        loop {
            let j1 = way[j0];
            row_of[j0] = row_of[j1];
            j0 = j1;
            if j0 == 0 {
                break;
            }
        }
    }
    out.fill(0);
    for j in 1..=n {
        if row_of[j] > 0 {
            out[row_of[j] - 1] = j - 1;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The least total cost over every permutation (n ≤ 7).
    fn brute(cost: &[f64], n: usize) -> f64 {
        fn go(cost: &[f64], n: usize, row: usize, used: &mut Vec<bool>) -> f64 {
            if row == n {
                return 0.0;
            }
            let mut best = f64::INFINITY;
            for j in 0..n {
                if !used[j] {
                    used[j] = true;
                    best = best.min(cost[row * n + j] + go(cost, n, row + 1, used));
                    used[j] = false;
                }
            }
            best
        }
        go(cost, n, 0, &mut vec![false; n])
    }

    #[test]
    fn matches_the_best_permutation_on_pseudo_random_matrices() {
        let mut state = 0x2545_f491_4f6c_dd1du64;
        let mut next = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state >> 11) as f64 / (1u64 << 53) as f64
        };
        for n in 1..=7 {
            for _ in 0..40 {
                let cost: Vec<f64> = (0..n * n).map(|_| next()).collect();
                let a = optimal_assignment(&cost, n);
                let mut seen = a.clone();
                seen.sort_unstable();
                assert_eq!(seen, (0..n).collect::<Vec<_>>(), "not a permutation");
                let total: f64 = a.iter().enumerate().map(|(i, &j)| cost[i * n + j]).sum();
                assert!((total - brute(&cost, n)).abs() <= 1e-12, "n = {n}");
            }
        }
    }

    #[test]
    fn one_good_pair_does_not_force_two_bad_ones() {
        // closest pair first would take (0, 0) = 0 and then pay 100
        let cost = [0.0, 1.0, 1.0, 100.0];
        assert_eq!(optimal_assignment(&cost, 2), vec![1, 0]);
    }
}
