//! Text for `kgain check` (the assembled problem) and `kgain list` (built-ins).

use crate::analysis::Plan;
use crate::case::Case;
use crate::operator::Operator;
use crate::problem::Problem;
use crate::stencil::catalogue;
use crate::time;
use std::fmt::Write;

fn fmt_c(z: num_complex::Complex64) -> String {
    format!("{:+.6e}{:+.6e}i", z.re, z.im)
}

fn limit_text(x: f64) -> String {
    if x.is_infinite() {
        "unbounded".into()
    } else if x == 0.0 {
        "0 (unstable)".into()
    } else {
        format!("{x:.10}")
    }
}

/// The stable stretch of the negative real axis of z = dt^2 mu, in words.
fn real_axis_text(x: f64) -> String {
    if x.is_infinite() {
        "stable for every dt^2 mu <= 0 (the whole negative real axis)".into()
    } else if x == 0.0 {
        "unstable on the negative real axis".into()
    } else {
        format!("stable for dt^2 mu in [-{x:.10}, 0]")
    }
}

/// The assembled problem of a case, as `kgain check` prints it.
pub fn check(c: &Case) -> String {
    let case = &c.problem;
    let op = case.operator();
    let mut s = String::new();
    let _ = writeln!(s, "case          {} ({})", case.name, c.file.display());
    if let Some(d) = &case.description {
        let _ = writeln!(s, "description   {d}");
    }
    let _ = writeln!(
        s,
        "dimensions    {} (spacing {:?})",
        case.dims(),
        case.spacing
    );
    let _ = writeln!(s, "model         {}", case.system.kind.name());
    let _ = writeln!(s, "variables     {}", case.system.variables.join(", "));
    let _ = writeln!(
        s,
        "ref. speed    s = {:.10e} (largest characteristic speed), h = {:.6e}",
        case.system.reference_speed,
        case.reference_spacing()
    );
    if let Some(d) = case.system.diffusivity_max {
        let _ = writeln!(s, "diffusivity   D_max = {d:.6e}");
    }
    let _ = writeln!(s, "stencils");
    let wave = case.system.kind == crate::physics::ModelKind::Wave;
    // the wave model has no first-derivative term (K_d = c_d^2 on the second)
    for (d, st) in case.space.first.iter().enumerate().filter(|_| !wave) {
        let kind = if st.is_central() {
            "central"
        } else {
            "biased, upwinded"
        };
        let _ = writeln!(
            s,
            "  first  axis {d}: {} (order {}, {kind}, offsets {:?})",
            st.name, st.order, st.offsets
        );
    }
    if case.system.diffusivity_max.is_some() || case.system.kind == crate::physics::ModelKind::Wave
    {
        for (d, st) in case.space.second.iter().enumerate() {
            let _ = writeln!(s, "  second axis {d}: {} (order {})", st.name, st.order);
        }
    }
    let _ = writeln!(s, "terms of L(theta)");
    for t in &op.terms {
        let _ = writeln!(s, "  {}", t.label);
    }
    if op.constant.iter().any(|z| z.norm() != 0.0) {
        let _ = writeln!(s, "  S (source)");
    }
    let m = &case.method;
    if let Some(c) = m.composite() {
        let _ = writeln!(
            s,
            "time method   {}: {} (order {}, {} level(s); limit by a verified search on dt)",
            m.name,
            c.description(),
            m.order,
            m.levels()
        );
    } else if m.is_second_order() {
        let _ = writeln!(
            s,
            "time method   {} (order {}, {}, second order in time, {} levels (u^n, u^(n-1)); {})",
            m.name,
            m.order,
            if m.explicit { "explicit" } else { "implicit" },
            m.levels(),
            real_axis_text(m.real_limit())
        );
    } else {
        let _ = writeln!(
            s,
            "time method   {} (order {}, {}, {} level(s); imaginary-axis limit {}, real-axis limit {})",
            m.name,
            m.order,
            if m.explicit { "explicit" } else { "implicit" },
            m.levels(),
            limit_text(m.imaginary_limit()),
            limit_text(m.real_limit())
        );
    }
    if !case.space.locations.is_empty() {
        let _ = writeln!(
            s,
            "arrangement   {} (cell offsets per variable)",
            case.space.arrangement.name()
        );
        for (v, loc) in case.system.variables.iter().zip(&case.space.locations) {
            let _ = writeln!(s, "  {v:<6} {loc:?}");
        }
    }
    let dt = case.dt();
    let _ = writeln!(
        s,
        "time step     dt = {dt:.6e}{}",
        case.courant_of(dt)
            .map(|c| format!(" (Courant {c:.6})"))
            .unwrap_or_default()
    );
    let sample: Vec<f64> = (0..case.dims()).map(|d| [0.7, 1.3, 2.1][d]).collect();
    let l = op.symbol_matrix(&sample);
    let _ = writeln!(s, "symbol L at theta = {sample:?}:");
    for i in 0..op.m {
        let row: Vec<String> = (0..op.m).map(|j| fmt_c(l[(i, j)])).collect();
        let _ = writeln!(s, "  [{}]", row.join("  "));
    }
    let eig = crate::linalg::eigenvalues(&crate::linalg::from_matrix(&l), op.m).unwrap_or_default();
    let ev: Vec<String> = eig.iter().map(|z| fmt_c(*z)).collect();
    let _ = writeln!(s, "  eigenvalues: {}", ev.join(", "));
    let (directions, tol) = settings(&c.plan);
    if case.method.is_second_order() {
        let _ = writeln!(
            s,
            "resolution    not computed: the dispersion analysis does not cover second-order-in-time methods"
        );
    } else {
        let _ = writeln!(s, "{}", resolution_line(case, &op, directions, tol));
    }
    let _ = writeln!(
        s,
        "scan          points {:?}, {} directions, tolerance {:e}",
        c.plan.points, directions, c.plan.tolerance
    );
    s
}

/// The direction count and phase tolerance of a plan (defaults when the
/// analyses using them are not asked for).
fn settings(plan: &Plan) -> (usize, f64) {
    let directions = plan
        .limit
        .as_ref()
        .map(|l| l.directions)
        .or(plan.dispersion.as_ref().map(|d| d.directions))
        .unwrap_or(180);
    let tol = plan.dispersion.as_ref().map_or(0.01, |d| d.phase_tolerance);
    (directions, tol)
}

/// Points per wavelength each physical mode needs for the case's phase tolerance,
/// from the dispersion curves (semi-discrete, and with the time method).
fn resolution_line(case: &Problem, op: &Operator, directions: usize, tol: f64) -> String {
    use crate::analysis::dispersion::{curves, frequencies::Frequencies, resolution};
    let f = Frequencies::new(case, op);
    let dt = case.dt();
    let dirs = curves::curve_directions(case.dims(), directions);
    let curves_: Vec<_> = dirs.iter().map(|n| curves::curve(&f, n, dt)).collect();
    let names = &case.system.mode_names;
    let res = resolution::resolve(&f, &dirs, &curves_, dt, tol, names.len(), crate::Par::Seq);
    let parts: Vec<String> = names
        .iter()
        .zip(&res)
        .filter_map(|(name, r)| {
            r.semi_ppw().map(|a| {
                format!(
                    "{name} {} ({} with {})",
                    crate::report::format::sig3(a),
                    crate::report::format::sig3(r.discrete_ppw().unwrap_or(f64::NAN)),
                    case.method.name
                )
            })
        })
        .collect();
    format!(
        "resolution    points per wavelength for {:.1}% phase error: {}",
        100.0 * tol,
        if parts.is_empty() {
            "no propagating mode".to_string()
        } else {
            parts.join(", ")
        }
    )
}

/// Built-in models.
pub fn list_models() -> String {
    let mut s = String::from("models (keys of [model]; description)\n");
    for e in crate::physics::catalogue::all() {
        let _ = writeln!(s, "  {:<15}{:<40}{}", e.name, e.keys.join(", "), e.summary);
    }
    s
}

/// Built-in stencils with their properties.
pub fn list_stencils() -> String {
    let mut s = format!(
        "stencils (resolving efficiency: fraction of [0, pi] and points per wavelength where the modified wavenumber is within 1% / 0.1%)\n  {:<10}{:>6}{:>7}{:>10}{:>16}{:>16}  {:<46}{}\n",
        "name", "deriv", "order", "max k*h", "1%: eff  ppw", "0.1%: eff  ppw", "offsets", "description"
    );
    for (st, summary) in catalogue::all() {
        let (kmax, _) = st.max_modified_wavenumber();
        let offs = format!("{:?}", st.offsets);
        let (e1, p1) = st.resolving_efficiency(0.01);
        let (e2, p2) = st.resolving_efficiency(0.001);
        let _ = writeln!(
            s,
            "  {:<10}{:>6}{:>7}{:>10.5}{:>9.3}{:>7.1}{:>9.3}{:>7.1}  {:<46}{}",
            st.name, st.derivative, st.order, kmax, e1, p1, e2, p2, offs, summary
        );
        let w: Vec<String> = st.weights.iter().map(|w| format!("{w:.10}")).collect();
        let _ = writeln!(s, "  {:<23}weights [{}]", "", w.join(", "));
        if st.is_compact() {
            let _ = writeln!(
                s,
                "  {:<23}implicit offsets {:?}, weights {:?}",
                "", st.implicit_offsets, st.implicit_weights
            );
        }
    }
    s
}

/// The order column of `kgain list methods`: for methods with a Butcher
/// tableau, the order from the order conditions, and the linear order of the
/// stability function after it when the two differ ("2 (lin. 4)").
fn order_text(name: &str, m: &time::Method) -> String {
    match time::presets::tableau(name) {
        Some(t) => {
            let nonlinear = time::order::order(&t);
            if nonlinear == m.order {
                nonlinear.to_string()
            } else {
                format!("{nonlinear} (lin. {})", m.order)
            }
        }
        None => m.order.to_string(),
    }
}

/// Built-in time methods with their stability intervals, computed here.
pub fn list_methods() -> String {
    let mut s = format!(
        "time methods (order from the order conditions, \"lin.\" the order on linear problems where it differs; stability limits computed from each method's region)\n  {:<16}{:>12}{:>8}{:>10}{:>8}{:>18}{:>18}\n",
        "name", "order", "stages", "kind", "levels", "imaginary axis", "negative real"
    );
    for name in time::method_names() {
        let m = match name {
            "theta" => time::methods::theta(0.5).expect("valid theta"),
            "tableau" | "low-storage" => continue,
            n => time::builtin(n).expect("listed methods exist"),
        };
        let label = if name == "theta" { "theta (0.5)" } else { name };
        let stages = time::methods::stages(name).map_or("-".to_string(), |n| n.to_string());
        let _ = writeln!(
            s,
            "  {:<16}{:>12}{:>8}{:>10}{:>8}{:>18}{:>18}",
            label,
            order_text(name, &m),
            stages,
            if m.explicit { "explicit" } else { "implicit" },
            m.levels(),
            limit_text(m.imaginary_limit()),
            limit_text(m.real_limit())
        );
    }
    s.push_str("presets from published coefficients\n");
    for p in time::presets::PRESETS {
        let _ = writeln!(s, "  {:<16}{}", p.name, p.source);
    }
    s.push_str("  tableau: any Butcher tableau (time.tableau = { a = [[..]], b = [..] }; entries may be fractions in quotes, \"1/6\")\n");
    s.push_str("  low-storage: any 2N scheme by its coefficients (time.low_storage = { a = [..], b = [..] })\n");
    s.push_str(&second_order_methods());
    s.push_str("composite schemes (limit by a verified search on dt)\n");
    for (n, d) in [
        ("forward-backward", "variables updated in order (time.first or time.sequence), each with the newest values; the Yee leapfrog"),
        ("imex-euler", "backward Euler on diffusion, forward Euler on the rest"),
        ("imex-cnab2", "Crank-Nicolson on diffusion, Adams-Bashforth 2 on the rest"),
        ("lax-wendroff", "two-level, second order, unsplit multi-D form"),
        ("lax-friedrichs", "two-level, first order"),
        ("splitting", "time.splitting = \"lie\" | \"strang\" with any one-step method"),
    ] {
        let _ = writeln!(s, "  {n:<18}{d}");
    }
    s.push_str(&list_filters());
    s
}

/// The filters section of `kgain list methods`, with the leapfrog limits the
/// time filters give on the imaginary axis at a typical strength.
fn list_filters() -> String {
    let mut s = String::from("filters (G = F(theta) G_step for a spatial filter; a time filter turns leapfrog into a two-step method)\n");
    s.push_str("  [space.filter] kind = \"explicit\", order = 2..10 (even), strength = sigma in (0, 1]: T = 1 - sigma sin^order(theta/2)\n");
    s.push_str("  [space.filter] kind = \"compact\", order = 2..10 (even), alpha = alpha_f in (-0.5, 0.5): Gaitonde & Visbal 2000\n");
    for (tag, f) in [
        (
            "robert-asselin",
            time::time_filter::TimeFilter::robert_asselin(0.1),
        ),
        ("raw", time::time_filter::TimeFilter::raw(0.1, 0.53)),
    ] {
        let Ok(f) = f else { continue };
        let m = time::Method {
            name: tag.into(),
            order: 0,
            explicit: true,
            scheme: time::Scheme::Multistep(f.filtered_leapfrog()),
        };
        let _ = writeln!(
            s,
            "  time.filter = \"{tag}\" (leapfrog only), filter_strength = 0.1{}: order {}, imaginary-axis limit {}",
            if tag == "raw" { ", filter_alpha = 0.53" } else { "" },
            f.filtered_leapfrog().order(),
            limit_text(m.imaginary_limit())
        );
    }
    s
}

/// The second-order-in-time methods of `kgain list methods`, with their limit
/// on the negative real axis of z = dt^2 mu, computed from each region.
fn second_order_methods() -> String {
    let mut s = String::from(
        "second-order-in-time methods (u_tt = L u, model wave only; limit in z = dt^2 mu on the negative real axis)\n",
    );
    for (label, m, note) in [
        (
            "central-difference",
            time::second_order::central_difference(),
            "u^(n+1) - 2u^n + u^(n-1) = dt^2 L u^n",
        ),
        (
            "newmark",
            time::second_order::newmark(
                time::second_order::DEFAULT_BETA,
                time::second_order::DEFAULT_GAMMA,
            )
            .expect("the default Newmark parameters are valid"),
            "Newmark family, time.beta (default 1/4) and time.gamma (default 1/2); shown at the defaults",
        ),
    ] {
        let _ = writeln!(
            s,
            "  {:<20}order {}, {:<9} {}; {}",
            label,
            m.order,
            if m.explicit { "explicit," } else { "implicit," },
            real_axis_text(m.real_limit()),
            note
        );
    }
    s
}

/// `kgain check` on a probe case: what will be run and measured, without
/// running the program.
pub fn check_probe(case: &crate::case::probe::ProbeCase) -> String {
    use std::fmt::Write;
    let spec = &case.spec;
    let plan = &case.plan;
    let mut t = String::new();
    let _ = writeln!(t, "probe case {} ({})", case.name, case.file.display());
    if let Some(d) = &case.description {
        let _ = writeln!(t, "  {d}");
    }
    let _ = writeln!(t, "  program       {}", case.command.join(" "));
    let _ = writeln!(t, "  runs in       {}", case.folder.display());
    let _ = writeln!(
        t,
        "  timeout       {} s per run",
        case.timeout.as_secs_f64()
    );
    let cells: Vec<String> = spec.cells.iter().map(|n| n.to_string()).collect();
    let _ = writeln!(
        t,
        "  grid          {} periodic cells, spacing {:?}",
        cells.join(" x "),
        case.spacing
    );
    let _ = writeln!(t, "  time step     dt = {:e}", plan.dt);
    if let Some((nu, c)) = case.courant {
        let _ = writeln!(t, "  Courant       {nu:.6} (wave speed {c})");
    }
    for (j, v) in spec.variables.iter().enumerate() {
        let _ = writeln!(
            t,
            "  variable      {v}: base {}, impulse {:e}, offset in the cell {:?}",
            spec.base[j],
            spec.amplitude_of(j),
            spec.locations[j]
        );
    }
    match &case.model {
        Some(m) => {
            let _ = writeln!(t, "  compared with model {m} (exact frequencies)");
        }
        None => {
            let _ = writeln!(t, "  compared with no model");
        }
    }
    let mut analyses = Vec::new();
    if plan.radius {
        analyses.push("radius".to_string());
    }
    if plan.limit.is_some() {
        analyses.push("limit (re-runs the program)".into());
    }
    if let Some(n) = plan.growth_steps {
        analyses.push(format!("growth (n <= {n}, norm: {})", plan.norm_origin()));
    }
    if plan.dispersion {
        analyses.push("dispersion".into());
    }
    let _ = writeln!(t, "  analyses      {}", analyses.join(", "));
    let _ = writeln!(
        t,
        "  program runs  {} for the matrices and checks (1 + 3 per variable), plus {} per limit probe",
        1 + 3 * spec.m(),
        1 + spec.m()
    );
    t
}
