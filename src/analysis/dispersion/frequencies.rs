//! Frequencies of a discretisation and of the continuous system, matched mode by
//! mode.
//!
//! Semi-discrete frequencies ω = i·eig L(θ) (a mode e^{i(k·x − ωt)}), the
//! continuous system's ω = i·eig L_c(k) at k_d = θ_d/h_d, and fully discrete ω
//! from the eigenvalues of G, λ = e^{−iωΔt}, on the branch nearest the
//! semi-discrete ω (so the branch follows the mode continuously from small
//! wavenumbers rather than the principal logarithm).
//!
//! The exact modes carry the model's mode names by continuation from the long-wave
//! limit: along the ray from θ = 0 to each wavevector the exact spectrum is
//! followed step by step (each step pairs eigenvalues with the previous ones,
//! extrapolated linearly, by the cheapest assignment), in ascending Re ω at the
//! start. Each numerical mode is then paired with the exact mode of the same
//! shape at θ itself: its eigenvector is expanded in the exact eigenvectors and
//! goes to the exact mode that holds most of it ([`shape`]). Only where shapes do
//! not decide (a defective exact system, or a numerical eigenvector spread over
//! several exact modes of different frequency) is the numerical spectrum followed
//! along the ray like the exact one. Frequencies alone cannot keep identity: two
//! waves whose discrete speeds cross would swap names.

use super::shape;
use crate::analysis::context::amplification_at;
use crate::linalg::{self, EigSolver};
use crate::numeric::assignment::optimal_assignment;
use crate::operator::Operator;
use crate::physics::ModelKind;
use crate::problem::Problem;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// Steps of the continuation along a ray.
const TRACK_STEPS: usize = 20;
/// Relative start of the ray (long-wave limit).
const START: f64 = 1e-4;

/// Pairs `new` with `target` by the least total distance (an optimal
/// assignment); returns `new` reordered.
fn assign(target: &[C64], new: &[C64]) -> Vec<C64> {
    let m = target.len();
    let mut cost = vec![0.0; m * m];
    for (i, t) in target.iter().enumerate() {
        for (j, n) in new.iter().enumerate().take(m) {
            cost[i * m + j] = (t - n).norm();
        }
    }
    optimal_assignment(&cost, m)
        .into_iter()
        .map(|j| new[j])
        .collect()
}

/// Frequencies along a ray, evaluated by `freq` at fractions s of the end point.
struct Tracker<'a> {
    freq: &'a dyn Fn(&[f64]) -> Vec<C64>,
}

impl Tracker<'_> {
    /// Frequencies at `theta`, in the order they have at the start of the ray
    /// (ascending Re ω there).
    fn follow(&self, theta: &[f64]) -> Vec<C64> {
        let at = |s: f64| -> Vec<f64> { theta.iter().map(|t| t * s).collect() };
        let mut prev = (self.freq)(&at(START));
        prev.sort_by(|a, b| a.re.total_cmp(&b.re));
        // geometric steps: in the long-wave limit ω grows in proportion to s, so the
        // first prediction scales the start values and later ones extrapolate
        let ratio = (1.0 / START).powf(1.0 / TRACK_STEPS as f64);
        let mut prev2: Option<Vec<C64>> = None;
        let mut s_prev = START;
        let mut s_prev2 = START;
        for k in 1..=TRACK_STEPS {
            let s = if k == TRACK_STEPS {
                1.0
            } else {
                START * ratio.powi(k as i32)
            };
            let raw = (self.freq)(&at(s));
            let predicted: Vec<C64> = match &prev2 {
                None => prev.iter().map(|a| a * (s / s_prev)).collect(),
                Some(p2) => {
                    let slope = (s - s_prev) / (s_prev - s_prev2);
                    prev.iter()
                        .zip(p2)
                        .map(|(a, b)| a + (a - b) * slope)
                        .collect()
                }
            };
            let next = assign(&predicted, &raw);
            prev2 = Some(std::mem::replace(&mut prev, next));
            s_prev2 = s_prev;
            s_prev = s;
        }
        prev
    }
}

/// Semi-discrete and exact frequencies at θ, each in physical-mode order.
pub struct Frequencies<'a> {
    problem: &'a Problem,
    op: &'a Operator,
    /// Whether the continuous symbol is homogeneous of degree one in k (no
    /// source, no diffusion), so that the exact spectrum scales along a ray.
    homogeneous: bool,
}

impl<'a> Frequencies<'a> {
    /// For a problem and its operator.
    pub fn new(problem: &'a Problem, op: &'a Operator) -> Self {
        let system = &problem.system;
        let zero = |m: &nalgebra::DMatrix<C64>| m.iter().all(|z| *z == C64::new(0.0, 0.0));
        let homogeneous = zero(&system.source) && system.diffusion.iter().all(zero);
        Self {
            problem,
            op,
            homogeneous,
        }
    }

    /// The problem.
    pub fn problem(&self) -> &Problem {
        self.problem
    }

    fn eig(&self, l: &[C64]) -> Vec<C64> {
        let m = self.op.m;
        let mut out = vec![C64::new(0.0, 0.0); m];
        if EigSolver::new(m).eigenvalues(l, &mut out).is_err() {
            out.fill(C64::new(f64::NAN, f64::NAN));
        }
        out.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect()
    }

    /// Semi-discrete ω at θ (unordered).
    pub fn numerical_raw(&self, theta: &[f64]) -> Vec<C64> {
        self.eig(&self.op.symbol(theta))
    }

    /// Exact ω at the physical wavevector of θ (unordered).
    pub fn exact_raw(&self, theta: &[f64]) -> Vec<C64> {
        let k: Vec<f64> = theta
            .iter()
            .zip(&self.problem.spacing)
            .map(|(t, h)| t / h)
            .collect();
        self.eig(&linalg::from_matrix(
            &self.problem.system.continuous_symbol(&k),
        ))
    }

    /// (numerical, exact) ω at θ, both in physical-mode order.
    pub fn matched(&self, theta: &[f64]) -> (Vec<C64>, Vec<C64>) {
        let mut exact = if self.homogeneous {
            // ω(sθ) = s ω(θ): the order at the start of the ray is the order here
            let mut w = self.exact_raw(theta);
            w.sort_by(|a, b| a.re.total_cmp(&b.re));
            w
        } else {
            Tracker {
                freq: &|t| self.exact_raw(t),
            }
            .follow(theta)
        };
        if self.problem.system.kind == ModelKind::Linear {
            if let Some(named) = self.named_by_reference_shape(theta, &exact) {
                exact = named;
            }
        }
        let num = self.paired_by_shape(theta, &exact).unwrap_or_else(|| {
            Tracker {
                freq: &|t| self.numerical_raw(t),
            }
            .follow(theta)
        });
        (num, exact)
    }

    /// A user's system has no physical mode names, only mode1..m, and ordering by
    /// frequency would give one name to different waves in different directions
    /// (the slower wave along +x is the faster one's mirror along −x). Its mode j
    /// is therefore the wave whose shape is eigenvector j of the x-flux matrix A₁
    /// (ascending speed along +x), wherever that shape decides; `exact` is
    /// reordered accordingly. None when A₁'s speeds are not distinct or shapes do
    /// not decide.
    fn named_by_reference_shape(&self, theta: &[f64], exact: &[C64]) -> Option<Vec<C64>> {
        let system = &self.problem.system;
        let m = self.op.m;
        let zero = C64::new(0.0, 0.0);
        let mut solver = EigSolver::new(m);
        let (mut speeds, mut refs) = (vec![zero; m], vec![zero; m * m]);
        solver
            .eigenvalues_and_vectors(
                &linalg::from_matrix(&system.flux[0]),
                &mut speeds,
                &mut refs,
            )
            .ok()?;
        let mut by_speed: Vec<usize> = (0..m).collect();
        by_speed.sort_by(|a, b| speeds[*a].re.total_cmp(&speeds[*b].re));
        let scale = speeds.iter().map(|z| z.norm()).fold(0.0, f64::max);
        let distinct = by_speed
            .windows(2)
            .all(|w| (speeds[w[1]] - speeds[w[0]]).norm() > 1e-6 * scale);
        if !distinct || scale == 0.0 {
            return None;
        }
        let k: Vec<f64> = theta
            .iter()
            .zip(&self.problem.spacing)
            .map(|(t, h)| t / h)
            .collect();
        let lc = linalg::from_matrix(&system.continuous_symbol(&k));
        let (mut ve, mut xe) = (vec![zero; m], vec![zero; m * m]);
        solver.eigenvalues_and_vectors(&lc, &mut ve, &mut xe).ok()?;
        let we: Vec<C64> = ve.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        // the exact eigenvectors at θ in the order of `exact`
        let order = shape::nearest_order(exact, &we)?;
        let at_theta: Vec<C64> = (0..m * m)
            .map(|rc| xe[(rc / m) * m + order[rc % m]])
            .collect();
        let ref_speeds: Vec<C64> = by_speed.iter().map(|&j| speeds[j]).collect();
        let pairing = shape::pair(&refs, &by_speed, &ref_speeds, &at_theta, m)?;
        Some(pairing.iter().map(|&j| exact[j]).collect())
    }

    /// The numerical ω at θ in the order of `exact` (the exact ω at θ in mode
    /// order), paired by eigenvector shape; None when shapes do not decide.
    fn paired_by_shape(&self, theta: &[f64], exact: &[C64]) -> Option<Vec<C64>> {
        let m = self.op.m;
        let k: Vec<f64> = theta
            .iter()
            .zip(&self.problem.spacing)
            .map(|(t, h)| t / h)
            .collect();
        let lc = linalg::from_matrix(&self.problem.system.continuous_symbol(&k));
        let zero = C64::new(0.0, 0.0);
        let (mut ve, mut xe) = (vec![zero; m], vec![zero; m * m]);
        let (mut vn, mut xn) = (vec![zero; m], vec![zero; m * m]);
        let mut solver = EigSolver::new(m);
        solver.eigenvalues_and_vectors(&lc, &mut ve, &mut xe).ok()?;
        solver
            .eigenvalues_and_vectors(&self.op.symbol(theta), &mut vn, &mut xn)
            .ok()?;
        // the exact decomposition's modes in the order of `exact`
        let we: Vec<C64> = ve.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        let order = shape::nearest_order(exact, &we)?;
        let wn: Vec<C64> = vn.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        let pairing = shape::pair(&xe, &order, exact, &xn, m)?;
        Some(pairing.iter().map(|&j| wn[j]).collect())
    }

    /// Group velocities (physical units) of the matched numerical and exact modes
    /// at θ, by central differences in θ.
    pub fn group_velocities(
        &self,
        theta: &[f64],
        num: &[C64],
        exact: &[C64],
    ) -> (Vec<Vec<f64>>, Vec<Vec<f64>>) {
        let m = num.len();
        let d = theta.len();
        let mut gn = vec![vec![0.0; d]; m];
        let mut ge = vec![vec![0.0; d]; m];
        let delta = 1e-6;
        for ax in 0..d {
            let mut tp = theta.to_vec();
            let mut tm = theta.to_vec();
            tp[ax] += delta;
            tm[ax] -= delta;
            let h = self.problem.spacing[ax];
            let np = assign(num, &self.numerical_raw(&tp));
            let nm = assign(num, &self.numerical_raw(&tm));
            let ep = assign(exact, &self.exact_raw(&tp));
            let em = assign(exact, &self.exact_raw(&tm));
            for j in 0..m {
                gn[j][ax] = (np[j].re - nm[j].re) / (2.0 * delta) * h;
                ge[j][ax] = (ep[j].re - em[j].re) / (2.0 * delta) * h;
            }
        }
        (gn, ge)
    }

    /// Fully discrete group velocities of the principal roots at θ, by central
    /// differences of the fully discrete ω (each branch followed from θ).
    pub fn discrete_group_velocities(
        &self,
        theta: &[f64],
        num: &[C64],
        disc: &[C64],
        dt: f64,
    ) -> Vec<Vec<f64>> {
        let m = num.len();
        let d = theta.len();
        let mut g = vec![vec![0.0; d]; m];
        let delta = 1e-6;
        for ax in 0..d {
            let mut tp = theta.to_vec();
            let mut tm = theta.to_vec();
            tp[ax] += delta;
            tm[ax] -= delta;
            let h = self.problem.spacing[ax];
            let near = |t: &[f64]| {
                let n = assign(num, &self.numerical_raw(t));
                let w = self.discrete(t, &n, dt);
                assign(&disc[..m], &w[..m])
            };
            let (wp, wm) = (near(&tp), near(&tm));
            for j in 0..m {
                g[j][ax] = (wp[j].re - wm[j].re) / (2.0 * delta) * h;
            }
        }
        g
    }

    /// Fully discrete ω for the matched semi-discrete modes (principal roots, in
    /// physical-mode order) followed by the computational modes.
    ///
    /// A one-step or multistep method acts on each eigenvector of L(θ) alone, so
    /// mode j's amplification factors are those of z = Δt μ_j (R(z) for one-step
    /// methods, the roots of the characteristic polynomial for multistep ones,
    /// the principal one nearest e^z): the mode keeps its identity exactly. Only
    /// composite schemes, whose G is not a function of L, take the eigenvalues of
    /// G and pair each mode with the one nearest e^{−iωΔt}.
    pub fn discrete(&self, theta: &[f64], num: &[C64], dt: f64) -> Vec<C64> {
        let method = &self.problem.method;
        if method.composite().is_some() {
            return self.discrete_composite(theta, num, dt);
        }
        let mut out = Vec::with_capacity(num.len() * method.levels());
        let mut computational = Vec::new();
        for w in num {
            let z = C64::new(0.0, -1.0) * w * dt;
            let target = z.exp();
            let roots = method.amplification_eigenvalues(z);
            let principal = (0..roots.len())
                .min_by(|a, b| {
                    (roots[*a] - target)
                        .norm()
                        .total_cmp(&(roots[*b] - target).norm())
                })
                .unwrap_or(0);
            for (j, l) in roots.iter().enumerate() {
                if j == principal {
                    out.push(log_branch(*l, dt, w.re));
                } else {
                    computational.push(log_branch(*l, dt, 0.0));
                }
            }
        }
        out.extend(computational);
        out
    }

    /// [`Frequencies::discrete`] for composite schemes, from the eigenvalues of G.
    fn discrete_composite(&self, theta: &[f64], num: &[C64], dt: f64) -> Vec<C64> {
        let g = amplification_at(self.problem, self.op, theta, dt);
        let size = g.nrows();
        let lam = linalg::eigenvalues(&linalg::from_matrix(&g), size)
            .unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); size]);
        // principal root of each mode: the eigenvalue nearest e^{−iωΔt}
        let target: Vec<C64> = num
            .iter()
            .map(|w| (C64::new(0.0, -1.0) * w * dt).exp())
            .collect();
        let mut used = vec![false; size];
        let mut out = Vec::with_capacity(size);
        for (t, w) in target.iter().zip(num) {
            let j = (0..size)
                .filter(|j| !used[*j])
                .min_by(|a, b| (lam[*a] - t).norm().total_cmp(&(lam[*b] - t).norm()))
                .unwrap_or(0);
            used[j] = true;
            out.push(log_branch(lam[j], dt, w.re));
        }
        for (j, l) in lam.iter().enumerate() {
            if !used[j] {
                out.push(log_branch(*l, dt, 0.0));
            }
        }
        out
    }
}

/// ω = i ln λ / Δt on the branch whose real part is nearest `near`.
pub fn log_branch(lam: C64, dt: f64, near: f64) -> C64 {
    if lam.norm() == 0.0 {
        return C64::new(f64::NAN, f64::NEG_INFINITY);
    }
    let base = -lam.arg() / dt;
    let period = 2.0 * PI / dt;
    let k = ((near - base) / period).round();
    C64::new(base + k * period, lam.norm().ln() / dt)
}
