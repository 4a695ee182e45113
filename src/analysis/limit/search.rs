//! Stability limits of composite schemes (forward–backward, splitting, IMEX,
//! Lax–Wendroff, Lax–Friedrichs), whose eigenvalues are not functions of eig(L).
//!
//! The criterion is strict: Δt is unstable at θ when ρ(G(θ, Δt)) exceeds 1 by
//! more than the rounding of its computation, 64ε·max(1, ‖G‖_F) — not by a
//! user tolerance, so a scheme unstable by a hair is unstable. Steps:
//! 1. unstable at every Δt? The largest excess ρ − 1 over the grid is followed as
//!    Δt halves from the natural scale 1/‖L‖; if it stays positive, or decays as
//!    a power of Δt down to the rounding level (forward Euler with central
//!    differences: ρ² − 1 ∝ Δt²), no Δt is stable (kind "none");
//! 2. otherwise the first loss over the grid is bracketed upward from a stable
//!    Δt and bisected with sweeps that stop at the first unstable wavevector;
//! 3. per wavevector, the first loss is a root of ρ(G(θ, ·)) − 1
//!    ([`super::per_theta::PerTheta`]),
//!    found by a ladder from a Δt known to be stable and bisection; the
//!    limit's neighbourhood is refined with it in continuous θ (`refined` in [`super::per_theta`])
//!    and long waves are handled by [`super::longwave`];
//! 4. a uniform scan of Δt below the limit over the grid makes sure that a
//!    stable window does not hide an earlier loss of stability.

use crate::linalg;
use crate::numeric::bracket::bisect;
use crate::operator::Operator;
use crate::problem::Problem;
use crate::time::composite::{self, Composite};
use crate::time::increment;
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;
use rayon::prelude::*;
use std::sync::atomic::{AtomicUsize, Ordering};

/// How many uniformly spaced time steps below the limit are checked.
pub const VERIFY_STEPS: usize = 32;
pub(super) const BISECTIONS: usize = 80;
/// Halvings of Δt in the test for instability at every Δt.
pub(super) const SMALL_DT_LEVELS: usize = 48;

/// ρ(G(θ, Δt)) of a composite scheme.
pub struct CompositeEval<'a> {
    problem: &'a Problem,
    op: &'a Operator,
    scheme: &'a Composite,
    /// A number no other evaluator has: the key of the per-thread cache of
    /// θ-only quantities.
    id: usize,
    /// ‖A_d‖_F/h_d per axis for Lax–Wendroff and Lax–Friedrichs (empty for
    /// other schemes): the weights of [`CompositeEval::lax_term_scale`].
    lax_weights: Vec<f64>,
}

/// Source of [`CompositeEval`] ids (0 is never handed out).
static NEXT_ID: AtomicUsize = AtomicUsize::new(1);

impl<'a> CompositeEval<'a> {
    /// For a problem whose method is composite.
    pub fn new(problem: &'a Problem, op: &'a Operator, scheme: &'a Composite) -> Self {
        Self {
            problem,
            op,
            scheme,
            id: NEXT_ID.fetch_add(1, Ordering::Relaxed),
            lax_weights: if matches!(scheme, Composite::LaxWendroff | Composite::LaxFriedrichs) {
                let (flux, h) = (&problem.system.flux, &problem.spacing);
                h.iter()
                    .enumerate()
                    .map(|(d, h)| linalg::dense::frobenius(&flux[d]) / h)
                    .collect()
            } else {
                Vec::new()
            },
        }
    }

    /// Whether L(θ) has no real part by construction at θ (every eigenvalue
    /// exactly imaginary after the axis rule, trusted) for a scheme whose G
    /// tends to I + ΔtL.
    pub fn exactly_imaginary(&self, theta: &[f64]) -> bool {
        if !self.tends_to_identity() {
            return false;
        }
        let mut spectrum = crate::operator::Spectrum::new(self.op, 1e-12);
        let mut eig = vec![C64::new(0.0, 0.0); self.op.m];
        matches!(spectrum.at(theta, &mut eig), Ok(true)) && eig.iter().all(|z| z.re == 0.0)
    }

    /// Whether G(θ, Δt) = I + ΔtL(θ) + O(Δt²) with the case's L (every composite
    /// scheme but Lax–Wendroff and Lax–Friedrichs, which build G from the flux
    /// matrices with their own differences, and a filtered step, whose G tends to
    /// F(θ)·I): then an eigenvalue of L with a positive real part is unstable at
    /// every small Δt.
    pub fn tends_to_identity(&self) -> bool {
        !matches!(
            self.scheme,
            Composite::LaxWendroff | Composite::LaxFriedrichs | Composite::Filtered { .. }
        )
    }

    /// The problem.
    pub fn problem(&self) -> &Problem {
        self.problem
    }

    /// The scheme.
    pub fn scheme(&self) -> &Composite {
        self.scheme
    }

    /// The spatial operator the scheme advances.
    pub fn operator(&self) -> &Operator {
        self.op
    }

    /// The natural time scale 1/‖L‖.
    pub fn scale(&self) -> f64 {
        1.0 / self.op.scale().max(1e-300)
    }

    /// ρ(G(θ, Δt)) − 1 and its rounding level; NaN when the kernel fails.
    ///
    /// One-level schemes go through the increment E = G − I formed directly
    /// ([`increment`]): with e = eig(E), |1 + e| − 1 = (2 Re e + |e|²)/(|1 + e| + 1)
    /// carries the rounding of e, 64ε‖E‖_F, which is tiny where G is close to I
    /// (long waves, small Δt). CNAB2's companion matrix goes through G itself,
    /// with rounding 64ε‖G‖_F.
    pub fn growth_and_noise(&self, theta: &[f64], dt: f64) -> (f64, f64) {
        let p = self.problem;
        if let Some(e) =
            increment::increment(self.scheme, &p.system, self.op, &p.spacing, theta, dt)
        {
            let (norm, parts) = self.theta_scales(theta);
            // Lax–Wendroff/Friedrichs build E from the flux terms of each axis,
            // which cancel across axes where n·(A/h) is small: E's entries
            // carry rounding of the terms' size, not of E's (seed 7074)
            let terms = self.lax_term_scale(theta, dt);
            // a split step's increment is built from products E_k E of the
            // parts' increments, each rounded relative to their sizes: where
            // the parts cancel (advection along x against y) the product is
            // far smaller than its rounding, ε(Δt Σ‖L_k‖)² (bounded, as the
            // parts' increments are, for the stable inner methods that matter)
            let products = parts.map_or(0.0, |p| f64::EPSILON * (dt * p).powi(2).min(16.0));
            if e.nrows() == 1 {
                let (growth, noise) = self.scalar_growth(e[(0, 0)], theta, dt);
                let cancelled = f64::EPSILON * terms * (terms + e[(0, 0)].norm());
                return (growth, noise + 8.0 * (products + cancelled));
            }
            // implicit solves with I − ΔtL carry rounding relative to its
            // condition, about max(1, Δt‖L‖)
            let (growth, noise) = growth_of_increment(&e);
            let noise = noise.max(64.0 * f64::EPSILON * terms * (1.0 + terms));
            let operand = dt * norm;
            return (growth, (noise + 64.0 * products) * operand.max(1.0));
        }
        let cnab2 = matches!(self.scheme, Composite::Imex(composite::Imex::Cnab2));
        if let Some((s, rest)) = cnab2
            .then(|| increment::cnab2_split(self.op, theta, dt))
            .flatten()
        {
            let (a, b) = (growth_of_increment(&s), growth_of_increment(&rest));
            return if a.0 - a.1 >= b.0 - b.1 { a } else { b };
        }
        let g = composite::amplification(self.scheme, &p.system, self.op, &p.spacing, theta, dt);
        let size = linalg::dense::frobenius(&g).max(1.0);
        let rho = linalg::spectral_radius(&linalg::from_matrix(&g), g.nrows()).unwrap_or(f64::NAN);
        (rho - 1.0, 64.0 * f64::EPSILON * size)
    }

    /// For Lax–Wendroff and Lax–Friedrichs, Σ_d ‖A_d‖_F (Δt/h_d) |sin θ_d|: the
    /// size of the first-order terms of the increment, whose squares (and
    /// products across axes) make its second-order part; 0 for other schemes.
    fn lax_term_scale(&self, theta: &[f64], dt: f64) -> f64 {
        dt * self
            .lax_weights
            .iter()
            .zip(theta)
            .map(|(w, t)| w * t.sin().abs())
            .sum::<f64>()
    }

    /// ‖L(θ)‖_F and, for a split scheme, the sum of its parts' ‖L_k(θ)‖_F
    /// (axes and source), which depend on θ only: the searches on Δt call
    /// [`CompositeEval::growth_and_noise`] many times at one θ, so the last
    /// values of each thread are kept (keyed by this evaluator's id and θ; the
    /// same numbers as computing them afresh).
    fn theta_scales(&self, theta: &[f64]) -> (f64, Option<f64>) {
        use std::cell::RefCell;
        type Last = (usize, Vec<f64>, f64, Option<f64>);
        thread_local! {
            static LAST: RefCell<Last> = const { RefCell::new((0, Vec::new(), 0.0, None)) };
        }
        let key = self.id;
        LAST.with(|last| {
            let mut last = last.borrow_mut();
            if last.0 != key || last.1.as_slice() != theta {
                let f = linalg::dense::frobenius(&self.op.symbol_matrix(theta));
                let parts = matches!(self.scheme, Composite::Split { .. }).then(|| {
                    increment::split_parts(self.op, theta)
                        .iter()
                        .map(linalg::dense::frobenius)
                        .sum()
                });
                *last = (key, theta.to_vec(), f, parts);
            }
            (last.2, last.3)
        })
    }

    /// |1 + e| − 1 of a scalar increment e, and its rounding: e carries no
    /// eigenvalue error, only the rounding of the real part of L(θ) (far below
    /// ε|L| where biased stencils leave a real part of high order in θ), scaled
    /// by Δt and by |e|/(Δt|L|) for the schemes whose increment is a function of
    /// ΔtL, plus the rounding of 2 Re e + |e|² itself.
    fn scalar_growth(&self, e: C64, theta: &[f64], dt: f64) -> (f64, f64) {
        let growth = (2.0 * e.re + e.norm_sqr()) / ((C64::new(1.0, 0.0) + e).norm() + 1.0);
        let l = self.op.symbol(theta)[0].norm();
        let gain = if l > 0.0 {
            (e.norm() / (dt * l)).max(1.0)
        } else {
            1.0
        };
        let noise = 8.0 * (dt * self.op.real_noise(theta) * gain + f64::EPSILON * e.norm_sqr());
        (growth, noise)
    }

    /// Spectral radius of G at (θ, Δt); NaN when the kernel fails.
    pub fn radius(&self, theta: &[f64], dt: f64) -> f64 {
        1.0 + self.growth_and_noise(theta, dt).0
    }

    /// ρ − 1 beyond rounding (positive: unstable).
    pub fn excess(&self, theta: &[f64], dt: f64) -> f64 {
        let (growth, noise) = self.growth_and_noise(theta, dt);
        growth - noise
    }

    pub(super) fn unstable(&self, theta: &[f64], dt: f64) -> bool {
        self.excess(theta, dt) > 0.0
    }

    /// Index of some unstable point at Δt (trying `hint` first), or None.
    fn any_unstable(&self, points: &[Vec<f64>], dt: f64, hint: &AtomicUsize) -> Option<usize> {
        let h = hint.load(Ordering::Relaxed);
        if h < points.len() && self.unstable(&points[h], dt) {
            return Some(h);
        }
        let found = points.par_iter().position_any(|p| self.unstable(p, dt));
        if let Some(i) = found {
            hint.store(i, Ordering::Relaxed);
        }
        found
    }

    /// The largest excess over the points at Δt, and where.
    fn worst(&self, points: &[Vec<f64>], dt: f64) -> (f64, usize) {
        points
            .par_iter()
            .enumerate()
            .map(|(i, p)| (self.excess(p, dt), i))
            .filter(|(e, _)| !e.is_nan())
            .reduce(
                || (f64::NEG_INFINITY, 0),
                |a, b| if b.0 > a.0 { b } else { a },
            )
    }

    /// Whether every Δt > 0 is unstable somewhere on `points`, and a stable Δt
    /// to start from otherwise.
    pub fn small_dt(&self, points: &[Vec<f64>]) -> SmallDt {
        let mut dt = self.scale();
        let mut trail: Vec<(f64, usize)> = Vec::new();
        for _ in 0..SMALL_DT_LEVELS {
            let (e, i) = self.worst(points, dt);
            if e <= 0.0 {
                let at = trail.last().map_or(i, |t| t.1);
                if power_law(&trail, |d| self.growth_and_noise(&points[at], d), dt) {
                    return SmallDt::Unstable(trail.last().map_or(i, |t| t.1));
                }
                return SmallDt::Stable(dt);
            }
            trail.push((e, i));
            dt *= 0.5;
        }
        SmallDt::Unstable(trail.last().map_or(0, |t| t.1))
    }

    /// First loss over `points` upward from the stable `start`: (stable Δt,
    /// unstable Δt) to 1e-12 relative and the point that fails, or None when
    /// stable up to start·2⁴⁰ (unconditional).
    pub fn first_loss(&self, points: &[Vec<f64>], start: f64) -> Option<(f64, f64, usize)> {
        let hint = AtomicUsize::new(usize::MAX);
        let (mut lo, mut hi) = (start, 2.0 * start);
        let mut k = 0;
        while self.any_unstable(points, hi, &hint).is_none() {
            lo = hi;
            hi *= 2.0;
            k += 1;
            if k > 40 {
                return None;
            }
        }
        let stable = |dt: f64| self.any_unstable(points, dt, &hint).is_none();
        let (lo, hi) = bisect(stable, lo, hi, 1e-12, BISECTIONS);
        let i = self.any_unstable(points, hi, &hint).unwrap_or(0);
        Some((lo, hi, i))
    }

    /// The first Δt in (0, `limit`) at which some point is unstable, from a
    /// uniform scan of `VERIFY_STEPS` values; None when all are stable.
    pub fn earlier_loss(&self, points: &[Vec<f64>], limit: f64) -> Option<f64> {
        let hint = AtomicUsize::new(usize::MAX);
        (1..=VERIFY_STEPS)
            .map(|j| limit * j as f64 / (VERIFY_STEPS + 1) as f64)
            .find(|dt| self.any_unstable(points, *dt, &hint).is_some())
    }
}

/// max |1 + e| − 1 over the eigenvalues e of `e`, as (2 Re e + |e|²)/(|1 + e| + 1),
/// and its rounding level 64ε‖e‖_F; NaN when the kernel fails.
fn growth_of_increment(e: &DMatrix<C64>) -> (f64, f64) {
    let noise = 64.0 * f64::EPSILON * linalg::dense::frobenius(e);
    let growth = match linalg::eigenvalues(&linalg::from_matrix(e), e.nrows()) {
        Ok(ev) => ev
            .iter()
            .map(|z| (2.0 * z.re + z.norm_sqr()) / ((C64::new(1.0, 0.0) + z).norm() + 1.0))
            .fold(f64::NEG_INFINITY, f64::max),
        Err(_) => f64::NAN,
    };
    (growth, noise)
}

/// The outcome of the small-Δt test.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SmallDt {
    /// Stable everywhere at this Δt.
    Stable(f64),
    /// Unstable at every Δt > 0 (at this point).
    Unstable(usize),
}

/// Whether the growth ρ − 1 at the last worst point decayed like a power of Δt
/// down to the rounding level. Going up from Δt by doublings (as far as the
/// trail of unstable levels reaches), the first four levels where the growth is
/// clear of its rounding (16 times over) must give three successive ratios that
/// agree to 10%. A scheme that merely crosses into stability near Δt (growth ≈
/// c(Δt − Δt*)) gives ratios 1/3, 3/7, 7/15 and is not mistaken for one.
/// Nor is one damped at Δt itself beyond its rounding (ρ − 1 below −16 times
/// it): a growth running down to the rounding level is within it at Δt, while
/// a clear damping there makes the power law above a crossing's (AB2's
/// (Δt Im μ)⁴/4 beyond its first loss on a damped μ, seed 8848), not a growth
/// at every Δt.
pub(super) fn power_law(
    trail: &[(f64, usize)],
    growth_at: impl Fn(f64) -> (f64, f64),
    dt: f64,
) -> bool {
    let (g, noise) = growth_at(dt);
    if g < -16.0 * noise {
        return false;
    }
    let mut e: Vec<f64> = Vec::with_capacity(4);
    for k in 1..=trail.len() {
        let (g, noise) = growth_at(dt * 2f64.powi(k as i32));
        if g > 16.0 * noise {
            e.push(g);
            if e.len() == 4 {
                break;
            }
        } else if !e.is_empty() {
            return false;
        }
    }
    if e.len() < 4 {
        return false;
    }
    let r: Vec<f64> = e.windows(2).map(|w| w[0] / w[1]).collect();
    r[0] > 1e-3 && r[0] < 0.9 && (r[0] / r[1] - 1.0).abs() < 0.1 && (r[1] / r[2] - 1.0).abs() < 0.1
}
