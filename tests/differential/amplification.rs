//! The amplification matrix G(θ, Δt) built directly as a matrix from the pieces
//! of L(θ): Runge–Kutta polynomials and Butcher stages, θ-method solves, the
//! multistep block companion matrix, forward–backward, Lie/Strang splitting,
//! IMEX Euler and CNAB2, Lax–Wendroff and Lax–Friedrichs.

use crate::scheme::{CMat, Method, Scheme};
use crate::symbol::Parts;
use num_complex::Complex64 as C64;

fn c(x: f64) -> C64 {
    C64::new(x, 0.0)
}

fn nan(n: usize) -> CMat {
    CMat::from_element(n, n, C64::new(f64::NAN, f64::NAN))
}

/// a⁻¹ b, or NaN entries when a is singular.
fn solve(a: CMat, b: &CMat) -> CMat {
    a.lu().solve(b).unwrap_or_else(|| nan(b.nrows()))
}

/// G of a one-step method for Z = Δt·L.
pub fn one_step(method: &Method, z: &CMat) -> CMat {
    let m = z.nrows();
    let id = CMat::identity(m, m);
    match method {
        Method::Polynomial { coeffs, .. } => coeffs
            .iter()
            .rev()
            .fold(CMat::zeros(m, m), |acc, k| acc * z + &id * c(*k)),
        Method::Theta { theta, .. } => solve(&id - z * c(*theta), &(&id + z * c(1.0 - theta))),
        Method::Tableau { a, b } => {
            // stage increments K_i = Z (I + Σ_{j<i} a_ij K_j), G = I + Σ b_i K_i
            let mut k: Vec<CMat> = Vec::new();
            for row in a {
                let mut arg = id.clone();
                for (kj, aij) in k.iter().zip(row) {
                    arg += kj * c(*aij);
                }
                k.push(z * arg);
            }
            k.iter()
                .zip(b)
                .fold(id.clone(), |g, (ki, bi)| g + ki * c(*bi))
        }
        _ => nan(m),
    }
}

/// Block companion matrix of Σ_j (α_j I − β_j Z) u^{n+j} = 0.
fn multistep(alpha: &[f64], beta: &[f64], z: &CMat) -> CMat {
    let m = z.nrows();
    let s = alpha.len() - 1;
    let id = CMat::identity(m, m);
    let lead = &id * c(alpha[s]) - z * c(beta[s]);
    let mut g = CMat::zeros(m * s, m * s);
    for col in 0..s {
        let j = s - 1 - col;
        let rhs = z * c(beta[j]) - &id * c(alpha[j]);
        g.view_mut((0, col * m), (m, m))
            .copy_from(&solve(lead.clone(), &rhs));
    }
    for r in 1..s {
        g.view_mut((r * m, (r - 1) * m), (m, m)).copy_from(&id);
    }
    g
}

fn lax(s: &Scheme, p: &Parts, theta: &[f64], dt: f64, wendroff: bool) -> CMat {
    let m = s.system.size();
    let dims = s.dims();
    let id = CMat::identity(m, m);
    let a: Vec<CMat> = (0..dims)
        .map(|d| s.system.flux[d].map(|x| c(x * dt / s.spacing[d])))
        .collect();
    let i = C64::new(0.0, 1.0);
    let mut g = if wendroff {
        id.clone()
    } else {
        &id * c(theta.iter().map(|t| t.cos()).sum::<f64>() / dims as f64)
    };
    for d in 0..dims {
        g -= &a[d] * (i * theta[d].sin());
        if wendroff {
            g -= &a[d] * &a[d] * c(2.0 * (0.5 * theta[d]).sin().powi(2));
            for e in (0..dims).filter(|e| *e != d) {
                g -= &a[d] * &a[e] * c(0.5 * theta[d].sin() * theta[e].sin());
            }
        }
    }
    g + p.non_flux_part() * c(dt)
}

/// G(θ, Δt) of the scheme, with the pieces of L(θ) already assembled.
pub fn amplification(s: &Scheme, p: &Parts, theta: &[f64], dt: f64) -> CMat {
    let m = s.system.size();
    let id = CMat::identity(m, m);
    match &s.method {
        Method::Polynomial { .. } | Method::Theta { .. } | Method::Tableau { .. } => {
            one_step(&s.method, &(p.total() * c(dt)))
        }
        Method::Multistep { alpha, beta, .. } => multistep(alpha, beta, &(p.total() * c(dt))),
        Method::ForwardBackward { first } => {
            let l = p.total();
            let n = CMat::from_fn(m, m, |i, j| {
                if first.contains(&j) && !first.contains(&i) {
                    l[(i, j)]
                } else {
                    c(0.0)
                }
            });
            solve(&id - &n * c(dt), &(&id + (&l - &n) * c(dt)))
        }
        Method::ImexEuler => solve(
            &id - p.diffusion_part() * c(dt),
            &(&id + p.explicit_part() * c(dt)),
        ),
        Method::ImexCnab2 => {
            let li = p.diffusion_part();
            let le = p.explicit_part();
            let lead = &id - &li * c(0.5 * dt);
            let g0 = solve(lead.clone(), &(&id + &le * c(1.5 * dt) + &li * c(0.5 * dt)));
            let g1 = solve(lead, &(&le * c(-0.5 * dt)));
            let mut g = CMat::zeros(2 * m, 2 * m);
            g.view_mut((0, 0), (m, m)).copy_from(&g0);
            g.view_mut((0, m), (m, m)).copy_from(&g1);
            g.view_mut((m, 0), (m, m)).copy_from(&id);
            g
        }
        Method::LaxWendroff => lax(s, p, theta, dt, true),
        Method::LaxFriedrichs => lax(s, p, theta, dt, false),
        Method::Split { strang, inner } => {
            let mut pieces: Vec<CMat> = (0..s.dims()).map(|d| p.axis_part(d)).collect();
            if p.source.iter().any(|x| x.norm() != 0.0) {
                pieces.push(p.source.clone());
            }
            let step = |q: &CMat, f: f64| one_step(inner, &(q * c(f * dt)));
            let n = pieces.len();
            if !*strang {
                return pieces.iter().fold(id, |g, q| step(q, 1.0) * g);
            }
            let half = pieces[..n - 1].iter().fold(id, |g, q| step(q, 0.5) * g);
            let mid = step(&pieces[n - 1], 1.0) * half;
            pieces[..n - 1]
                .iter()
                .rev()
                .fold(mid, |g, q| step(q, 0.5) * g)
        }
    }
}
