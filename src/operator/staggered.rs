//! Assembly of L(θ) on a staggered arrangement (A–E grids, the Yee cell): entry
//! by entry, each coupling with the staggered or ordinary difference its two
//! variables' offsets call for and two-point averages across the other axes;
//! entries sharing the same factors are grouped into one term.

use super::{Factor, Operator, OperatorError, Space, Term, TermKind, AXIS};
use crate::physics::System;
use crate::stencil::Stencil;
use num_complex::Complex64 as C64;

/// The staggered counterpart of a central stencil (offsets ±½, ±3⁄2, …).
fn staggered(st: &Stencil) -> Option<Stencil> {
    let (o, w): (Vec<f64>, Vec<f64>) = match st.name.as_str() {
        "central2" => (vec![-0.5, 0.5], vec![-1.0, 1.0]),
        "central4" => (
            vec![-1.5, -0.5, 0.5, 1.5],
            vec![1.0 / 24.0, -9.0 / 8.0, 9.0 / 8.0, -1.0 / 24.0],
        ),
        _ => return None,
    };
    let mut s = Stencil::new(&format!("{}-staggered", st.name), 1, o, w, None).ok()?;
    s.name = format!("{} (staggered)", st.name);
    Some(s)
}

fn is_half(x: f64) -> bool {
    ((x.rem_euclid(1.0)) - 0.5).abs() < 1e-12
}

/// L(θ) of `sys` on the staggered arrangement of `space`.
pub(super) fn assemble(
    sys: &System,
    h: &[f64],
    space: &Space,
    real_coefficients: bool,
) -> Result<Operator, OperatorError> {
    let m = sys.size();
    let dims = h.len();
    let loc = &space.locations;
    let mut groups: Vec<(String, Term)> = Vec::new();
    let mut add = |key: String,
                   kind,
                   axis,
                   i: usize,
                   j: usize,
                   v: C64,
                   factors: Vec<(usize, Factor)>,
                   label: String| {
        if v.norm() == 0.0 {
            return;
        }
        if let Some((_, t)) = groups.iter_mut().find(|(k, _)| *k == key) {
            t.matrix[i * m + j] += v;
        } else {
            let mut matrix = vec![C64::new(0.0, 0.0); m * m];
            matrix[i * m + j] = v;
            groups.push((
                key,
                Term {
                    kind,
                    axis,
                    matrix,
                    factors,
                    label,
                },
            ));
        }
    };
    let averages = |i: usize, j: usize, skip: Option<usize>| -> (Vec<(usize, Factor)>, String) {
        let mut f = Vec::new();
        let mut tag = String::new();
        for e in 0..dims {
            if Some(e) != skip && is_half(loc[j][e] - loc[i][e]) {
                f.push((e, Factor::Average));
                tag.push_str(&format!(" avg_{}", AXIS[e]));
            }
        }
        (f, tag)
    };
    for (d, &hd) in h.iter().enumerate() {
        let st = &space.first[d];
        let st_half = staggered(st);
        for i in 0..m {
            for j in 0..m {
                let v = sys.flux[d][(i, j)];
                if v.norm() == 0.0 {
                    continue;
                }
                let half = is_half(loc[j][d] - loc[i][d]);
                let stencil = if half {
                    let fits = st.offsets.iter().all(|o| is_half(*o));
                    match (&st_half, fits) {
                        (_, true) => st.clone(),
                        (Some(s), false) => s.clone(),
                        (None, false) => {
                            return Err(OperatorError::Staggering {
                                stencil: st.name.clone(),
                                axis: d,
                                shift: "half a",
                                arrangement: space.arrangement.name().to_string(),
                                need: "half-integers (use central2 or central4, or a user stencil with offsets such as [-0.5, 0.5])",
                            })
                        }
                    }
                } else {
                    if st.offsets.iter().any(|o| is_half(*o)) || !st.is_central() {
                        return Err(OperatorError::Staggering {
                            stencil: st.name.clone(),
                            axis: d,
                            shift: "no",
                            arrangement: space.arrangement.name().to_string(),
                            need: "integers and central (biased stencils need a collocated arrangement)",
                        });
                    }
                    st.clone()
                };
                let (mut factors, tag) = averages(i, j, Some(d));
                let label = format!("-A_{x} d/d{x} ({}){tag}", stencil.name, x = AXIS[d]);
                let key = format!("flux{d}{half}{tag}");
                factors.insert(
                    0,
                    (
                        d,
                        Factor::Stencil {
                            stencil,
                            scale: -1.0 / hd,
                        },
                    ),
                );
                add(key, TermKind::Flux, d, i, j, v, factors, label);
            }
        }
        let st2 = &space.second[d];
        for i in 0..m {
            for j in 0..m {
                let v = sys.diffusion[d][(i, j)];
                let (mut factors, tag) = averages(i, j, None);
                factors.insert(
                    0,
                    (
                        d,
                        Factor::Stencil {
                            stencil: st2.clone(),
                            scale: 1.0 / (hd * hd),
                        },
                    ),
                );
                let label = format!("K_{x} d2/d{x}2 ({}){tag}", st2.name, x = AXIS[d]);
                add(
                    format!("diff{d}{tag}"),
                    TermKind::Diffusion,
                    d,
                    i,
                    j,
                    v,
                    factors,
                    label,
                );
            }
        }
        if let Some(dis) = space.dissipation {
            for i in 0..m {
                let f = Factor::Dissipation {
                    coeff: dis.strength * sys.reference_speed / hd,
                    order: dis.order,
                };
                let label = format!(
                    "-sigma s/h_{x} sin^{}(theta_{x}/2) I",
                    dis.order,
                    x = AXIS[d]
                );
                add(
                    format!("dis{d}"),
                    TermKind::Dissipation,
                    d,
                    i,
                    i,
                    C64::new(1.0, 0.0),
                    vec![(d, f)],
                    label,
                );
            }
        }
    }
    let mut constant = vec![C64::new(0.0, 0.0); m * m];
    for i in 0..m {
        for j in 0..m {
            let v = sys.source[(i, j)];
            let (factors, tag) = averages(i, j, None);
            if factors.is_empty() {
                constant[i * m + j] = v;
            } else {
                add(
                    format!("src{tag}"),
                    TermKind::Source,
                    0,
                    i,
                    j,
                    v,
                    factors,
                    format!("S{tag}"),
                );
            }
        }
    }
    Ok(Operator {
        m,
        dims,
        constant,
        terms: groups.into_iter().map(|(_, t)| t).collect(),
        real_coefficients,
        term_classes: Default::default(),
    })
}
