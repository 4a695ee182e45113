//! Spectral radius of an amplification matrix and the strict stability test
//! ρ(G) ≤ 1 + roundoff, the allowance relative to the scale of G
//! (`ROUNDOFF` × max(1, ‖G‖_F)). Sizes 1 and 2 in closed form, larger ones
//! through nalgebra's complex Schur form.

use crate::scheme::CMat;
use num_complex::Complex64 as C64;

/// Roundoff allowance relative to the scale of G.
pub const ROUNDOFF: f64 = 1e-13;

/// Eigenvalues of a 2×2 complex matrix as t/2 ± √((a − d)²/4 + bc): the
/// discriminant is taken from the traceless part, so a G close to a multiple of
/// I (every scheme as Δt → 0) loses no accuracy to cancellation.
fn eig2(g: &CMat) -> [C64; 2] {
    let mean = (g[(0, 0)] + g[(1, 1)]) * 0.5;
    let half_diff = (g[(0, 0)] - g[(1, 1)]) * 0.5;
    let root = (half_diff * half_diff + g[(0, 1)] * g[(1, 0)]).sqrt();
    [mean + root, mean - root]
}

/// ρ(G); NaN when an entry is not finite or the eigenvalue iteration fails.
pub fn spectral_radius(g: &CMat) -> f64 {
    if g.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
        return f64::NAN;
    }
    match g.nrows() {
        1 => g[(0, 0)].norm(),
        2 => eig2(g).iter().map(|z| z.norm()).fold(0.0, f64::max),
        _ => schur_radius(g),
    }
}

/// ρ(G) from a complex Schur form with an iteration cap, of G minus the mean of
/// its eigenvalues first (G close to a multiple of I loses nothing). The QR
/// iteration can stall on matrices whose eigenvalues are ±1 in a permutation-like
/// pattern (the leapfrog companion matrix as Δt → 0); then the same is tried on
/// G + cI with a complex c (eigenvalues λ + c, so ρ is recovered from them).
fn schur_radius(g: &CMat) -> f64 {
    schur_eigenvalues(g)
        .map(|ev| ev.iter().map(|z| z.norm()).fold(0.0, f64::max))
        .unwrap_or(f64::NAN)
}

/// Eigenvalues through the complex Schur form (see [`schur_radius`]).
fn schur_eigenvalues(g: &CMat) -> Option<Vec<C64>> {
    let try_shift = |c: C64| {
        let n = g.nrows();
        let shifted = g + CMat::identity(n, n) * c;
        nalgebra::linalg::Schur::try_new(shifted, f64::EPSILON, 2000)
            .and_then(|s| s.eigenvalues())
            .map(|ev| ev.iter().map(|z| z - c).collect::<Vec<C64>>())
    };
    let norm = g.norm().max(1e-300);
    let mean = g.trace() / g.nrows() as f64;
    [
        -mean,
        C64::new(0.0, 0.0),
        C64::new(-1.0, 0.0),
        C64::new(0.1, 0.07) * norm,
        C64::new(-0.05, 0.13) * norm,
    ]
    .into_iter()
    .find_map(try_shift)
}

/// ρ(G) − 1 − allowance·max(1, ‖G‖_F, `operand`), with `operand` the size of
/// the matrices G was computed from (‖ΔtL‖_F: an implicit solve at large Δt
/// carries roundoff of that order): positive means unstable beyond roundoff
/// (NaN counts as unstable, +∞).
pub fn excess_with(g: &CMat, allowance: f64, operand: f64) -> f64 {
    let rho = spectral_radius(g);
    if rho.is_nan() {
        return f64::INFINITY;
    }
    rho - 1.0 - allowance * g.norm().max(operand).max(1.0)
}

/// ρ(I + D) − 1 from the eigenvalues λ of D, as (2 Re λ + |λ|²)/(1 + |1 + λ|),
/// minus allowance·max(‖D‖_F, `operand`); NaN counts as unstable (+∞).
pub fn excess_of_delta(d: &CMat, allowance: f64, operand: f64) -> f64 {
    if d.iter().any(|z| !z.re.is_finite() || !z.im.is_finite()) {
        return f64::INFINITY;
    }
    let growth = |l: C64| (2.0 * l.re + l.norm_sqr()) / (1.0 + (l + 1.0).norm());
    let worst = match d.nrows() {
        1 => growth(d[(0, 0)]),
        2 => eig2(d)
            .into_iter()
            .map(growth)
            .fold(f64::NEG_INFINITY, f64::max),
        _ => match schur_eigenvalues(d) {
            Some(ev) => ev.into_iter().map(growth).fold(f64::NEG_INFINITY, f64::max),
            None => return f64::INFINITY,
        },
    };
    worst - allowance * d.norm().max(operand)
}
