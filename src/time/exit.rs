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

/// Coefficients of |Σ c_j (r w)^j|² as a real polynomial in r.
fn modulus_squared(c: &[f64], w: C64) -> (Vec<f64>, Vec<f64>) {
    let mut a = Vec::with_capacity(c.len());
    let mut wp = C64::new(1.0, 0.0);
    for cj in c {
        a.push(wp * cj);
        wp *= w;
    }
    let n = 2 * c.len() - 1;
    let mut out = vec![0.0; n];
    let mut mag = vec![0.0; n];
    for (j, aj) in a.iter().enumerate() {
        for (k, ak) in a.iter().enumerate() {
            out[j + k] += (aj * ak.conj()).re;
            // the rounding of Re(a_j conj a_k) = Re a_j Re a_k + Im a_j Im a_k is
            // relative to those products (not to |a_j||a_k|): a real part of
            // w of 1e-13 stays exact in the linear coefficient 2 Re w
            mag[j + k] += (aj.re * ak.re).abs() + (aj.im * ak.im).abs();
        }
    }
    (out, mag)
}

#[allow(clippy::needless_range_loop)]
pub(super) fn one_step(os: &OneStep, w: C64) -> f64 {
    let (gp, mp) = modulus_squared(&os.p, w);
    let (gq, mq) = modulus_squared(&os.q, w);
    let n = gp.len().max(gq.len());
    let mut g = vec![0.0; n];
    for (i, gi) in g.iter_mut().enumerate() {
        let v = gp.get(i).copied().unwrap_or(0.0) - gq.get(i).copied().unwrap_or(0.0);
        let scale = mp.get(i).copied().unwrap_or(0.0) + mq.get(i).copied().unwrap_or(0.0);
        *gi = if v.abs() <= 1e-13 * scale { 0.0 } else { v };
    }
    let Some(k) = (1..n).find(|&i| g[i] != 0.0) else {
        // |R| = 1 along the whole ray (or R ≡ 1): neutral, never leaves.
        return f64::INFINITY;
    };
    let gt = &g[k..];
    if gt[0] > 0.0 {
        return 0.0;
    }
    let roots = match poly::positive_real_roots(gt) {
        Ok(r) => r,
        Err(_) => return f64::NAN,
    };
    classify(&roots, |r| poly::eval_real(gt, r) <= 0.0)
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

pub(super) fn multistep(ms: &Multistep, w: C64) -> f64 {
    let eval = |c: &[f64], z: C64| c.iter().rev().fold(C64::new(0.0, 0.0), |a, x| a * z + x);
    // ρ and σ at ζ = 1 + d with d = e^{iω} − 1 = −2 sin²(ω/2) + i sin ω, from the
    // shifted coefficients: next to ω = 0, where ρ vanishes, ρ keeps its
    // relative accuracy (the locus there decides rays close to the imaginary axis)
    let (alpha, beta) = (taylor_shift(&ms.alpha), taylor_shift(&ms.beta));
    // v(ω) = w̄ ρ σ̄ = (w̄ ρ/σ)|σ|²: a crossing is Im v = 0 with Re v > 0.
    let locus = |om: f64| {
        let d = C64::new(-2.0 * (0.5 * om).sin().powi(2), om.sin());
        let rho = eval(&alpha, d);
        let sigma = eval(&beta, d);
        let (a, b) = (w.conj() * rho, sigma.conj());
        let v = a * b;
        let s2 = sigma.norm_sqr();
        let r = if s2 > 0.0 { v.re / s2 } else { f64::INFINITY };
        // the rounding of Im v = Im a Re b + Re a Im b, whose terms cancel where
        // the locus runs along the ray
        let noise = 16.0 * f64::EPSILON * ((a.im * b.re).abs() + (a.re * b.im).abs());
        (v.im, rho.norm() * sigma.norm(), r, noise)
    };
    let om = locus_angles(ms);
    let n = om.len() - 1;
    let samples: Vec<(f64, f64, f64, f64)> = om.iter().map(|x| locus(*x)).collect();
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
                let same_side = |x: f64| locus(x).0.signum() == s_lo;
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
