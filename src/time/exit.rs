//! First-exit radius r*(φ) of a stability region along the ray t·w, |w| = 1.
//!
//! One-step methods: along the ray, g(r) = |P(rw)|² − |Q(rw)|² is a real
//! polynomial in r with g(0) = 0. Its lowest non-vanishing coefficient decides the
//! behaviour next to the origin exactly (no tolerance: Heun on the imaginary axis
//! is unstable for every r > 0); its positive roots are the only places where
//! stability can change, so the intervals between them are classified by the sign
//! of g at their midpoints.
//!
//! Linear multistep methods: a root ζ of Σ(α_j − zβ_j)ζ^j crosses the unit circle
//! only where z lies on the boundary locus z(ω) = ρ(e^{iω})/σ(e^{iω}). The crossings
//! of the ray with the locus (sign changes of Im(w̄ ρ σ̄) in ω, bisected to full
//! precision, plus the extremes of any stretch of locus lying along the ray, as for
//! leapfrog on the imaginary axis) split the ray into intervals, each classified by
//! the root condition at its midpoint.

use super::{Multistep, OneStep};
use crate::linalg::poly;
use num_complex::Complex64 as C64;

/// Coefficients of |Σ c_j (r w)^j|² as a real polynomial in r into `out`, and
/// the sums of the moduli of their products into `mag` (both zero on entry, at
/// least 2·len(c) − 1 long; `a` at least len(c) long is scratch).
fn modulus_squared_into(c: &[f64], w: C64, a: &mut [C64], out: &mut [f64], mag: &mut [f64]) {
    let mut wp = C64::new(1.0, 0.0);
    for (aj, cj) in a.iter_mut().zip(c) {
        *aj = wp * cj;
        wp *= w;
    }
    let a = &a[..c.len()];
    for (j, aj) in a.iter().enumerate() {
        for (k, ak) in a.iter().enumerate() {
            out[j + k] += (aj * ak.conj()).re;
            // the rounding of Re(a_j conj a_k) = Re a_j Re a_k + Im a_j Im a_k is
            // relative to those products (not to |a_j||a_k|): a real part of
            // w of 1e-13 stays exact in the linear coefficient 2 Re w
            mag[j + k] += (aj.re * ak.re).abs() + (aj.im * ak.im).abs();
        }
    }
}

/// Up to this many coefficients of g are kept on the stack (methods of up to
/// twelve stages); longer polynomials use the heap.
const RAY_STACK: usize = 25;

/// The coefficients of g from its lowest non-vanishing one on (see
/// [`ray_polynomial`]), on the stack or the heap.
enum RayPoly {
    Stack([f64; RAY_STACK], usize, usize),
    Heap(Vec<f64>, usize),
}

impl std::ops::Deref for RayPoly {
    type Target = [f64];
    fn deref(&self) -> &[f64] {
        match self {
            RayPoly::Stack(c, k, n) => &c[*k..*n],
            RayPoly::Heap(c, k) => &c[*k..],
        }
    }
}

/// Fills g (length n) from zeroed scratch; returns the index of its lowest
/// non-vanishing coefficient after the constant one.
fn fill_ray_polynomial(
    os: &OneStep,
    w: C64,
    a: &mut [C64],
    (gp, mp): (&mut [f64], &mut [f64]),
    (gq, mq): (&mut [f64], &mut [f64]),
    g: &mut [f64],
) -> Option<usize> {
    modulus_squared_into(&os.p, w, a, gp, mp);
    modulus_squared_into(&os.q, w, a, gq, mq);
    for (i, gi) in g.iter_mut().enumerate() {
        let v = gp[i] - gq[i];
        let scale = mp[i] + mq[i];
        *gi = if v.abs() <= 1e-13 * scale { 0.0 } else { v };
    }
    (1..g.len()).find(|&i| g[i] != 0.0)
}

/// g(r) = |P(rw)|² − |Q(rw)|² with coefficients at rounding level set to zero,
/// from its lowest non-vanishing coefficient on (the factor r^k dropped);
/// `None` when every coefficient vanishes (|R| = 1 along the whole ray).
fn ray_polynomial(os: &OneStep, w: C64) -> Option<RayPoly> {
    let len = os.p.len().max(os.q.len());
    let n = 2 * len - 1;
    if n <= RAY_STACK {
        let mut a = [C64::new(0.0, 0.0); RAY_STACK];
        let mut parts = [[0.0f64; RAY_STACK]; 4];
        let [gp, mp, gq, mq] = &mut parts;
        let mut g = [0.0f64; RAY_STACK];
        let k = fill_ray_polynomial(os, w, &mut a, (gp, mp), (gq, mq), &mut g[..n])?;
        Some(RayPoly::Stack(g, k, n))
    } else {
        let mut a = vec![C64::new(0.0, 0.0); len];
        let mut parts = vec![vec![0.0f64; n]; 4];
        let [gp, mp, gq, mq] = &mut parts[..] else {
            unreachable!()
        };
        let mut g = vec![0.0f64; n];
        let k = fill_ray_polynomial(os, w, &mut a, (gp, mp), (gq, mq), &mut g)?;
        Some(RayPoly::Heap(g, k))
    }
}

pub(super) fn one_step(os: &OneStep, w: C64) -> f64 {
    one_step_of(ray_polynomial(os, w))
}

/// [`one_step`] from g as [`ray_polynomial`] gives it.
fn one_step_of(g: Option<RayPoly>) -> f64 {
    let Some(gt) = g else {
        // |R| = 1 along the whole ray (or R ≡ 1): neutral, never leaves.
        return f64::INFINITY;
    };
    if gt[0] > 0.0 {
        return 0.0;
    }
    let roots = match poly::positive_real_roots(&gt) {
        Ok(r) => r,
        Err(_) => return f64::NAN,
    };
    classify(&roots, |r| poly::eval_real(&gt, r) <= 0.0)
}

/// Largest degree of g for which a negativity certificate is tried.
const CERTIFIED_DEGREE: usize = 40;

/// Whether g (ascending coefficients, g(0) < 0) is certified negative on the
/// whole of [0, r], its computed values (Horner's rule) included: g(r·x),
/// x ∈ [0, 1], has Bernstein coefficients all below minus a bound on their
/// rounding and on that of Horner's rule. By the convex-hull property of the
/// Bernstein form (Farouki & Rajan, Computer Aided Geometric Design 5, 1988)
/// the polynomial then lies below its largest coefficient. `false` says
/// nothing.
fn certified_negative(g: &[f64], r: f64) -> bool {
    let d = g.len() - 1;
    if g[0] >= 0.0 || d > CERTIFIED_DEGREE || !(r.is_finite() && r > 0.0) {
        return false;
    }
    // a_j = g_j r^j: g(r x) = Σ a_j x^j
    let mut a = [0.0f64; CERTIFIED_DEGREE + 1];
    let mut rj = 1.0;
    for (aj, gj) in a.iter_mut().zip(g) {
        *aj = gj * rj;
        rj *= r;
    }
    let size: f64 = a[..=d].iter().map(|x| x.abs()).sum();
    if !size.is_finite() {
        return false;
    }
    let margin = 4.0 * (d + 2) as f64 * f64::EPSILON * size;
    // b_i = Σ_{j ≤ i} C(i, j)/C(d, j) a_j
    let mut choose_d = [1.0f64; CERTIFIED_DEGREE + 1];
    for j in 1..=d {
        choose_d[j] = choose_d[j - 1] * (d + 1 - j) as f64 / j as f64;
    }
    let mut row = [0.0f64; CERTIFIED_DEGREE + 1];
    for i in 0..=d {
        // row holds C(i, j) for j ≤ i (Pascal's rule, updated in place)
        row[i] = 1.0;
        for j in (1..i).rev() {
            row[j] += row[j - 1];
        }
        row[0] = 1.0;
        let b: f64 = (0..=i).map(|j| row[j] / choose_d[j] * a[j]).sum();
        if b > -margin {
            return false;
        }
    }
    true
}

/// Whether the ray t·w is certified to stay inside the region for every
/// t ∈ (0, r], so that [`one_step`] returns at least r ([`certified_negative`]:
/// no break point below r can start an unstable stretch). `false` says
/// nothing: the exact exit must be computed.
pub(super) fn one_step_stable_through(os: &OneStep, w: C64, r: f64) -> bool {
    match ray_polynomial(os, w) {
        None => true,
        Some(g) => certified_negative(&g, r),
    }
}

/// Newton steps allowed from a guess of the exit.
const GUESS_STEPS: usize = 16;
/// Largest relative uncertainty of a root (the rounding of g over r·g′(r))
/// accepted from a guess.
const ROOT_CONDITION: f64 = 1e-12;
/// How many times that uncertainty the stretch below the root left out of
/// the negativity certificate and the point above it checked unstable are.
const ROOT_GAP: f64 = 4.0;

/// The first exit along t·w from guesses of it (the exits of nearby
/// directions), without the companion matrix where one guess succeeds:
/// Newton's method on g from each guess in turn to a root r₁, accepted only
/// when the ray is verified unstable at r₁(1 + δ) (g there above its rounding)
/// and certified stable on (0, r₁(1 − δ)] ([`certified_negative`]), δ =
/// [`ROOT_GAP`] times the root's relative uncertainty (at most
/// [`ROOT_CONDITION`]). The true first exit is then within δ of r₁, as is what
/// [`one_step`] computes. Where every guess fails a check (a guess beyond a
/// lobe, a touching or ill-conditioned root) the exit is computed in full from
/// the same g.
pub(super) fn one_step_near(os: &OneStep, w: C64, guesses: &[f64]) -> f64 {
    let g = ray_polynomial(os, w);
    if let Some(gt) = &g {
        let usable = guesses.iter().filter(|x| x.is_finite() && **x > 0.0);
        if let Some(r) = usable
            .into_iter()
            .find_map(|&x| first_exit_from_guess(gt, x))
        {
            return r;
        }
    }
    one_step_of(g)
}

/// [`one_step_near`] with one guess, `None` where it fails (tests).
#[cfg(test)]
fn one_step_from_guess(os: &OneStep, w: C64, guess: f64) -> Option<f64> {
    if !(guess.is_finite() && guess > 0.0) {
        return None;
    }
    first_exit_from_guess(&ray_polynomial(os, w)?, guess)
}

/// One guess of [`one_step_near`] on g itself (ascending coefficients, g(0) ≠ 0).
fn first_exit_from_guess(g: &[f64], guess: f64) -> Option<f64> {
    let d = g.len() - 1;
    if g[0] >= 0.0 || d == 0 {
        return None;
    }
    // g(r), g′(r) and Σ|g_j| r^j by Horner's rule
    let horner = |r: f64| {
        let (mut p, mut dp, mut size) = (g[d], 0.0, g[d].abs());
        for &gj in g[..d].iter().rev() {
            dp = dp * r + p;
            p = p * r + gj;
            size = size * r + gj.abs();
        }
        (p, dp, size)
    };
    let rounding_at = |size: f64| 2.0 * (d + 1) as f64 * f64::EPSILON * size;
    let mut r = guess;
    let mut converged = false;
    for _ in 0..GUESS_STEPS {
        let (p, dp, size) = horner(r);
        if dp.is_nan() || dp <= 0.0 {
            return None;
        }
        // g(r) within its rounding: r is a root to working accuracy
        if p.abs() <= rounding_at(size) {
            converged = true;
            break;
        }
        r -= p / dp;
        if !(r > 0.0 && r.is_finite()) {
            return None;
        }
    }
    if !converged {
        return None;
    }
    let (_, dp, size) = horner(r);
    let condition = rounding_at(size) / (r * dp);
    if condition.is_nan() || condition > ROOT_CONDITION {
        return None;
    }
    let delta = ROOT_GAP * condition.max(f64::EPSILON);
    let (above, _, size_above) = horner(r * (1.0 + delta));
    let unstable_above = above > rounding_at(size_above);
    (unstable_above && certified_negative(g, r * (1.0 - delta))).then_some(r)
}

/// Walks the sorted break points; returns the first one after which the ray is
/// unstable. Beyond the last break the verdict is constant, so it is taken at
/// max(2·last, 1), clear of the origin where rounding blurs every test.
fn classify(breaks: &[f64], stable: impl Fn(f64) -> bool) -> f64 {
    let mut prev = 0.0;
    for &b in breaks {
        if b <= prev {
            continue;
        }
        if !stable(0.5 * (prev + b)) {
            return prev;
        }
        prev = b;
    }
    let probe = (2.0 * prev).max(1.0);
    if stable(probe) {
        f64::INFINITY
    } else {
        prev
    }
}

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

pub(super) fn multistep(ms: &Multistep, w: C64) -> f64 {
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
pub(super) fn taylor_shift(p: &[f64]) -> Vec<f64> {
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
    use super::super::methods::builtin;
    use num_complex::Complex64 as C64;

    fn exit(name: &str, w: C64) -> f64 {
        builtin(name).unwrap().exit_radius(w / w.norm())
    }

    /// The warm start from the exit of a direction 1e-3 rad away agrees with
    /// the companion-matrix computation to 1e-12 wherever it accepts, and
    /// accepts for nine in ten directions into the left half-plane for methods
    /// of up to six stages (a warm start that never accepts would be silently
    /// slow, not wrong). The ten-stage SSP method's g has coefficients that
    /// cancel so much that the rounding bound leaves its roots uncertified: it
    /// takes the full path almost everywhere, and is checked for agreement only.
    #[test]
    fn warm_start_agrees_with_the_full_computation() {
        let methods = [
            ("euler", true),
            ("heun", true),
            ("ssprk3", true),
            ("rk4", true),
            ("lsrk54", true),
            ("lddrk-hhm", true),
            ("ssprk104", false),
        ];
        for (name, mostly) in methods {
            let m = builtin(name).unwrap();
            let os = match &m.scheme {
                super::super::Scheme::OneStep(os) => os.clone(),
                _ => unreachable!(),
            };
            let (mut accepted, mut tried) = (0, 0);
            for k in 0..2000 {
                let phi =
                    std::f64::consts::FRAC_PI_2 + std::f64::consts::PI * (k as f64 + 0.5) / 2000.0;
                let w = C64::from_polar(1.0, phi);
                let full = super::one_step(&os, w);
                let guess = super::one_step(&os, C64::from_polar(1.0, phi + 1e-3));
                if let Some(r) = super::one_step_from_guess(&os, w, guess) {
                    accepted += 1;
                    assert!(
                        (r - full).abs() <= 1e-12 * full,
                        "{name} φ {phi}: warm {r} vs full {full}"
                    );
                }
                if full.is_finite() && full > 0.0 {
                    tried += 1;
                }
            }
            assert!(
                !mostly || accepted * 10 >= tried * 9,
                "{name}: {accepted} of {tried} accepted"
            );
        }
    }

    /// The negativity certificate: (r − 1)(r − 2)(r − 3) is negative on
    /// [0, 0.999], and is not certified on intervals that reach a root.
    #[test]
    fn negativity_certificate_stops_short_of_the_first_root() {
        let g = [-6.0, 11.0, -6.0, 1.0]; // (r − 1)(r − 2)(r − 3)
        assert!(super::certified_negative(&g, 0.999));
        assert!(!super::certified_negative(&g, 1.0));
        assert!(!super::certified_negative(&g, 1.5));
        assert!(!super::certified_negative(&g, 3.5));
    }

    /// A guess past the first exit is refused: g = (r − 1)(r − 2)(r − 3)
    /// leaves at 1, returns at 2 and leaves again at 3; from 3.1 Newton's
    /// method finds the crossing at 3, and the certificate below it fails. From
    /// 0.9 it finds the first exit.
    #[test]
    fn warm_start_refuses_a_later_crossing() {
        let g = [-6.0, 11.0, -6.0, 1.0];
        assert_eq!(super::first_exit_from_guess(&g, 3.1), None);
        let r = super::first_exit_from_guess(&g, 0.9).unwrap();
        assert!((r - 1.0).abs() < 1e-14, "{r}");
        // a guess on the way down at 2 has g′ < 0 there: refused
        assert_eq!(super::first_exit_from_guess(&g, 2.0), None);
        // Heun along −1 leaves at 2 only: a guess of 5 comes back to it
        let m = builtin("heun").unwrap();
        let os = match &m.scheme {
            super::super::Scheme::OneStep(os) => os.clone(),
            _ => unreachable!(),
        };
        let r = super::one_step_from_guess(&os, C64::new(-1.0, 0.0), 5.0).unwrap();
        assert!((r - 2.0).abs() < 1e-14, "{r}");
    }

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

    #[test]
    fn adams_bashforth_2_reaches_minus_one_on_the_negative_real_axis() {
        // AB2 boundary locus at ζ = −1: z = (1 + 1)/(−1.5 − 0.5) = −1 (closed form)
        let r = exit("ab2", C64::new(-1.0, 0.0));
        assert!((r - 1.0).abs() < 1e-12, "{r}");
        let r = exit("ab2", C64::new(-1.0, 1e-12));
        assert!((r - 1.0).abs() < 1e-9, "{r}");
    }

    #[test]
    fn adams_bashforth_3_reaches_six_elevenths_on_the_negative_real_axis() {
        // AB3: the real-axis interval of absolute stability is [−6/11, 0] (closed
        // form from the boundary locus at ζ = −1: z = −2/(5/12 + 16/12 + 23/12))
        let r = exit("ab3", C64::new(-1.0, 0.0));
        assert!((r - 6.0 / 11.0).abs() < 1e-12, "{r}");
    }

    #[test]
    fn adams_bashforth_2_near_the_imaginary_axis_has_a_small_positive_exit() {
        // next to the axis the locus z(ω) ≈ iω − ω⁴/4 ... crosses the ray
        // t·(−δ + i) at ω ≈ (4δ)^{1/3}, far inside the first uniform locus cell
        for delta in [1e-6, 1e-9, 1e-12, 1e-15] {
            let r = exit("ab2", C64::new(-delta, 1.0));
            let want = (4.0 * delta).powf(1.0 / 3.0);
            assert!(r > 0.5 * want && r < 2.0 * want, "δ {delta}: {r} vs {want}");
        }
        assert_eq!(exit("ab2", C64::new(0.0, 1.0)), 0.0);
    }

    #[test]
    fn heun_a_hair_left_of_the_imaginary_axis_exits_at_the_cube_root() {
        // |1 + z + z²/2|² − 1 = 2x + y⁴/4 + O(xy², x²) for z = x + iy, so along
        // r·(−δ + i) the first exit is at r³ ≈ 8δ (closed form). δ = 2.4e-16 puts
        // the roots of g far below the companion matrix's rounding unless the
        // variable is scaled first.
        for delta in [2.4e-16, 4.2e-15, 1e-12] {
            let r = exit("heun", C64::new(-delta, 1.0));
            let expected = (8.0 * delta).cbrt();
            assert!(
                (r / expected - 1.0).abs() < 1e-3,
                "δ {delta}: {r} vs {expected}"
            );
        }
    }

    #[test]
    fn leapfrog_is_unstable_on_the_negative_real_axis_and_neutral_on_the_imaginary() {
        assert_eq!(exit("leapfrog", C64::new(-1.0, 0.0)), 0.0);
        let r = exit("leapfrog", C64::new(0.0, 1.0));
        assert!((r - 1.0).abs() < 1e-12, "{r}");
    }

    #[test]
    fn adams_bashforth_3_keeps_a_stretch_of_the_imaginary_axis() {
        // AB3 is stable on the imaginary axis up to |z| = 0.7236 (value quoted
        // from memory; it is where the boundary locus re-crosses the axis, and
        // we check that crossing in closed form: Re z(ω) = 0 there)
        let r = exit("ab3", C64::new(0.0, 1.0));
        assert!(r > 0.72 && r < 0.73, "{r}");
        let ms = match &builtin("ab3").unwrap().scheme {
            super::super::Scheme::Multistep(ms) => ms.clone(),
            _ => unreachable!(),
        };
        let eval = |c: &[f64], z: C64| c.iter().rev().fold(C64::new(0.0, 0.0), |a, x| a * z + x);
        // find ω with Im z(ω) = r on the upper half of the locus and check Re z ≈ 0
        let z_of = |om: f64| {
            let zeta = C64::from_polar(1.0, om);
            eval(&ms.alpha, zeta) / eval(&ms.beta, zeta)
        };
        let best = (1..20000)
            .map(|k| z_of(std::f64::consts::PI * k as f64 / 20000.0))
            .filter(|z| z.re.abs() < 1e-3)
            .map(|z| (z.im - r).abs())
            .fold(f64::INFINITY, f64::min);
        assert!(best < 1e-3, "{best}");
    }

    #[test]
    fn bdf2_is_stable_along_every_ray_into_the_left_half_plane() {
        // BDF2 is A-stable (Dahlquist's second barrier: the only A-stable linear
        // multistep methods are of order ≤ 2, BDF2 and the trapezoidal rule
        // among them), so no ray with Re w ≤ 0 ever leaves its region
        for delta in [0.0, 1e-12, 1e-8, 1e-4, 1e-2, 0.5] {
            for sign in [1.0, -1.0] {
                let r = exit("bdf2", C64::new(-delta, sign));
                assert!(r.is_infinite(), "δ {delta}, sign {sign}: {r}");
            }
        }
        assert!(exit("bdf2", C64::new(-1.0, 0.0)).is_infinite());
    }
}
