//! D = G − I formed without adding I, for every scheme whose G is close to I at
//! long waves (one-step methods, forward–backward, IMEX Euler, Lax–Wendroff,
//! Lax–Friedrichs, splitting). Then ρ(G) − 1 = max over eigenvalues λ of D of
//! (2 Re λ + |λ|²)/(1 + |1 + λ|) loses nothing to the rounding of 1 + small, so
//! long-wave crossings, where ρ − 1 is of order |θ|², stay measurable.
//! Multistep companion matrices and CNAB2 have no such form (None).

use crate::scheme::{CMat, Method, Scheme};
use crate::symbol::Parts;
use num_complex::Complex64 as C64;

fn c(x: f64) -> C64 {
    C64::new(x, 0.0)
}

/// a⁻¹ b, or None when a is singular.
fn solve(a: CMat, b: &CMat) -> Option<CMat> {
    a.lu().solve(b)
}

/// D of a one-step method for Z = Δt·L.
pub fn one_step(method: &Method, z: &CMat) -> Option<CMat> {
    let m = z.nrows();
    let id = CMat::identity(m, m);
    match method {
        Method::Polynomial { coeffs, .. } => {
            // Σ_{k≥1} c_k Z^k = Z (c_1 + c_2 Z + …)
            let inner = coeffs[1..]
                .iter()
                .rev()
                .fold(CMat::zeros(m, m), |acc, k| acc * z + &id * c(*k));
            Some(z * inner)
        }
        Method::Theta { theta, .. } => solve(&id - z * c(*theta), z),
        Method::Tableau { a, b } => {
            let mut k: Vec<CMat> = Vec::new();
            for row in a {
                let mut arg = id.clone();
                for (kj, aij) in k.iter().zip(row) {
                    arg += kj * c(*aij);
                }
                k.push(z * arg);
            }
            Some(
                k.iter()
                    .zip(b)
                    .fold(CMat::zeros(m, m), |d, (ki, bi)| d + ki * c(*bi)),
            )
        }
        _ => None,
    }
}

fn lax(s: &Scheme, p: &Parts, theta: &[f64], dt: f64, wendroff: bool) -> CMat {
    let m = s.system.size();
    let dims = s.dims();
    let a: Vec<CMat> = (0..dims)
        .map(|d| s.system.flux[d].map(|x| c(x * dt / s.spacing[d])))
        .collect();
    let i = C64::new(0.0, 1.0);
    let mut d_mat = if wendroff {
        CMat::zeros(m, m)
    } else {
        // (1/d)Σ cos θ_d − 1 = −(2/d)Σ sin²(θ_d/2)
        let mean_minus_one =
            -2.0 * theta.iter().map(|t| (0.5 * t).sin().powi(2)).sum::<f64>() / dims as f64;
        CMat::identity(m, m) * c(mean_minus_one)
    };
    for d in 0..dims {
        d_mat -= &a[d] * (i * theta[d].sin());
        if wendroff {
            d_mat -= &a[d] * &a[d] * c(2.0 * (0.5 * theta[d]).sin().powi(2));
            for e in (0..dims).filter(|e| *e != d) {
                d_mat -= &a[d] * &a[e] * c(0.5 * theta[d].sin() * theta[e].sin());
            }
        }
    }
    d_mat + p.non_flux_part() * c(dt)
}

/// G − I of the scheme, when it has a near-identity form.
pub fn delta(s: &Scheme, p: &Parts, theta: &[f64], dt: f64) -> Option<CMat> {
    let m = s.system.size();
    let id = CMat::identity(m, m);
    match &s.method {
        Method::Polynomial { .. } | Method::Theta { .. } | Method::Tableau { .. } => {
            one_step(&s.method, &(p.total() * c(dt)))
        }
        Method::ForwardBackward { first } => {
            let l = p.total();
            let n = CMat::from_fn(m, m, |i, j| {
                if first.contains(&j) && !first.contains(&i) {
                    l[(i, j)]
                } else {
                    c(0.0)
                }
            });
            solve(&id - &n * c(dt), &(l * c(dt)))
        }
        Method::ImexEuler => solve(&id - p.diffusion_part() * c(dt), &(p.total() * c(dt))),
        Method::LaxWendroff => Some(lax(s, p, theta, dt, true)),
        Method::LaxFriedrichs => Some(lax(s, p, theta, dt, false)),
        Method::Split { strang, inner } => {
            let mut pieces: Vec<CMat> = (0..s.dims()).map(|d| p.axis_part(d)).collect();
            if p.source.iter().any(|x| x.norm() != 0.0) {
                pieces.push(p.source.clone());
            }
            let step = |q: &CMat, f: f64| one_step(inner, &(q * c(f * dt)));
            // (I + D_q)(I + D) − I = D_q + D + D_q D
            let compose = |d: CMat, dq: CMat| &dq + &d + &dq * &d;
            let n = pieces.len();
            let order: Vec<(usize, f64)> = if *strang {
                let half = (0..n - 1).map(|k| (k, 0.5));
                half.clone()
                    .chain(std::iter::once((n - 1, 1.0)))
                    .chain(half.rev())
                    .collect()
            } else {
                (0..n).map(|k| (k, 1.0)).collect()
            };
            order.into_iter().try_fold(CMat::zeros(m, m), |d, (k, f)| {
                Some(compose(d, step(&pieces[k], f)?))
            })
        }
        Method::Multistep { .. } | Method::ImexCnab2 => None,
    }
}
