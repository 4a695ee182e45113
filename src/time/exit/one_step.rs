//! First exits of one-step methods along a ray: the real polynomial
//! g(r) = |P(rw)|² − |Q(rw)|², its positive roots (the real kernel through
//! [`poly::positive_real_roots`]), a Bernstein certificate that g stays
//! negative up to a radius, and the certified Newton warm start from a nearby
//! exit.

use super::classify;
use crate::linalg::poly;
use crate::time::OneStep;
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

pub(in crate::time) fn one_step(os: &OneStep, w: C64) -> f64 {
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
pub(in crate::time) fn one_step_stable_through(os: &OneStep, w: C64, r: f64) -> bool {
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
pub(in crate::time) fn one_step_near(os: &OneStep, w: C64, guesses: &[f64]) -> f64 {
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

#[cfg(test)]
mod tests {
    use crate::time::methods::builtin;
    use num_complex::Complex64 as C64;

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
                crate::time::Scheme::OneStep(os) => os.clone(),
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
            crate::time::Scheme::OneStep(os) => os.clone(),
            _ => unreachable!(),
        };
        let r = super::one_step_from_guess(&os, C64::new(-1.0, 0.0), 5.0).unwrap();
        assert!((r - 2.0).abs() < 1e-14, "{r}");
    }
}
