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

/// Unit vectors for a dimension: ±x in 1-D, `count` angles in 2-D, `count`
/// sphere points in 3-D.
pub fn unit_vectors(dims: usize, count: usize) -> Vec<Vec<f64>> {
    match dims {
        1 => vec![vec![1.0], vec![-1.0]],
        2 => circle(count)
            .into_iter()
            .map(|a| vec![a.cos(), a.sin()])
            .collect(),
        _ => sphere(count).into_iter().map(|v| v.to_vec()).collect(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
