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
//! extrapolated linearly; a step whose pairing is not clear is halved, and the
//! cheapest assignment decides only where halving does not settle it), in
//! ascending Re ω at the start. Each numerical mode is then paired with the exact mode of the same
//! shape at θ itself: its eigenvector is expanded in the exact eigenvectors and
//! goes to the exact mode that holds most of it ([`shape`]). Only where shapes do
//! not decide (a defective exact system, or a numerical eigenvector spread over
//! several exact modes of different frequency) is the numerical spectrum followed
//! along the ray like the exact one. Frequencies alone cannot keep identity: two
//! waves whose discrete speeds cross would swap names.

pub(super) use super::ray::{assign, follow_ray, pair_into};
use super::{shape, sorted};
use crate::analysis::context::amplification_at;
use crate::linalg::{self, EigSolver};
use crate::operator::Operator;
use crate::physics::ModelKind;
use crate::problem::Problem;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// The eigen-decomposition of a user's x-flux matrix A₁ that names the modes of
/// a `linear` system (see [`Frequencies::named_with`]), computed once.
struct Reference {
    /// Eigenvectors of A₁ (row-major, one per column).
    vectors: Vec<C64>,
    /// Columns in ascending speed.
    by_speed: Vec<usize>,
    /// The speeds in that order.
    speeds: Vec<C64>,
}

impl Reference {
    /// None when A₁'s speeds are not distinct or its decomposition fails.
    fn of(system: &crate::physics::System) -> Option<Reference> {
        let m = system.size();
        let zero = C64::new(0.0, 0.0);
        let (mut speeds, mut vectors) = (vec![zero; m], vec![zero; m * m]);
        EigSolver::new(m)
            .eigenvalues_and_vectors(
                &linalg::from_matrix(&system.flux[0]),
                &mut speeds,
                &mut vectors,
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
        let speeds = by_speed.iter().map(|&j| speeds[j]).collect();
        Some(Reference {
            vectors,
            by_speed,
            speeds,
        })
    }
}

/// `w` in ascending Re ω, None when a value is not finite.
pub(super) fn ascending(mut w: Vec<C64>) -> Option<Vec<C64>> {
    if !w.iter().all(|z| z.is_finite()) {
        return None;
    }
    w.sort_by(|a, b| a.re.total_cmp(&b.re));
    Some(w)
}

/// Semi-discrete and exact frequencies at θ, each in physical-mode order.
pub struct Frequencies<'a> {
    problem: &'a Problem,
    op: &'a Operator,
    /// Whether the continuous symbol is homogeneous of degree one in k (no
    /// source, no diffusion), so that the exact spectrum scales along a ray.
    homogeneous: bool,
    /// For a `linear` system, the decomposition of A₁ that names its modes.
    reference: Option<Reference>,
    /// Whether ascending frequency names the numerical modes wherever a ray
    /// would be followed ([`sorted`]).
    ascending_names: bool,
}

impl<'a> Frequencies<'a> {
    /// For a problem and its operator.
    pub fn new(problem: &'a Problem, op: &'a Operator) -> Self {
        let system = &problem.system;
        let zero = |m: &nalgebra::DMatrix<C64>| m.iter().all(|z| *z == C64::new(0.0, 0.0));
        let homogeneous = zero(&system.source) && system.diffusion.iter().all(zero);
        let reference = if system.kind == ModelKind::Linear {
            Reference::of(system)
        } else {
            None
        };
        Self {
            problem,
            op,
            homogeneous,
            reference,
            ascending_names: sorted::ascending_names_modes(problem, op, homogeneous),
        }
    }

    /// The problem.
    pub fn problem(&self) -> &Problem {
        self.problem
    }

    /// The operator.
    pub(super) fn operator(&self) -> &Operator {
        self.op
    }

    /// Whether the exact spectrum scales along a ray (no source, no diffusion).
    pub(super) fn homogeneous(&self) -> bool {
        self.homogeneous
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
        let k = self.wavevector(theta);
        self.eig(&linalg::from_matrix(
            &self.problem.system.continuous_symbol(&k),
        ))
    }

    /// The physical wavevector k_d = θ_d/h_d.
    fn wavevector(&self, theta: &[f64]) -> Vec<f64> {
        theta
            .iter()
            .zip(&self.problem.spacing)
            .map(|(t, h)| t / h)
            .collect()
    }

    /// The exact ω at θ in mode order before naming by shape: ascending Re ω
    /// at the start of the ray from θ = 0 (`raw`: the exact ω at θ, used when
    /// the spectrum scales along the ray).
    pub(super) fn exact_in_ray_order(&self, theta: &[f64], raw: Vec<C64>) -> Vec<C64> {
        if self.homogeneous {
            // ω(sθ) = s ω(θ): the order at the start of the ray is the order here
            let mut w = raw;
            w.sort_by(|a, b| a.re.total_cmp(&b.re));
            w
        } else {
            follow_ray(theta, |t, out| *out = self.exact_raw(t))
        }
    }

    /// The numerical ω at θ in the order following the ray from θ = 0 gives
    /// them (where shapes do not decide): sorted by Re ω where that is the
    /// same order ([`sorted`]), else [`Frequencies::numerical_followed`].
    pub fn numerical_by_ray(&self, theta: &[f64]) -> Vec<C64> {
        if self.ascending_at(theta) {
            if let Some(w) = ascending(self.numerical_raw(theta)) {
                return w;
            }
        }
        self.numerical_followed(theta)
    }

    /// The numerical ω at θ followed step by step along the ray from θ = 0,
    /// also where sorting would name them.
    pub fn numerical_followed(&self, theta: &[f64]) -> Vec<C64> {
        follow_ray(theta, |t, out| *out = self.numerical_raw(t))
    }

    /// Whether the case is one where ascending Re ω names the numerical modes
    /// at every θ with an axis strictly inside (0, π) ([`sorted`]).
    pub fn names_by_ascending_frequency(&self) -> bool {
        self.ascending_names
    }

    /// Whether the ray to θ ends in ascending Re ω, so that sorting the
    /// numerical ω at θ names them as following the ray would ([`sorted`]).
    pub(super) fn ascending_at(&self, theta: &[f64]) -> bool {
        self.ascending_names && sorted::off_the_zeros(theta)
    }

    /// (numerical, exact) ω at θ, both in physical-mode order.
    pub fn matched(&self, theta: &[f64]) -> (Vec<C64>, Vec<C64>) {
        let raw = if self.homogeneous {
            self.exact_raw(theta)
        } else {
            Vec::new()
        };
        let mut exact = self.exact_in_ray_order(theta, raw);
        if self.reference.is_some() {
            if let Some(named) = self.named_by_reference_shape(theta, &exact) {
                exact = named;
            }
        }
        let num = self
            .paired_by_shape(theta, &exact)
            .unwrap_or_else(|| self.numerical_by_ray(theta));
        (num, exact)
    }

    /// The exact eigen-decomposition at θ: (values, vectors).
    fn exact_decomposition(&self, theta: &[f64]) -> Option<(Vec<C64>, Vec<C64>)> {
        let m = self.op.m;
        let lc = linalg::from_matrix(
            &self
                .problem
                .system
                .continuous_symbol(&self.wavevector(theta)),
        );
        let zero = C64::new(0.0, 0.0);
        let (mut ve, mut xe) = (vec![zero; m], vec![zero; m * m]);
        EigSolver::new(m)
            .eigenvalues_and_vectors(&lc, &mut ve, &mut xe)
            .ok()?;
        Some((ve, xe))
    }

    fn named_by_reference_shape(&self, theta: &[f64], exact: &[C64]) -> Option<Vec<C64>> {
        let (ve, xe) = self.exact_decomposition(theta)?;
        self.named_with(exact, &ve, &xe)
    }

    /// A user's system has no physical mode names, only mode1..m, and ordering by
    /// frequency would give one name to different waves in different directions
    /// (the slower wave along +x is the faster one's mirror along −x). Its mode j
    /// is therefore the wave whose shape is eigenvector j of the x-flux matrix A₁
    /// (ascending speed along +x), wherever that shape decides; `exact` is
    /// reordered accordingly. None when A₁'s speeds are not distinct, shapes do
    /// not decide, or the system is not a `linear` one. `ve`, `xe`: the
    /// eigenvalues and eigenvectors of the continuous symbol at θ.
    pub(super) fn named_with(&self, exact: &[C64], ve: &[C64], xe: &[C64]) -> Option<Vec<C64>> {
        let reference = self.reference.as_ref()?;
        let m = self.op.m;
        let we: Vec<C64> = ve.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        // the exact eigenvectors at θ in the order of `exact`
        let order = shape::nearest_order(exact, &we)?;
        let at_theta: Vec<C64> = (0..m * m)
            .map(|rc| xe[(rc / m) * m + order[rc % m]])
            .collect();
        let pairing = shape::pair(
            &reference.vectors,
            &reference.by_speed,
            &reference.speeds,
            &at_theta,
            m,
        )?;
        Some(pairing.iter().map(|&j| exact[j]).collect())
    }

    /// The numerical ω at θ in the order of `exact` (the exact ω at θ in mode
    /// order), paired by eigenvector shape; None when shapes do not decide.
    fn paired_by_shape(&self, theta: &[f64], exact: &[C64]) -> Option<Vec<C64>> {
        let m = self.op.m;
        let (ve, xe) = self.exact_decomposition(theta)?;
        let zero = C64::new(0.0, 0.0);
        let (mut vn, mut xn) = (vec![zero; m], vec![zero; m * m]);
        EigSolver::new(m)
            .eigenvalues_and_vectors(&self.op.symbol(theta), &mut vn, &mut xn)
            .ok()?;
        self.paired_with(exact, &ve, &xe, &vn, &xn)
    }

    /// [`Frequencies::paired_by_shape`] from the decompositions of the exact
    /// (`ve`, `xe`) and numerical (`vn`, `xn`) symbols at θ.
    pub(super) fn paired_with(
        &self,
        exact: &[C64],
        ve: &[C64],
        xe: &[C64],
        vn: &[C64],
        xn: &[C64],
    ) -> Option<Vec<C64>> {
        let m = self.op.m;
        // the exact decomposition's modes in the order of `exact`
        let we: Vec<C64> = ve.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        let order = shape::nearest_order(exact, &we)?;
        let wn: Vec<C64> = vn.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect();
        let pairing = shape::pair(xe, &order, exact, xn, m)?;
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
                g[j][ax] = discrete_difference(wp[j].re, wm[j].re, dt) / (2.0 * delta) * h;
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
            let (roots, principal) = self.roots(*w, dt);
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

    /// The amplification factors of a one-step or multistep method for the
    /// semi-discrete frequency ω (z = −iωΔt) and the index of the principal
    /// one, nearest e^z.
    fn roots(&self, w: C64, dt: f64) -> (Vec<C64>, usize) {
        let z = C64::new(0.0, -1.0) * w * dt;
        let target = z.exp();
        let roots = self.problem.method.amplification_eigenvalues(z);
        let principal = (0..roots.len())
            .min_by(|a, b| {
                (roots[*a] - target)
                    .norm()
                    .total_cmp(&(roots[*b] - target).norm())
            })
            .unwrap_or(0);
        (roots, principal)
    }

    /// The fully discrete ω of the principal root for the semi-discrete ω
    /// (one-step and multistep methods; see [`Frequencies::discrete`]).
    pub(super) fn principal(&self, w: C64, dt: f64) -> C64 {
        let (roots, principal) = self.roots(w, dt);
        roots
            .get(principal)
            .map_or(C64::new(f64::NAN, f64::NAN), |l| log_branch(*l, dt, w.re))
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

/// a − b for two fully discrete frequencies, which are defined modulo 2π/Δt:
/// the representative nearest zero, so that a difference straddling the
/// branch cut (λ near the negative real axis, Re ω_d near ±π/Δt) does not
/// jump by a period.
pub fn discrete_difference(a: f64, b: f64, dt: f64) -> f64 {
    let period = 2.0 * PI / dt;
    let d = a - b;
    d - period * (d / period).round()
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
