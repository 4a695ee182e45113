//! The time method from its name and options: built-in one-step and multistep
//! methods, θ-methods, Butcher tableaux, the composite schemes (forward–backward,
//! IMEX, Lax–Wendroff, Lax–Friedrichs), dimension splitting of a one-step
//! method, and the second-order-in-time methods of the `wave` model
//! (`central-difference`, `newmark` with `time.beta`, `time.gamma`), which
//! pair only with it; then the filters: a time filter turns leapfrog into its
//! filtered multistep equivalent, a spatial filter wraps a one-level scheme.

use super::spec::{FilterSpec, MethodSpec, TimeFilterSpec};
use crate::error::InputError;
use crate::operator::Space;
use crate::physics::{ModelKind, System};
use crate::stencil::filter::SpatialFilter;
use crate::time::composite::{Composite, Imex, Splitting};
use crate::time::time_filter::TimeFilter;
use crate::time::{self, Method, Scheme};

const COMPOSITE_METHODS: [&str; 5] = [
    "forward-backward",
    "imex-euler",
    "imex-cnab2",
    "lax-wendroff",
    "lax-friedrichs",
];

fn only_with(key: &str, method: &str) -> InputError {
    InputError::new(key, format!("is only used with method = \"{method}\""))
}

/// Resolves the method of `spec` for a system and spatial scheme, filters
/// included.
pub(super) fn method(spec: &MethodSpec, sys: &System, space: &Space) -> Result<Method, InputError> {
    let mut m = unfiltered(spec, sys, space)?;
    if let Some(tf) = &spec.time_filter {
        m = time_filtered(m, tf)?;
    }
    if let Some(f) = &spec.filter {
        m = spatially_filtered(m, f)?;
    }
    Ok(m)
}

/// Leapfrog with a Robert–Asselin or RAW filter, as its multistep equivalent.
fn time_filtered(base: Method, spec: &TimeFilterSpec) -> Result<Method, InputError> {
    let kinds = ["robert-asselin", "raw"];
    let Some(kind) = spec.kind.as_deref() else {
        return Err(InputError::new(
            "time.filter",
            "is required when time.filter_strength or time.filter_alpha is given",
        )
        .hint("filter = \"robert-asselin\" or \"raw\""));
    };
    if !kinds.contains(&kind) {
        return Err(InputError::unknown(
            "time.filter",
            "time filter",
            kind,
            &kinds,
        ));
    }
    if base.name != "leapfrog" {
        return Err(InputError::new(
            "time.filter",
            format!(
                "time filters act on leapfrog's computational mode; method '{}' has none",
                base.name
            ),
        )
        .hint("use method = \"leapfrog\", or a spatial filter ([space.filter])"));
    }
    let strength = spec.strength.ok_or_else(|| {
        InputError::new("time.filter_strength", "is required with time.filter")
            .hint("e.g. filter_strength = 0.1")
    })?;
    let filter = if kind == "raw" {
        TimeFilter::raw(strength, spec.alpha.unwrap_or(0.53))
    } else {
        if spec.alpha.is_some() {
            return Err(only_with(
                "time.filter_alpha",
                "leapfrog\" and filter = \"raw",
            ));
        }
        TimeFilter::robert_asselin(strength)
    }
    .map_err(|e| {
        let key = match e {
            time::time_filter::TimeFilterError::Alpha(_) => "time.filter_alpha",
            time::time_filter::TimeFilterError::Strength(_) => "time.filter_strength",
        };
        InputError::new(key, e.to_string())
    })?;
    let ms = filter.filtered_leapfrog();
    Ok(Method {
        name: format!("{}+{}", base.name, filter.tag_with_parameters()),
        order: ms.order(),
        explicit: true,
        scheme: Scheme::Multistep(ms),
    })
}

/// A one-level scheme followed by a spatial filter once per step.
fn spatially_filtered(base: Method, spec: &FilterSpec) -> Result<Method, InputError> {
    let kinds = ["explicit", "compact"];
    let filter = match spec.kind.as_str() {
        "explicit" => {
            if spec.alpha.is_some() {
                return Err(InputError::new(
                    "space.filter.alpha",
                    "is only used with kind = \"compact\"",
                ));
            }
            let s = spec.strength.ok_or_else(|| {
                InputError::new(
                    "space.filter.strength",
                    "is required with kind = \"explicit\"",
                )
                .hint("e.g. strength = 0.2 (1 removes the two-cell wave each step)")
            })?;
            SpatialFilter::explicit(spec.order, s)
        }
        "compact" => {
            if spec.strength.is_some() {
                return Err(InputError::new(
                    "space.filter.strength",
                    "is only used with kind = \"explicit\"",
                ));
            }
            let a = spec.alpha.ok_or_else(|| {
                InputError::new("space.filter.alpha", "is required with kind = \"compact\"")
                    .hint("e.g. alpha = 0.45")
            })?;
            SpatialFilter::compact(spec.order, a)
        }
        other => {
            return Err(InputError::unknown(
                "space.filter.kind",
                "filter kind",
                other,
                &kinds,
            ))
        }
    }
    .map_err(|e| {
        let key = match e {
            crate::stencil::filter::FilterError::Order(_) => "space.filter.order",
            crate::stencil::filter::FilterError::Strength(_) => "space.filter.strength",
            crate::stencil::filter::FilterError::Alpha(_) => "space.filter.alpha",
        };
        InputError::new(key, e.to_string())
    })?;
    if base.levels() > 1 {
        return Err(InputError::new(
            "space.filter",
            format!(
                "a spatial filter is applied after one-level steps; '{}' carries {} time levels",
                base.name,
                base.levels()
            ),
        )
        .hint("use a Runge-Kutta or theta method, or a time filter for leapfrog (time.filter)"));
    }
    Ok(Method {
        name: format!("{}+filter", base.name),
        order: base.order,
        explicit: base.explicit,
        scheme: Scheme::Composite(Composite::Filtered {
            filter,
            inner: Box::new(base),
        }),
    })
}

fn unfiltered(spec: &MethodSpec, sys: &System, space: &Space) -> Result<Method, InputError> {
    let name = spec.name.as_deref().ok_or_else(|| {
        InputError::new("time.method", "is required").hint("e.g. method = \"rk4\"")
    })?;
    let mut valid = time::method_names();
    valid.extend(COMPOSITE_METHODS);
    valid.extend(time::second_order::names());
    if name != "newmark" && spec.beta.is_some() {
        return Err(only_with("time.beta", "newmark"));
    }
    if name != "newmark" && spec.gamma.is_some() {
        return Err(only_with("time.gamma", "newmark"));
    }
    pairing(name, sys)?;
    let uses_order = name == "forward-backward";
    if !uses_order && spec.first.is_some() {
        return Err(only_with("time.first", "forward-backward"));
    }
    if !uses_order && spec.sequence.is_some() {
        return Err(only_with("time.sequence", "forward-backward"));
    }
    if name != "theta" && spec.theta.is_some() {
        return Err(only_with("time.theta", "theta"));
    }
    if name != "tableau" && spec.tableau.is_some() {
        return Err(only_with("time.tableau", "tableau"));
    }
    let splitting = match spec.splitting.as_deref().unwrap_or("none") {
        "none" => None,
        "lie" => Some(Splitting::Lie),
        "strang" => Some(Splitting::Strang),
        other => {
            return Err(InputError::unknown(
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
    let second = time::second_order::by_name(
        name,
        spec.beta.unwrap_or(time::second_order::DEFAULT_BETA),
        spec.gamma.unwrap_or(time::second_order::DEFAULT_GAMMA),
    );
    if let Some(m) = second {
        if splitting.is_some() {
            return Err(InputError::new(
                "time.splitting",
                format!("method '{name}' is a second-order-in-time recurrence and cannot be split"),
            ));
        }
        if space.dissipation.is_some() {
            return Err(InputError::new(
                "space.dissipation",
                "added dissipation is a damping term of first-order-in-time systems; in u_tt = L u it would act as extra stiffness, not damping",
            )
            .hint("remove space.dissipation; newmark with time.gamma > 1/2 adds numerical damping"));
        }
        return m.map_err(|e| {
            let key = match e {
                time::MethodError::NewmarkGamma(_) => "time.gamma",
                _ => "time.beta",
            };
            InputError::new(key, e.to_string())
        });
    }
    let base = match name {
        "forward-backward" => {
            let rank = update_ranks(spec, sys)?;
            return no_split(splitting, name)
                .map(|_| composite(Composite::ForwardBackward { rank }, 1));
        }
        "imex-euler" => {
            return no_split(splitting, name).map(|_| composite(Composite::Imex(Imex::Euler), 1))
        }
        "imex-cnab2" => {
            return no_split(splitting, name).map(|_| composite(Composite::Imex(Imex::Cnab2), 2))
        }
        "lax-wendroff" | "lax-friedrichs" => {
            no_split(splitting, name)?;
            if !space.locations.is_empty() {
                return Err(InputError::new(
                    "space.arrangement",
                    format!("method '{name}' defines its own collocated differences"),
                )
                .hint("remove space.arrangement or set it to \"collocated\""));
            }
            let (c, order) = if name == "lax-wendroff" {
                (Composite::LaxWendroff, 2)
            } else {
                (Composite::LaxFriedrichs, 1)
            };
            return Ok(composite(c, order));
        }
        "theta" => {
            let th = spec.theta.ok_or_else(|| {
                InputError::new("time.theta", "is required for method = \"theta\"")
            })?;
            time::methods::theta(th).map_err(|e| InputError::new("time.theta", e.to_string()))?
        }
        "tableau" => {
            let tb = spec.tableau.as_ref().ok_or_else(|| {
                InputError::new("time.tableau", "is required for method = \"tableau\"")
            })?;
            if let Some(c) = &tb.c {
                let rows_ok = c.len() == tb.a.len()
                    && c.iter()
                        .zip(&tb.a)
                        .all(|(ci, row)| (ci - row.iter().sum::<f64>()).abs() <= 1e-10);
                if !rows_ok {
                    return Err(InputError::new(
                        "time.tableau.c",
                        "must equal the row sums of a (c_i = sum_j a_ij); it may be omitted",
                    ));
                }
            }
            time::methods::tableau(&tb.a, &tb.b)
                .map_err(|e| InputError::new("time.tableau", e.to_string()))?
        }
        _ => time::builtin(name)
            .ok_or_else(|| InputError::unknown("time.method", "time method", name, &valid))?,
    };
    let Some(kind) = splitting else {
        return Ok(base);
    };
    if base.levels() > 1 {
        return Err(InputError::new(
            "time.splitting",
            format!("splitting needs a one-step method, and '{name}' is a multistep method"),
        )
        .hint("use a Runge-Kutta or theta method, or splitting = \"none\""));
    }
    let order = if kind == Splitting::Strang {
        base.order.min(2)
    } else {
        1
    };
    let tag = if kind == Splitting::Lie {
        "lie"
    } else {
        "strang"
    };
    Ok(Method {
        name: format!("{name}+{tag}"),
        order,
        explicit: base.explicit,
        scheme: Scheme::Composite(Composite::Split {
            kind,
            inner: Box::new(base),
        }),
    })
}

/// The `wave` model (second order in time) takes only the second-order
/// methods, and they take only it.
fn pairing(name: &str, sys: &System) -> Result<(), InputError> {
    let second = time::second_order::names().contains(&name);
    let wave = sys.kind == ModelKind::Wave;
    if second && !wave {
        return Err(InputError::new(
            "time.method",
            format!(
                "method '{name}' advances second-order-in-time equations u_tt = L u, and model '{}' is first order in time",
                sys.kind.name()
            ),
        )
        .hint("use it with model.kind = \"wave\", or choose a method for first-order systems (kgain list methods)"));
    }
    if wave
        && !second
        && time::method_names()
            .iter()
            .chain(&COMPOSITE_METHODS)
            .any(|n| *n == name)
    {
        return Err(InputError::new(
            "time.method",
            format!(
                "model 'wave' is second order in time (u_tt = L u), and method '{name}' advances first-order systems"
            ),
        )
        .hint("use method = \"central-difference\" or \"newmark\" (time.beta, time.gamma)"));
    }
    Ok(())
}

fn no_split(splitting: Option<Splitting>, name: &str) -> Result<(), InputError> {
    match splitting {
        None => Ok(()),
        Some(_) => Err(InputError::new(
            "time.splitting",
            format!("method '{name}' is already a composite scheme and cannot be split"),
        )),
    }
}

/// Update ranks of forward-backward stepping: `time.first` (updated first, the
/// rest after) or `time.sequence` (every variable, in update order).
fn update_ranks(spec: &MethodSpec, sys: &System) -> Result<Vec<usize>, InputError> {
    let vars = &sys.variables;
    let lookup = |key: &str, v: &str| {
        vars.iter().position(|x| x == v).ok_or_else(|| {
            let list: Vec<&str> = vars.iter().map(|s| s.as_str()).collect();
            InputError::unknown(key, "variable", v, &list)
        })
    };
    match (&spec.first, &spec.sequence) {
        (Some(_), Some(_)) => Err(InputError::new(
            "time.sequence",
            "give time.first or time.sequence, not both",
        )),
        (None, None) => Err(InputError::new(
            "time.first",
            "forward-backward needs the variables updated first",
        )
        .hint(format!("e.g. first = [\"{}\"]", vars[0]))),
        (Some(first), None) => {
            let mut rank = vec![1; vars.len()];
            for (k, v) in first.iter().enumerate() {
                rank[lookup(&format!("time.first.{k}"), v)?] = 0;
            }
            if rank.iter().all(|r| *r == 0) || first.is_empty() {
                return Err(InputError::new(
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
                return Err(InputError::new(
                    "time.sequence",
                    "must list every variable once",
                ));
            }
            Ok(rank)
        }
    }
}
