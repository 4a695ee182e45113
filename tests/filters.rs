//! Spatial filters (explicit centred and compact) and leapfrog time filters
//! (Robert–Asselin, Robert–Asselin–Williams): transfer functions against their
//! closed forms, G = F(θ)·R(ΔtL) against a direct evaluation, limits against
//! closed forms derived here, and the filtered leapfrog's multistep form against
//! the three-level scheme stepped from its definition.

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::limit::LimitKind;
use kgain::stencil::filter::SpatialFilter;
use kgain::time::time_filter::TimeFilter;
use kgain::time::Method;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

fn thetas() -> impl Iterator<Item = f64> {
    (0..=200).map(|i| -PI + 2.0 * PI * i as f64 / 200.0)
}

#[test]
fn explicit_filters_have_the_transfer_function_one_minus_sigma_sin_to_the_order() {
    // Closed form derived from the symbol of the second difference,
    // δ² → −4 sin²(θ/2): û = u − σ(−1)^p 4^{−p} δ^{2p}u has T = 1 − σ sin^{2p}(θ/2).
    // Common practice: σ = 1, order 2 is the 1-2-1 smoother (1/4, 1/2, 1/4).
    let smoother = SpatialFilter::explicit(2, 1.0).unwrap().stencil().0;
    for (w, want) in smoother.iter().zip([0.25, 0.5, 0.25]) {
        assert!(
            (w - want).abs() <= 1e-15,
            "1-2-1 smoother weights {smoother:?}"
        );
    }
    for order in [2, 4, 6, 8, 10] {
        for sigma in [0.05, 0.3, 1.0] {
            let f = SpatialFilter::explicit(order, sigma).unwrap();
            let (w, _) = f.stencil();
            assert_eq!(w.len(), order as usize + 1, "points of order {order}");
            assert!((w.iter().sum::<f64>() - 1.0).abs() <= 1e-14, "T(0) = 1");
            for t in thetas() {
                let want = 1.0 - sigma * (0.5 * t).sin().powi(order as i32);
                let got = f.transfer_from_stencil(t);
                assert!(
                    (got - want).abs() <= 1e-14,
                    "order {order}, sigma {sigma}, theta {t}: {got} vs {want}"
                );
                assert!((f.transfer(t) - want).abs() <= 1e-15);
            }
        }
    }
}

#[test]
fn compact_filter_tables_match_the_maximally_flat_closed_form() {
    // The compact filter of order 2N has a degree-N cosine polynomial over
    // 1 + 2α cos θ; T(π) = 0 and 1 − T = O(θ^{2N}) leave only
    // T = 1 − (1 − 2α) sin^{2N}(θ/2)/(1 + 2α cos θ) (derived here: the numerator
    // 1 + 2α cos θ − (1 − 2α) sin^{2N}(θ/2) is a cosine polynomial of degree N).
    // The coefficient tables (Gaitonde & Visbal 2000) must reproduce it.
    for order in [2, 4, 6, 8, 10] {
        for alpha in [-0.3, 0.0, 0.25, 0.45, 0.49] {
            let f = SpatialFilter::compact(order, alpha).unwrap();
            for t in thetas() {
                let want = 1.0
                    - (1.0 - 2.0 * alpha) * (0.5 * t).sin().powi(order as i32)
                        / (1.0 + 2.0 * alpha * t.cos());
                let got = f.transfer_from_stencil(t);
                assert!(
                    (got - want).abs() <= 1e-13,
                    "order {order}, alpha {alpha}, theta {t}: {got} vs {want}"
                );
            }
            assert!(f.transfer_from_stencil(PI).abs() <= 1e-14, "T(pi) = 0");
            // order: the damping 1 − T (formed without cancellation) over θ^{2N}
            // tends to (1 − 2α)/(4^N (1 + 2α))
            let t = 1e-2;
            let ratio = f.damping(t) / t.powi(order as i32);
            let limit = (1.0 - 2.0 * alpha) / (4f64.powi(order as i32 / 2) * (1.0 + 2.0 * alpha));
            assert!(
                (ratio / limit - 1.0).abs() < 1e-3,
                "order {order}: {ratio} vs {limit}"
            );
        }
    }
}

#[test]
fn a_compact_filter_with_alpha_zero_is_the_explicit_filter_of_strength_one() {
    for order in [2, 4, 6, 8, 10] {
        let c = SpatialFilter::compact(order, 0.0).unwrap().stencil().0;
        let e = SpatialFilter::explicit(order, 1.0).unwrap().stencil().0;
        for (a, b) in c.iter().zip(&e) {
            assert!((a - b).abs() <= 1e-15, "order {order}: {c:?} vs {e:?}");
        }
    }
}

#[test]
fn bad_filter_parameters_are_refused() {
    assert!(SpatialFilter::explicit(3, 0.5).is_err());
    assert!(SpatialFilter::explicit(12, 0.5).is_err());
    assert!(SpatialFilter::explicit(4, 0.0).is_err());
    assert!(SpatialFilter::explicit(4, 1.5).is_err());
    assert!(SpatialFilter::compact(4, 0.5).is_err());
    assert!(SpatialFilter::compact(4, -0.5).is_err());
    assert!(SpatialFilter::compact(4, f64::NAN).is_err());
    assert!(TimeFilter::robert_asselin(0.5).is_err());
    assert!(TimeFilter::robert_asselin(0.0).is_err());
    assert!(TimeFilter::raw(0.1, 0.0).is_err());
    assert!(TimeFilter::raw(0.1, 1.2).is_err());
}

fn advection(filter: &str, method: &str, courant: f64, analyses: &str) -> String {
    format!(
        "[grid]\nspacing = [1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0]\n\
         [space]\nfirst = \"central2\"\n{filter}[time]\nmethod = \"{method}\"\ncourant = {courant}\n\
         [scan]\npoints = [129]\nanalyses = [{analyses}]\n"
    )
}

#[test]
fn rk4_with_a_compact_filter_has_radius_t_times_r() {
    // G = F(θ) R(ΔtL) with L = −i a sin θ / h (C2) and R the RK4 polynomial:
    // the radius is T(θ)|R(−iν sin θ)|, evaluated here directly.
    let filter = "[space.filter]\nkind = \"compact\"\norder = 8\nalpha = 0.4\n";
    let case = support::case(&advection(filter, "rk4", 2.5, "\"radius\""));
    let r = support::analyse_par(&case, 1);
    let map = &r.radius.as_ref().unwrap().map;
    let f = SpatialFilter::compact(8, 0.4).unwrap();
    for (i, t) in r.grid.coords[0].iter().enumerate() {
        let z = C64::new(0.0, -2.5 * t.sin());
        let rk4 = C64::new(1.0, 0.0) + z + z * z / 2.0 + z * z * z / 6.0 + z * z * z * z / 24.0;
        let want = f.transfer(*t) * rk4.norm();
        assert!(
            (map[i] - want).abs() <= 1e-13,
            "theta {t}: {} vs {want}",
            map[i]
        );
    }
}

#[test]
fn forward_euler_with_a_second_order_filter_is_stable_up_to_root_of_half_sigma() {
    // FTCS (forward Euler, C2) is unstable at every Δt; after the explicit
    // order-2 filter of strength σ, with x = sin²(θ/2),
    // |G|² = (1 − σx)²(1 + 4ν²x(1 − x)) ≤ 1 ⇔ ν² ≤ σ(2 − σx)/(4(1 − σx)²(1 − x)),
    // whose right side increases with x: the limit is its value at x → 0,
    // ν_max = √(σ/2), set by the longest waves (derived here).
    for sigma in [0.25_f64, 0.5, 1.0] {
        let filter =
            format!("[space.filter]\nkind = \"explicit\"\norder = 2\nstrength = {sigma}\n");
        let case = support::case(&advection(&filter, "euler", 0.1, "\"limit\""));
        let r = support::analyse_par(&case, 2);
        let lim = r.limit.as_ref().unwrap();
        let want = (0.5 * sigma).sqrt();
        assert_eq!(lim.kind, LimitKind::Bounded, "sigma {sigma}");
        assert!(
            lim.dt_max <= want * (1.0 + 1e-12),
            "unsafe: {} > {want}",
            lim.dt_max
        );
        support::assert_close(lim.dt_max, want, 1e-6, &format!("sigma {sigma}"));
    }
}

#[test]
fn forward_euler_with_a_fourth_order_filter_is_unstable_at_every_dt() {
    // With the order-4 filter the damping σx² loses to FTCS's growth 4ν²x at
    // small x = sin²(θ/2): |G|² = 1 + 4ν²x − 2σx² + O(x²ν², x³) > 1 for every ν > 0.
    let filter = "[space.filter]\nkind = \"explicit\"\norder = 4\nstrength = 1.0\n";
    let case = support::case(&advection(filter, "euler", 0.1, "\"limit\""));
    let r = support::analyse_par(&case, 2);
    assert_eq!(r.limit.as_ref().unwrap().kind, LimitKind::None);
}

#[test]
fn a_filter_never_lowers_the_limit_of_rk4() {
    // F(θ) ∈ [0, 1] and G = F·R: ρ(G) = F ρ(R) ≤ ρ(R), so the filtered limit is
    // at least RK4's C2 limit 2√2 (imaginary-axis limit of RK4, common practice).
    let filter = "[space.filter]\nkind = \"compact\"\norder = 10\nalpha = 0.45\n";
    let case = support::case(&advection(filter, "rk4", 1.0, "\"limit\""));
    let r = support::analyse_par(&case, 2);
    let lim = r.limit.as_ref().unwrap();
    assert!(lim.dt_max >= 8f64.sqrt() * (1.0 - 1e-9), "{}", lim.dt_max);
}

fn filtered_leapfrog(filter: TimeFilter) -> Method {
    Method {
        name: "leapfrog+filter".into(),
        order: 1,
        explicit: true,
        scheme: kgain::time::Scheme::Multistep(filter.filtered_leapfrog()),
    }
}

#[test]
fn robert_asselin_roots_match_the_published_closed_form() {
    // Leapfrog + Robert–Asselin on u' = iωu, Ω = ωΔt:
    // A± = γ + iΩ ± √((1 − γ)² − Ω²) (Durran, Numerical Methods for Wave
    // Equations in Geophysical Fluid Dynamics, 1999, from memory; derived again
    // here from A² − 2(γ + iΩ)A + 2γiΩ − (1 − 2γ) = 0). At Ω = 0 the
    // computational mode is −(1 − 2γ): damped by 1 − 2γ per step (Asselin 1972).
    for gamma in [0.01, 0.1, 0.2] {
        let m = filtered_leapfrog(TimeFilter::robert_asselin(gamma).unwrap());
        // (not at Ω = 1 − γ, a double root, which any root finder gets only to √ε)
        for om in [0.0, 0.2, 0.5, 0.7, 0.95, 1.2] {
            let z = C64::new(0.0, om);
            let root = (C64::new((1.0 - gamma).powi(2) - om * om, 0.0)).sqrt();
            let want = [C64::new(gamma, om) + root, C64::new(gamma, om) - root];
            let got = m.amplification_eigenvalues(z);
            for w in want {
                let d = got
                    .iter()
                    .map(|g| (g - w).norm())
                    .fold(f64::INFINITY, f64::min);
                assert!(d <= 1e-13, "gamma {gamma}, Omega {om}: {got:?} vs {want:?}");
            }
        }
        let at_rest = m.amplification_eigenvalues(C64::new(0.0, 0.0));
        assert!(at_rest
            .iter()
            .any(|a| (a - C64::new(-(1.0 - 2.0 * gamma), 0.0)).norm() <= 1e-15));
        assert!(at_rest
            .iter()
            .any(|a| (a - C64::new(1.0, 0.0)).norm() <= 1e-15));
    }
}

/// The three-level amplification matrix of leapfrog + RAW on u' = zu/Δt, built
/// by stepping the definition on the two basis states (ũ^n, ū^{n−1}).
fn raw_matrix(z: C64, gamma: f64, a: f64) -> [[C64; 2]; 2] {
    let zero = C64::new(0.0, 0.0);
    let one = C64::new(1.0, 0.0);
    let column = |ut: C64, ub: C64| {
        let unew = ub + 2.0 * z * ut;
        let d = gamma * (ub - 2.0 * ut + unew);
        (unew - (1.0 - a) * d, ut + a * d)
    };
    let (c0, c1) = (column(one, zero), column(zero, one));
    [[c0.0, c1.0], [c0.1, c1.1]]
}

#[test]
fn raw_multistep_form_has_the_eigenvalues_of_the_three_level_scheme() {
    for (gamma, a) in [(0.1, 0.53), (0.05, 0.5), (0.2, 1.0), (0.1, 0.8)] {
        let m = filtered_leapfrog(TimeFilter::raw(gamma, a).unwrap());
        for (re, im) in [
            (0.0, 0.3),
            (-0.2, 0.7),
            (0.1, -0.4),
            (-1.0, 0.0),
            (0.0, 1.1),
        ] {
            let z = C64::new(re, im);
            let g = raw_matrix(z, gamma, a);
            let tr = g[0][0] + g[1][1];
            let det = g[0][0] * g[1][1] - g[0][1] * g[1][0];
            let disc = (tr * tr - 4.0 * det).sqrt();
            let want = [(tr + disc) / 2.0, (tr - disc) / 2.0];
            let got = m.amplification_eigenvalues(z);
            for w in want {
                let d = got
                    .iter()
                    .map(|x| (x - w).norm())
                    .fold(f64::INFINITY, f64::min);
                assert!(
                    d <= 1e-13,
                    "gamma {gamma}, a {a}, z {z}: {got:?} vs {want:?}"
                );
            }
        }
    }
}

#[test]
fn raw_with_half_weight_is_second_order_and_robert_asselin_first() {
    // Williams (2009): the RAW filter with a = 1/2 keeps leapfrog's second order;
    // Robert–Asselin (a = 1) reduces it to first order. From the multistep error
    // constants.
    assert_eq!(
        TimeFilter::raw(0.1, 0.5)
            .unwrap()
            .filtered_leapfrog()
            .order(),
        2
    );
    assert_eq!(
        TimeFilter::robert_asselin(0.1)
            .unwrap()
            .filtered_leapfrog()
            .order(),
        1
    );
    assert_eq!(
        TimeFilter::raw(0.1, 0.53)
            .unwrap()
            .filtered_leapfrog()
            .order(),
        1
    );
}

#[test]
fn leapfrog_with_robert_asselin_on_c2_is_stable_up_to_its_closed_form() {
    // |A+| = 1 on the imaginary axis where Ω + √(Ω² − (1 − γ)²) = √(1 − γ²), i.e.
    // Ω* = √((1 − γ)/(1 + γ)) (derived here from the closed form above); with C2,
    // Ω = ν sin θ, so ν_max = Ω*. The filter shrinks leapfrog's limit of 1.
    for gamma in [0.05_f64, 0.1, 0.2] {
        let text = advection("", "leapfrog", 0.5, "\"limit\"").replace(
            "courant = 0.5",
            &format!("courant = 0.5\nfilter = \"robert-asselin\"\nfilter_strength = {gamma}"),
        );
        let case = support::case(&text);
        assert_eq!(case.problem.method.order, 1);
        let r = support::analyse_par(&case, 2);
        let lim = r.limit.as_ref().unwrap();
        let want = ((1.0 - gamma) / (1.0 + gamma)).sqrt();
        assert!(
            lim.dt_max <= want * (1.0 + 1e-12),
            "unsafe: {} > {want}",
            lim.dt_max
        );
        support::assert_close(lim.dt_max, want, 1e-9, &format!("gamma {gamma}"));
    }
}

#[test]
fn the_terminal_and_summary_name_the_spatial_filter() {
    let dir = tempfile::tempdir().unwrap();
    let case = dir.path().join("filtered.toml");
    let filter = "[space.filter]\nkind = \"compact\"\norder = 6\nalpha = 0.45\n";
    std::fs::write(
        &case,
        advection(filter, "rk4", 1.0, "\"radius\", \"limit\""),
    )
    .unwrap();
    let out = dir.path().join("out");
    let run = std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
        .arg("run")
        .arg(&case)
        .arg("--out")
        .arg(&out)
        .output()
        .unwrap();
    assert_eq!(
        run.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let text = String::from_utf8_lossy(&run.stdout);
    assert!(
        text.contains("compact order-6 filter (alpha_f = 0.45) once per step"),
        "{text}"
    );
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("summary.json")).unwrap()).unwrap();
    assert_eq!(summary["method"], "rk4+filter");
    assert_eq!(
        summary["spatial_filter"],
        "compact order-6 filter (alpha_f = 0.45)"
    );
}

#[test]
fn a_filtered_composite_step_is_the_filter_times_the_unfiltered_step() {
    // G of (scheme + filter) = F(θ)·G(scheme) at every wavevector, for composite
    // steps whose G is built from pieces of the symbol (the increment path
    // E − s(I + E) must give the same matrix as the product).
    use kgain::analysis::amplification_at;
    let base = "[grid]\nspacing = [1.0, 2.0]\n[model]\nkind = \"acoustics\"\nsound_speed = 1.0\n\
                velocity = [0.3, 0.1]\n[time]\nMETHOD\ncourant = 0.4\n[scan]\npoints = [9, 9]\n";
    let filter = "[space.filter]\nkind = \"compact\"\norder = 6\nalpha = 0.3\n";
    let f = SpatialFilter::compact(6, 0.3).unwrap();
    for method in [
        "method = \"lax-wendroff\"",
        "method = \"forward-backward\"\nfirst = [\"p\"]",
        "method = \"rk4\"\nsplitting = \"strang\"",
    ] {
        let plain = support::case(&base.replace("METHOD", method));
        let filtered = support::case(&format!("{}{filter}", base.replace("METHOD", method)));
        let (pp, fp) = (&plain.problem, &filtered.problem);
        assert!(fp.method.spatial_filter().is_some(), "{method}");
        let (po, fo) = (pp.operator(), fp.operator());
        let dt = 0.37;
        for theta in [[0.3, -1.2], [3.0, 0.1], [-2.2, 2.9], [1e-4, 2e-4]] {
            let g = amplification_at(pp, &po, &theta, dt);
            let gf = amplification_at(fp, &fo, &theta, dt);
            let t = f.transfer(theta[0]) * f.transfer(theta[1]);
            for i in 0..g.nrows() {
                for j in 0..g.ncols() {
                    let want = g[(i, j)] * t;
                    assert!(
                        (gf[(i, j)] - want).norm() <= 1e-13,
                        "{method} at {theta:?}: {} vs {want}",
                        gf[(i, j)]
                    );
                }
            }
        }
    }
}
