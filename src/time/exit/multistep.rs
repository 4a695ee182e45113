//! First exits of linear multistep methods along a ray: crossings of the ray
//! with the boundary locus z(ω) = ρ(e^{iω})/σ(e^{iω}) (tabulated once per
//! thread and method), bisected to full precision, each interval between them
//! classified by the root condition at its midpoint.

use super::classify;
use crate::linalg::poly;
use crate::time::Multistep;
use num_complex::Complex64 as C64;

const LOCUS_SAMPLES: usize = 2048;
/// Geometric refinement levels of the locus next to each point where it passes
/// through the origin (ρ(e^{iω}) = 0): crossings with rays close to the
/// imaginary axis lie at ω ∝ (angle to the axis)^{1/3} for AB2, far inside the
/// first uniform cell.
const ORIGIN_LEVELS: i32 = 60;

/// The angles ω at which the boundary locus is sampled: uniform on [0, 2π], plus
/// geometric sequences on both sides of every root e^{iω₀} of ρ on the unit circle.
fn locus_angles(ms: &Multistep) -> Vec<f64> {
    let two_pi = std::f64::consts::TAU;
    let h = two_pi / LOCUS_SAMPLES as f64;
    let mut om: Vec<f64> = (0..=LOCUS_SAMPLES).map(|k| h * k as f64).collect();
    let alpha: Vec<C64> = ms.alpha.iter().map(|a| C64::new(*a, 0.0)).collect();
    for z in poly::roots(&alpha).unwrap_or_default() {
        if (z.norm() - 1.0).abs() > 1e-8 {
            continue;
        }
        let w0 = z.arg().rem_euclid(two_pi);
        om.push(w0);
        for j in 1..=ORIGIN_LEVELS {
            let d = h * 2f64.powi(-j);
            om.extend([w0 - d, w0 + d].map(|x| x.rem_euclid(two_pi)));
        }
    }
    om.sort_by(|a, b| a.total_cmp(b));
    om.dedup();
    om
}

/// ρ and σ at ζ = e^{iω} = 1 + d with d = −2 sin²(ω/2) + i sin ω, from the
/// shifted coefficients `alpha`, `beta` ([`taylor_shift`]): next to ω = 0, where
/// ρ vanishes, ρ keeps its relative accuracy (the locus there decides rays
/// close to the imaginary axis).
fn locus_point(alpha: &[f64], beta: &[f64], om: f64) -> (C64, C64) {
    let eval = |c: &[f64], z: C64| c.iter().rev().fold(C64::new(0.0, 0.0), |a, x| a * z + x);
    let d = C64::new(-2.0 * (0.5 * om).sin().powi(2), om.sin());
    (eval(alpha, d), eval(beta, d))
}

/// The boundary locus of one method at its sample angles ([`locus_angles`]):
/// ρ, σ, |ρ||σ| and |σ|² at each, none of which depends on the ray, with the
/// method's coefficients (the key) and their Taylor shifts.
struct LocusTable {
    alpha: Vec<f64>,
    beta: Vec<f64>,
    shifted: (Vec<f64>, Vec<f64>),
    angles: Vec<f64>,
    points: Vec<(C64, C64, f64, f64)>,
}

thread_local! {
    /// The locus table of the method last asked for on this thread: a limit
    /// analysis takes every exit for one method, so the 2,000-odd samples are
    /// computed once per thread instead of once per exit.
    static LOCUS: std::cell::RefCell<Option<std::rc::Rc<LocusTable>>> =
        const { std::cell::RefCell::new(None) };
}

fn locus_table(ms: &Multistep) -> std::rc::Rc<LocusTable> {
    LOCUS.with(|cell| {
        let mut cached = cell.borrow_mut();
        if let Some(t) = cached.as_ref() {
            if t.alpha == ms.alpha && t.beta == ms.beta {
                return t.clone();
            }
        }
        let (alpha, beta) = (taylor_shift(&ms.alpha), taylor_shift(&ms.beta));
        let angles = locus_angles(ms);
        let points = angles
            .iter()
            .map(|&om| {
                let (rho, sigma) = locus_point(&alpha, &beta, om);
                (rho, sigma, rho.norm() * sigma.norm(), sigma.norm_sqr())
            })
            .collect();
        let table = std::rc::Rc::new(LocusTable {
            alpha: ms.alpha.clone(),
            beta: ms.beta.clone(),
            shifted: (alpha, beta),
            angles,
            points,
        });
        *cached = Some(table.clone());
        table
    })
}

pub(in crate::time) fn multistep(ms: &Multistep, w: C64) -> f64 {
    let table = locus_table(ms);
    let (alpha, beta) = &table.shifted;
    // v(ω) = w̄ ρ σ̄ = (w̄ ρ/σ)|σ|²: a crossing is Im v = 0 with Re v > 0.
    let along = |rho: C64, sigma: C64, scale: f64, s2: f64| {
        let (a, b) = (w.conj() * rho, sigma.conj());
        let v = a * b;
        let r = if s2 > 0.0 { v.re / s2 } else { f64::INFINITY };
        // the rounding of Im v = Im a Re b + Re a Im b, whose terms cancel where
        // the locus runs along the ray
        let noise = 16.0 * f64::EPSILON * ((a.im * b.re).abs() + (a.re * b.im).abs());
        (v.im, scale, r, noise)
    };
    let locus = |om: f64| {
        let (rho, sigma) = locus_point(alpha, beta, om);
        along(rho, sigma, rho.norm() * sigma.norm(), sigma.norm_sqr())
    };
    let om = &table.angles;
    let n = om.len() - 1;
    let samples: Vec<(f64, f64, f64, f64)> = table
        .points
        .iter()
        .map(|&(rho, sigma, scale, s2)| along(rho, sigma, scale, s2))
        .collect();
    let degenerate = |s: &(f64, f64, f64, f64)| s.0.abs() <= 1e-14 * s.1.max(1e-300);
    let mut breaks: Vec<f64> = Vec::new();
    let push = |breaks: &mut Vec<f64>, r: f64| {
        if r.is_finite() && r > 1e-14 {
            breaks.push(r);
        }
    };
    // Runs of samples lying along the ray (Im v at rounding level, Re v > 0):
    // a run spanning at least one uniform cell is a stretch of locus along the
    // ray (leapfrog on the imaginary axis) and its extreme radii are break
    // points; a shorter run is the locus touching the ray at the origin (AB2 is
    // tangent to the imaginary axis), whose samples keep their sign below.
    let cell = std::f64::consts::TAU / LOCUS_SAMPLES as f64;
    let mut in_stretch = vec![false; n + 1];
    let mut k = 0;
    while k <= n {
        if !(degenerate(&samples[k]) && samples[k].2 > 0.0) {
            k += 1;
            continue;
        }
        let start = k;
        while k <= n && degenerate(&samples[k]) && samples[k].2 > 0.0 {
            k += 1;
        }
        if om[k - 1] - om[start] < 0.99 * cell {
            continue;
        }
        in_stretch[start..k].iter_mut().for_each(|x| *x = true);
        let run = start..k;
        let imax = run
            .clone()
            .max_by(|a, b| samples[*a].2.total_cmp(&samples[*b].2))
            .unwrap_or(start);
        let lo = om[imax.saturating_sub(1)];
        let hi = om[(imax + 1).min(n)];
        let (_, rmax) = crate::numeric::minimise::golden_max(&|x| locus(x).2, lo, hi);
        push(&mut breaks, rmax.max(samples[imax].2));
        let imin = run
            .min_by(|a, b| samples[*a].2.total_cmp(&samples[*b].2))
            .unwrap_or(start);
        push(&mut breaks, samples[imin].2);
    }
    // sign changes of Im v between successive samples off the stretches
    let mut last: Option<usize> = None;
    for k in 0..=n {
        // off the stretches, and with a sign clear of rounding
        if in_stretch[k] || (samples[k].0.abs() <= samples[k].3 || samples[k].0.is_nan()) {
            continue;
        }
        if let Some(p) = last {
            if samples[p].0.signum() != samples[k].0.signum() {
                let s_lo = samples[p].0.signum();
                // only the sign of Im v, computed as `locus` does, without
                // the moduli it also returns
                let same_side = |x: f64| {
                    let (rho, sigma) = locus_point(alpha, beta, x);
                    ((w.conj() * rho) * sigma.conj()).im.signum() == s_lo
                };
                let (lo, hi) = crate::numeric::bracket::bisect(same_side, om[p], om[k], 0.0, 80);
                let (_, scale, r, _) = locus(0.5 * (lo + hi));
                // A sign change through a pole of ρ/σ (σ = 0) gives a huge |r|: skip it.
                if scale > 0.0 {
                    push(&mut breaks, r);
                }
            }
        }
        last = Some(k);
    }
    breaks.sort_by(|a, b| a.total_cmp(b));
    breaks.dedup_by(|a, b| (*a - *b).abs() <= 1e-12 * b.abs());
    classify(&breaks, |r| roots_inside(ms, w * r))
}

/// Whether every root ζ = 1 + e of Σ(α_j − zβ_j)ζ^j has |ζ| ≤ 1, judged from e:
/// the polynomial is shifted to ζ = 1 + e (so the principal root e ≈ z keeps its
/// relative accuracy however small z is) and |1 + e| − 1 is computed as
/// (2 Re e + |e|²)/(|1 + e| + 1), allowed 64ε·max(|e|, |e|²) of rounding.
fn roots_inside(ms: &Multistep, z: C64) -> bool {
    // α and β are shifted separately, so that the constant term Σα (zero for a
    // consistent method) is not lost against −1 − zβ₁
    let (alpha, beta) = (taylor_shift(&ms.alpha), taylor_shift(&ms.beta));
    let c: Vec<C64> = alpha
        .iter()
        .zip(&beta)
        .map(|(a, b)| C64::new(*a, 0.0) - z * b)
        .collect();
    match poly::roots(poly::trim(&c)) {
        Ok(roots) => roots.iter().all(|e| {
            let growth = (2.0 * e.re + e.norm_sqr()) / ((C64::new(1.0, 0.0) + e).norm() + 1.0);
            growth <= 64.0 * f64::EPSILON * e.norm().max(e.norm_sqr())
        }),
        Err(_) => false,
    }
}

/// Coefficients of p(1 + e) from those of p(ζ), by repeated synthetic division.
pub(in crate::time) fn taylor_shift(p: &[f64]) -> Vec<f64> {
    let mut c = p.to_vec();
    let n = c.len();
    for i in 0..n {
        for j in (i..n.saturating_sub(1)).rev() {
            c[j] += c[j + 1];
        }
    }
    c
}

#[cfg(test)]
mod tests {
    use super::super::tests::exit;
    use num_complex::Complex64 as C64;

    /// The per-thread locus table follows the method asked for: exits taken
    /// alternately for AB2 and AB3 on one thread equal those taken with a
    /// fresh table each time (the table is rebuilt when the method changes).
    #[test]
    fn locus_table_follows_the_method() {
        let w = C64::new(-0.3, 1.0);
        let fresh = |name: &str| {
            super::LOCUS.with(|c| *c.borrow_mut() = None);
            exit(name, w)
        };
        let (ab2, ab3) = (fresh("ab2"), fresh("ab3"));
        assert!(ab2 != ab3, "{ab2} {ab3}");
        for _ in 0..3 {
            assert_eq!(exit("ab2", w), ab2);
            assert_eq!(exit("ab3", w), ab3);
        }
    }
}
