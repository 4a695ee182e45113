//! Orders: the Butcher order conditions (17 trees up to order 5) give each
//! preset's published nonlinear order, the stability polynomial its published
//! linear order (the LDDRK of Hu, Hussaini & Manthey: 2 and 4), and the
//! polynomial agrees with the one the scheme's published low-storage form
//! produces on a linear problem.

use super::poly;
use super::{preset, stability_polynomial};
use kgain::time::lowstorage::williamson;
use kgain::time::order::{order, residuals};
use kgain::time::presets::{self, PRESETS};

fn factorial(k: usize) -> f64 {
    (1..=k).map(|i| i as f64).product()
}

#[test]
fn every_preset_has_its_published_nonlinear_order() {
    for p in PRESETS {
        let t = presets::tableau(p.name).unwrap();
        assert_eq!(t.stages(), p.stages, "{}: stages", p.name);
        assert_eq!(
            order(&t),
            p.order,
            "{}: order from the order conditions",
            p.name
        );
        // the next order's conditions fail clearly, not by a rounding hair
        let worst = residuals(&t)
            .iter()
            .filter(|r| r.order == p.order + 1)
            .map(|r| r.residual.abs())
            .fold(0.0, f64::max);
        assert!(
            worst > 1e-4,
            "{}: order {} conditions nearly hold ({worst:e})",
            p.name,
            p.order + 1
        );
    }
}

#[test]
fn every_preset_has_its_published_linear_order_and_exponential_leading_terms() {
    for p in PRESETS {
        let m = preset(p.name);
        assert_eq!(m.order, p.linear_order, "{}: linear order", p.name);
        assert!(m.explicit, "{}", p.name);
        let r = stability_polynomial(&m);
        assert_eq!(r.len(), p.stages + 1, "{}: degree of R", p.name);
        let lin = p.linear_order as usize;
        for (k, rk) in r.iter().enumerate().take(lin + 1) {
            let want = 1.0 / factorial(k);
            assert!(
                (rk - want).abs() <= 1e-12 * want,
                "{}: z^{k} coefficient {rk:e}, want 1/{k}!",
                p.name
            );
        }
        let next = 1.0 / factorial(lin + 1);
        assert!(
            (r.get(lin + 1).unwrap_or(&0.0) - next).abs() > 1e-6 * next,
            "{}: z^{} coefficient is 1/{}! too",
            p.name,
            lin + 1,
            lin + 1
        );
    }
}

#[test]
fn williamson_2n_conversion_gives_a_third_order_tableau() {
    let t = williamson(
        &[0.0, -5.0 / 9.0, -153.0 / 128.0],
        &[1.0 / 3.0, 15.0 / 16.0, 8.0 / 15.0],
    )
    .unwrap();
    assert_eq!(order(&t), 3);
    // the tableau known for this scheme, from memory (c = 0, 1/3, 3/4; b = 1/6, 3/10, 8/15)
    assert!((t.a[2][0] + 3.0 / 16.0).abs() < 1e-15 && (t.a[2][1] - 15.0 / 16.0).abs() < 1e-15);
    assert!((t.b[0] - 1.0 / 6.0).abs() < 1e-15 && (t.b[1] - 0.3).abs() < 1e-15);
    assert!((t.c[2] - 0.75).abs() < 1e-15);
}

fn same_polynomial(name: &str, got: &[f64], want: &[f64]) {
    assert_eq!(
        got.len(),
        want.len(),
        "{name}: degree ({got:?} vs {want:?})"
    );
    for (k, (g, w)) in got.iter().zip(want).enumerate() {
        assert!(
            (g - w).abs() <= 1e-14 + 1e-12 * w.abs(),
            "{name}: z^{k}: {g:e} vs {w:e}"
        );
    }
}

#[test]
fn tableau_path_reproduces_the_low_storage_schemes_on_a_linear_problem() {
    let w = poly::two_register(
        &[0.0, -5.0 / 9.0, -153.0 / 128.0],
        &[1.0 / 3.0, 15.0 / 16.0, 8.0 / 15.0],
    );
    same_polynomial("lsrk3", &stability_polynomial(&preset("lsrk3")), &w);
    // Carpenter & Kennedy 1994 coefficients, entered again here
    let a = [
        0.0,
        -567301805773.0 / 1357537059087.0,
        -2404267990393.0 / 2016746695238.0,
        -3550918686646.0 / 2091501179385.0,
        -1275806237668.0 / 842570457699.0,
    ];
    let b = [
        1432997174477.0 / 9575080441755.0,
        5161836677717.0 / 13612068292357.0,
        1720146321549.0 / 2090206949498.0,
        3134564353537.0 / 4481467310338.0,
        2277821191437.0 / 14882151754819.0,
    ];
    same_polynomial(
        "lsrk54",
        &stability_polynomial(&preset("lsrk54")),
        &poly::two_register(&a, &b),
    );
    same_polynomial(
        "ssprk104",
        &stability_polynomial(&preset("ssprk104")),
        &poly::ketcheson_10_4(),
    );
}

#[test]
fn optimised_schemes_have_their_published_gamma_coefficients() {
    // R(z) = 1 + Σ γ_j z^j with the published γ_j
    let hhm = [1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0, 0.00781005, 0.00132141];
    let bb = [
        1.0,
        1.0,
        0.5,
        0.165919771368,
        0.040919732041,
        0.007555704391,
        0.000891421261,
    ];
    same_polynomial(
        "lddrk-hhm",
        &stability_polynomial(&preset("lddrk-hhm")),
        &hhm,
    );
    same_polynomial("lddrk-bb", &stability_polynomial(&preset("lddrk-bb")), &bb);
    // and the one-register stage coefficients β_j give the same polynomial
    let beta = kgain::time::lowstorage::betas_from_gammas(&bb[1..]);
    same_polynomial("lddrk-bb β form", &poly::one_register(&beta), &bb);
}
