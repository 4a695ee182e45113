//! Dispersion analysis against published relations (sources beside each check).

#[path = "support/mod.rs"]
mod support;

use kgain::analysis::dispersion::DispersionResult;
use kgain::case::Case;
use num_complex::Complex64 as C64;

/// A named closed form of one variable.
type Form1 = (&'static str, fn(f64) -> f64);
/// A named closed form of two angles and a parameter.
type Form3 = (&'static str, fn(f64, f64, f64) -> f64);

fn run(text: &str) -> (Case, kgain::analysis::Results) {
    let case = support::case(text);
    let r = support::analyse_par(&case, 2);
    (case, r)
}

fn advection_1d(stencil: &str, method: &str, courant: f64) -> String {
    format!(
        "[grid]\nspacing = [1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0]\n[space]\nfirst = \"{stencil}\"\n[time]\nmethod = \"{method}\"\ncourant = {courant}\n[scan]\npoints = [65]\nanalyses = [\"dispersion\"]\n"
    )
}

fn disp(r: &kgain::analysis::Results) -> &DispersionResult {
    r.dispersion.as_ref().expect("dispersion computed")
}

#[test]
fn central_second_order_phase_is_sin_theta_and_group_velocity_is_cos_theta() {
    // Common practice (von Neumann analysis): C2 gives ω = a sin(θ)/h, so
    // c_num/c = sin θ/θ and the group velocity is a cos θ.
    let (_, r) = run(&advection_1d("central2", "rk4", 0.5));
    let d = disp(&r);
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        let w = d.node(i).numerical[0];
        assert!((w.re - th.sin()).abs() <= 1e-12, "omega at {th}");
        assert!(w.im.abs() <= 1e-12);
        // exact derivatives from the eigenvectors: rounding only
        let g = d.node(i).group[0];
        assert!(
            (g - th.cos()).abs() <= 1e-14,
            "group velocity {g} vs cos {th}"
        );
        assert!((d.node(i).group_exact[0] - 1.0).abs() <= 1e-15);
    }
}

#[test]
fn modified_wavenumbers_of_c4_and_compact_stencils_set_the_phase_speed() {
    // C4: (8 sin θ − sin 2θ)/6 (common practice); Padé compact 4: (3/2 sin θ)/(1 + ½ cos θ);
    // compact 6: (14/9 sin θ + 1/18 sin 2θ)/(1 + 2/3 cos θ) (Lele, J. Comput. Phys. 103, 1992).
    let forms: [Form1; 3] = [
        ("central4", |t| (8.0 * t.sin() - (2.0 * t).sin()) / 6.0),
        ("compact4", |t| 1.5 * t.sin() / (1.0 + 0.5 * t.cos())),
        ("compact6", |t| {
            (14.0 / 9.0 * t.sin() + (2.0 * t).sin() / 18.0) / (1.0 + 2.0 / 3.0 * t.cos())
        }),
    ];
    for (name, f) in forms {
        let (_, r) = run(&advection_1d(name, "rk4", 0.5));
        let d = disp(&r);
        for (i, th) in r.grid.coords[0].iter().enumerate() {
            assert!(
                (d.node(i).numerical[0].re - f(*th)).abs() <= 1e-12,
                "{name} at {th}"
            );
        }
    }
}

#[test]
fn points_per_wavelength_for_one_percent_error_with_c2_follow_sin_theta_over_theta() {
    // sin θ/θ = 0.99 at θ = 0.24508 (root of the equation, computed here), so
    // C2 needs 2π/θ ≈ 25.6 points per wavelength (common practice).
    let mut th: f64 = 0.2;
    for _ in 0..50 {
        let f = th.sin() / th - 0.99;
        let df = (th * th.cos() - th.sin()) / (th * th);
        th -= f / df;
    }
    let want = 2.0 * std::f64::consts::PI / th;
    let (_, r) = run(&advection_1d("central2", "rk4", 0.1));
    let got = disp(&r).resolution[0].semi_ppw().unwrap();
    // the crossing is found by bisection on the error curve, not interpolated
    assert!((got - want).abs() <= 1e-7 * want, "{got} vs {want}");
}

#[test]
fn upwind_euler_amplitude_per_step_is_the_closed_form() {
    // Common practice: first-order upwind + forward Euler has the amplification
    // factor 1 − ν(1 − e^{−iθ}); |λ| = exp(Im ω Δt) for λ = e^{−iωΔt}.
    let nu = 0.6;
    let (_, r) = run(&advection_1d("upwind1", "euler", nu));
    let d = disp(&r);
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        let g = num_complex::Complex64::new(1.0, 0.0)
            - (num_complex::Complex64::new(1.0, 0.0)
                - num_complex::Complex64::from_polar(1.0, -th))
                * nu;
        let amp = (d.node(i).discrete[0].im * r.dt).exp();
        assert!(
            (amp - g.norm()).abs() <= 1e-12,
            "at {th}: {amp} vs {}",
            g.norm()
        );
    }
}

#[test]
fn leapfrog_has_one_computational_mode_per_variable() {
    // Leapfrog is a two-step method: besides the principal root it has a parasitic
    // root ζ ≈ −1 per mode (common practice; Strikwerda).
    let (_, r) = run(&advection_1d("central2", "leapfrog", 0.5));
    let d = disp(&r);
    assert_eq!(d.computational, 1);
    // the computational root of leapfrog at θ = 0 is ζ = −1: ωΔt = ±π
    let i0 = r.grid.coords[0]
        .iter()
        .position(|t| t.abs() < 1e-12)
        .unwrap();
    let w = d.node(i0).discrete[1];
    assert!(
        ((w.re * r.dt).abs() - std::f64::consts::PI).abs() <= 1e-9,
        "{w}"
    );
}

fn shallow(arrangement: &str) -> String {
    format!(
        "[grid]\nspacing = [1.0e5, 1.0e5]\n[model]\nkind = \"shallow-water\"\ngravity = 9.81\ndepth = 100.0\ncoriolis = 1.0e-4\n[space]\narrangement = \"{arrangement}\"\n[time]\nmethod = \"rk4\"\ncourant = 0.1\n[scan]\npoints = [17, 17]\nanalyses = [\"dispersion\"]\n"
    )
}

#[test]
fn inertia_gravity_frequencies_on_the_a_b_and_c_grids() {
    // Arakawa & Lamb, Methods in Computational Physics 17 (1977), with λ² = gH/f²,
    // X = k d, Y = l d (formulas from memory, re-derived from the staggered
    // differences and averages):
    //   A: (ω/f)² = 1 + (λ/d)²(sin²X + sin²Y)
    //   B: (ω/f)² = 1 + 2(λ/d)²(1 − cos X cos Y)
    //   C: (ω/f)² = cos²(X/2)cos²(Y/2) + 4(λ/d)²(sin²(X/2) + sin²(Y/2))
    let (f, g, h, d) = (1.0e-4, 9.81, 100.0, 1.0e5);
    let l2 = g * h / (f * f) / (d * d);
    let rel: [Form3; 3] = [
        ("a", |x, y, l2| {
            1.0 + l2 * (x.sin().powi(2) + y.sin().powi(2))
        }),
        ("b", |x, y, l2| 1.0 + 2.0 * l2 * (1.0 - x.cos() * y.cos())),
        ("c", |x, y, l2| {
            ((0.5 * x).cos() * (0.5 * y).cos()).powi(2)
                + 4.0 * l2 * ((0.5 * x).sin().powi(2) + (0.5 * y).sin().powi(2))
        }),
    ];
    for (arr, formula) in rel {
        let (_, r) = run(&shallow(arr));
        let dr = disp(&r);
        let n1 = r.grid.points[1];
        for (i, node) in dr.numerical.chunks(dr.modes()).enumerate() {
            let (x, y) = (r.grid.coords[0][i / n1], r.grid.coords[1][i % n1]);
            let want = f * formula(x, y, l2).sqrt();
            let mut w: Vec<f64> = node.iter().map(|z| z.re).collect();
            w.sort_by(|a, b| a.total_cmp(b));
            assert!(
                (w[2] - want).abs() <= 1e-9 * want,
                "{arr}-grid at ({x}, {y}): {} vs {want}",
                w[2]
            );
            assert!((w[0] + want).abs() <= 1e-9 * want);
        }
    }
}

#[test]
fn yee_fully_discrete_frequencies_satisfy_the_numerical_dispersion_relation() {
    // Taflove & Hagness: [sin(ωΔt/2)/(cΔt)]² = Σ_d [sin(k_d h_d/2)/h_d]².
    let text = "[grid]\nspacing = [1.0e-3, 2.0e-3]\n[model]\nkind = \"maxwell\"\nspeed = 3.0e8\n[space]\narrangement = \"yee\"\n[time]\nmethod = \"forward-backward\"\nfirst = [\"hz\"]\ncourant = 0.6\n[scan]\npoints = [17, 17]\nanalyses = [\"dispersion\"]\n";
    let (case, r) = run(text);
    let d = disp(&r);
    let n1 = r.grid.points[1];
    let c = 3.0e8;
    for (i, node) in d.discrete.chunks(d.discrete_modes).enumerate() {
        let th = [r.grid.coords[0][i / n1], r.grid.coords[1][i % n1]];
        if th.iter().all(|t| t.abs() < 1e-12) {
            continue;
        }
        let rhs: f64 = th
            .iter()
            .zip(&case.problem.spacing)
            .map(|(t, h)| ((0.5 * t).sin() / h).powi(2))
            .sum();
        // the two electromagnetic modes (names end in ±1); the static one has ω = 0
        for (j, name) in d.names.iter().enumerate() {
            if name.starts_with("electromagnetic") {
                let lhs = ((0.5 * node[j].re * r.dt).sin() / (c * r.dt)).powi(2);
                assert!(
                    (lhs - rhs).abs() <= 1e-8 * rhs,
                    "{name} at {th:?}: {lhs} vs {rhs}"
                );
            }
        }
    }
}

#[test]
fn continuous_euler_frequencies_are_convected_and_acoustic() {
    // Common practice: ω = u·k (entropy, vorticity) and u·k ± c|k| (acoustic).
    let text = "[grid]\nspacing = [1.0, 2.0]\n[model]\nkind = \"euler\"\ndensity = 1.0\npressure = 0.7142857142857143\ngamma = 1.4\nvelocity = [0.5, 0.2]\n[space]\nfirst = \"central4\"\n[time]\nmethod = \"rk4\"\ncourant = 1.0\n[scan]\npoints = [9, 9]\nanalyses = [\"dispersion\"]\n";
    let (_, r) = run(text);
    let d = disp(&r);
    assert_eq!(
        d.names,
        ["acoustic-", "convected1", "convected2", "acoustic+"]
    );
    let n1 = r.grid.points[1];
    for (i, w) in d.exact.chunks(d.modes()).enumerate() {
        let k = [r.grid.coords[0][i / n1], r.grid.coords[1][i % n1] / 2.0];
        let uk = 0.5 * k[0] + 0.2 * k[1];
        let kk = (k[0] * k[0] + k[1] * k[1]).sqrt();
        if kk == 0.0 {
            continue;
        }
        let mut got: Vec<f64> = w.iter().map(|z| z.re).collect();
        got.sort_by(|a, b| a.total_cmp(b));
        let mut want = [uk - kk, uk, uk, uk + kk];
        want.sort_by(|a, b| a.total_cmp(b));
        for (g, e) in got.iter().zip(&want) {
            assert!((g - e).abs() <= 1e-12 * (1.0 + kk));
        }
    }
}

#[test]
fn leapfrog_group_velocity_follows_its_discrete_dispersion_relation() {
    // Strikwerda: leapfrog + C2 has sin(ωΔt) = ν sin θ, so the fully discrete
    // group velocity is a cos θ / √(1 − ν² sin² θ) (a = 1, h = 1).
    let nu = 0.5;
    let (_, r) = run(&advection_1d("central2", "leapfrog", nu));
    let d = disp(&r);
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        let want = th.cos() / (1.0 - (nu * th.sin()).powi(2)).sqrt();
        let got = d.node(i).group_discrete[0];
        // a central difference of the scalar map ω → ω_d (step 1e-6 along dω/dθ)
        assert!((got - want).abs() <= 1e-8, "at {th}: {got} vs {want}");
        let w = (nu * th.sin()).asin() / r.dt;
        assert!(
            (d.node(i).discrete[0].re - w).abs() <= 1e-9 * (1.0 + w.abs()),
            "omega at {th}"
        );
    }
}

/// Points per wavelength at which the fully discrete phase ratio of upwind1 +
/// forward Euler, r(θ) = −arg(1 − ν(1 − e^{−iθ}))/(νθ) (the closed form of the
/// scheme's amplification factor, derived by hand), first leaves 1 ± tol,
/// scanning from long waves.
fn upwind_euler_ppw(nu: f64, tol: f64) -> f64 {
    let ratio = |th: f64| {
        let g = num_complex::Complex64::new(1.0 - nu + nu * th.cos(), -nu * th.sin());
        -g.arg() / (nu * th)
    };
    let mut th = 1e-4;
    while (ratio(th) - 1.0).abs() <= tol {
        th += 1e-3;
    }
    // bisection between the last good and the first bad step
    let (mut good, mut bad) = (th - 1e-3, th);
    for _ in 0..60 {
        let mid = 0.5 * (good + bad);
        if (ratio(mid) - 1.0).abs() <= tol {
            good = mid;
        } else {
            bad = mid;
        }
    }
    2.0 * std::f64::consts::PI / good
}

#[test]
fn each_wave_of_a_user_system_keeps_its_name_and_its_own_speed_in_both_directions() {
    // Two waves of speeds 1 and 1.1 (lower-triangular flux, characteristic
    // upwinding): each behaves as scalar upwind1 + forward Euler with its own
    // Courant number ν = 0.9 × speed/1.1. Ordering by frequency once named the
    // slower wave "mode1" along +x and the faster one along −x, and paired a
    // fully discrete wave with the other wave's exact speed.
    let text = "[grid]\nspacing = [1.0]\n[model]\nkind = \"linear\"\nvariables = [\"c\", \"s\"]\nflux = [ [[1.0, 0.0], [8.0, 1.1]] ]\n[space]\nfirst = \"upwind1\"\nupwind = \"characteristic\"\n[time]\nmethod = \"euler\"\ncourant = 0.9\n[scan]\npoints = [129]\nanalyses = [\"dispersion\"]\n";
    let (_, r) = run(text);
    let d = disp(&r);
    for (mode, speed) in [(0usize, 1.0), (1, 1.1)] {
        let want = upwind_euler_ppw(0.9 * speed / 1.1, d.tolerance);
        let got = d.resolution[mode]
            .discrete_ppw()
            .expect("a fully discrete requirement");
        assert!(
            (got - want).abs() <= 1e-7 * want,
            "mode {mode}: {got} vs {want}"
        );
        // the same wave in both directions: its exact frequency is speed·θ
        for (i, th) in r.grid.coords[0].iter().enumerate() {
            let w = d.node(i).exact[mode];
            assert!(
                (w.re - speed * th).abs() <= 1e-9,
                "mode {mode} at θ = {th}: {w}"
            );
        }
    }
}

/// The first points per wavelength p (scanning from 256 down to 2) at which
/// |ratio(2π/p) − 1| leaves `tol`, refined by bisection; 2 when it never does.
fn crossing_ppw(ratio: impl Fn(f64) -> f64, tol: f64) -> f64 {
    let bad = |p: f64| (ratio(2.0 * std::f64::consts::PI / p) - 1.0).abs() > tol;
    let steps = 20_000;
    let at = |j: usize| 256.0 * (2.0f64 / 256.0).powf(j as f64 / steps as f64);
    let Some(j) = (1..=steps).find(|&j| bad(at(j))) else {
        return 2.0;
    };
    let (mut good, mut worse) = (at(j - 1), at(j));
    for _ in 0..60 {
        let mid = 0.5 * (good + worse);
        if bad(mid) {
            worse = mid;
        } else {
            good = mid;
        }
    }
    good
}

#[test]
fn an_anisotropic_grid_needs_the_same_points_per_wavelength_along_each_axis() {
    // Gravity waves without rotation, C2 on a grid with h_x = 2 h_y. Along each
    // axis c_num/c = sin θ/θ (common practice), so 1 % phase error needs
    // 2π/θ* ≈ 25.6 cells per wavelength along x and along y alike; obliquely the
    // ratio is a weighted mean of sin θ_d/θ_d, never below that of max_d |θ_d|,
    // so no direction needs more. Counting in the smallest spacing charged the
    // x-wave twice that. The shortest wavelength kept within 1 % in every
    // direction is that of the x-wave, 25.6 h_x.
    let text = "[grid]\nspacing = [2.0, 1.0]\n[model]\nkind = \"shallow-water\"\ngravity = 9.81\ndepth = 10.0\n[space]\nfirst = \"central2\"\n[time]\nmethod = \"rk4\"\ncourant = 0.05\n[scan]\npoints = [17, 17]\nanalyses = [\"dispersion\"]\n";
    let (_, r) = run(text);
    let d = disp(&r);
    let want = crossing_ppw(|t| t.sin() / t, d.tolerance);
    let mut propagating = 0;
    for res in &d.resolution {
        let Some(q) = &res.semi else { continue };
        propagating += 1;
        assert!(
            (q.ppw() - want).abs() <= 1e-7 * want,
            "{} vs {want}",
            q.ppw()
        );
        assert!(
            (q.wavelength - 2.0 * want).abs() <= 1e-7 * want,
            "{}",
            q.wavelength
        );
        let cells = q.cells_by_axis(&[2.0, 1.0]);
        assert!((cells[0] - want).abs() <= 1e-7 * want, "{cells:?}");
        assert!((cells[1] - 2.0 * want).abs() <= 1e-7 * want, "{cells:?}");
        assert!(res.excluded.is_empty());
    }
    assert_eq!(propagating, 2, "two gravity waves");
}

#[test]
fn directions_almost_across_the_flow_are_left_out_and_the_rest_follow_the_closed_form() {
    // Oblique advection with velocity u = (1, 0.3), C2: along a physical
    // direction n the phase ratio is (u·sin θ)/(u·θ) with sin taken per
    // component (common practice). Where u·n → 0 the wave hardly moves and its
    // relative phase error blows up at every wavelength, so the requirement once
    // depended on which directions were sampled. Directions where |u·n| is below
    // 10 % of its largest are left out (and counted); every other direction's
    // crossing follows the closed form.
    let u = [1.0, 0.3];
    let text = "[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0, 0.3]\n[space]\nfirst = \"central2\"\n[time]\nmethod = \"rk4\"\ncourant = 0.05\n[scan]\npoints = [17, 17]\nanalyses = [\"dispersion\"]\n";
    let (_, r) = run(text);
    let d = disp(&r);
    let speed = |n: &[f64]| u[0] * n[0] + u[1] * n[1];
    let fastest = d
        .directions
        .iter()
        .map(|n| speed(n).abs())
        .fold(0.0, f64::max);
    let slow: Vec<usize> = (0..d.directions.len())
        .filter(|&k| speed(&d.directions[k]).abs() < 0.1 * fastest)
        .collect();
    assert!(!slow.is_empty());
    assert_eq!(d.resolution[0].excluded, slow);
    let mut want = 0.0f64;
    for (k, n) in d.directions.iter().enumerate() {
        if slow.contains(&k) {
            continue;
        }
        let norm_inf = n[0].abs().max(n[1].abs());
        let p = crossing_ppw(
            |t| {
                let th = [t * n[0] / norm_inf, t * n[1] / norm_inf];
                (u[0] * th[0].sin() + u[1] * th[1].sin()) / (u[0] * th[0] + u[1] * th[1])
            },
            d.tolerance,
        );
        want = want.max(p);
    }
    let got = d.resolution[0].semi_ppw().expect("a requirement");
    assert!((got - want).abs() <= 1e-6 * want, "{got} vs {want}");
}

#[test]
fn the_number_of_curve_directions_is_a_case_key() {
    let base = "[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"advection\"\nvelocity = [1.0, 0.5]\n[space]\nfirst = \"central4\"\n[time]\nmethod = \"rk4\"\ncourant = 0.1\n[scan]\npoints = [9, 9]\nanalyses = [\"dispersion\"]\n";
    // default: 36 angles, rounded up to 40 so that axes and diagonals are in the set
    let (_, r) = run(base);
    assert_eq!(disp(&r).directions.len(), 40);
    let (_, r) = run(&format!("{base}dispersion_directions = 16\n"));
    let d = disp(&r);
    assert_eq!(d.directions.len(), 16);
    assert_eq!(d.phase_curves.len(), 16);
    for bad in ["0", "100000"] {
        let text = format!("{base}dispersion_directions = {bad}\n");
        let Err(err) = Case::from_str_with(&text, std::path::Path::new("c.toml"), &[]) else {
            panic!("dispersion_directions = {bad} accepted");
        };
        assert!(
            err.to_string().contains("scan.dispersion_directions"),
            "{err}"
        );
    }
}

#[test]
fn diffusion_accuracy_follows_the_closed_forms_of_c2_and_crank_nicolson() {
    // Pure diffusion u_t = D u_xx with C2 and Crank–Nicolson (common practice,
    // derived here): the semi-discrete decay rate is 4 D sin²(θ/2)/h², so its
    // ratio to the exact D k² is sinc²(θ/2); Crank–Nicolson's amplification
    // factor is λ = (1 − 2r s)/(1 + 2r s) with s = sin²(θ/2), r = DΔt/h², so the
    // fully discrete decay rate is −ln|λ|/Δt. The decay-rate error reaches 1 %
    // at the points per wavelength found from these closed forms.
    let (d_coef, dt) = (1.0, 0.4);
    let text = format!(
        "[grid]\nspacing = [1.0]\n[model]\nkind = \"advection\"\nvelocity = [0.0]\ndiffusivity = {d_coef}\n[space]\nsecond = \"central2\"\n[time]\nmethod = \"crank-nicolson\"\ndt = {dt}\n[scan]\npoints = [65]\nanalyses = [\"dispersion\"]\n"
    );
    let (_, r) = run(&text);
    let d = disp(&r);
    let semi = |t: f64| (2.0 * (t / 2.0).sin() / t).powi(2);
    let discrete = |t: f64| {
        let s = (t / 2.0).sin().powi(2);
        let rr = d_coef * dt;
        let lam: f64 = (1.0 - 2.0 * rr * s) / (1.0 + 2.0 * rr * s);
        -lam.abs().ln() / (dt * d_coef * t * t)
    };
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        let got = d.maps.decay_rate_ratio[i];
        if th.abs() < 1e-12 {
            assert!(got.is_nan(), "no decay at θ = 0: {got}");
            continue;
        }
        assert!((got - semi(*th)).abs() <= 1e-12, "at {th}: {got}");
        let got = d.maps.decay_rate_ratio_discrete[i];
        assert!((got - discrete(*th)).abs() <= 1e-9, "at {th}: {got}");
    }
    let res = &d.resolution[0];
    assert!(res.semi.is_none(), "nothing propagates");
    let want = crossing_ppw(semi, d.tolerance);
    let got = res.decay.as_ref().expect("a decay requirement").ppw();
    assert!((got - want).abs() <= 1e-7 * want, "{got} vs {want}");
    let want = crossing_ppw(discrete, d.tolerance);
    let got = res.decay_discrete.as_ref().expect("fully discrete").ppw();
    assert!((got - want).abs() <= 1e-7 * want, "{got} vs {want}");
}

#[test]
fn group_velocities_of_c4_and_compact_stencils_are_exact_derivatives() {
    // C4: d/dθ (8 sin θ − sin 2θ)/6 = (4 cos θ − cos 2θ)/3 (common practice);
    // Padé compact 4, S = (3/2) sin θ / (1 + ½ cos θ):
    // S′ = (3/2)(cos θ + ½)/(1 + ½ cos θ)² (derived here by the quotient rule).
    let forms: [Form1; 2] = [
        ("central4", |t| (4.0 * t.cos() - (2.0 * t).cos()) / 3.0),
        ("compact4", |t| {
            1.5 * (t.cos() + 0.5) / (1.0 + 0.5 * t.cos()).powi(2)
        }),
    ];
    for (stencil, slope) in forms {
        let (_, r) = run(&advection_1d(stencil, "rk4", 0.5));
        let d = disp(&r);
        for (i, th) in r.grid.coords[0].iter().enumerate() {
            let g = d.node(i).group[0];
            assert!(
                (g - slope(*th)).abs() <= 1e-13,
                "{stencil} at {th}: {g} vs {}",
                slope(*th)
            );
        }
    }
}

#[test]
fn euler_group_velocities_are_exact_for_every_mode() {
    // Common practice: the convected modes move with u; the acoustic ones with
    // u ± c k/|k| (exact) and, for C4 (modified wavenumber κ(θ) = (8 sin θ −
    // sin 2θ)/6 per axis, h = 1), with u_d κ′_d ± c κ_d κ′_d/|κ| (derived here by
    // differentiating ω = u·κ ± c|κ|). c = 1, u = (0.5, 0.2).
    let text = "[grid]\nspacing = [1.0, 1.0]\n[model]\nkind = \"euler\"\ndensity = 1.0\npressure = 0.7142857142857143\ngamma = 1.4\nvelocity = [0.5, 0.2]\n[space]\nfirst = \"central4\"\n[time]\nmethod = \"rk4\"\ncourant = 1.0\n[scan]\npoints = [16, 16]\nanalyses = [\"dispersion\"]\n";
    let (_, r) = run(text);
    let d = disp(&r);
    let u = [0.5, 0.2];
    let kappa = |t: f64| (8.0 * t.sin() - (2.0 * t).sin()) / 6.0;
    let kappa_slope = |t: f64| (4.0 * t.cos() - (2.0 * t).cos()) / 3.0;
    let n1 = r.grid.points[1];
    for i in 0..r.grid.len() {
        let th = [r.grid.coords[0][i / n1], r.grid.coords[1][i % n1]];
        let kk = (th[0] * th[0] + th[1] * th[1]).sqrt();
        let ka = [kappa(th[0]), kappa(th[1])];
        let kan = (ka[0] * ka[0] + ka[1] * ka[1]).sqrt();
        if kk < 1e-12 || kan < 1e-3 {
            continue;
        }
        let node = d.node(i);
        let k_dot_u = u[0] * th[0] + u[1] * th[1];
        let kappa_dot_u = u[0] * ka[0] + u[1] * ka[1];
        for (j, name) in d.names.iter().enumerate() {
            // which wave each frequency is: u·k + s|k| with s = −1, 0 or 1
            let wave = |w: f64, dot: f64, size: f64| -> f64 {
                [-1.0, 0.0, 1.0f64]
                    .into_iter()
                    .min_by(|p, q| {
                        let e = |s: f64| (w - dot - s * size).abs();
                        e(*p).total_cmp(&e(*q))
                    })
                    .unwrap_or(0.0)
            };
            let exact_sign = wave(node.exact[j].re, k_dot_u, kk);
            let sign = wave(node.numerical[j].re, kappa_dot_u, kan);
            for a in 0..2 {
                let exact = u[a] + exact_sign * th[a] / kk;
                let numerical = kappa_slope(th[a]) * (u[a] + sign * ka[a] / kan);
                let (ge, gn) = (node.group_exact[j * 2 + a], node.group[j * 2 + a]);
                assert!(
                    (ge - exact).abs() <= 1e-13,
                    "{name} exact at {th:?}, axis {a}: {ge} vs {exact}"
                );
                assert!(
                    (gn - numerical).abs() <= 1e-12,
                    "{name} numerical at {th:?}, axis {a}: {gn} vs {numerical}"
                );
            }
        }
    }
}

#[test]
fn forward_euler_discrete_group_velocity_is_its_closed_form() {
    // Derived here: forward Euler + C2 advection has λ = 1 − iν sin θ, so the
    // fully discrete ω_d = i ln λ/Δt has Re ω_d = atan(ν sin θ)/Δt and the
    // group velocity h dRe ω_d/dθ = a cos θ/(1 + ν² sin² θ) (a = h = 1 here).
    let (_, r) = run(&advection_1d("central2", "euler", 0.4));
    let d = disp(&r);
    let nu = r.dt;
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        let want = th.cos() / (1.0 + nu * nu * th.sin().powi(2));
        let got = d.node(i).group_discrete[0];
        assert!((got - want).abs() <= 1e-13, "at {th}: {got} vs {want}");
    }
}

#[test]
fn discrete_group_velocity_is_continuous_through_the_branch_cut_at_theta_pi() {
    // The bundled river case: upwind1 + forward Euler on a 2×2 system with
    // speeds a = 1 and 1.1, each mode advected alone: λ_j = 1 − ν_j(1 − e^{−iθ}),
    // ν_j = a_j Δt/h. Derived here: d ln λ_j/dθ = −iν_j e^{−iθ}/λ_j, so the group
    // velocity of ω_d = i ln λ_j/Δt is h Re(dω_d/dθ) = a_j Re(e^{−iθ}/λ_j); at
    // θ = ±π, λ_j = 1 − 2ν_j < 0 sits on the logarithm's branch cut, where
    // differences of ω_d jumped by a period 2π/Δt (−3.8e6 instead of 1.57).
    let text = std::fs::read_to_string("cases/river-sediment-growth.toml").expect("bundled case");
    let case = support::case_with(&text, &["scan.analyses=[\"dispersion\"]".to_string()]);
    let r = support::analyse_par(&case, 2);
    let d = disp(&r);
    let h = case.problem.spacing[0];
    for (i, th) in r.grid.coords[0].iter().enumerate() {
        for j in 0..2 {
            // the mode's speed, from its exact group velocity (1 or 1.1)
            let a = d.node(i).group_exact[j];
            assert!(
                (a - 1.0).abs() < 1e-12 || (a - 1.1).abs() < 1e-12,
                "speed {a}"
            );
            let nu = a * r.dt / h;
            let e = C64::new(0.0, -th).exp();
            let lam = C64::new(1.0, 0.0) - (C64::new(1.0, 0.0) - e) * nu;
            let want = a * (e / lam).re;
            let got = d.node(i).group_discrete[j];
            assert!(
                (got - want).abs() <= 1e-12 * want.abs().max(1.0),
                "mode {j} at {th}: {got} vs {want}"
            );
        }
    }
}
