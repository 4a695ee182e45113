//! Long-wave limits of composite schemes: for IMEX schemes in closed form
//! ([`imex_closed_form`]: the explicit method's growth on the imaginary axis
//! against L's damping, as for one-step methods), for the others a verdict from
//! orders ([`verdict`]): the growth a scheme adds to a travelling long wave
//! against the damping L gives it.
//!
//! Along θ₀ + s n, each eigenvalue branch of L behaves as μ ≈ i a s − b sʳ
//! ([`super::closed_form::branches`]). A composite scheme whose G tends to
//! I + ΔtL (IMEX, splitting, forward–backward) gives ρ(G) − 1 ≈ −Δt b sʳ +
//! β Δtᵏ s^q for small Δt|μ|: the first term its consistency, the second what
//! it does to waves on the imaginary axis (AB2's explicit part in IMEX CNAB2:
//! k = q = 4, the (Δt a s)⁴/4 growth of the principal root). Both orders of the
//! second term are read numerically from ρ(G) − 1 at Δt|L| ≈ 1/20, where it
//! dominates: k from halving Δt, q from halving s, each required to settle on
//! an integer, the value positive and far above its rounding. Then, as for
//! one-step methods in closed form:
//! - every moving branch damped at an order above q: the growth wins for small
//!   enough s at every Δt — unstable at every Δt (0). The growth then sits far
//!   below the rounding of any sample at the Δt where it starts (IMEX CNAB2
//!   with eighth-order dissipation, seed 5751), so no sampling can see it;
//! - every moving branch damped at an order below q: long waves set no limit;
//! - otherwise (equal orders, a limit of its own) no verdict: the samples of
//!   the long-wave approach decide.

use super::closed_form::{
    branches, imaginary_axis, imaginary_axis_multistep, long_wave_limit_from, ClosedForm,
};
use super::search::CompositeEval;

/// First level s of the growth fit.
const S: f64 = 0.05;
/// Levels of the fit (s, s/2, s/4).
const LEVELS: usize = 3;
/// Δt‖L(θ₀ + S n)‖ at which the growth is read.
const REACH: f64 = 0.05;
/// How far above its rounding a growth reading must be.
const CLEAR: f64 = 1e3;
/// Largest distance of a measured order from the integer it is read as.
const SETTLED: f64 = 0.1;

/// The long-wave limit along θ₀ + s n from the orders (0: unstable at every
/// Δt; ∞: no limit), or None where they give no verdict.
pub fn verdict(ev: &CompositeEval, tolerance: f64, origin: &[f64], n: &[f64]) -> Option<f64> {
    let op = ev.operator();
    if !ev.tends_to_identity() {
        return None;
    }
    let all = branches(op, tolerance, origin, n)?;
    let scale = all.iter().fold(0.0_f64, |acc, b| acc.max(b.a.abs()));
    if scale == 0.0 {
        return None;
    }
    let moving: Vec<u32> = all
        .iter()
        .filter(|b| b.a.abs() > 1e-9 * scale)
        .map(|b| b.r)
        .collect::<Option<Vec<u32>>>()?;
    let (r_min, r_max) = (*moving.iter().min()?, *moving.iter().max()?);
    let q = growth_order(ev, origin, n)?;
    if r_min > q {
        Some(0.0)
    } else if r_max < q {
        Some(f64::INFINITY)
    } else {
        None
    }
}

/// The long-wave limit of an IMEX scheme in closed form: the implicit method
/// (backward Euler, Crank–Nicolson) acts on the diffusion terms only, whose
/// symbol is real along the approach (central second differences), so the
/// growth of a long wave on the imaginary axis is the explicit method's alone
/// and |ζ|² − 1 ≈ 2Δt Re μ + c (Δt Im μ)ᵏ as for that method by itself
/// (forward Euler: k = 2, c = 1, whence IMEX Euler's 2D/a²; AB2: k = 4, c = 1/2,
/// whence Δt³ = 4b/a⁴ against fourth-order damping b s⁴). None for other
/// schemes, or where a diffusion symbol has an imaginary part.
pub fn imex_closed_form(
    ev: &CompositeEval,
    tolerance: f64,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    let op = ev.operator();
    use crate::time::composite::{Composite, Imex};
    use crate::time::Scheme;
    let explicit = match ev.scheme() {
        Composite::Imex(Imex::Euler) => "euler",
        Composite::Imex(Imex::Cnab2) => "ab2",
        _ => return None,
    };
    let real_diffusion = [1e-2, 1e-3, 1e-4].iter().all(|s| {
        let theta: Vec<f64> = origin.iter().zip(n).map(|(o, x)| o + x * s).collect();
        op.diffusion_is_real_at(&theta)
    });
    if !real_diffusion {
        return None;
    }
    let axis = match crate::time::methods::builtin(explicit)?.scheme {
        Scheme::OneStep(os) => imaginary_axis(&os),
        Scheme::Multistep(ms) => imaginary_axis_multistep(&ms),
        _ => None,
    }?;
    long_wave_limit_from(axis, op, tolerance, origin, n)
}

/// The order q in s of the growth ρ(G) − 1 ≈ β Δtᵏ s^q at a fixed small
/// Δt|L|, when it is positive, clear of rounding, and both its orders settle.
fn growth_order(ev: &CompositeEval, origin: &[f64], n: &[f64]) -> Option<u32> {
    let op = ev.operator();
    let at = |s: f64| -> Vec<f64> { origin.iter().zip(n).map(|(o, x)| o + x * s).collect() };
    let size = crate::linalg::nonnormal::frobenius(op.symbol(&at(S)).into_iter());
    if !(size.is_finite() && size > 0.0) {
        return None;
    }
    let dt = REACH / size;
    let mut by_s: Vec<f64> = Vec::with_capacity(LEVELS);
    let mut k_orders: Vec<f64> = Vec::with_capacity(LEVELS);
    for j in 0..LEVELS {
        let theta = at(S * 0.5f64.powi(j as i32));
        let (g, noise) = ev.growth_and_noise(&theta, dt);
        let (h, noise_h) = ev.growth_and_noise(&theta, 0.5 * dt);
        if !(g > CLEAR * noise && h > CLEAR * noise_h) {
            return None;
        }
        k_orders.push((g / h).log2());
        by_s.push(g);
    }
    let k = k_orders[0].round();
    if k < 2.0 || k_orders.iter().any(|o| (o - k).abs() > SETTLED) {
        return None;
    }
    let q_orders: Vec<f64> = by_s.windows(2).map(|w| (w[0] / w[1]).log2()).collect();
    let q = q_orders[0].round();
    if !(1.0..=16.0).contains(&q) || q_orders.iter().any(|o| (o - q).abs() > SETTLED) {
        return None;
    }
    Some(q as u32)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// IMEX CNAB2 (implicit diffusion, explicit rest) on 1-D advection with
    /// central differences: its explicit AB2 part grows a wave on the imaginary
    /// axis as |ζ|² − 1 ≈ (Δtω)⁴/2 (the principal root of AB2, derived by
    /// expanding ζ² − ζ = z(3ζ − 1)/2 at z = iΔtω), order q = 4 in s. Against
    /// it: explicit eighth-order dissipation (r = 8 > 4: unstable at every Δt),
    /// implicit diffusion (r = 2 < 4: no long-wave limit, but the
    /// growth hides under the damping), explicit
    /// fourth-order dissipation (r = 4: a limit of its own, no verdict).
    fn cnab2(diffusion: f64, dissipation: Option<i64>) -> Option<f64> {
        let mut b = Problem::builder()
            .spacing(&[0.3])
            .system(crate::physics::advection(&[1.3], &[diffusion]))
            .first("central2")
            .second("central2")
            .method("imex-cnab2")
            .dt(1e-3);
        if let Some(order) = dissipation {
            b = b.dissipation(order, 1e-3);
        }
        let p = b.build().unwrap();
        let op = p.operator();
        let scheme = p.method.composite().unwrap();
        let ev = CompositeEval::new(&p, &op, scheme);
        verdict(&ev, 1e-12, &[0.0], &[1.0])
    }

    #[test]
    fn eighth_order_dissipation_loses_to_the_growth_of_ab2() {
        assert_eq!(cnab2(0.0, Some(8)), Some(0.0));
    }

    /// Implicit diffusion damps more than AB2 grows at Δt|L| = 1/20, so the
    /// growth is never seen and its order not read: no verdict (the samples of
    /// the approach, growing like 1/s, decide).
    #[test]
    fn growth_hidden_under_implicit_diffusion_gives_no_verdict() {
        assert_eq!(cnab2(0.05, None), None);
    }

    #[test]
    fn fourth_order_dissipation_balances_the_growth_and_gives_no_verdict() {
        assert_eq!(cnab2(0.0, Some(4)), None);
    }

    /// A scheme whose G is not I + ΔtL to first order is outside the analysis.
    #[test]
    fn lax_wendroff_gets_no_verdict() {
        let p = Problem::builder()
            .spacing(&[0.3])
            .system(crate::physics::advection(&[1.3], &[0.0]))
            .first("central2")
            .method("lax-wendroff")
            .dissipation(8, 1e-3)
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        let ev = CompositeEval::new(&p, &op, p.method.composite().unwrap());
        assert_eq!(verdict(&ev, 1e-12, &[0.0], &[1.0]), None);
    }
}
