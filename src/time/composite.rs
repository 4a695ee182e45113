//! Composite time schemes, whose amplification matrix is not a function of the
//! eigenvalues of L alone: it is built from pieces of the symbol.
//!
//! * forward–backward: variables are updated in rank order, each using the newest
//!   values of lower-ranked ones: (I − Δt N) u^{n+1} = (I + Δt (L − N)) u^n with N
//!   the part of L coupling a variable to lower-ranked ones. With E first (or H
//!   first) this is the Yee leapfrog; with h first, the forward–backward scheme of
//!   shallow-water models (Mesinger & Arakawa, GARP Publ. 17, 1976).
//! * dimension splitting: L = Σ_k L_k (one part per axis, plus the source); Lie
//!   G = R(ΔtL_n)⋯R(ΔtL_1); Strang G = R(½ΔtL_1)⋯R(ΔtL_n)⋯R(½ΔtL_1), R the
//!   chosen one-step method.
//! * IMEX: diffusion implicit, everything else explicit. IMEX Euler
//!   (I − ΔtL_I)u^{n+1} = (I + ΔtL_E)u^n; CNAB2 (Crank–Nicolson on L_I,
//!   Adams–Bashforth 2 on L_E) through its 2m×2m companion matrix.
//! * two-level fully discrete schemes on the flux matrices A_d (ν_d = Δt/h_d):
//!   Lax–Friedrichs G = (1/d)Σ cos θ_d I − iΣ ν_d A_d sin θ_d, and the unsplit
//!   Lax–Wendroff G = I − iΣ ν_d A_d sin θ_d − 2Σ ν_d² A_d² sin²(θ_d/2)
//!   − ½Σ_{d≠e} ν_d ν_e A_d A_e sin θ_d sin θ_e (the second-order Taylor series in
//!   Δt with central first differences, the three-point second difference and
//!   products of central differences for the cross derivatives). Diffusion and
//!   source terms, if any, are added explicitly (forward Euler) with the case's
//!   second-derivative stencil.

use super::Method;
use crate::operator::{Operator, TermKind};
use crate::physics::System;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Lie or Strang splitting.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Splitting {
    /// First order: one sweep of sub-steps.
    Lie,
    /// Second order: symmetric half steps.
    Strang,
}

/// IMEX pairs.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Imex {
    /// Backward Euler on diffusion, forward Euler on the rest.
    Euler,
    /// Crank–Nicolson on diffusion, Adams–Bashforth 2 on the rest.
    Cnab2,
}

/// A composite scheme.
#[derive(Debug, Clone, PartialEq)]
pub enum Composite {
    /// Partitioned forward–backward stepping; `rank[i]` orders the updates.
    ForwardBackward {
        /// Update rank of each variable (lower first).
        rank: Vec<usize>,
    },
    /// Dimension splitting with a one-step method per sub-step.
    Split {
        /// Lie or Strang.
        kind: Splitting,
        /// The sub-step method.
        inner: Box<Method>,
    },
    /// An IMEX pair.
    Imex(Imex),
    /// Lax–Wendroff.
    LaxWendroff,
    /// Lax–Friedrichs.
    LaxFriedrichs,
}

impl Composite {
    /// Number of time levels the state carries.
    pub fn levels(&self) -> usize {
        match self {
            Composite::Imex(Imex::Cnab2) => 2,
            _ => 1,
        }
    }

    /// Whether diffusion is treated implicitly.
    pub fn description(&self) -> String {
        match self {
            Composite::ForwardBackward { .. } => "forward-backward (partitioned)".into(),
            Composite::Split { kind, inner } => format!(
                "{} dimension splitting of {}",
                if *kind == Splitting::Lie {
                    "Lie"
                } else {
                    "Strang"
                },
                inner.name
            ),
            Composite::Imex(Imex::Euler) => "IMEX Euler (implicit diffusion)".into(),
            Composite::Imex(Imex::Cnab2) => "IMEX Crank-Nicolson/Adams-Bashforth 2".into(),
            Composite::LaxWendroff => "Lax-Wendroff (two-level, unsplit)".into(),
            Composite::LaxFriedrichs => "Lax-Friedrichs (two-level)".into(),
        }
    }
}

fn solve(a: DMatrix<C64>, b: &DMatrix<C64>) -> DMatrix<C64> {
    let n = b.nrows();
    a.lu()
        .solve(b)
        .unwrap_or_else(|| DMatrix::from_element(n, b.ncols(), C64::new(f64::NAN, f64::NAN)))
}

/// G(θ, Δt) of a composite scheme.
pub fn amplification(
    c: &Composite,
    sys: &System,
    op: &Operator,
    h: &[f64],
    theta: &[f64],
    dt: f64,
) -> DMatrix<C64> {
    let m = op.m;
    let id = DMatrix::<C64>::identity(m, m);
    let dtc = C64::new(dt, 0.0);
    match c {
        Composite::ForwardBackward { rank } => {
            let l = op.symbol_matrix(theta);
            let n = DMatrix::from_fn(m, m, |i, j| {
                if rank[j] < rank[i] {
                    l[(i, j)]
                } else {
                    C64::new(0.0, 0.0)
                }
            });
            let rhs = &id + (&l - &n) * dtc;
            solve(&id - &n * dtc, &rhs)
        }
        Composite::Split { kind, inner } => {
            let mut parts: Vec<DMatrix<C64>> = (0..op.dims)
                .map(|d| {
                    op.part_matrix(theta, |t| t.axis == d && t.kind != TermKind::Source, false)
                })
                .collect();
            let src = op.part_matrix(theta, |t| t.kind == TermKind::Source, true);
            if src.iter().any(|z| z.norm() != 0.0) {
                parts.push(src);
            }
            let step =
                |p: &DMatrix<C64>, f: f64| inner.amplification_matrix(&(p * C64::new(dt * f, 0.0)));
            let mut g = id.clone();
            match kind {
                Splitting::Lie => {
                    for p in &parts {
                        g = step(p, 1.0) * g;
                    }
                }
                Splitting::Strang => {
                    let n = parts.len();
                    for p in &parts[..n - 1] {
                        g = step(p, 0.5) * g;
                    }
                    g = step(&parts[n - 1], 1.0) * g;
                    for p in parts[..n - 1].iter().rev() {
                        g = step(p, 0.5) * g;
                    }
                }
            }
            g
        }
        Composite::Imex(kind) => {
            let li = op.part_matrix(theta, |t| t.kind == TermKind::Diffusion, false);
            let le = op.part_matrix(theta, |t| t.kind != TermKind::Diffusion, true);
            match kind {
                Imex::Euler => solve(&id - &li * dtc, &(&id + &le * dtc)),
                Imex::Cnab2 => {
                    let lead = &id - &li * C64::new(0.5 * dt, 0.0);
                    let lu = lead.lu();
                    let b0 = &id + &le * C64::new(1.5 * dt, 0.0) + &li * C64::new(0.5 * dt, 0.0);
                    let b1 = &le * C64::new(-0.5 * dt, 0.0);
                    let nan = || DMatrix::from_element(m, m, C64::new(f64::NAN, f64::NAN));
                    let g0 = lu.solve(&b0).unwrap_or_else(nan);
                    let g1 = lu.solve(&b1).unwrap_or_else(nan);
                    let mut g = DMatrix::<C64>::zeros(2 * m, 2 * m);
                    g.view_mut((0, 0), (m, m)).copy_from(&g0);
                    g.view_mut((0, m), (m, m)).copy_from(&g1);
                    g.view_mut((m, 0), (m, m)).copy_from(&id);
                    g
                }
            }
        }
        Composite::LaxWendroff | Composite::LaxFriedrichs => {
            let dims = h.len();
            let a: Vec<DMatrix<C64>> = (0..dims)
                .map(|d| &sys.flux[d] * C64::new(dt / h[d], 0.0))
                .collect();
            let i = C64::new(0.0, 1.0);
            let mut g = if *c == Composite::LaxFriedrichs {
                let mean: f64 = theta.iter().map(|t| t.cos()).sum::<f64>() / dims as f64;
                &id * C64::new(mean, 0.0)
            } else {
                id.clone()
            };
            for d in 0..dims {
                g -= &a[d] * (i * theta[d].sin());
            }
            if *c == Composite::LaxWendroff {
                for d in 0..dims {
                    let s2 = (0.5 * theta[d]).sin().powi(2);
                    g -= &a[d] * &a[d] * C64::new(2.0 * s2, 0.0);
                    for e in 0..dims {
                        if e != d {
                            let f = 0.5 * theta[d].sin() * theta[e].sin();
                            g -= &a[d] * &a[e] * C64::new(f, 0.0);
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
            g + rest * dtc
        }
    }
}
