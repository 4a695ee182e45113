//! Ignored helper tests for reading a failure: print one seed's case text, or
//! the reference's ρ(G) − 1 at a chosen wavevector and Δt.

/// Prints the case text of `KGAIN_DIFF_SEED` (a helper for writing a named
/// regression test; run it with `-- --ignored --nocapture`).
#[test]
#[ignore = "a helper: prints one seed's case text"]
fn print_case_of_seed() {
    let seed = std::env::var("KGAIN_DIFF_SEED")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1);
    let text = crate::render::case_text(&crate::generate::scheme(seed));
    println!("{text}");
    assert!(text.contains("[scan]"), "a whole case was rendered");
}

/// Prints ρ(G) − 1 at `KGAIN_DIFF_THETA` (comma-separated) and `KGAIN_DIFF_DT`
/// for `KGAIN_DIFF_SEED` (a helper for reading a failure).
#[test]
#[ignore = "a helper: prints the reference's excess at one point"]
fn print_excess_at_point() {
    let get = |k: &str| std::env::var(k).unwrap_or_default();
    let seed = get("KGAIN_DIFF_SEED").parse().unwrap_or(1);
    let s = crate::generate::scheme(seed);
    let mut theta: Vec<f64> = get("KGAIN_DIFF_THETA")
        .split(',')
        .filter_map(|x| x.trim().parse().ok())
        .collect();
    theta.resize(s.dims(), 0.5);
    let dt: f64 = get("KGAIN_DIFF_DT").parse().unwrap_or(1e-3);
    let parts = crate::symbol::Parts::at(&s, &theta);
    let g = crate::amplification::amplification(&s, &parts, &theta, dt);
    let rho = crate::radius::spectral_radius(&g);
    println!(
        "L = {}\nG = {}\nrho - 1 = {:e}",
        parts.total(),
        g,
        rho - 1.0
    );
    assert!(!rho.is_nan(), "the spectral radius is a number");
}

/// Prints the engine's limit for `KGAIN_DIFF_SEED`: the overall Δt and its
/// wavevector, then each direction's Δt and wavevector (a helper for reading a
/// failure).
#[test]
#[ignore = "a helper: prints the engine's limit of one seed"]
fn print_engine_limit_of_seed() {
    let seed = std::env::var("KGAIN_DIFF_SEED")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1);
    let text = crate::render::case_text(&crate::generate::scheme(seed));
    let l = crate::engine::engine_limit(&text).unwrap();
    println!("{:?} dt {:.15e} at {:?}", l.kind, l.dt_max, l.wavevector);
    for (i, ((n, dt), w)) in l
        .directions
        .iter()
        .zip(&l.dt_by_direction)
        .zip(&l.wavevector_by_direction)
        .enumerate()
    {
        println!("#{i} {n:?}: dt {dt:.15e} at {w:?}");
    }
    assert_eq!(l.directions.len(), l.dt_by_direction.len());
}
