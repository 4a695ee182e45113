//! The built-in time methods, one entry each, and methods built from a Butcher
//! tableau or a θ parameter.
//!
//! Stability functions of the explicit Runge–Kutta methods are the truncated
//! exponential series (Hairer & Wanner, Solving ODEs II); SSP RK3 is the method of
//! Gottlieb & Shu, Math. Comp. 67 (1998). Multistep coefficients are the textbook
//! Adams–Bashforth, leapfrog (explicit midpoint) and BDF2 ones (common practice).
//! The optimised and low-storage presets (`lsrk3`, `lsrk54`, `lddrk-hhm`,
//! `lddrk-bb`, `ssprk104`) are built from their published coefficients in
//! [`super::presets`].

use super::{Method, Multistep, OneStep, Scheme};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Why a method could not be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum MethodError {
    /// A Butcher tableau with inconsistent shapes or values.
    #[error("{0}")]
    Tableau(String),
    /// θ outside [0, 1].
    #[error("theta must lie in [0, 1], got {0}")]
    Theta(f64),
    /// Newmark β negative.
    #[error("beta must be at least 0 (0 is the explicit central-difference member), got {0}")]
    NewmarkBeta(f64),
    /// Newmark γ below 1/2.
    #[error("gamma must be at least 1/2, got {0}: below 1/2 the numerical damping is negative and every mode grows, whatever dt")]
    NewmarkGamma(f64),
}

/// Names accepted by [`builtin`], the parametrised `theta` and `tableau`, and
/// `low-storage` (a 2N scheme, which the case reader turns into its tableau).
pub fn method_names() -> Vec<&'static str> {
    vec![
        "euler",
        "heun",
        "ssprk3",
        "rk4",
        "lsrk3",
        "lsrk54",
        "lddrk-hhm",
        "lddrk-bb",
        "ssprk104",
        "backward-euler",
        "crank-nicolson",
        "theta",
        "tableau",
        "low-storage",
        "ab2",
        "ab3",
        "leapfrog",
        "bdf2",
    ]
}

fn one(name: &str, order: u32, explicit: bool, p: &[f64], q: &[f64]) -> Method {
    Method {
        name: name.into(),
        order,
        explicit,
        scheme: Scheme::OneStep(OneStep {
            p: p.to_vec(),
            q: q.to_vec(),
        }),
    }
}

fn multi(name: &str, order: u32, alpha: &[f64], beta: &[f64]) -> Method {
    Method {
        name: name.into(),
        order,
        explicit: beta[beta.len() - 1] == 0.0,
        scheme: Scheme::Multistep(Multistep {
            alpha: alpha.to_vec(),
            beta: beta.to_vec(),
        }),
    }
}

/// Stages of the built-in explicit Runge–Kutta methods (evaluations of the
/// right-hand side per step); `None` for the others.
pub fn stages(name: &str) -> Option<usize> {
    match name {
        "euler" => Some(1),
        "heun" => Some(2),
        "ssprk3" => Some(3),
        "rk4" => Some(4),
        n => super::presets::published(n).map(|p| p.stages),
    }
}

/// A built-in method without parameters.
pub fn builtin(name: &str) -> Option<Method> {
    if let Some(m) = super::presets::method(name) {
        return Some(m);
    }
    Some(match name {
        "euler" => one(name, 1, true, &[1.0, 1.0], &[1.0]),
        "heun" => one(name, 2, true, &[1.0, 1.0, 0.5], &[1.0]),
        "ssprk3" => one(name, 3, true, &[1.0, 1.0, 0.5, 1.0 / 6.0], &[1.0]),
        "rk4" => one(
            name,
            4,
            true,
            &[1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0],
            &[1.0],
        ),
        "backward-euler" => one(name, 1, false, &[1.0], &[1.0, -1.0]),
        "crank-nicolson" => one(name, 2, false, &[1.0, 0.5], &[1.0, -0.5]),
        "ab2" => multi(name, 2, &[0.0, -1.0, 1.0], &[-0.5, 1.5, 0.0]),
        "ab3" => multi(
            name,
            3,
            &[0.0, 0.0, -1.0, 1.0],
            &[5.0 / 12.0, -16.0 / 12.0, 23.0 / 12.0, 0.0],
        ),
        "leapfrog" => multi(name, 2, &[-1.0, 0.0, 1.0], &[0.0, 2.0, 0.0]),
        "bdf2" => multi(
            name,
            2,
            &[1.0 / 3.0, -4.0 / 3.0, 1.0],
            &[0.0, 0.0, 2.0 / 3.0],
        ),
        _ => return None,
    })
}

/// The θ-method u^{n+1} = u^n + Δt[(1−θ) f^n + θ f^{n+1}].
pub fn theta(th: f64) -> Result<Method, MethodError> {
    if !(0.0..=1.0).contains(&th) || !th.is_finite() {
        return Err(MethodError::Theta(th));
    }
    let order = if (th - 0.5).abs() < 1e-15 { 2 } else { 1 };
    Ok(one(
        "theta",
        order,
        th == 0.0,
        &[1.0, 1.0 - th],
        &[1.0, -th],
    ))
}

/// A Runge–Kutta method from its Butcher tableau (explicit or implicit).
///
/// R(z) = det(I − zA + z 1bᵀ)/det(I − zA); both determinants are polynomials of
/// degree ≤ s, recovered exactly from their values at the (s+1)-th roots of unity.
pub fn tableau(a: &[Vec<f64>], b: &[f64]) -> Result<Method, MethodError> {
    let s = b.len();
    if s == 0 || a.len() != s || a.iter().any(|row| row.len() != s) {
        return Err(MethodError::Tableau(format!(
            "the tableau needs a square s×s matrix a and s weights b; got {} rows and {} weights",
            a.len(),
            s
        )));
    }
    if a.iter().flatten().chain(b).any(|x| !x.is_finite()) {
        return Err(MethodError::Tableau(
            "tableau entries must be finite".into(),
        ));
    }
    let sum_b: f64 = b.iter().sum();
    if (sum_b - 1.0).abs() > 1e-10 {
        return Err(MethodError::Tableau(format!(
            "the weights b must sum to 1 for consistency; they sum to {sum_b}"
        )));
    }
    let explicit = (0..s).all(|i| (i..s).all(|j| a[i][j] == 0.0));
    if explicit {
        let p = explicit_polynomial(a, b);
        let order = linear_order(&p, &[1.0]);
        return Ok(one("tableau", order, true, &p, &[1.0]));
    }
    let am = DMatrix::from_fn(s, s, |i, j| C64::new(a[i][j], 0.0));
    let ones_bt = DMatrix::from_fn(s, s, |_, j| C64::new(b[j], 0.0));
    let id = DMatrix::<C64>::identity(s, s);
    let n = s + 1;
    let nodes: Vec<C64> = (0..n)
        .map(|k| C64::from_polar(1.0, std::f64::consts::TAU * k as f64 / n as f64))
        .collect();
    let coeffs = |f: &dyn Fn(C64) -> C64| -> Vec<f64> {
        let vals: Vec<C64> = nodes.iter().map(|z| f(*z)).collect();
        // the interpolation's rounding is relative to the largest value on the
        // circle: a coefficient below it is noise, and kept it would raise the
        // degree (spurious huge roots, and a companion matrix of the full
        // degree at every exit computation)
        let noise = vals.iter().fold(0.0_f64, |m, v| m.max(v.norm())) * 1e-13;
        (0..n)
            .map(|j| {
                let c: C64 = vals
                    .iter()
                    .zip(&nodes)
                    .map(|(v, z)| v * z.powi(-(j as i32)))
                    .sum();
                let c = c / n as f64;
                if c.re.abs() < noise.max(1e-14) {
                    0.0
                } else {
                    c.re
                }
            })
            .collect()
    };
    let q = coeffs(&|z| (&id - &am * z).determinant());
    let p = coeffs(&|z| (&id - &am * z + &ones_bt * z).determinant());
    let q = trim_real(q);
    let p = trim_real(p);
    let order = linear_order(&p, &q);
    Ok(one("tableau", order, explicit, &p, &q))
}

/// R(z) = 1 + Σ_k z^k bᵀA^{k−1}1 of an explicit tableau (A nilpotent, so the
/// series ends at k = s). Exact sums of products: the interpolation used for
/// implicit tableaux loses the small high-degree coefficients of many-stage
/// methods to rounding (1e-15 absolute on 4e-9 for ten stages), which moves
/// real-axis limits near |z| = 14 in the fifth digit.
fn explicit_polynomial(a: &[Vec<f64>], b: &[f64]) -> Vec<f64> {
    let s = b.len();
    let mut p = vec![1.0];
    let mut v = vec![1.0; s];
    for _ in 0..s {
        p.push(b.iter().zip(&v).map(|(x, y)| x * y).sum());
        v = a
            .iter()
            .map(|row| row.iter().zip(&v).map(|(x, y)| x * y).sum())
            .collect();
    }
    trim_real(p)
}

fn trim_real(mut c: Vec<f64>) -> Vec<f64> {
    while c.len() > 1 && c[c.len() - 1] == 0.0 {
        c.pop();
    }
    c
}

/// Largest p with R(z) − e^z = O(z^{p+1}), from the power series of P/Q.
fn linear_order(p: &[f64], q: &[f64]) -> u32 {
    let n = 12;
    let at = |c: &[f64], i: usize| c.get(i).copied().unwrap_or(0.0);
    let mut r = vec![0.0; n];
    for i in 0..n {
        let mut v = at(p, i);
        for j in 1..=i {
            v -= at(q, j) * r[i - j];
        }
        r[i] = v / q[0];
    }
    let mut fact = 1.0;
    for (i, ri) in r.iter().enumerate() {
        if i > 0 {
            fact *= i as f64;
        }
        if (ri - 1.0 / fact).abs() > 1e-10 / fact.min(1e6) {
            return i.saturating_sub(1) as u32;
        }
    }
    (n - 1) as u32
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn classical_rk4_tableau_reproduces_its_stability_function() {
        let a = vec![
            vec![0.0, 0.0, 0.0, 0.0],
            vec![0.5, 0.0, 0.0, 0.0],
            vec![0.0, 0.5, 0.0, 0.0],
            vec![0.0, 0.0, 1.0, 0.0],
        ];
        let m = tableau(&a, &[1.0 / 6.0, 1.0 / 3.0, 1.0 / 3.0, 1.0 / 6.0]).unwrap();
        let Scheme::OneStep(os) = &m.scheme else {
            panic!()
        };
        let want = [1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0];
        for (g, w) in os.p.iter().zip(want) {
            assert!((g - w).abs() < 1e-13);
        }
        assert_eq!(os.q, vec![1.0]);
        assert_eq!(m.order, 4);
        assert!(m.explicit);
    }

    #[test]
    fn implicit_midpoint_tableau_is_crank_nicolson() {
        let m = tableau(&[vec![0.5]], &[1.0]).unwrap();
        let Scheme::OneStep(os) = &m.scheme else {
            panic!()
        };
        assert!((os.p[1] - 0.5).abs() < 1e-14 && (os.q[1] + 0.5).abs() < 1e-14);
        assert_eq!(m.order, 2);
    }
}
