//! Non-normality and transient growth against closed forms and theorems
//! (Trefethen & Embree, Spectra and Pseudospectra, 2005; Henrici 1962).

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::growth;
use kgain::sample::Par;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

fn c(re: f64, im: f64) -> C64 {
    C64::new(re, im)
}

fn jordan(lambda: C64) -> DMatrix<C64> {
    DMatrix::from_row_slice(2, 2, &[lambda, c(1.0, 0.0), c(0.0, 0.0), lambda])
}

/// ‖[[a, b], [0, a]]‖₂ for a, b ≥ 0: (b + √(b² + 4a²))/2.
fn jordan_power_norm(lambda: C64, n: usize) -> f64 {
    let r = lambda.norm();
    let a = r.powi(n as i32);
    let b = if n == 0 {
        0.0
    } else {
        n as f64 * r.powi(n as i32 - 1)
    };
    0.5 * (b + (b * b + 4.0 * a * a).sqrt())
}

fn run(text: &str, par: Par) -> kgain::analysis::Results {
    let case = support::case(text);
    match par {
        Par::Seq => support::analyse(&case),
        Par::Threads(n) => support::analyse_par(&case, n),
    }
}

#[test]
fn jordan_block_powers_have_their_exact_norms() {
    // Trefethen & Embree (2005): J^n = [[λ^n, nλ^(n−1)], [0, λ^n]] for J = [[λ, 1], [0, λ]].
    for lambda in [c(0.9, 0.0), c(0.0, 1.0), c(-0.6, 0.7)] {
        let norms = growth::power_norms(&jordan(lambda), 60);
        for (n, got) in norms.iter().enumerate() {
            let want = jordan_power_norm(lambda, n);
            assert!(
                (got - want).abs() <= 1e-12 * want.max(1.0),
                "n = {n}, lambda = {lambda}: {got} vs {want}"
            );
        }
    }
}

#[test]
fn kreiss_bounds_bracket_the_growth_of_a_jordan_block() {
    // Kreiss matrix theorem (Trefethen & Embree 2005): K ≤ sup_n ‖J^n‖ ≤ e·m·K, m = 2.
    let j = jordan(c(0.9, 0.0));
    let k = growth::kreiss_lower_bound(&j);
    let sup = growth::power_norms(&j, 400).into_iter().fold(0.0, f64::max);
    assert!(
        k <= sup * (1.0 + 1e-12),
        "K = {k} must not exceed sup = {sup}"
    );
    assert!(
        sup <= std::f64::consts::E * 2.0 * k,
        "sup = {sup} must not exceed e m K = {}",
        std::f64::consts::E * 2.0 * k
    );
    // a matrix with an eigenvalue outside the unit disc has an infinite Kreiss constant
    assert!(growth::kreiss_lower_bound(&jordan(c(1.01, 0.0))).is_infinite());
}

#[test]
fn kreiss_bound_is_sharp_enough_near_the_unit_circle() {
    // [[λ, 1], [0, λ]] with λ = 0.9995 e^{iπ/128}: the resolvent peaks close
    // to the eigenvalue, whose angle lies midway between two angles of a fixed
    // 128-angle polar grid (that grid alone gives K ≈ 19, numpy, while
    // sup ‖Gⁿ‖/(e m) ≈ 135). The theorem's right-hand side,
    // sup_n ‖Gⁿ‖ ≤ e·m·K, turns the true growth into a floor for any honest
    // lower bound of K.
    let lambda = C64::from_polar(0.9995, std::f64::consts::PI / 128.0);
    let g = DMatrix::from_row_slice(2, 2, &[lambda, c(1.0, 0.0), c(0.0, 0.0), lambda]);
    let k = growth::kreiss_lower_bound(&g);
    let sup = growth::power_norms(&g, 20000)
        .into_iter()
        .fold(0.0, f64::max);
    assert!(k <= sup * (1.0 + 1e-12), "K = {k} above sup = {sup}");
    assert!(
        sup <= std::f64::consts::E * 2.0 * k,
        "K = {k} too weak: sup ||G^n|| = {sup} > e m K"
    );
}

#[test]
fn kreiss_bound_is_at_least_one_for_every_matrix() {
    // (|z| − 1)‖(zI − G)⁻¹‖ → 1 as |z| → ∞, so K ≥ 1 always; a normal matrix
    // inside the disc (here diagonal) has K = 1 exactly.
    let zero = DMatrix::from_element(3, 3, c(0.0, 0.0));
    let normal = DMatrix::from_diagonal(&nalgebra::DVector::from_vec(vec![
        c(0.5, 0.1),
        c(-0.3, 0.0),
        c(0.0, 0.9),
    ]));
    for g in [zero, normal] {
        let k = growth::kreiss_lower_bound(&g);
        assert!((1.0 - 1e-9..=1.0 + 1e-9).contains(&k), "K = {k}");
    }
}

#[test]
fn pseudospectral_radius_of_a_normal_matrix_is_rho_plus_epsilon() {
    // For normal G the ε-pseudospectrum is the union of ε-discs around the
    // eigenvalues (Trefethen & Embree 2005), so ρ_ε = ρ + ε.
    let g = DMatrix::from_diagonal(&nalgebra::DVector::from_vec(vec![
        c(0.5, 0.5),
        c(-0.9, 0.0),
        c(0.0, 0.2),
    ]));
    let eps = 1e-3;
    let r = growth::pseudospectral_radius(&g, eps);
    assert!((r - (0.9 + eps)).abs() <= 1e-9, "rho_eps = {r}");
    // a Jordan block's pseudospectrum is much larger: radius ≈ |λ| + √ε
    let rj = growth::pseudospectral_radius(&jordan(c(0.5, 0.0)), eps);
    assert!(rj > 0.5 + 0.9 * eps.sqrt(), "Jordan block rho_eps = {rj}");
}

const LEAPFROG_AT_LIMIT: &str = r#"
[grid]
spacing = [1.0]
[model]
kind = "advection"
velocity = [1.0]
[space]
first = "central2"
[time]
method = "leapfrog"
courant = 1.0
[scan]
points = [129]
steps = 64
analyses = ["radius", "growth"]
"#;

#[test]
fn leapfrog_at_exactly_its_limit_is_weakly_unstable() {
    // Strikwerda: leapfrog + C2 at ν = 1 has the double root ζ = i at θ = π/2, a
    // defective eigenvalue on the unit circle; ‖G^n‖ grows linearly.
    let r = run(LEAPFROG_AT_LIMIT, Par::Seq);
    let rad = r.radius.unwrap();
    assert!(rad.stable, "every |λ| ≤ 1 + tolerance");
    let g = r.growth.unwrap();
    assert_eq!(g.class.as_str(), "weakly-unstable", "{}", g.verdict);
    assert!(g.defective_on_circle > 0);
    // linear growth: the envelope at n is about proportional to n
    let e = &g.envelope;
    assert!(
        e[64] > 1.8 * e[32] && e[64] < 2.2 * e[32],
        "{} vs {}",
        e[64],
        e[32]
    );
}

#[test]
fn scalar_schemes_are_normal_and_never_grow() {
    // A 1×1 amplification factor is normal: departure 0, κ(V) = 1 (common practice);
    // below the limit |g| ≤ 1, so ‖G^n‖ ≤ 1.
    let text = LEAPFROG_AT_LIMIT
        .replace("method = \"leapfrog\"", "method = \"rk4\"")
        .replace("courant = 1.0", "courant = 2.0");
    let g = run(&text, Par::Seq).growth.unwrap();
    assert!(g.departure.iter().all(|d| *d == 0.0));
    assert!(g.condition.iter().all(|k| (*k - 1.0).abs() < 1e-12));
    assert!(g.envelope.iter().all(|v| *v <= 1.0 + 1e-12));
    assert_eq!(g.class.as_str(), "stable-normal");
}

const SEDIMENT: &str = r#"
[grid]
spacing = [2.0]
[model]
kind = "linear"
variables = ["c", "s"]
flux = [ [[1.0, 0.0], [8.0, 1.1]] ]
[space]
first = "upwind1"
[time]
method = "euler"
courant = 0.9
[scan]
points = [33]
steps = 40
analyses = ["radius", "growth"]
"#;

#[test]
fn pruned_envelope_equals_the_brute_force_maximum_over_the_grid() {
    // The envelope skips exact 2-norms that cannot win; it must still equal the
    // brute-force max over every node of the exact ‖G^n‖₂ (common practice check
    // of a fast path against its slow reference).
    let case = support::case(SEDIMENT);
    let r = support::analyse_par(&case, 2);
    let g = r.growth.unwrap();
    let op = case.problem.operator();
    let mut brute = vec![0.0f64; g.steps + 1];
    for th in &r.grid.coords[0] {
        let gm = kgain::analysis::amplification_at(&case.problem, &op, &[*th], r.dt);
        for (n, v) in growth::power_norms(&gm, g.steps).iter().enumerate() {
            brute[n] = brute[n].max(*v);
        }
    }
    for (n, (a, b)) in g.envelope.iter().zip(&brute).enumerate() {
        assert!((a - b).abs() <= 1e-12 * b.max(1.0), "n = {n}: {a} vs {b}");
    }
    assert_eq!(g.class.as_str(), "stable-transient-growth");
    assert!(
        g.peak.0 > 5.0,
        "a strongly non-normal flux gives large transient growth"
    );
}

#[test]
fn pruned_envelope_of_a_two_d_euler_system_equals_the_brute_force_maximum() {
    // A 4×4 G with transient growth in the identity norm (linearised 2-D Euler,
    // C4, RK4; envelope about 2.4): most (θ, n) are ruled out by the bracket
    // or the Cholesky exclusion test rather than an SVD. The envelope and its
    // peak must still equal the brute-force maximum of the exact ‖Gⁿ‖₂ over
    // every node (a fast path against its slow reference).
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/bench/peer-euler2d.toml");
    let text = std::fs::read_to_string(path).expect("bundled benchmark case");
    let overrides = [
        "scan.points=[17,17]",
        "scan.weights=[1,1,1,1]",
        "scan.steps=60",
        "scan.analyses=[\"growth\"]",
    ];
    let case = support::case_with(&text, &overrides.map(String::from));
    let r = support::analyse_par(&case, 2);
    let g = r.growth.unwrap();
    let op = case.problem.operator();
    let mut brute = vec![0.0f64; g.steps + 1];
    for tx in &r.grid.coords[0] {
        for ty in &r.grid.coords[1] {
            let gm = kgain::analysis::amplification_at(&case.problem, &op, &[*tx, *ty], r.dt);
            for (n, v) in growth::power_norms(&gm, g.steps).iter().enumerate() {
                brute[n] = brute[n].max(*v);
            }
        }
    }
    for (n, (a, b)) in g.envelope.iter().zip(&brute).enumerate() {
        assert!((a - b).abs() <= 1e-12 * b.max(1.0), "n = {n}: {a} vs {b}");
    }
    let top = brute.iter().copied().fold(0.0, f64::max);
    assert!(top > 2.0, "transient growth expected, got {top}");
    assert!(
        (g.peak.0 - top).abs() <= 1e-12 * top,
        "peak {} vs {top}",
        g.peak.0
    );
}

#[test]
fn sequential_and_parallel_growth_sweeps_agree_exactly() {
    // Parallelism must not change results.
    let a = run(SEDIMENT, Par::Seq).growth.unwrap();
    let b = run(SEDIMENT, Par::Threads(2)).growth.unwrap();
    assert_eq!(a.envelope, b.envelope);
    assert_eq!(a.norm, b.norm);
    assert_eq!(a.departure, b.departure);
}

#[test]
fn envelope_is_bracketed_by_spectral_radius_and_norm_powers() {
    // ρ(G)^n ≤ ‖G^n‖₂ ≤ ‖G‖₂^n at every wavevector, hence for the maxima too.
    let r = run(SEDIMENT, Par::Seq);
    let g = r.growth.unwrap();
    let rho = r.radius.unwrap().max;
    let nmax = g.norm.iter().copied().fold(0.0, f64::max);
    for (n, e) in g.envelope.iter().enumerate() {
        let n = n as i32;
        assert!(*e >= rho.powi(n) * (1.0 - 1e-12) && *e <= nmax.powi(n) * (1.0 + 1e-12));
    }
}

#[test]
fn linearised_euler_in_its_symmetrising_norm_shows_no_transient_growth() {
    // Common practice: in the variables (p'/(ρc) − cρ'/ρ, u, p'/(ρc)) the linearised
    // Euler fluxes are symmetric, so central differences give a skew-Hermitian L and
    // RK4 below its limit a normal contraction: ||G^n|| <= 1 (no 1 + sqrt 2 artefact
    // of the primitive variables).
    let text = r#"
[grid]
spacing = [1.0, 1.0]
[model]
kind = "euler"
density = 1.0
pressure = 0.7142857142857143
gamma = 1.4
velocity = [0.5, 0.2]
[space]
first = "central4"
[time]
method = "rk4"
courant = 1.0
[scan]
points = [33, 33]
steps = 60
analyses = ["growth"]
"#;
    let g = run(text, Par::Threads(2)).growth.unwrap();
    assert!(
        g.envelope.iter().all(|v| *v <= 1.0 + 1e-12),
        "max {}",
        g.peak.0
    );
    assert!(g.departure.iter().all(|d| *d <= 1e-7));
    assert_eq!(g.class.as_str(), "stable-normal");
}

#[test]
fn a_normal_amplification_matrix_with_a_repeated_eigenvalue_has_eigenvector_condition_one() {
    // The bundled 3-D combustor in its symmetrising norm: G is normal (departure at
    // rounding), and its entropy and two vorticity waves share one eigenvalue. A
    // normal matrix has orthonormal eigenvectors, so κ₂(V) = 1; dividing rounding
    // by rounding inside the repeated eigenvalue gave an arbitrary basis of its
    // eigenspace and κ₂ up to 10.4 on this grid.
    let text = std::fs::read_to_string("cases/combustor-euler3d.toml").expect("bundled case");
    let case = support::case_with(
        &text,
        &[
            "scan.analyses=[\"growth\"]".to_string(),
            "scan.points=[17,17,17]".to_string(),
        ],
    );
    let g = support::analyse_par(&case, 2)
        .growth
        .expect("growth computed");
    let departure = g.departure.iter().fold(0.0f64, |a, d| a.max(*d));
    assert!(departure <= 1e-14, "departure {departure}");
    let worst = g.condition.iter().fold(0.0f64, |a, k| a.max(*k));
    assert!(
        worst <= 1.0 + 1e-9,
        "largest eigenvector condition number {worst}"
    );
}

#[test]
fn a_user_telegraph_line_is_measured_in_its_energy_norm() {
    // v_t + i_x/C = 0, i_t + v_x/L = 0 with L = 250 nH/m, C = 100 pF/m (Z0 = 50 Ω),
    // upwind-free central differences and RK4. The energy C v²/2 + L i²/2 is
    // ‖diag(1, Z0) u‖² up to a factor (common practice); the automatic diagonal
    // symmetriser must find W = diag(1, 50), and the growth it reports must equal
    // the growth measured with those weights given explicitly. In the identity
    // norm of volts and amperes the same scheme "grows" by the ratio of units.
    let base = "[grid]\nspacing = [1.0e-3]\n[model]\nkind = \"linear\"\nvariables = [\"v\", \"i\"]\nflux = [ [[0.0, 1.0e10], [4.0e6, 0.0]] ]\n[space]\nfirst = \"central4\"\n[time]\nmethod = \"rk4\"\ncourant = 0.5\n[scan]\npoints = [65]\nsteps = 40\nanalyses = [\"growth\"]\n";
    let auto = run(base, Par::Seq);
    let explicit = run(&format!("{base}weights = [1.0, 50.0]\n"), Par::Seq);
    let identity = run(&format!("{base}weights = [1.0, 1.0]\n"), Par::Seq);
    let (a, e, i) = (
        auto.growth.as_ref().unwrap(),
        explicit.growth.as_ref().unwrap(),
        identity.growth.as_ref().unwrap(),
    );
    assert_eq!(a.norm_matrix, e.norm_matrix);
    for (x, y) in a.envelope.iter().zip(&e.envelope) {
        assert!((x - y).abs() <= 1e-12 * y, "{x} vs {y}");
    }
    // RK4 + central differences is normal in the energy norm: no growth
    assert!(a.envelope.iter().all(|v| *v <= 1.0 + 1e-9));
    assert!(i.envelope.iter().fold(0.0f64, |m, v| m.max(*v)) > 10.0);
}

#[test]
fn a_user_system_without_a_diagonal_symmetriser_carries_a_caution() {
    // lower-triangular coupling: waves of speeds 1 and 1.1 whose eigenvectors
    // are nearly parallel (condition number 160); growth stays in the identity
    // norm, and the summary says how far an energy norm could differ
    let text = "[grid]\nspacing = [1.0]\n[model]\nkind = \"linear\"\nvariables = [\"c\", \"s\"]\nflux = [ [[1.0, 0.0], [8.0, 1.1]] ]\n[space]\nfirst = \"upwind1\"\n[time]\nmethod = \"euler\"\ncourant = 0.9\n[scan]\npoints = [33]\nsteps = 20\nanalyses = [\"growth\"]\n";
    let case = support::case(text);
    let r = support::analyse(&case);
    let s = kgain::report::summary_json(&case.problem, &r);
    let origin = &s["growth"]["norm_origin"];
    assert_eq!(origin["kind"], "identity");
    let k = origin["flux_eigenvector_condition"].as_f64().unwrap();
    assert!((k - 160.0).abs() < 1.0, "{k}");
    assert!(origin["caution"].as_str().unwrap().contains("scan.weights"));
}
