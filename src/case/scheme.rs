//! Space and time keys → the discretisation: stencils (built-in and user),
//! upwinding, dissipation, grid arrangement, time method and composite schemes.

use super::raw::{OneOrMany, RawSpace, RawTime};
use super::validate::Ctx;
use super::CaseError;
use crate::operator::{Dissipation, Space, Upwind};
use crate::physics::System;
use crate::stencil::{catalogue, Stencil};
use crate::time::composite::{Composite, Imex, Splitting};
use crate::time::{self, Method, Scheme};
use std::collections::BTreeMap;

const COMPOSITE_METHODS: [&str; 5] = [
    "forward-backward",
    "imex-euler",
    "imex-cnab2",
    "lax-wendroff",
    "lax-friedrichs",
];

fn user_stencils(cx: &Ctx, s: &RawSpace) -> Result<BTreeMap<String, Stencil>, CaseError> {
    let mut out = BTreeMap::new();
    for (name, r) in &s.stencils {
        let key = format!("space.stencils.{name}");
        let implicit = match (&r.implicit_offsets, &r.implicit_weights) {
            (Some(o), Some(w)) => Some((o.clone(), w.clone())),
            (None, None) => None,
            _ => {
                return Err(cx.err(
                    &key,
                    "give both implicit_offsets and implicit_weights, or neither",
                ))
            }
        };
        if !(1..=2).contains(&r.derivative) {
            return Err(cx.err(&format!("{key}.derivative"), "must be 1 or 2"));
        }
        let st = Stencil::new(
            name,
            r.derivative as u32,
            r.offsets.clone(),
            r.weights.clone(),
            implicit,
        )
        .map_err(|e| cx.err(&key, e.to_string()))?;
        out.insert(name.clone(), st);
    }
    Ok(out)
}

fn stencils(
    cx: &Ctx,
    key: &str,
    spec: &Option<OneOrMany<String>>,
    derivative: u32,
    dims: usize,
    user: &BTreeMap<String, Stencil>,
) -> Result<Vec<Stencil>, CaseError> {
    let names = match spec {
        None => vec!["central2".to_string(); dims],
        Some(OneOrMany::One(n)) => vec![n.clone(); dims],
        Some(OneOrMany::Many(v)) if v.len() == dims => v.clone(),
        Some(OneOrMany::Many(v)) => {
            return Err(cx.err(
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
                    return Err(cx.err(
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
                let k = if dims > 1 && matches!(spec, Some(OneOrMany::Many(_))) {
                    format!("{key}.{d}")
                } else {
                    key.to_string()
                };
                cx.unknown(&k, &format!("stencil for derivative {derivative}"), n, &valid)
            })
        })
        .collect()
}

pub(super) fn space(
    cx: &Ctx,
    s: &RawSpace,
    dims: usize,
    kind: &str,
    polarization_tm: bool,
) -> Result<Space, CaseError> {
    let user = user_stencils(cx, s)?;
    let first = stencils(cx, "space.first", &s.first, 1, dims, &user)?;
    let second = stencils(cx, "space.second", &s.second, 2, dims, &user)?;
    let upwind = match s.upwind.as_deref().unwrap_or("characteristic") {
        "characteristic" => Upwind::Characteristic,
        "rusanov" => Upwind::Rusanov,
        other => {
            return Err(cx.unknown(
                "space.upwind",
                "upwinding",
                other,
                &["characteristic", "rusanov"],
            ))
        }
    };
    let dissipation = match &s.dissipation {
        None => None,
        Some(d) => {
            if d.order < 2 || d.order % 2 != 0 || d.order > 16 {
                return Err(cx.err(
                    "space.dissipation.order",
                    "must be an even power between 2 and 16",
                ));
            }
            let strength = cx.finite("space.dissipation.strength", d.strength)?;
            if strength < 0.0 {
                return Err(cx.err("space.dissipation.strength", "must not be negative"));
            }
            Some(Dissipation {
                order: d.order as u32,
                strength,
            })
        }
    };
    let arrangement = s.arrangement.as_deref().unwrap_or("collocated");
    let tm = polarization_tm;
    let locations = arrangement_locations(cx, arrangement, kind, dims, tm)?;
    Ok(Space {
        first,
        second,
        upwind,
        dissipation,
        arrangement: arrangement.to_string(),
        locations,
    })
}

/// Cell offsets of each variable for a named arrangement (empty: collocated).
///
/// Shallow water (h, u, v), the lettered grid families: A all together; B h at
/// centres, u and v at corners; C u on x-faces, v on y-faces; D u on y-faces,
/// v on x-faces. Maxwell on the Yee cell: E components on edges, H on faces
/// (2-D: the TE and TM cells of the 3-D Yee cell).
fn arrangement_locations(
    cx: &Ctx,
    arrangement: &str,
    kind: &str,
    dims: usize,
    tm: bool,
) -> Result<Vec<Vec<f64>>, CaseError> {
    let key = "space.arrangement";
    let all = ["collocated", "a", "b", "c", "d", "e", "yee"];
    if !all.contains(&arrangement) {
        return Err(cx.unknown(key, "arrangement", arrangement, &all));
    }
    if arrangement == "collocated" || (arrangement == "a" && kind == "shallow-water") {
        return Ok(Vec::new());
    }
    let h = 0.5;
    let v = |x: &[f64]| x[..dims].to_vec();
    match (kind, arrangement) {
        ("shallow-water", "d" | "e") if dims == 1 => Err(cx.err(
            key,
            format!("the {}-grid needs two axes", arrangement.to_uppercase()),
        )),
        ("shallow-water", a) if a != "yee" => {
            // the E-grid is analysed as the B-grid on axes turned by 45 degrees
            let (u, w): ([f64; 2], [f64; 2]) = match a {
                "b" | "e" => ([h, h], [h, h]),
                "c" => ([h, 0.0], [0.0, h]),
                _ => ([0.0, h], [h, 0.0]),
            };
            let mut out = vec![v(&[0.0, 0.0]), v(&u)];
            if dims == 2 {
                out.push(v(&w));
            }
            Ok(out)
        }
        ("maxwell", "yee") => Ok(match (dims, tm) {
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
        }),
        _ => {
            let owner = if arrangement == "yee" {
                "maxwell"
            } else {
                "shallow-water"
            };
            Err(cx.err_hint(
                key,
                format!("arrangement '{arrangement}' belongs to the {owner} model; model '{kind}' has only \"collocated\""),
                "remove the key or set it to \"collocated\"",
            ))
        }
    }
}

pub(super) fn method(
    cx: &Ctx,
    t: &RawTime,
    sys: &System,
    space: &Space,
) -> Result<Method, CaseError> {
    let name = t.method.as_str();
    let mut valid = time::method_names();
    valid.extend(COMPOSITE_METHODS);
    let uses_order = name == "forward-backward";
    if !uses_order && t.first.is_some() {
        return Err(cx.err(
            "time.first",
            "is only used with method = \"forward-backward\"",
        ));
    }
    if !uses_order && t.sequence.is_some() {
        return Err(cx.err(
            "time.sequence",
            "is only used with method = \"forward-backward\"",
        ));
    }
    if name != "theta" && t.theta.is_some() {
        return Err(cx.err("time.theta", "is only used with method = \"theta\""));
    }
    if name != "tableau" && t.tableau.is_some() {
        return Err(cx.err("time.tableau", "is only used with method = \"tableau\""));
    }
    let splitting = match t.splitting.as_deref().unwrap_or("none") {
        "none" => None,
        "lie" => Some(Splitting::Lie),
        "strang" => Some(Splitting::Strang),
        other => {
            return Err(cx.unknown(
                "time.splitting",
                "splitting",
                other,
                &["none", "lie", "strang"],
            ))
        }
    };
    let composite = |c: Composite, order: u32| Method {
        name: name.to_string(),
        order,
        explicit: !matches!(c, Composite::Imex(_)),
        scheme: Scheme::Composite(c),
    };
    let base = match name {
        "forward-backward" => {
            let rank = update_ranks(cx, t, sys)?;
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::ForwardBackward { rank }, 1));
        }
        "imex-euler" => {
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::Imex(Imex::Euler), 1))
        }
        "imex-cnab2" => {
            return no_split(cx, splitting, name)
                .map(|_| composite(Composite::Imex(Imex::Cnab2), 2))
        }
        "lax-wendroff" | "lax-friedrichs" => {
            no_split(cx, splitting, name)?;
            if !space.locations.is_empty() {
                return Err(cx.err_hint(
                    "space.arrangement",
                    format!("method '{name}' defines its own collocated differences"),
                    "remove space.arrangement or set it to \"collocated\"",
                ));
            }
            let (c, order) = if name == "lax-wendroff" {
                (Composite::LaxWendroff, 2)
            } else {
                (Composite::LaxFriedrichs, 1)
            };
            return Ok(composite(c, order));
        }
        "theta" => {
            let th = t
                .theta
                .ok_or_else(|| cx.err("time.theta", "is required for method = \"theta\""))?;
            time::methods::theta(th).map_err(|e| cx.err("time.theta", e.to_string()))?
        }
        "tableau" => {
            let tb = t
                .tableau
                .as_ref()
                .ok_or_else(|| cx.err("time.tableau", "is required for method = \"tableau\""))?;
            if let Some(c) = &tb.c {
                let rows_ok = c.len() == tb.a.len()
                    && c.iter()
                        .zip(&tb.a)
                        .all(|(ci, row)| (ci - row.iter().sum::<f64>()).abs() <= 1e-10);
                if !rows_ok {
                    return Err(cx.err(
                        "time.tableau.c",
                        "must equal the row sums of a (c_i = sum_j a_ij); it may be omitted",
                    ));
                }
            }
            time::methods::tableau(&tb.a, &tb.b)
                .map_err(|e| cx.err("time.tableau", e.to_string()))?
        }
        _ => time::builtin(name)
            .ok_or_else(|| cx.unknown("time.method", "time method", name, &valid))?,
    };
    match splitting {
        None => Ok(base),
        Some(kind) => {
            if base.levels() > 1 {
                return Err(cx.err_hint(
                    "time.splitting",
                    format!(
                        "splitting needs a one-step method, and '{name}' is a multistep method"
                    ),
                    "use a Runge-Kutta or theta method, or splitting = \"none\"",
                ));
            }
            let order = if kind == Splitting::Strang {
                base.order.min(2)
            } else {
                1
            };
            Ok(Method {
                name: format!(
                    "{name}+{}",
                    if kind == Splitting::Lie {
                        "lie"
                    } else {
                        "strang"
                    }
                ),
                order,
                explicit: base.explicit,
                scheme: Scheme::Composite(Composite::Split {
                    kind,
                    inner: Box::new(base),
                }),
            })
        }
    }
}

fn no_split(cx: &Ctx, splitting: Option<Splitting>, name: &str) -> Result<(), CaseError> {
    match splitting {
        None => Ok(()),
        Some(_) => Err(cx.err(
            "time.splitting",
            format!("method '{name}' is already a composite scheme and cannot be split"),
        )),
    }
}

/// Update ranks of forward-backward stepping: `time.first` (updated first, the
/// rest after) or `time.sequence` (every variable, in update order).
fn update_ranks(cx: &Ctx, t: &RawTime, sys: &System) -> Result<Vec<usize>, CaseError> {
    let vars = &sys.variables;
    let lookup = |key: &str, v: &str| {
        vars.iter().position(|x| x == v).ok_or_else(|| {
            let list: Vec<&str> = vars.iter().map(|s| s.as_str()).collect();
            cx.unknown(key, "variable", v, &list)
        })
    };
    match (&t.first, &t.sequence) {
        (Some(_), Some(_)) => Err(cx.err(
            "time.sequence",
            "give time.first or time.sequence, not both",
        )),
        (None, None) => Err(cx.err_hint(
            "time.first",
            "forward-backward needs the variables updated first",
            format!("e.g. first = [\"{}\"]", vars[0]),
        )),
        (Some(first), None) => {
            let mut rank = vec![1; vars.len()];
            for (k, v) in first.iter().enumerate() {
                rank[lookup(&format!("time.first.{k}"), v)?] = 0;
            }
            if rank.iter().all(|r| *r == 0) || first.is_empty() {
                return Err(cx.err(
                    "time.first",
                    "must name some, but not all, of the variables",
                ));
            }
            Ok(rank)
        }
        (None, Some(seq)) => {
            let mut rank = vec![usize::MAX; vars.len()];
            for (k, v) in seq.iter().enumerate() {
                rank[lookup(&format!("time.sequence.{k}"), v)?] = k;
            }
            if rank.contains(&usize::MAX) {
                return Err(cx.err("time.sequence", "must list every variable once"));
            }
            Ok(rank)
        }
    }
}
