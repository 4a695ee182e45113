//! Stencils for the generator: the catalogue names with their textbook weights
//! (standard central and one-sided differences, common practice; the compact
//! schemes of Lele, J. Comput. Phys. 103, 1992; the 7-point stencil of Tam & Webb,
//! J. Comput. Phys. 107, 1993), and random consistent user stencils built by
//! solving the Taylor conditions.

use crate::rng::Rng;
use crate::scheme::Stencil;
use nalgebra::{DMatrix, DVector};

fn explicit(name: &str, derivative: u32, offsets: &[f64], weights: &[f64]) -> Stencil {
    Stencil {
        name: name.into(),
        builtin: true,
        derivative,
        offsets: offsets.to_vec(),
        weights: weights.to_vec(),
        lhs_offsets: vec![0.0],
        lhs_weights: vec![1.0],
    }
}

/// The catalogue first-derivative stencils by name.
pub fn catalogue_first(name: &str) -> Stencil {
    let third = 1.0 / 3.0;
    match name {
        "central2" => explicit(name, 1, &[-1.0, 1.0], &[-0.5, 0.5]),
        "central4" => explicit(
            name,
            1,
            &[-2.0, -1.0, 1.0, 2.0],
            &[1.0 / 12.0, -2.0 / 3.0, 2.0 / 3.0, -1.0 / 12.0],
        ),
        "central6" => explicit(
            name,
            1,
            &[-3.0, -2.0, -1.0, 1.0, 2.0, 3.0],
            &[-1.0 / 60.0, 0.15, -0.75, 0.75, -0.15, 1.0 / 60.0],
        ),
        "upwind1" => explicit(name, 1, &[-1.0, 0.0], &[-1.0, 1.0]),
        "upwind2" => explicit(name, 1, &[-2.0, -1.0, 0.0], &[0.5, -2.0, 1.5]),
        "upwind3" => explicit(
            name,
            1,
            &[-2.0, -1.0, 0.0, 1.0],
            &[1.0 / 6.0, -1.0, 0.5, third],
        ),
        "compact4" => Stencil {
            lhs_offsets: vec![-1.0, 0.0, 1.0],
            lhs_weights: vec![0.25, 1.0, 0.25],
            ..explicit(name, 1, &[-1.0, 1.0], &[-0.75, 0.75])
        },
        "compact6" => Stencil {
            lhs_offsets: vec![-1.0, 0.0, 1.0],
            lhs_weights: vec![third, 1.0, third],
            ..explicit(
                name,
                1,
                &[-2.0, -1.0, 1.0, 2.0],
                &[-1.0 / 36.0, -7.0 / 9.0, 7.0 / 9.0, 1.0 / 36.0],
            )
        },
        _ => explicit(
            "drp7",
            1,
            &[-3.0, -2.0, -1.0, 1.0, 2.0, 3.0],
            &[
                -0.02651995,
                0.18941314,
                -0.79926643,
                0.79926643,
                -0.18941314,
                0.02651995,
            ],
        ),
    }
}

/// Catalogue first-derivative names used by the generator.
pub const FIRST_NAMES: [&str; 9] = [
    "central2", "central4", "central6", "upwind1", "upwind2", "upwind3", "compact4", "compact6",
    "drp7",
];

/// The catalogue second-derivative stencils by name (central2, central4, central6).
pub fn catalogue_second(name: &str) -> Stencil {
    match name {
        "central4" => explicit(
            name,
            2,
            &[-2.0, -1.0, 0.0, 1.0, 2.0],
            &[-1.0 / 12.0, 4.0 / 3.0, -2.5, 4.0 / 3.0, -1.0 / 12.0],
        ),
        "central6" => explicit(
            name,
            2,
            &[-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0],
            &[1.0 / 90.0, -0.15, 1.5, -49.0 / 18.0, 1.5, -0.15, 1.0 / 90.0],
        ),
        _ => explicit("central2", 2, &[-1.0, 0.0, 1.0], &[1.0, -2.0, 1.0]),
    }
}

/// Right-hand-side weights of a first-derivative stencil on `offsets` with the
/// left-hand side (p_k, a_k), from the Taylor conditions
/// Σ_j w_j o_j^n/n! = Σ_k a_k p_k^{n−1}/(n−1)! for n = 0..N−1 (N = offsets):
/// a square Vandermonde-type system (well posed for distinct offsets).
pub fn taylor_weights(
    offsets: &[f64],
    lhs_offsets: &[f64],
    lhs_weights: &[f64],
) -> Option<Vec<f64>> {
    let n = offsets.len();
    let fact = |k: usize| (1..=k).map(|x| x as f64).product::<f64>();
    let a = DMatrix::from_fn(n, n, |row, j| offsets[j].powi(row as i32) / fact(row));
    let b = DVector::from_fn(n, |row, _| {
        if row == 0 {
            0.0
        } else {
            let k = row - 1;
            lhs_offsets
                .iter()
                .zip(lhs_weights)
                .map(|(p, w)| w * p.powi(k as i32) / fact(k))
                .sum()
        }
    });
    let w = a.lu().solve(&b)?;
    w.iter()
        .all(|x| x.is_finite())
        .then(|| w.iter().copied().collect())
}

/// A random consistent user first-derivative stencil named `name`: central
/// (symmetric offsets), biased towards negative offsets (upwind for positive
/// speed), or compact with a left-hand side bounded away from zero on [−π, π].
pub fn random_first(rng: &mut Rng, name: &str) -> Stencil {
    let kind = rng.int(0, 3);
    let (lhs_offsets, lhs_weights) = if kind >= 2 {
        if rng.chance(0.6) {
            let alpha = rng.uniform(0.05, 0.42);
            (vec![-1.0, 0.0, 1.0], vec![alpha, 1.0, alpha])
        } else {
            // one-sided left-hand side 1 + β e^{−iθ}: |1 + β e^{−iθ}| ≥ 1 − |β| > 0
            (vec![-1.0, 0.0], vec![rng.uniform(-0.4, 0.4), 1.0])
        }
    } else {
        (vec![0.0], vec![1.0])
    };
    let offsets: Vec<f64> = if kind.is_multiple_of(2) {
        let k = rng.int(1, 3) as i32;
        (-k..=k).filter(|o| *o != 0).map(f64::from).collect()
    } else {
        let left = rng.int(1, 3) as i32;
        let right = rng.int(0, left as usize - 1) as i32;
        (-left..=right).map(f64::from).collect()
    };
    let weights =
        taylor_weights(&offsets, &lhs_offsets, &lhs_weights).unwrap_or_else(|| vec![-0.5, 0.5]);
    let offsets = if weights.len() == offsets.len() {
        offsets
    } else {
        vec![-1.0, 1.0]
    };
    let lhs_symmetric = lhs_offsets.iter().all(|p| lhs_offsets.contains(&-p));
    let weights = if lhs_symmetric {
        antisymmetrised(&offsets, weights)
    } else {
        weights
    };
    Stencil {
        name: name.into(),
        builtin: false,
        derivative: 1,
        offsets,
        weights,
        lhs_offsets,
        lhs_weights,
    }
}

/// Makes the weights of a symmetric offset set exactly antisymmetric (the Taylor
/// solve leaves roundoff that would give a central stencil a spurious real part).
fn antisymmetrised(offsets: &[f64], mut weights: Vec<f64>) -> Vec<f64> {
    let symmetric = offsets.iter().all(|o| offsets.contains(&-o)) && !offsets.contains(&0.0);
    if symmetric {
        let copy = weights.clone();
        for (j, o) in offsets.iter().enumerate() {
            let k = offsets.iter().position(|p| *p == -o).unwrap_or(j);
            weights[j] = 0.5 * (copy[j] - copy[k]);
        }
    }
    weights
}
