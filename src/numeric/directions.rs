//! Sets of wave directions: angles on the circle and unit vectors on the sphere.
//!
//! On the circle, D angles 2πj/D, j = 0..D−1 (exact multiples, computed from the
//! integer j). On the sphere, a Fibonacci lattice: quasi-uniform points with
//! heights z_j = 1 − 2(j + ½)/D and golden-angle longitudes (González,
//! Math. Geosci. 42, 2010).

use std::f64::consts::PI;

/// D angles 2πj/D, j = 0..D−1.
pub fn circle(count: usize) -> Vec<f64> {
    (0..count)
        .map(|j| 2.0 * PI * j as f64 / count as f64)
        .collect()
}

/// D quasi-uniform unit vectors on the sphere (Fibonacci lattice).
pub fn sphere(count: usize) -> Vec<[f64; 3]> {
    let golden = PI * (3.0 - 5f64.sqrt());
    (0..count)
        .map(|j| {
            let z = 1.0 - 2.0 * (j as f64 + 0.5) / count as f64;
            let r = (1.0 - z * z).max(0.0).sqrt();
            let phi = golden * j as f64;
            [r * phi.cos(), r * phi.sin(), z]
        })
        .collect()
}

/// The 26 lattice directions of 3-D: 6 along the axes, 12 along the face
/// diagonals, 8 along the body diagonals (unit vectors).
pub fn lattice_3d() -> Vec<[f64; 3]> {
    let mut out = Vec::with_capacity(26);
    for i in -1i32..=1 {
        for j in -1i32..=1 {
            for k in -1i32..=1 {
                if (i, j, k) != (0, 0, 0) {
                    let n = ((i * i + j * j + k * k) as f64).sqrt();
                    out.push([i as f64 / n, j as f64 / n, k as f64 / n]);
                }
            }
        }
    }
    out.sort_by_key(|v| v.iter().filter(|x| **x != 0.0).count());
    out
}

/// The unit vector at angle 2πj/D on the circle, with the axes exact
/// (cos(π/2) is 6.1e-17 in floating point, and a ray θ = s n off the axis by
/// that much is no longer neutral by construction for a scheme upwinded across
/// the axis: its real part is then lost in rounding) and the diagonals'
/// components exactly ±1/√2. The angle is reduced to a quarter turn and the
/// quarter turns are applied exactly.
fn circle_point(j: usize, count: usize) -> [f64; 2] {
    let quarter = count / 4;
    if !count.is_multiple_of(4) || quarter == 0 {
        let a = 2.0 * PI * j as f64 / count as f64;
        return [a.cos(), a.sin()];
    }
    let (turns, r) = (j / quarter, j % quarter);
    let (c, s) = if r == 0 {
        (1.0, 0.0)
    } else if 2 * r == quarter {
        (
            std::f64::consts::FRAC_1_SQRT_2,
            std::f64::consts::FRAC_1_SQRT_2,
        )
    } else {
        let a = 2.0 * PI * r as f64 / count as f64;
        (a.cos(), a.sin())
    };
    match turns % 4 {
        0 => [c, s],
        1 => [-s, c],
        2 => [-c, -s],
        _ => [s, -c],
    }
}

/// Unit vectors for a dimension: ±x in 1-D; in 2-D `count` angles rounded up
/// to a multiple of 8, so that the axes and diagonals are in the set (exactly,
/// see `circle_point`); in 3-D
/// the 26 lattice directions (axes, face and body diagonals; the first `count`
/// of them when fewer are asked for) followed by `count − 26` Fibonacci points.
pub fn unit_vectors(dims: usize, count: usize) -> Vec<Vec<f64>> {
    match dims {
        1 => vec![vec![1.0], vec![-1.0]],
        2 => {
            let d = count.max(1).div_ceil(8) * 8;
            (0..d).map(|j| circle_point(j, d).to_vec()).collect()
        }
        _ => {
            let mut v: Vec<Vec<f64>> = lattice_3d().into_iter().map(|v| v.to_vec()).collect();
            v.truncate(count);
            let rest = count.saturating_sub(v.len());
            v.extend(sphere(rest).into_iter().map(|p| p.to_vec()));
            v
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn circle_points_are_the_angles_with_exact_axes_and_diagonals() {
        for d in [8, 16, 32, 184] {
            let set = unit_vectors(2, d);
            for (j, v) in set.iter().enumerate() {
                let a = 2.0 * PI * j as f64 / d as f64;
                assert!((v[0] - a.cos()).abs() < 2e-15 && (v[1] - a.sin()).abs() < 2e-15);
                if 4 * j % d == 0 {
                    assert!(
                        v.iter().filter(|x| **x == 0.0).count() == 1,
                        "{j}/{d}: {v:?}"
                    );
                    assert!(v.iter().any(|x| x.abs() == 1.0));
                }
                if 8 * j % d == 0 && 4 * j % d != 0 {
                    assert!(v.iter().all(|x| x.abs() == std::f64::consts::FRAC_1_SQRT_2));
                }
            }
        }
    }

    #[test]
    fn sets_hold_the_axes_and_the_diagonals() {
        let has = |set: &[Vec<f64>], v: &[f64]| {
            set.iter()
                .any(|u| u.iter().zip(v).all(|(a, b)| (a - b).abs() < 1e-15))
        };
        let h = 0.5f64.sqrt();
        for count in [30, 36, 180, 181] {
            let set = unit_vectors(2, count);
            assert_eq!(set.len() % 8, 0);
            assert!(set.len() >= count);
            for v in [
                [1.0, 0.0],
                [0.0, 1.0],
                [-1.0, 0.0],
                [0.0, -1.0],
                [h, h],
                [-h, h],
                [-h, -h],
                [h, -h],
            ] {
                assert!(has(&set, &v), "{count}: {v:?} missing");
            }
        }
        let t = 1.0 / 3f64.sqrt();
        let lattice: Vec<Vec<f64>> = lattice_3d().iter().map(|v| v.to_vec()).collect();
        assert_eq!(lattice.len(), 26);
        for v in [[0.0, 0.0, 1.0], [h, 0.0, -h], [0.0, -h, h], [t, -t, t]] {
            assert!(has(&lattice, &v), "{v:?} missing");
        }
        // 3-D sets begin with the lattice directions, then Fibonacci points
        let set = unit_vectors(3, 400);
        assert_eq!(set.len(), 400);
        assert!(lattice.iter().all(|v| has(&set, v)));
        assert_eq!(unit_vectors(3, 6).len(), 6);
    }

    #[test]
    fn sphere_points_are_unit_vectors_with_zero_mean() {
        let v = sphere(400);
        let mut mean = [0.0; 3];
        for p in &v {
            let n: f64 = p.iter().map(|x| x * x).sum();
            assert!((n - 1.0).abs() < 1e-14);
            for k in 0..3 {
                mean[k] += p[k] / 400.0;
            }
        }
        assert!(mean.iter().all(|m| m.abs() < 0.01));
    }
}
