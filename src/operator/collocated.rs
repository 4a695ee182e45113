//! Assembly of L(θ) on a collocated grid: one term per flux, diffusion and
//! dissipation part and axis; a biased stencil splits its flux matrix into
//! right- and left-going parts (characteristic or Rusanov) and applies its mirror
//! image to the left-going one.

use super::{flat, Factor, Operator, OperatorError, Space, Term, TermKind, Upwind, AXIS};
use crate::physics::System;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// L(θ) of `sys` on a collocated grid of spacings `h`.
pub(super) fn assemble(
    sys: &System,
    h: &[f64],
    space: &Space,
    real_coefficients: bool,
) -> Result<Operator, OperatorError> {
    let m = sys.size();
    let mut terms = Vec::new();
    let mut push = |kind, axis: usize, a: DMatrix<C64>, factor: Factor, label: String| {
        if a.iter().any(|z| z.norm() != 0.0) {
            terms.push(Term {
                kind,
                axis,
                matrix: flat(&a),
                factors: vec![(axis, factor)],
                label,
            });
        }
    };
    for (d, &hd) in h.iter().enumerate() {
        let a = &sys.flux[d];
        let st = &space.first[d];
        let scale = -1.0 / hd;
        let x = AXIS[d];
        if st.is_central() {
            let f = Factor::Stencil {
                stencil: st.clone(),
                scale,
            };
            push(
                TermKind::Flux,
                d,
                a.clone(),
                f,
                format!("-A_{x} d/d{x} ({})", st.name),
            );
        } else {
            let (ap, am) =
                split_flux(a, space.upwind).ok_or(OperatorError::NotDiagonalisable { axis: d })?;
            let f = Factor::Stencil {
                stencil: st.clone(),
                scale,
            };
            push(
                TermKind::Flux,
                d,
                ap,
                f,
                format!("-A+_{x} d/d{x} ({})", st.name),
            );
            let mir = st.mirror();
            let label = format!("-A-_{x} d/d{x} ({})", mir.name);
            let f = Factor::Stencil {
                stencil: mir,
                scale,
            };
            push(TermKind::Flux, d, am, f, label);
        }
        let st2 = &space.second[d];
        let f = Factor::Stencil {
            stencil: st2.clone(),
            scale: 1.0 / (hd * hd),
        };
        let label = format!("K_{x} d2/d{x}2 ({})", st2.name);
        push(TermKind::Diffusion, d, sys.diffusion[d].clone(), f, label);
        if let Some(dis) = space.dissipation {
            let f = Factor::Dissipation {
                coeff: dis.strength * sys.reference_speed / hd,
                order: dis.order,
            };
            let label = format!("-sigma s/h_{x} sin^{}(theta_{x}/2) I", dis.order);
            push(TermKind::Dissipation, d, DMatrix::identity(m, m), f, label);
        }
    }
    Ok(Operator {
        m,
        dims: h.len(),
        constant: flat(&sys.source),
        terms,
        real_coefficients,
        term_classes: Default::default(),
    })
}

/// Splits a flux matrix into right- and left-going parts.
fn split_flux(a: &DMatrix<C64>, how: Upwind) -> Option<(DMatrix<C64>, DMatrix<C64>)> {
    let m = a.nrows();
    let half = C64::new(0.5, 0.0);
    let abs_a = match how {
        Upwind::Rusanov => {
            let rho = crate::linalg::spectral_radius(&flat(a), m).ok()?;
            DMatrix::identity(m, m) * C64::new(rho, 0.0)
        }
        Upwind::Characteristic => {
            let cluster = 1e-9 * a.norm().max(1e-300);
            crate::linalg::diagonalisable_function(
                a,
                cluster,
                |l| if l.re >= 0.0 { l } else { -l },
            )?
        }
    };
    Some(((a + &abs_a) * half, (a - &abs_a) * half))
}
