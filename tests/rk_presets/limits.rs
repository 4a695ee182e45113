//! Stability limits of the presets on the imaginary and negative real axes:
//! published figures where known, and for every preset the engine's first-exit
//! radius against an independent scan-and-bisect root search on |R|² − 1.

use super::support::{assert_close, bisect, quoted};
use super::{poly, preset, stability_polynomial};
use kgain::time::presets::PRESETS;

/// First y > 0 where |R(y·w)| exceeds 1 (w = (wr, wi) a unit direction):
/// a scan in steps of 1e-3 from 0.1, then bisection.
fn first_exit(p: &[f64], wr: f64, wi: f64) -> f64 {
    let f = |t: f64| poly::excess(p, t * wr, t * wi);
    let h = 1e-3;
    let mut t = 0.1;
    assert!(f(t) < 0.0, "unstable at the start of the scan");
    while f(t + h) < 0.0 {
        t += h;
        assert!(t < 50.0, "no exit found");
    }
    bisect(f, t, t + h)
}

#[test]
fn engine_limits_agree_with_an_independent_root_search() {
    for name in PRESETS.iter().map(|p| p.name).chain(["rk4", "ssprk3"]) {
        let m = preset(name);
        let p = stability_polynomial(&m);
        assert_close(
            m.imaginary_limit(),
            first_exit(&p, 0.0, 1.0),
            1e-9,
            &format!("{name} imaginary"),
        );
        assert_close(
            m.real_limit(),
            first_exit(&p, -1.0, 0.0),
            1e-9,
            &format!("{name} real"),
        );
    }
}

#[test]
fn published_figures() {
    // RK4: 2√2 on the imaginary axis, 2.7853 on the real axis (from memory;
    // Hairer & Wanner, Solving ODEs II, sec. IV.2)
    let rk4 = preset("rk4");
    assert_close(
        rk4.imaginary_limit(),
        8f64.sqrt(),
        1e-10,
        "rk4 imaginary 2√2",
    );
    assert_close(
        rk4.real_limit(),
        2.7853,
        quoted(2.7853, 4),
        "rk4 real 2.7853",
    );
    // Williamson's scheme has R = 1 + z + z²/2 + z³/6 like every 3-stage
    // third-order method: √3 and 2.5127 (from memory, same source)
    let w = preset("lsrk3");
    assert_close(
        w.imaginary_limit(),
        3f64.sqrt(),
        1e-10,
        "lsrk3 imaginary √3",
    );
    assert_close(
        w.real_limit(),
        2.5127,
        quoted(2.5127, 4),
        "lsrk3 real 2.5127",
    );
    // Carpenter–Kennedy: imaginary-axis limit ≈ 3.34 (figure quoted from memory)
    let ck = preset("lsrk54");
    assert_close(
        ck.imaginary_limit(),
        3.34,
        quoted(3.34, 2),
        "lsrk54 imaginary ≈ 3.34",
    );
}

#[test]
fn ssprk104_contains_the_disk_of_its_ssp_coefficient() {
    // SSP coefficient 6 (Ketcheson 2008): R is absolutely monotonic on [−6, 0],
    // so the disk |z + 6| ≤ 6 lies in the stability region and the real-axis
    // limit is at least 12.
    let m = preset("ssprk104");
    let p = stability_polynomial(&m);
    for k in 0..=720 {
        let th = std::f64::consts::TAU * k as f64 / 720.0;
        let (re, im) = (-6.0 + 6.0 * th.cos(), 6.0 * th.sin());
        assert!(
            poly::excess(&p, re, im) <= 1e-12,
            "|R| > 1 on the SSP disk at θ = {th}"
        );
    }
    assert!(m.real_limit() >= 12.0, "real limit {}", m.real_limit());
    // The root of R(−x) = 1, with R from the tableau in exact rational
    // arithmetic (computed for this test to 50 digits; not a published
    // figure): 13.9170474646374. Coefficients of R obtained by interpolation
    // at roots of unity put it at 13.91699, off in the fifth digit.
    assert_close(
        m.real_limit(),
        13.917047464637366,
        1e-8,
        "ssprk104 real, exact root",
    );
}
