//! The long-wave limit of IMEX Euler (and so of forward Euler, its explicit
//! part) in closed form at θ = 0, from the leading matrices of L.
//!
//! Along θ = s n (|n| = 1), for real coefficients L(sn) = isB − s²K + O(s³)
//! (B = lim Im L/s, K = −lim Re L/s²: diffusion, first-order upwinding, second-
//! order dissipation). IMEX Euler's G = (I − ΔtL_I)⁻¹(I + ΔtL_E) is
//! I + ΔtL + Δt²L_I L + … with L_I = O(s²), so G = I + ΔtL + O(s³). For a simple
//! real eigenvalue λ of B with eigenvectors r, l (l·r = 1) the branch is
//! ζ = 1 + isΔtλ − s²Δt l·K·r + O(s³) (first-order perturbation; the
//! second-order term −s⁴(…)/(is Δλ) is imaginary at order s³), so
//!
//!   |ζ|² − 1 = s² Δt (Δtλ² − 2κ) + O(s⁴),   κ = l·K·r,
//!
//! and long waves are stable up to Δt = 2κ/λ² (for advection–diffusion with
//! central differences ν² ≤ 2r, Hirsch, Numerical Computation of Internal and
//! External Flows; here per characteristic branch). This reads κ from the
//! projected matrix K rather than from the real parts of eigenvalues of L,
//! whose O(s⁴) remainder is large when two speeds are close or κ is small.
//! B and K are read from L(sn) at s = 10⁻², …, 10⁻²/16 by Richardson
//! extrapolation, the change between the last two levels giving the
//! uncertainty.
//!
//! The same holds at a corner or face centre θ₀ (each coordinate 0 or π) where
//! the explicit part vanishes (central first differences at π) and the
//! implicit part L_I(θ₀) = −D does not: diffusion whose matrix is singular
//! along that axis (rank-one K_d) leaves D a null space, on which long waves
//! are neither damped at order s⁰ nor stable at every Δt. With
//! L(θ₀ + sn) = −D + isB − s²K + O(s³) (real coefficients: θ₀ ≡ −θ₀, so the
//! real part is even in s and the imaginary part odd), ζ − 1 = ε solves
//! ΔtL v = ε(I − ΔtL_I)v exactly. On the null space (right and left bases R,
//! W, WR = I; D's zero eigenvalue semisimple) the rest of the space follows as
//! v_R = is D#Bv_N + O(s²) (D# the inverse of D on its range), and since
//! W(I − ΔtL_I(θ₀)) = W the branch is, by second-order perturbation through
//! the range,
//!
//!   ε = isΔtλ − s²Δt l·(K + B D# B)·r + O(s³)
//!
//! for a simple real eigenvalue λ of the reduced WBR (r, l its eigenvectors
//! carried back to the full space): the long-wave limit from θ₀ is again
//! 2κ/λ², now with κ = l·(K + B D# B)·r. The modes of D's range have
//! ζ → 1/(1 + Δtd), |ζ| < 1 for Re d > 0. Eigenvalues of D within 10⁻¹² of
//! L's size (the rounding of a rank-one K_d as the case gives it, ~1e-17) are
//! taken as 0: the limit of a D with exactly that null space. A tiny positive
//! eigenvalue d damps that mode once s falls below ~√(d/‖K‖); with the
//! rounded matrices of the cases checked in 40 digits the first loss then has
//! a shallow minimum 1e-8 to 1e-7 above this limit, never below it. B and K are read from the slope dL/ds = iB − 2sK + O(s²) (the
//! stencils' derivatives), which keeps its relative accuracy where
//! (L(θ₀ + sn) − L(θ₀))/s² would lose the rounding of D.

use super::closed_form::ClosedForm;
use super::eigenpairs;
use crate::operator::{Operator, TermKind};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// First level s of the fit.
const S: f64 = 1e-2;
/// Levels s, s/2, …, s/16.
const LEVELS: usize = 5;
/// Relative size below which an imaginary part or an eigenvalue is rounding.
const CLEAR: f64 = 1e-9;

/// The long-wave limit of IMEX Euler along `n` from θ = 0, or None where the
/// closed form does not apply.
pub fn long_wave_limit(op: &Operator, origin: &[f64], n: &[f64]) -> Option<ClosedForm> {
    if !op.real_coefficients {
        return None;
    }
    if origin.iter().any(|x| *x != 0.0) {
        return corner_limit(op, origin, n);
    }
    let zero: Vec<f64> = vec![0.0; n.len()];
    if op.symbol_matrix(&zero).iter().any(|z| z.norm() != 0.0) {
        return None;
    }
    // Im L(s)/s and −Re L(s)/s², each erring like s² (odd and even in s)
    let levels: Vec<(DMatrix<f64>, DMatrix<f64>)> = (0..LEVELS)
        .map(|j| {
            let s = S * 0.5f64.powi(j as i32);
            let theta: Vec<f64> = n.iter().map(|x| x * s).collect();
            let l = op.symbol_matrix(&theta);
            (l.map(|z| z.im / s), l.map(|z| -z.re / (s * s)))
        })
        .collect();
    // a real part of lower order than s² (growing as s falls) is another balance
    if !settled(&levels) {
        return None;
    }
    let extrapolated = |last: usize| {
        let b = &levels[last].0 + (&levels[last].0 - &levels[last - 1].0) / 3.0;
        let k = &levels[last].1 + (&levels[last].1 - &levels[last - 1].1) / 3.0;
        (b, k)
    };
    let of = |last: usize| {
        let (b, k) = extrapolated(last);
        let pairs = eigenpairs::simple_real(&b, CLEAR)?;
        limit_from(&pairs, &k, b.norm())
    };
    let best = of(LEVELS - 1)?;
    let before = of(LEVELS - 2)?;
    ClosedForm::from_fits(best, before).filter(|f| f.limit > 0.0)
}

/// Relative size (to [`Operator::scale`], L's size over all θ) below which an
/// eigenvalue or singular value of L(θ₀), or an entry of its explicit part,
/// is rounding at a corner or face centre θ₀.
const ZERO: f64 = 1e-12;

/// The long-wave limit of IMEX Euler along θ₀ + s n from a corner or face
/// centre θ₀ (each coordinate 0 or π) where the explicit part of L vanishes
/// and the implicit part L_I(θ₀) = −D is singular (see the module comment),
/// or None where the closed form does not apply.
fn corner_limit(op: &Operator, origin: &[f64], n: &[f64]) -> Option<ClosedForm> {
    if origin.iter().any(|x| *x != 0.0 && *x != PI) {
        return None;
    }
    let m = op.m;
    let scale = op.scale();
    if !(scale > 0.0 && scale.is_finite()) {
        return None;
    }
    let zero = ZERO * scale;
    let explicit = op.part_matrix(origin, |t| t.kind != TermKind::Diffusion, true);
    let at_origin = op.symbol_matrix(origin);
    if explicit
        .iter()
        .any(|z| z.norm().is_nan() || z.norm() > zero)
        || at_origin.iter().any(|z| z.im.is_nan() || z.im.abs() > zero)
    {
        return None;
    }
    let d = at_origin.map(|z| -z.re);
    let (null, sharp) = null_space(&d, zero)?;
    let at = |s: f64| -> Vec<f64> { origin.iter().zip(n).map(|(o, x)| o + x * s).collect() };
    // the implicit part stays real along the approach (central second
    // differences): with an imaginary part of order s it would enter ζ at s²
    let real_diffusion =
        (0..LEVELS).all(|j| op.diffusion_is_real_at(&at(S * 0.5f64.powi(j as i32))));
    if !real_diffusion {
        return None;
    }
    // the slope of L along the approach, dL/ds = iB − 2sK + O(s²): its
    // imaginary part, and minus its real part over 2s, each erring like s²
    // (even and odd in s about θ₀ ≡ −θ₀). Read from the stencils' derivatives,
    // it keeps its relative accuracy where L(θ₀ + s n) − L(θ₀) would lose the
    // rounding of D over s².
    let levels: Vec<(DMatrix<f64>, DMatrix<f64>)> = (0..LEVELS)
        .map(|j| {
            let s = S * 0.5f64.powi(j as i32);
            let theta = at(s);
            let mut slope = DMatrix::<C64>::zeros(m, m);
            let mut part = vec![C64::new(0.0, 0.0); m * m];
            for (axis, x) in n.iter().enumerate() {
                op.derivative_into(&theta, axis, &mut part);
                slope += crate::linalg::to_matrix(&part, m) * C64::new(*x, 0.0);
            }
            (slope.map(|z| z.im), slope.map(|z| -z.re / (2.0 * s)))
        })
        .collect();
    if !settled(&levels) {
        return None;
    }
    let of = |last: usize| {
        let extrapolate = |pick: &dyn Fn(usize) -> DMatrix<f64>| {
            let (p, l) = (pick(last - 1), pick(last));
            &l + (&l - &p) / 3.0
        };
        let b = extrapolate(&|j| levels[j].0.clone());
        let k = extrapolate(&|j| levels[j].1.clone()) + &b * &sharp * &b;
        let (b_null, k_null) = (null.reduce(&b), null.reduce(&k));
        let pairs = eigenpairs::simple_real(&b_null, CLEAR)?;
        limit_from(&pairs, &k_null, b_null.norm())
    };
    let best = of(LEVELS - 1)?;
    let before = of(LEVELS - 2)?;
    ClosedForm::from_fits(best, before).filter(|f| f.limit > 0.0)
}

/// The null space of a singular D: right and left bases R (m×k) and W (k×m)
/// with W R = I, whose projection R W along the range reduces a matrix M to
/// W M R on it.
struct Null {
    right: DMatrix<f64>,
    left: DMatrix<f64>,
}

impl Null {
    fn reduce(&self, a: &DMatrix<f64>) -> DMatrix<f64> {
        &self.left * a * &self.right
    }
}

/// D's null space (singular values within `zero`) and its group inverse D#
/// (the inverse of D on its range, 0 on the null space; (D + cP)⁻¹ − P/c for
/// the projection P onto the null space along the range), or None unless
/// every eigenvalue of D is either within `zero` of 0, as many as the null
/// space's dimension (a semisimple 0), or of real part above `zero` (a mode
/// damped at θ₀).
fn null_space(d: &DMatrix<f64>, zero: f64) -> Option<(Null, DMatrix<f64>)> {
    let m = d.nrows();
    let mut small = 0;
    for z in d.clone().complex_eigenvalues().iter() {
        if z.norm() <= zero {
            small += 1;
        } else if z.re.is_nan() || z.re <= zero {
            return None;
        }
    }
    let svd = d.clone().svd(true, true);
    let (u, v_t) = (svd.u?, svd.v_t?);
    let idx: Vec<usize> = (0..m).filter(|&i| svd.singular_values[i] <= zero).collect();
    let k = idx.len();
    if k == 0 || k != small {
        return None;
    }
    let right = DMatrix::from_fn(m, k, |i, a| v_t[(idx[a], i)]);
    let left = DMatrix::from_fn(k, m, |a, i| u[(i, idx[a])]);
    let overlap = &left * &right;
    let inverse = overlap.clone().try_inverse()?;
    if overlap.clone().svd(false, false).singular_values.min() < 1e-6 {
        return None;
    }
    let left = inverse * left;
    let sharp = if k == m {
        DMatrix::zeros(m, m)
    } else {
        let c = d.norm();
        let p = &right * &left;
        (d + &p * c).try_inverse()? - p / c
    };
    if sharp.iter().any(|x| !x.is_finite()) {
        return None;
    }
    Some((Null { right, left }, sharp))
}

/// The smallest 2κ/λ² over the moving branches; None where a branch is not
/// damped at order s² (κ ≤ 0 clear of rounding: growth, or a damping of higher
/// order whose balance is another one) or does not move.
fn limit_from(pairs: &[eigenpairs::EigenPair], k: &DMatrix<f64>, scale: f64) -> Option<f64> {
    let mut limit = f64::INFINITY;
    for p in pairs {
        let kappa = p.project(k);
        if p.lambda.abs() <= 1e-6 * scale
            || kappa.partial_cmp(&(1e-9 * k.norm())) != Some(std::cmp::Ordering::Greater)
        {
            return None;
        }
        limit = limit.min(2.0 * kappa / (p.lambda * p.lambda));
    }
    Some(limit)
}

/// Whether the levels (B, K) read at s, s/2, … are finite and each entry
/// settles over the last three levels (its last change at most 0.3 times the
/// one before, up to 1e-9 of its size).
fn settled(levels: &[(DMatrix<f64>, DMatrix<f64>)]) -> bool {
    if levels
        .iter()
        .any(|(a, b)| a.iter().chain(b.iter()).any(|x| !x.is_finite()))
    {
        return false;
    }
    let n = levels.len();
    let settles = |v: &dyn Fn(usize) -> f64| {
        let (a, b, c) = (v(n - 3), v(n - 2), v(n - 1));
        let size = a.abs().max(b.abs()).max(c.abs());
        size == 0.0 || (c - b).abs() <= 0.3 * (b - a).abs() + 1e-9 * size
    };
    let (rows, cols) = levels[0].0.shape();
    (0..rows).all(|i| {
        (0..cols).all(|j| settles(&|l| levels[l].0[(i, j)]) && settles(&|l| levels[l].1[(i, j)]))
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// 1-D 2×2 system with central differences and rank-one diffusion
    /// K = k w wᵀ (its f64 entries leave an eigenvalue ~1e-17): at θ = π − s,
    /// L = −iA sin s/h − K(2 + 2cos s)/h², so D = 4K/h², B = −A/h, and on the
    /// null vector v of K the reduced speed is λ = −vᵀAv/h and
    /// κ = l·(K_s² + B D# B)·r = (vᵀAw)²/(4k) (the s² part of the diffusion
    /// vanishes on v). The long-wave limit from the corner is
    /// 2κ/λ² = h²(vᵀAw)²/(2k(vᵀAv)²) (forward Euler's 2D/a² balance of the
    /// branch, its damping coming through the range of D).
    #[test]
    fn rank_one_diffusion_corner_limit_is_the_reduced_balance() {
        let (h, k) = (0.7, 0.5);
        let (w, v) = ([0.6, 0.8], [-0.8, 0.6]);
        let a = [[1.0, 0.3], [0.3, -0.5]];
        let c = |x: f64| C64::new(x, 0.0);
        let flux = DMatrix::from_fn(2, 2, |i, j| c(a[i][j]));
        let diff = DMatrix::from_fn(2, 2, |i, j| c(k * w[i] * w[j]));
        let sys = crate::physics::linear(
            vec!["p".into(), "q".into()],
            vec![flux],
            vec![diff],
            DMatrix::zeros(2, 2),
        );
        let p = Problem::builder()
            .spacing(&[h])
            .system(sys)
            .first("central2")
            .second("central2")
            .method("imex-euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let quad = |x: &[f64; 2], y: &[f64; 2]| -> f64 {
            (0..2)
                .map(|i| (0..2).map(|j| x[i] * a[i][j] * y[j]).sum::<f64>())
                .sum()
        };
        let (vav, vaw) = (quad(&v, &v), quad(&v, &w));
        let exact = h * h * vaw * vaw / (2.0 * k * vav * vav);
        let op = p.operator();
        for n in [1.0, -1.0] {
            let f = long_wave_limit(&op, &[PI], &[n]).unwrap();
            assert!((f.limit - exact).abs() <= 1e-9 * exact, "{f:?} vs {exact}");
            assert!(f.uncertainty < 1e-8, "{f:?}");
        }
    }

    /// 1-D advection–diffusion with central differences: Δt = 2D/a² (FTCS's
    /// ν² ≤ 2r, whose explicit part IMEX Euler shares at long waves).
    #[test]
    fn advection_diffusion_limit_is_two_d_over_a_squared() {
        let (a, d, h) = (1.1, 0.07, 0.3);
        let p = Problem::builder()
            .spacing(&[h])
            .system(crate::physics::advection(&[a], &[d]))
            .first("central2")
            .second("central2")
            .method("imex-euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let f = long_wave_limit(&p.operator(), &[0.0], &[1.0]).unwrap();
        let exact = 2.0 * d / (a * a);
        assert!((f.limit - exact).abs() <= 1e-9 * exact, "{f:?} vs {exact}");
    }
}
