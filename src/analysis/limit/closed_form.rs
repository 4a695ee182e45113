//! Long-wave limits of one-step methods in closed form.
//!
//! Near a wavevector θ₀ where L vanishes (θ = 0; corners and faces for
//! central differences), each eigenvalue branch along θ₀ + s n behaves as
//! μ(s) = i a s − b sʳ + …  (a the speed along n, b > 0 the leading damping of
//! order r: 2 for diffusion or first-order upwinding, 4 for third-order upwind
//! or fourth-order dissipation, …), and the method's stability function as
//! |R(x + iy)|² = 1 + 2x + c y^k + …  near z = 0 (k even, c the leading
//! coefficient of |R(iy)|² − 1; k = 2, c = 1 − 2ϑ for the ϑ-method, k = 4,
//! c = 1/4 for Heun... with c < 0 for methods that contain a stretch of the
//! imaginary axis, where long waves set no limit). With z = Δt μ the balance
//! −2Δt b sʳ + c (Δt |a| s)ᵏ ≤ 0 as s → 0 gives, for c > 0:
//! r < k: no long-wave limit; r = k: Δt ≤ (2b/(c|a|ᵏ))^{1/(k−1)} (FTCS:
//! k = 2, c = 1, Δt ≤ 2D/a², Hirsch's ν² ≤ 2r); r > k or b = 0: unstable at
//! every Δt. The orders are read from the exact stability polynomial (k, c)
//! and from the eigenvalues of L at s = 10⁻², 5·10⁻³, … (a and b by Richardson
//! extrapolation, r as the rounded log₂ ratio of successive real parts, which
//! must agree). The fit's own uncertainty is the error of the last Richardson
//! value where the next term is of order s⁴: 1/15 of its distance from the
//! value of the two levels before (for v = b + αs² + βs⁴ the two values are
//! b − βs⁴/4 and b − 4βs⁴), carried to Δt through the exponents. It does not
//! bound rounding at the smallest s beyond what that distance shows. Any doubt
//! (untrusted eigenvalues, equal speeds of two branches, an order that does
//! not settle, a positive real part) gives None and the numerical
//! extrapolation stands.

use crate::operator::{Operator, Spectrum};
use crate::time::{Multistep, OneStep};
use num_complex::Complex64 as C64;

/// Levels s = S · 2⁻ʲ of the branch fit.
const S: f64 = 1e-2;
const LEVELS: usize = 5;

/// (k, c): |R(iy)|² − 1 = c yᵏ + O(y^{k+2}); None when |R(iy)| = 1 to every
/// order the polynomials hold (no imaginary-axis growth or decay).
pub fn imaginary_axis(os: &OneStep) -> Option<(usize, f64)> {
    let square = |c: &[f64]| -> (Vec<f64>, Vec<f64>) {
        // c_j (i y)^j: real parts at even j, imaginary at odd j
        let a: Vec<C64> = c
            .iter()
            .enumerate()
            .map(|(j, x)| C64::new(0.0, 1.0).powi(j as i32) * x)
            .collect();
        let n = 2 * a.len() - 1;
        let (mut out, mut mag) = (vec![0.0; n], vec![0.0; n]);
        for (j, aj) in a.iter().enumerate() {
            for (l, al) in a.iter().enumerate() {
                out[j + l] += (aj * al.conj()).re;
                mag[j + l] += aj.norm() * al.norm();
            }
        }
        (out, mag)
    };
    let (gp, mp) = square(&os.p);
    let (gq, mq) = square(&os.q);
    let n = gp.len().max(gq.len());
    for k in 1..n {
        let v = gp.get(k).copied().unwrap_or(0.0) - gq.get(k).copied().unwrap_or(0.0);
        let scale = mp.get(k).copied().unwrap_or(0.0) + mq.get(k).copied().unwrap_or(0.0);
        if v.abs() > 1e-12 * scale.max(1.0) {
            return (k % 2 == 0).then_some((k, v));
        }
    }
    None
}

/// (k, c) of a linear multistep method's principal root:
/// |ζ₁(iy)|² − 1 = c yᵏ + O(y^{k+2}), from its power series
/// ([`super::principal_root`]); None when the principal root stays on the unit
/// circle (leapfrog). AB2: k = 4, c = 1/2.
pub fn imaginary_axis_multistep(ms: &Multistep) -> Option<(usize, f64)> {
    super::principal_root::imaginary_axis(ms)
}

/// One eigenvalue branch near θ₀: μ ≈ i a s − b sʳ (r = None: no real part
/// at any level, exactly imaginary by construction).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Branch {
    /// Speed along n (per unit s).
    pub a: f64,
    /// Leading damping coefficient (0 with `r` None).
    pub b: f64,
    /// Order of the damping.
    pub r: Option<u32>,
    /// Relative uncertainty of `a` (see `richardson`).
    pub a_spread: f64,
    /// Relative uncertainty of `b`, likewise (0 with `r` None).
    pub b_spread: f64,
}

/// A long-wave limit in closed form with its relative uncertainty.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ClosedForm {
    /// The limit (∞: long waves set no limit; 0: unstable at every Δt).
    pub limit: f64,
    /// Its relative uncertainty, from the branch fit (at least 1e-12).
    pub uncertainty: f64,
}

impl ClosedForm {
    /// The closed form from its value with the last Richardson levels (`best`)
    /// and with the levels before (`before`): their relative change is the
    /// uncertainty (at least [`UNCERTAINTY_FLOOR`]); None when it has not
    /// settled to 1e-6, or when only one of them is infinite.
    pub fn from_fits(best: f64, before: f64) -> Option<ClosedForm> {
        if best.is_infinite() || before.is_infinite() {
            return (best.is_infinite() && before.is_infinite()).then_some(ClosedForm {
                limit: f64::INFINITY,
                uncertainty: 0.0,
            });
        }
        let uncertainty = ((best - before) / best).abs().max(UNCERTAINTY_FLOOR);
        (uncertainty < 1e-6).then_some(ClosedForm {
            limit: best,
            uncertainty,
        })
    }
}

/// Relative uncertainty a closed form never goes below (the rounding of the
/// formula itself).
pub const UNCERTAINTY_FLOOR: f64 = 1e-12;

/// The Richardson value of `values(j)` (which err like s²) from the last two
/// levels, and its relative error estimate: 1/15 of its distance from the value
/// of the two levels before, the error of the first when the next term is s⁴.
fn richardson(values: &dyn Fn(usize) -> f64) -> (f64, f64) {
    let (q, p, l) = (values(LEVELS - 3), values(LEVELS - 2), values(LEVELS - 1));
    let best = l + (l - p) / 3.0;
    let before = p + (p - q) / 3.0;
    (best, ((best - before) / best).abs() / 15.0)
}

/// The branches of L along `origin + s n`, or None when they cannot be told
/// apart or their orders do not settle.
pub fn branches(op: &Operator, tolerance: f64, origin: &[f64], n: &[f64]) -> Option<Vec<Branch>> {
    let m = op.m;
    let mut spectrum = Spectrum::new(op, tolerance);
    let mut eig = vec![C64::new(0.0, 0.0); m];
    let mut levels: Vec<Vec<C64>> = Vec::with_capacity(LEVELS);
    for j in 0..LEVELS {
        let s = S * 0.5f64.powi(j as i32);
        let theta: Vec<f64> = origin.iter().zip(n).map(|(o, x)| o + x * s).collect();
        if !matches!(spectrum.at(&theta, &mut eig), Ok(true)) {
            return None;
        }
        let mut level = eig.clone();
        level.sort_by(|a, b| a.im.total_cmp(&b.im));
        levels.push(level);
    }
    let s_last = S * 0.5f64.powi(LEVELS as i32 - 1);
    let scale = levels[LEVELS - 1]
        .iter()
        .fold(0.0_f64, |acc, z| acc.max(z.norm()))
        / s_last;
    let mut out = Vec::with_capacity(m);
    for k in 0..m {
        let speeds: Vec<f64> = (0..LEVELS)
            .map(|j| levels[j][k].im / (S * 0.5f64.powi(j as i32)))
            .collect();
        // odd in s for real coefficients: the error of Im μ/s is O(s²)
        let (a, a_spread) = richardson(&|j| speeds[j]);
        if k > 0 && (a - out.last().map_or(f64::NAN, |b: &Branch| b.a)).abs() <= 1e-6 * scale {
            return None;
        }
        let re: Vec<f64> = levels.iter().map(|lv| lv[k].re).collect();
        if re.iter().all(|x| *x == 0.0) {
            out.push(Branch {
                a,
                b: 0.0,
                r: None,
                a_spread,
                b_spread: 0.0,
            });
            continue;
        }
        if re.iter().any(|x| *x >= 0.0) {
            return None;
        }
        let orders: Vec<f64> = re.windows(2).map(|w| (w[0] / w[1]).log2()).collect();
        let r = orders[orders.len() - 1].round();
        if !(1.0..=16.0).contains(&r)
            || orders[orders.len() - 2..]
                .iter()
                .any(|o| (o - r).abs() > 0.02)
        {
            return None;
        }
        let coefficient = |j: usize| -re[j] / (S * 0.5f64.powi(j as i32)).powi(r as i32);
        let (p, l) = (coefficient(LEVELS - 2), coefficient(LEVELS - 1));
        let (b, b_spread) = richardson(&coefficient);
        if (l - p).abs() > 1e-3 * l {
            return None;
        }
        out.push(Branch {
            a,
            b,
            r: Some(r as u32),
            a_spread,
            b_spread,
        });
    }
    Some(out)
}

/// The long-wave limit of a one-step method along `origin + s n` as s → 0
/// (∞: long waves set no limit; 0: unstable at every Δt), or None when the
/// closed form does not apply.
pub fn long_wave_limit(
    os: &OneStep,
    op: &Operator,
    tolerance: f64,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    long_wave_limit_from(imaginary_axis(os)?, op, tolerance, origin, n)
}

/// The same from the method's imaginary-axis behaviour (k, c) near z = 0
/// (one-step: [`imaginary_axis`]; multistep: [`imaginary_axis_multistep`]).
pub fn long_wave_limit_from(
    (k, c): (usize, f64),
    op: &Operator,
    tolerance: f64,
    origin: &[f64],
    n: &[f64],
) -> Option<ClosedForm> {
    let all = branches(op, tolerance, origin, n)?;
    let scale = all.iter().fold(0.0_f64, |acc, b| acc.max(b.a.abs()));
    let mut limit = f64::INFINITY;
    // the smallest of the branches' limits less their uncertainties
    let mut lowest = f64::INFINITY;
    for br in all {
        if br.a.abs() <= 1e-9 * scale {
            // a mode that does not move along n: damping alone, or nothing
            // the leading orders can tell
            br.r?;
            continue;
        }
        if c < 0.0 {
            continue;
        }
        let (here, spread) = match br.r {
            None => (0.0, 0.0),
            Some(r) if (r as usize) < k => (f64::INFINITY, 0.0),
            Some(r) if r as usize == k => {
                let exponent = 1.0 / (k as f64 - 1.0);
                (
                    (2.0 * br.b / (c * br.a.abs().powi(k as i32))).powf(exponent),
                    exponent * (br.b_spread + k as f64 * br.a_spread),
                )
            }
            Some(_) => (0.0, 0.0),
        };
        limit = limit.min(here);
        lowest = lowest.min(here * (1.0 - spread));
    }
    let uncertainty = if limit.is_finite() && limit > 0.0 {
        ((limit - lowest) / limit).max(UNCERTAINTY_FLOOR)
    } else {
        0.0
    };
    Some(ClosedForm { limit, uncertainty })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;
    use crate::time::Scheme;

    /// FTCS for u_t + a u_x = D u_xx with central differences: ν² ≤ 2r
    /// (Hirsch, Numerical Computation of Internal and External Flows), i.e.
    /// Δt ≤ 2D/a², whatever the spacing; the branch fit gives a = −a_phys/h
    /// and b = D/h² along +x.
    #[test]
    fn ftcs_long_wave_limit_is_two_d_over_a_squared() {
        let (a, d, h) = (1.7, 0.23, 0.4);
        let p = Problem::builder()
            .spacing(&[h])
            .system(crate::physics::advection(&[a], &[d]))
            .first("central2")
            .second("central2")
            .method("euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        let Scheme::OneStep(os) = &p.method.scheme else {
            panic!("a one-step method")
        };
        let br = branches(&op, 1e-12, &[0.0], &[1.0]).unwrap();
        assert_eq!(br.len(), 1);
        assert!((br[0].a + a / h).abs() < 1e-9 * a / h, "{br:?}");
        assert!((br[0].b - d / (h * h)).abs() < 1e-8 * d / (h * h), "{br:?}");
        assert_eq!(br[0].r, Some(2));
        let form = long_wave_limit(os, &op, 1e-12, &[0.0], &[1.0]).unwrap();
        let l = form.limit;
        assert!(
            (l - 2.0 * d / (a * a)).abs() < 1e-8 * l,
            "{l} vs {}",
            2.0 * d / (a * a)
        );
        // the stated uncertainty covers the error and is small
        assert!(
            (UNCERTAINTY_FLOOR..1e-9).contains(&form.uncertainty)
                && (l - 2.0 * d / (a * a)).abs() <= form.uncertainty * l,
            "{form:?}"
        );
    }

    /// AB2's principal root, from ζ² − ζ = z(3ζ − 1)/2 order by order:
    /// ζ₁ = 1 + z + z²/2 − z³/4 − z⁴/8 + …, i.e. e^z − (5/12)z³ − (1/6)z⁴, so
    /// at z = iy: |ζ₁|² − 1 = (5/6)y⁴ − (2/6)y⁴ + O(y⁶) = y⁴/2. AB3 keeps a
    /// stretch of the imaginary axis (its interval 0.72, `kgain list methods`):
    /// k = 4 with c < 0. Leapfrog stays on the circle.
    #[test]
    fn multistep_principal_root_orders() {
        let ab2 = Multistep {
            alpha: vec![0.0, -1.0, 1.0],
            beta: vec![-0.5, 1.5, 0.0],
        };
        let (k, c) = imaginary_axis_multistep(&ab2).unwrap();
        assert_eq!(k, 4);
        assert!((c - 0.5).abs() < 1e-8, "{c}");
        let ab3 = Multistep {
            alpha: vec![0.0, 0.0, -1.0, 1.0],
            beta: vec![5.0 / 12.0, -16.0 / 12.0, 23.0 / 12.0, 0.0],
        };
        let (k, c) = imaginary_axis_multistep(&ab3).unwrap();
        assert_eq!(k, 4);
        assert!(c < 0.0, "{c}");
        let leapfrog = Multistep {
            alpha: vec![-1.0, 0.0, 1.0],
            beta: vec![0.0, 2.0, 0.0],
        };
        assert_eq!(imaginary_axis_multistep(&leapfrog), None);
    }

    /// Heun (k = 4, c = 1/4) with central differences and no damping: unstable
    /// at every Δt; with second-order damping (r = 2 < 4): no long-wave limit.
    #[test]
    fn heun_long_waves_need_damping_of_order_below_four() {
        let build = |d: f64| {
            Problem::builder()
                .spacing(&[1.0])
                .system(crate::physics::advection(&[1.0], &[d]))
                .first("central2")
                .second("central2")
                .method("heun")
                .dt(1e-3)
                .build()
                .unwrap()
        };
        for (d, want) in [(0.0, 0.0), (0.1, f64::INFINITY)] {
            let p = build(d);
            let Scheme::OneStep(os) = &p.method.scheme else {
                panic!("a one-step method")
            };
            let l = long_wave_limit(os, &p.operator(), 1e-12, &[0.0], &[1.0])
                .unwrap()
                .limit;
            assert_eq!(l, want, "D = {d}");
        }
    }

    #[test]
    fn imaginary_axis_orders_of_textbook_methods() {
        // forward Euler |1 + iy|² = 1 + y²; Heun 1 + y⁴/4; RK4 1 − y⁶/72;
        // theta method (1 − 2ϑ) y²
        let euler = OneStep {
            p: vec![1.0, 1.0],
            q: vec![1.0],
        };
        assert_eq!(imaginary_axis(&euler), Some((2, 1.0)));
        let heun = OneStep {
            p: vec![1.0, 1.0, 0.5],
            q: vec![1.0],
        };
        let (k, c) = imaginary_axis(&heun).unwrap();
        assert_eq!(k, 4);
        assert!((c - 0.25).abs() < 1e-15);
        let rk4 = OneStep {
            p: vec![1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0],
            q: vec![1.0],
        };
        let (k, c) = imaginary_axis(&rk4).unwrap();
        assert_eq!(k, 6);
        assert!((c + 1.0 / 72.0).abs() < 1e-15);
        let t = 0.28125;
        let theta = OneStep {
            p: vec![1.0, 1.0 - t],
            q: vec![1.0, -t],
        };
        let (k, c) = imaginary_axis(&theta).unwrap();
        assert_eq!(k, 2);
        assert!((c - (1.0 - 2.0 * t)).abs() < 1e-15);
        let cn = OneStep {
            p: vec![1.0, 0.5],
            q: vec![1.0, -0.5],
        };
        assert_eq!(imaginary_axis(&cn), None);
    }
}
