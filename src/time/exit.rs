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
            mag[j + k] += aj.norm() * ak.norm();
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

/// Walks the sorted break points; returns the first one after which the ray is unstable.
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
    let probe = if prev == 0.0 { 1.0 } else { 2.0 * prev };
    if stable(probe) {
        f64::INFINITY
    } else {
        prev
    }
}

const LOCUS_SAMPLES: usize = 2048;

pub(super) fn multistep(ms: &Multistep, w: C64) -> f64 {
    let eval = |c: &[f64], z: C64| c.iter().rev().fold(C64::new(0.0, 0.0), |a, x| a * z + x);
    // v(ω) = w̄ ρ σ̄ = (w̄ ρ/σ)|σ|²: a crossing is Im v = 0 with Re v > 0.
    let locus = |om: f64| {
        let zeta = C64::from_polar(1.0, om);
        let rho = eval(&ms.alpha, zeta);
        let sigma = eval(&ms.beta, zeta);
        let v = w.conj() * rho * sigma.conj();
        let s2 = sigma.norm_sqr();
        let r = if s2 > 0.0 { v.re / s2 } else { f64::INFINITY };
        (v.im, rho.norm() * sigma.norm(), r)
    };
    let two_pi = std::f64::consts::TAU;
    let om = |k: usize| two_pi * k as f64 / LOCUS_SAMPLES as f64;
    let samples: Vec<(f64, f64, f64)> = (0..=LOCUS_SAMPLES).map(|k| locus(om(k))).collect();
    let degenerate = |s: &(f64, f64, f64)| s.0.abs() <= 1e-11 * s.1.max(1e-300);
    let mut breaks: Vec<f64> = Vec::new();
    let push = |breaks: &mut Vec<f64>, r: f64| {
        if r.is_finite() && r > 1e-14 {
            breaks.push(r);
        }
    };
    for k in 0..LOCUS_SAMPLES {
        let (a, b) = (samples[k], samples[k + 1]);
        if degenerate(&a) || degenerate(&b) {
            continue;
        }
        if a.0.signum() != b.0.signum() {
            let s_lo = a.0.signum();
            let same_side = |x: f64| locus(x).0.signum() == s_lo;
            let (lo, hi) = crate::numeric::bracket::bisect(same_side, om(k), om(k + 1), 0.0, 80);
            let (_, scale, r) = locus(0.5 * (lo + hi));
            // A sign change through a pole of ρ/σ (σ = 0) gives a huge |r|: skip it.
            if scale > 0.0 {
                push(&mut breaks, r);
            }
        }
    }
    // Stretches of locus lying along the ray: their extreme radii are break points.
    let mut k = 0;
    while k <= LOCUS_SAMPLES {
        if !(degenerate(&samples[k]) && samples[k].2 > 0.0) {
            k += 1;
            continue;
        }
        let start = k;
        while k <= LOCUS_SAMPLES && degenerate(&samples[k]) && samples[k].2 > 0.0 {
            k += 1;
        }
        let run = start..k;
        let imax = run
            .clone()
            .max_by(|a, b| samples[*a].2.total_cmp(&samples[*b].2))
            .unwrap_or(start);
        let lo = om(imax.saturating_sub(1));
        let hi = om((imax + 1).min(LOCUS_SAMPLES));
        let (_, rmax) = crate::numeric::minimise::golden_max(&|x| locus(x).2, lo, hi);
        push(&mut breaks, rmax.max(samples[imax].2));
        let imin = run
            .min_by(|a, b| samples[*a].2.total_cmp(&samples[*b].2))
            .unwrap_or(start);
        push(&mut breaks, samples[imin].2);
    }
    breaks.sort_by(|a, b| a.total_cmp(b));
    breaks.dedup_by(|a, b| (*a - *b).abs() <= 1e-12 * b.abs());
    classify(&breaks, |r| {
        poly::max_root_modulus(&ms.characteristic(w * r)).is_ok_and(|m| m <= 1.0 + 1e-9)
    })
}
