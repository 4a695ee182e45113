//! The spatial scheme from names: first- and second-derivative stencils per axis
//! (built-in or the user's own), upwinding, dissipation and the grid arrangement
//! with each variable's offset in the cell.

use super::spec::{StencilChoice, UserStencil};
use crate::error::InputError;
use crate::operator::{Arrangement, Dissipation, Space, Upwind};
use crate::physics::{ModelKind, System};
use crate::stencil::{catalogue, Stencil};
use std::collections::BTreeMap;

/// The user's stencils by name, each checked (consistency, order, a compact
/// left-hand side that does not vanish).
pub(super) fn user_stencils(
    specs: &BTreeMap<String, UserStencil>,
) -> Result<BTreeMap<String, Stencil>, InputError> {
    let mut out = BTreeMap::new();
    for (name, r) in specs {
        let key = format!("space.stencils.{name}");
        if !(1..=2).contains(&r.derivative) {
            return Err(InputError::new(
                format!("{key}.derivative"),
                "must be 1 or 2",
            ));
        }
        let st = Stencil::new(
            name,
            r.derivative as u32,
            r.offsets.clone(),
            r.weights.clone(),
            r.implicit.clone(),
        )
        .map_err(|e| InputError::new(&key, e.to_string()))?;
        out.insert(name.clone(), st);
    }
    Ok(out)
}

/// The stencils of one key (`space.first` or `space.second`), one per axis.
pub(super) fn stencils(
    key: &str,
    choice: &StencilChoice,
    derivative: u32,
    dims: usize,
    user: &BTreeMap<String, Stencil>,
) -> Result<Vec<Stencil>, InputError> {
    let names = match choice {
        StencilChoice::Default => vec!["central2".to_string(); dims],
        StencilChoice::One(n) => vec![n.clone(); dims],
        StencilChoice::PerAxis(v) if v.len() == dims => v.clone(),
        StencilChoice::PerAxis(v) => {
            return Err(InputError::new(
                key,
                format!(
                    "needs one stencil name or one per axis ({dims}), got {}",
                    v.len()
                ),
            ))
        }
    };
    names
        .iter()
        .enumerate()
        .map(|(d, n)| {
            if let Some(st) = user.get(n) {
                if st.derivative != derivative {
                    return Err(InputError::new(
                        key,
                        format!(
                            "stencil '{n}' approximates derivative {}, but this key needs derivative {derivative}",
                            st.derivative
                        ),
                    ));
                }
                return Ok(st.clone());
            }
            catalogue::builtin(n, derivative).ok_or_else(|| {
                let mut valid = catalogue::names(derivative);
                valid.extend(user.keys().map(|s| s.as_str()));
                let k = if dims > 1 && matches!(choice, StencilChoice::PerAxis(_)) {
                    format!("{key}.{d}")
                } else {
                    key.to_string()
                };
                InputError::unknown(&k, &format!("stencil for derivative {derivative}"), n, &valid)
            })
        })
        .collect()
}

/// Upwinding by name.
pub(super) fn upwind(name: Option<&str>) -> Result<Upwind, InputError> {
    match name.unwrap_or("characteristic") {
        "characteristic" => Ok(Upwind::Characteristic),
        "rusanov" => Ok(Upwind::Rusanov),
        other => Err(InputError::unknown(
            "space.upwind",
            "upwinding",
            other,
            &["characteristic", "rusanov"],
        )),
    }
}

/// Added dissipation −σ (s/h_d) sin^p(θ_d/2) from its order and strength.
pub(super) fn dissipation(spec: Option<(i64, f64)>) -> Result<Option<Dissipation>, InputError> {
    let Some((order, strength)) = spec else {
        return Ok(None);
    };
    if order < 2 || order % 2 != 0 || order > 16 {
        return Err(InputError::new(
            "space.dissipation.order",
            "must be an even power between 2 and 16",
        ));
    }
    let strength = crate::error::finite("space.dissipation.strength", strength)?;
    if strength < 0.0 {
        return Err(InputError::new(
            "space.dissipation.strength",
            "must not be negative",
        ));
    }
    Ok(Some(Dissipation {
        order: order as u32,
        strength,
    }))
}

/// The arrangement by name.
pub(super) fn arrangement(name: Option<&str>) -> Result<Arrangement, InputError> {
    let name = name.unwrap_or("collocated");
    Arrangement::from_name(name).ok_or_else(|| {
        let all: Vec<&str> = Arrangement::ALL.iter().map(|(_, n)| *n).collect();
        InputError::unknown("space.arrangement", "arrangement", name, &all)
    })
}

/// Cell offsets of each variable for an arrangement (empty: collocated).
///
/// Shallow water (h, u, v), the lettered grid families: A all together; B h at
/// centres, u and v at corners; C u on x-faces, v on y-faces; D u on y-faces,
/// v on x-faces. Maxwell on the Yee cell: E components on edges, H on faces
/// (2-D: the TE and TM cells of the 3-D Yee cell).
pub(super) fn locations(
    a: Arrangement,
    sys: &System,
    dims: usize,
) -> Result<Vec<Vec<f64>>, InputError> {
    let key = "space.arrangement";
    let kind = sys.kind;
    if a == Arrangement::Collocated || (a == Arrangement::A && kind == ModelKind::ShallowWater) {
        return Ok(Vec::new());
    }
    let h = 0.5;
    let v = |x: &[f64]| x[..dims].to_vec();
    match (kind, a) {
        (ModelKind::ShallowWater, Arrangement::D | Arrangement::E) if dims == 1 => {
            Err(InputError::new(
                key,
                format!("the {}-grid needs two axes", a.name().to_uppercase()),
            ))
        }
        (ModelKind::ShallowWater, a) if a != Arrangement::Yee => {
            // the E-grid is analysed as the B-grid on axes turned by 45 degrees
            let (u, w): ([f64; 2], [f64; 2]) = match a {
                Arrangement::B | Arrangement::E => ([h, h], [h, h]),
                Arrangement::C => ([h, 0.0], [0.0, h]),
                _ => ([0.0, h], [h, 0.0]),
            };
            let mut out = vec![v(&[0.0, 0.0]), v(&u)];
            if dims == 2 {
                out.push(v(&w));
            }
            Ok(out)
        }
        (ModelKind::Maxwell, Arrangement::Yee) => {
            let tm = sys.variables.last().is_some_and(|n| n == "ez") && dims == 2;
            Ok(match (dims, tm) {
                (3, _) => vec![
                    vec![h, 0.0, 0.0],
                    vec![0.0, h, 0.0],
                    vec![0.0, 0.0, h],
                    vec![0.0, h, h],
                    vec![h, 0.0, h],
                    vec![h, h, 0.0],
                ],
                (_, false) => vec![vec![h, 0.0], vec![0.0, h], vec![h, h]],
                (_, true) => vec![vec![0.0, h], vec![h, 0.0], vec![0.0, 0.0]],
            })
        }
        _ => {
            let owner = if a == Arrangement::Yee {
                "maxwell"
            } else {
                "shallow-water"
            };
            Err(InputError::new(
                key,
                format!(
                    "arrangement '{}' belongs to the {owner} model; model '{}' has only \"collocated\"",
                    a.name(),
                    kind.name()
                ),
            )
            .hint("remove the key or set it to \"collocated\""))
        }
    }
}

/// The assembled spatial scheme.
pub(super) fn space(
    first: Vec<Stencil>,
    second: Vec<Stencil>,
    upwind: Upwind,
    dissipation: Option<Dissipation>,
    arrangement: Arrangement,
    locations: Vec<Vec<f64>>,
) -> Space {
    Space {
        first,
        second,
        upwind,
        dissipation,
        arrangement,
        locations,
    }
}
