//! Renders a generated scheme as case-file text for the engine. Numbers are
//! written with full round-trip precision, so the engine sees exactly the
//! matrices and weights the reference uses.

use crate::scheme::{Mat, Method, Scheme, Stencil, Upwind};
use std::fmt::Write;

fn list(v: &[f64]) -> String {
    let parts: Vec<String> = v.iter().map(|x| format!("{x:?}")).collect();
    format!("[{}]", parts.join(", "))
}

fn matrix(a: &Mat) -> String {
    let rows: Vec<String> = (0..a.nrows())
        .map(|i| list(&a.row(i).iter().copied().collect::<Vec<_>>()))
        .collect();
    format!("[{}]", rows.join(", "))
}

fn matrices(v: &[Mat]) -> String {
    let parts: Vec<String> = v.iter().map(matrix).collect();
    format!("[{}]", parts.join(", "))
}

fn names(v: &[Stencil]) -> String {
    let parts: Vec<String> = v.iter().map(|s| format!("\"{}\"", s.name)).collect();
    format!("[{}]", parts.join(", "))
}

fn method_lines(method: &Method, variables: &[String]) -> String {
    match method {
        Method::Polynomial { name, .. } => format!("method = \"{name}\"\n"),
        Method::Theta { name, theta } if *name == "theta" => {
            format!("method = \"theta\"\ntheta = {theta:?}\n")
        }
        Method::Theta { name, .. } => format!("method = \"{name}\"\n"),
        Method::Tableau { a, b } => {
            let rows: Vec<String> = a.iter().map(|r| list(r)).collect();
            format!(
                "method = \"tableau\"\ntableau = {{ a = [{}], b = {} }}\n",
                rows.join(", "),
                list(b)
            )
        }
        Method::Multistep { name, .. } => format!("method = \"{name}\"\n"),
        Method::ForwardBackward { first } => {
            let v: Vec<String> = first
                .iter()
                .map(|i| format!("\"{}\"", variables[*i]))
                .collect();
            format!(
                "method = \"forward-backward\"\nfirst = [{}]\n",
                v.join(", ")
            )
        }
        Method::ImexEuler => "method = \"imex-euler\"\n".into(),
        Method::ImexCnab2 => "method = \"imex-cnab2\"\n".into(),
        Method::LaxWendroff => "method = \"lax-wendroff\"\n".into(),
        Method::LaxFriedrichs => "method = \"lax-friedrichs\"\n".into(),
        Method::Split { strang, inner } => format!(
            "{}splitting = \"{}\"\n",
            method_lines(inner, variables),
            if *strang { "strang" } else { "lie" }
        ),
    }
}

/// The case text of a scheme (limit analysis only, small scan).
pub fn case_text(s: &Scheme) -> String {
    let sys = &s.system;
    let mut t = String::new();
    let _ = writeln!(t, "name = \"differential-{}\"\n", s.seed);
    let _ = writeln!(t, "[grid]\nspacing = {}\n", list(&s.spacing));
    if sys.scalar_advection {
        let a: Vec<f64> = sys.flux.iter().map(|m| m[(0, 0)]).collect();
        let d: Vec<f64> = sys.diffusion.iter().map(|m| m[(0, 0)]).collect();
        let _ = writeln!(t, "[model]\nkind = \"advection\"\nvelocity = {}", list(&a));
        if d.iter().any(|x| *x != 0.0) {
            let _ = writeln!(t, "diffusivity = {}", list(&d));
        }
    } else {
        let vars: Vec<String> = sys.variables.iter().map(|v| format!("\"{v}\"")).collect();
        let _ = writeln!(
            t,
            "[model]\nkind = \"linear\"\nvariables = [{}]",
            vars.join(", ")
        );
        let _ = writeln!(t, "flux = {}", matrices(&sys.flux));
        if sys.diffusion.iter().any(|k| k.iter().any(|x| *x != 0.0)) {
            let _ = writeln!(t, "diffusion = {}", matrices(&sys.diffusion));
        }
        if sys.source.iter().any(|x| *x != 0.0) {
            let _ = writeln!(t, "source = {}", matrix(&sys.source));
        }
    }
    let _ = writeln!(t, "\n[space]\nfirst = {}", names(&s.first));
    let _ = writeln!(t, "second = {}", names(&s.second));
    let up = match s.upwind {
        Upwind::Characteristic => "characteristic",
        Upwind::Rusanov => "rusanov",
    };
    let _ = writeln!(t, "upwind = \"{up}\"");
    if let Some(d) = s.dissipation {
        let _ = writeln!(
            t,
            "dissipation = {{ order = {}, strength = {:?} }}",
            d.order, d.strength
        );
    }
    let mut seen = Vec::new();
    for st in s.first.iter().filter(|st| !st.builtin) {
        if seen.contains(&st.name) {
            continue;
        }
        seen.push(st.name.clone());
        let _ = writeln!(
            t,
            "\n[space.stencils.{}]\nderivative = 1\noffsets = {}\nweights = {}",
            st.name,
            list(&st.offsets),
            list(&st.weights)
        );
        if st.is_compact() {
            let _ = writeln!(
                t,
                "implicit_offsets = {}\nimplicit_weights = {}",
                list(&st.lhs_offsets),
                list(&st.lhs_weights)
            );
        }
    }
    let _ = writeln!(
        t,
        "\n[time]\n{}courant = 0.5\n",
        method_lines(&s.method, &sys.variables)
    );
    let _ = writeln!(
        t,
        "[scan]\npoints = {:?}\ndirections = {}\nanalyses = [\"limit\"]",
        vec![s.points; s.dims()],
        s.directions
    );
    t
}
