//! Random continuous systems for the generator: scalar advection(–diffusion) and
//! `linear` systems of 2 or 3 variables whose flux matrices are hyperbolic in
//! every direction (A_d = W⁻¹ S_d W with S_d symmetric of distinct eigenvalues and
//! W well conditioned, so A_d = V_d Λ_d V_d⁻¹ with V_d = W⁻¹ Q_d), with optional
//! symmetric positive semidefinite diffusion and optional sources (damping,
//! rotation, or weakly unstable growth).

use crate::rng::Rng;
use crate::scheme::{Mat, System};
use crate::speed::reference_speed;

/// A random orthogonal matrix (QR of a Gaussian matrix).
fn orthogonal(rng: &mut Rng, m: usize) -> Mat {
    let g = Mat::from_fn(m, m, |_, _| rng.normal());
    g.qr().q()
}

/// Distinct speeds in [−2, 2] with a gap of at least 0.25 between any two.
fn distinct_speeds(rng: &mut Rng, m: usize) -> Vec<f64> {
    loop {
        let mut v: Vec<f64> = (0..m).map(|_| rng.uniform(-2.0, 2.0)).collect();
        v.sort_by(f64::total_cmp);
        if v.windows(2).all(|w| w[1] - w[0] >= 0.25) && v.iter().any(|x| x.abs() > 0.2) {
            return v;
        }
    }
}

/// A well-conditioned change of variables W (2-norm condition number below 6).
fn change_of_variables(rng: &mut Rng, m: usize) -> Mat {
    loop {
        let w = Mat::identity(m, m) + Mat::from_fn(m, m, |_, _| 0.35 * rng.normal());
        let sv = w.clone().svd(false, false).singular_values;
        let (hi, lo) = (sv.max(), sv.min());
        if lo > 0.0 && hi / lo < 6.0 {
            return w;
        }
    }
}

/// Scalar advection with velocity per axis and optional diffusivity per axis.
pub fn advection(rng: &mut Rng, spacing: &[f64]) -> System {
    let dims = spacing.len();
    let velocity: Vec<f64> = (0..dims)
        .map(|_| rng.sign() * rng.uniform(0.1, 2.0))
        .collect();
    let speed = velocity.iter().map(|a| a * a).sum::<f64>().sqrt();
    let diffusive = rng.chance(0.5);
    let one = |x: f64| Mat::from_element(1, 1, x);
    let diffusion = spacing
        .iter()
        .map(|h| {
            if diffusive {
                one(rng.uniform(0.02, 1.0) * h * speed)
            } else {
                one(0.0)
            }
        })
        .collect();
    System {
        variables: vec!["q".into()],
        scalar_advection: true,
        flux: velocity.iter().map(|a| one(*a)).collect(),
        flux_vectors: vec![one(1.0); dims],
        flux_speeds: velocity.iter().map(|a| vec![*a]).collect(),
        diffusion,
        source: one(0.0),
        reference_speed: speed,
    }
}

/// A `linear` system of m variables (see the module documentation).
pub fn linear(rng: &mut Rng, spacing: &[f64], m: usize) -> System {
    let dims = spacing.len();
    let diffusive = rng.chance(0.4);
    // symmetric diffusion needs symmetric fluxes to stay well posed: W = I then
    let w = if diffusive {
        Mat::identity(m, m)
    } else {
        change_of_variables(rng, m)
    };
    let w_inv = w
        .clone()
        .try_inverse()
        .unwrap_or_else(|| Mat::identity(m, m));
    let mut flux = Vec::new();
    let mut vectors = Vec::new();
    let mut speeds = Vec::new();
    for _ in 0..dims {
        let q = orthogonal(rng, m);
        let lambda = distinct_speeds(rng, m);
        let s = &q * Mat::from_diagonal(&lambda.clone().into()) * q.transpose();
        flux.push(&w_inv * s * &w);
        vectors.push(&w_inv * q);
        speeds.push(lambda);
    }
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let diffusion = (0..dims)
        .map(|_| {
            if diffusive {
                let rank = rng.int(1, m);
                let b = Mat::from_fn(m, rank, |_, _| rng.normal());
                let k = &b * b.transpose();
                let scale = rng.uniform(0.02, 0.6) * h / k.norm().max(1e-300);
                k * scale
            } else {
                Mat::zeros(m, m)
            }
        })
        .collect();
    let mut sys = System {
        variables: ["a", "b", "c"][..m].iter().map(|s| s.to_string()).collect(),
        scalar_advection: false,
        flux,
        flux_vectors: vectors,
        flux_speeds: speeds,
        diffusion,
        source: Mat::zeros(m, m),
        reference_speed: 0.0,
    };
    sys.reference_speed = reference_speed(&sys.flux);
    sys.source = source(rng, m, sys.reference_speed / h);
    sys
}

/// None (60%), damping, rotation, or weak growth ε I plus rotation.
fn source(rng: &mut Rng, m: usize, rate: f64) -> Mat {
    let n = Mat::from_fn(m, m, |_, _| rng.normal());
    let skew = (&n - n.transpose()) * 0.5;
    match rng.int(0, 9) {
        0..=5 => Mat::zeros(m, m),
        6 => -(&n * n.transpose()) * (rng.uniform(0.01, 0.2) * rate / m as f64),
        7 | 8 => skew * (rng.uniform(0.01, 0.3) * rate),
        _ => {
            Mat::identity(m, m) * (rng.uniform(1e-4, 1e-2) * rate)
                + skew * (rng.uniform(0.0, 0.1) * rate)
        }
    }
}
