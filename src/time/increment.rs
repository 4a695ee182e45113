//! G(θ, Δt) − I of the one-level composite schemes, formed without subtracting
//! the identity: at long wavelengths and small Δt, G is I plus a tiny matrix,
//! and ρ(G) − 1 is only accurate if that matrix is computed directly (its
//! eigenvalues e then give |1 + e| − 1 to the rounding of e itself).
//!
//! * forward–backward: (I − ΔtN)⁻¹(I + Δt(L − N)) − I = (I − ΔtN)⁻¹ ΔtL;
//! * a one-step sub-step R = P/Q: R(Z) − I = Q(Z)⁻¹ (P − Q)(Z), whose constant
//!   term vanishes; products (I + E₁)(I + E₂) − I = E₁ + E₂ + E₁E₂;
//! * IMEX Euler: (I − ΔtL_I)⁻¹ Δt(L_E + L_I);
//! * Lax–Friedrichs: the mean of cos θ_d minus 1 is −(2/d) Σ sin²(θ_d/2);
//! * Lax–Wendroff: the Taylor terms without the leading I.
//! * a filtered step F·(I + E) with F = 1 − s: F(I + E) − I = E − s(I + E), with
//!   the damping s = 1 − F(θ) formed directly by the filter.
//!
//! CNAB2 carries two time levels; its companion matrix is [`cnab2`]. Its
//! eigenvalues are 1 + e with e²x = A₀x + eA₁x, A₀ = P⁻¹ΔtL (small) and
//! A₁ = P⁻¹(−I + 1.5ΔtL) (close to −I), P = I − ½ΔtL_I. The matrix quadratic
//! factors as (eI − (A₁ − S))(eI − S) with S² = A₁S + A₀: eig S are the principal
//! roots, computed to the rounding of S itself, and eig(A₁ − S) the spurious ones
//! near ζ = 0 ([`cnab2_split`]).

use super::composite::{Composite, Imex, Splitting};
use super::{Method, Scheme};
use crate::operator::{Operator, TermKind};
use crate::physics::System;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

fn nan(r: usize, c: usize) -> DMatrix<C64> {
    DMatrix::from_element(r, c, C64::new(f64::NAN, f64::NAN))
}

fn solve(a: DMatrix<C64>, b: &DMatrix<C64>) -> DMatrix<C64> {
    let (r, c) = (b.nrows(), b.ncols());
    a.lu().solve(b).unwrap_or_else(|| nan(r, c))
}

/// Σ_j c_j Z^j by Horner's rule.
fn poly(c: &[f64], z: &DMatrix<C64>) -> DMatrix<C64> {
    let m = z.nrows();
    let id = DMatrix::<C64>::identity(m, m);
    let mut acc = DMatrix::<C64>::zeros(m, m);
    for cj in c.iter().rev() {
        acc = &acc * z + &id * C64::new(*cj, 0.0);
    }
    acc
}

/// R(Z) − I of a one-step method R = P/Q (P(0) = Q(0) = 1).
fn one_step_increment(m: &Method, z: &DMatrix<C64>) -> DMatrix<C64> {
    let Scheme::OneStep(os) = &m.scheme else {
        return nan(z.nrows(), z.ncols());
    };
    let n = os.p.len().max(os.q.len());
    let diff: Vec<f64> = (1..n)
        .map(|j| os.p.get(j).copied().unwrap_or(0.0) - os.q.get(j).copied().unwrap_or(0.0))
        .collect();
    let top = z * poly(&diff, z);
    if os.q.len() == 1 {
        return top / C64::new(os.q[0], 0.0);
    }
    solve(poly(&os.q, z), &top)
}

/// The parts of L(θ) a split step applies one after another: the terms along
/// each axis (sources excluded), then the sources when there are any.
pub fn split_parts(op: &Operator, theta: &[f64]) -> Vec<DMatrix<C64>> {
    let mut parts: Vec<DMatrix<C64>> = (0..op.dims)
        .map(|d| op.part_matrix(theta, |t| t.axis == d && t.kind != TermKind::Source, false))
        .collect();
    let src = op.part_matrix(theta, |t| t.kind == TermKind::Source, true);
    if src.iter().any(|z| z.norm() != 0.0) {
        parts.push(src);
    }
    parts
}

/// G(θ, Δt) − I of a one-level composite scheme (None for CNAB2).
pub fn increment(
    c: &Composite,
    sys: &System,
    op: &Operator,
    h: &[f64],
    theta: &[f64],
    dt: f64,
) -> Option<DMatrix<C64>> {
    let m = op.m;
    let id = DMatrix::<C64>::identity(m, m);
    let dtc = C64::new(dt, 0.0);
    Some(match c {
        Composite::ForwardBackward { rank } => {
            let l = op.symbol_matrix(theta);
            let n = DMatrix::from_fn(m, m, |i, j| {
                if rank[j] < rank[i] {
                    l[(i, j)]
                } else {
                    C64::new(0.0, 0.0)
                }
            });
            solve(&id - &n * dtc, &(&l * dtc))
        }
        Composite::Split { kind, inner } => {
            let parts = split_parts(op, theta);
            let step =
                |p: &DMatrix<C64>, f: f64| one_step_increment(inner, &(p * C64::new(dt * f, 0.0)));
            // (I + E_k)(I + E) − I = E_k + E + E_k E
            let apply = |e: DMatrix<C64>, ek: DMatrix<C64>| &ek + &e + &ek * &e;
            let mut e = DMatrix::<C64>::zeros(m, m);
            let n = parts.len();
            match kind {
                Splitting::Lie => {
                    for p in &parts {
                        e = apply(e, step(p, 1.0));
                    }
                }
                Splitting::Strang => {
                    for p in &parts[..n - 1] {
                        e = apply(e, step(p, 0.5));
                    }
                    e = apply(e, step(&parts[n - 1], 1.0));
                    for p in parts[..n - 1].iter().rev() {
                        e = apply(e, step(p, 0.5));
                    }
                }
            }
            e
        }
        Composite::Imex(Imex::Euler) => {
            let li = op.part_matrix(theta, |t| t.kind == TermKind::Diffusion, false);
            let l = op.symbol_matrix(theta);
            solve(&id - &li * dtc, &(&l * dtc))
        }
        Composite::Imex(Imex::Cnab2) => return None,
        Composite::Filtered { filter, inner } => {
            let e = match inner.composite() {
                Some(ic) => increment(ic, sys, op, h, theta, dt)?,
                None => one_step_increment(inner, &(op.symbol_matrix(theta) * dtc)),
            };
            let s = filter.damping_nd(theta);
            &e - (&id + &e) * C64::new(s, 0.0)
        }
        Composite::LaxWendroff | Composite::LaxFriedrichs => {
            let dims = h.len();
            let a: Vec<DMatrix<C64>> = (0..dims)
                .map(|d| &sys.flux[d] * C64::new(dt / h[d], 0.0))
                .collect();
            let i = C64::new(0.0, 1.0);
            let mut e = if *c == Composite::LaxFriedrichs {
                let drop: f64 = theta.iter().map(|t| (0.5 * t).sin().powi(2)).sum::<f64>();
                &id * C64::new(-2.0 * drop / dims as f64, 0.0)
            } else {
                DMatrix::<C64>::zeros(m, m)
            };
            for d in 0..dims {
                e -= &a[d] * (i * theta[d].sin());
            }
            if *c == Composite::LaxWendroff {
                for d in 0..dims {
                    let s2 = (0.5 * theta[d]).sin().powi(2);
                    e -= &a[d] * &a[d] * C64::new(2.0 * s2, 0.0);
                    for f in 0..dims {
                        if f != d {
                            let w = 0.5 * theta[d].sin() * theta[f].sin();
                            e -= &a[d] * &a[f] * C64::new(w, 0.0);
                        }
                    }
                }
            }
            let rest = op.part_matrix(
                theta,
                |t| {
                    matches!(
                        t.kind,
                        TermKind::Diffusion | TermKind::Source | TermKind::Dissipation
                    )
                },
                true,
            );
            e + rest * dtc
        }
    })
}

/// The 2m×2m companion matrix of IMEX CNAB2: Crank–Nicolson on L_I (diffusion),
/// Adams–Bashforth 2 on L_E (the rest).
pub fn cnab2(op: &Operator, theta: &[f64], dt: f64) -> DMatrix<C64> {
    let m = op.m;
    let id = DMatrix::<C64>::identity(m, m);
    let li = op.part_matrix(theta, |t| t.kind == TermKind::Diffusion, false);
    let le = op.part_matrix(theta, |t| t.kind != TermKind::Diffusion, true);
    let lu = (&id - &li * C64::new(0.5 * dt, 0.0)).lu();
    let b0 = &id + &le * C64::new(1.5 * dt, 0.0) + &li * C64::new(0.5 * dt, 0.0);
    let b1 = &le * C64::new(-0.5 * dt, 0.0);
    let g0 = lu.solve(&b0).unwrap_or_else(|| nan(m, m));
    let g1 = lu.solve(&b1).unwrap_or_else(|| nan(m, m));
    let mut g = DMatrix::<C64>::zeros(2 * m, 2 * m);
    g.view_mut((0, 0), (m, m)).copy_from(&g0);
    g.view_mut((0, m), (m, m)).copy_from(&g1);
    g.view_mut((m, 0), (m, m)).copy_from(&id);
    g
}

/// The solvent S of S² = A₁S + A₀ for CNAB2 (the principal roots are 1 + eig S)
/// and A₁ − S (the spurious roots are 1 + its eigenvalues), by the fixed point
/// S ← A₁⁻¹(S² − A₀) from S = −A₁⁻¹A₀. None when the iteration is not a clear
/// contraction (‖A₁⁻¹‖·‖A₀‖ ≥ 0.1: large Δt), or does not settle to rounding.
pub fn cnab2_split(op: &Operator, theta: &[f64], dt: f64) -> Option<(DMatrix<C64>, DMatrix<C64>)> {
    let m = op.m;
    let id = DMatrix::<C64>::identity(m, m);
    let li = op.part_matrix(theta, |t| t.kind == TermKind::Diffusion, false);
    let l = op.symbol_matrix(theta);
    let p = (&id - &li * C64::new(0.5 * dt, 0.0)).lu();
    let a0 = p.solve(&(&l * C64::new(dt, 0.0)))?;
    let a1 = p.solve(&(&l * C64::new(1.5 * dt, 0.0) - &id))?;
    let a1_inv = a1.clone().try_inverse()?;
    if a1_inv.norm() * a0.norm() >= 0.1 {
        return None;
    }
    let mut s = -(&a1_inv * &a0);
    let mut change = f64::INFINITY;
    for _ in 0..80 {
        let next = &a1_inv * (&s * &s - &a0);
        change = (&next - &s).norm();
        s = next;
        if change <= 4.0 * f64::EPSILON * s.norm() {
            break;
        }
    }
    (change <= 64.0 * f64::EPSILON * s.norm()).then(|| {
        let rest = &a1 - &s;
        (s, rest)
    })
}
