//! The dispersion analysis at one wavevector, written straight into the output
//! arrays from a per-worker workspace.
//!
//! The frequencies are those of [`Frequencies::matched`] and
//! [`Frequencies::discrete`] (bit for bit), with the exact symbol decomposed
//! once for its shapes and matrices assembled into reused buffers. Group
//! velocities come from the eigenvectors ([`slopes`](super::slopes)): the
//! derivative of each eigenvalue of L(θ) along θ_d from ∂L/∂θ_d (the stencils'
//! derivatives in closed form), of the continuous symbol from ∂L_c/∂k_d =
//! −iA_d − 2k_d K_d, and the fully discrete one by the chain rule through the
//! time method's principal root. That costs no eigenproblem beyond those at θ
//! and carries no truncation or cancellation error, where the central
//! differences in θ of [`Frequencies::group_velocities`] and
//! [`Frequencies::discrete_group_velocities`] (the reference implementation,
//! still used along the dispersion curves) need four more eigenproblems per
//! axis and lose about ε|ω|/δ ≈ 1e-10 relative to rounding. Where the
//! eigenvectors are ill-conditioned (a nearly defective symbol) and for
//! composite schemes' fully discrete modes the differences are used.

use super::frequencies::{discrete_difference, pair_into, Frequencies};
use super::slopes::Slopes;
use crate::linalg::EigSolver;
use crate::time::Scheme;
use num_complex::Complex64 as C64;

/// Step of the central differences in θ (as in [`Frequencies::group_velocities`]).
const DELTA: f64 = 1e-6;

/// The outputs of one node, each a slice of the node-major output arrays.
pub struct NodeSlots<'a> {
    /// Semi-discrete ω (m).
    pub numerical: &'a mut [C64],
    /// Exact ω (m).
    pub exact: &'a mut [C64],
    /// Fully discrete ω (m principal, then the computational modes).
    pub discrete: &'a mut [C64],
    /// Semi-discrete group velocities (m × d).
    pub group: &'a mut [f64],
    /// Exact group velocities (m × d).
    pub group_exact: &'a mut [f64],
    /// Fully discrete group velocities (m × d).
    pub group_discrete: &'a mut [f64],
}

/// Buffers reused from node to node by one worker.
pub struct NodeWork {
    m: usize,
    solver: EigSolver,
    matrix: Vec<C64>,
    values: Vec<C64>,
    vectors: Vec<C64>,
    exact_values: Vec<C64>,
    exact_vectors: Vec<C64>,
    shifted: Vec<f64>,
    wavevector: Vec<f64>,
    raw: Vec<C64>,
    plus: [Vec<C64>; 3],
    minus: [Vec<C64>; 3],
    /// Whether the decompositions at θ succeeded (numerical, exact).
    decomposed: (bool, bool),
    numerical_slopes: Slopes,
    exact_slopes: Slopes,
    /// Eigen index of each numerical, exact mode.
    numerical_index: Vec<usize>,
    exact_index: Vec<usize>,
    slope: Vec<C64>,
    /// dω/dθ_d of each numerical mode (m × d, mode-major).
    numerical_slope: Vec<C64>,
}

impl NodeWork {
    /// Buffers for m×m symbols on `dims` axes.
    pub fn new(m: usize, dims: usize) -> Self {
        let zero = C64::new(0.0, 0.0);
        let v = || vec![zero; m];
        NodeWork {
            m,
            solver: EigSolver::new(m),
            matrix: vec![zero; m * m],
            values: v(),
            vectors: vec![zero; m * m],
            exact_values: v(),
            exact_vectors: vec![zero; m * m],
            shifted: vec![0.0; dims],
            wavevector: vec![0.0; dims],
            raw: v(),
            plus: [v(), v(), v()],
            minus: [v(), v(), v()],
            decomposed: (false, false),
            numerical_slopes: Slopes::new(m),
            exact_slopes: Slopes::new(m),
            numerical_index: vec![0; m],
            exact_index: vec![0; m],
            slope: v(),
            numerical_slope: vec![zero; m * dims],
        }
    }

    /// i·eig of `self.matrix` into `self.raw` (NaN when the kernel fails).
    fn frequencies_of_matrix(&mut self) {
        if self
            .solver
            .eigenvalues(&self.matrix, &mut self.raw)
            .is_err()
        {
            self.raw.fill(C64::new(f64::NAN, f64::NAN));
        }
        for w in self.raw.iter_mut() {
            *w = C64::new(0.0, 1.0) * *w;
        }
    }

    /// Semi-discrete ω at `theta` into `self.raw`, unordered.
    fn numerical_raw(&mut self, f: &Frequencies, theta: &[f64]) {
        f.operator().symbol_into(theta, &mut self.matrix);
        self.frequencies_of_matrix();
    }

    /// The physical wavevector k_d = θ_d/h_d of `theta` into `self.wavevector`.
    fn set_wavevector(&mut self, f: &Frequencies, theta: &[f64]) {
        for ((k, t), h) in self
            .wavevector
            .iter_mut()
            .zip(theta)
            .zip(&f.problem().spacing)
        {
            *k = t / h;
        }
    }

    /// The continuous symbol at the physical wavevector of `theta` into `self.matrix`.
    fn continuous_symbol(&mut self, f: &Frequencies, theta: &[f64]) {
        self.set_wavevector(f, theta);
        f.problem()
            .system
            .continuous_symbol_into(&self.wavevector, &mut self.matrix);
    }

    /// Exact ω at `theta` into `self.raw`, unordered.
    fn exact_raw(&mut self, f: &Frequencies, theta: &[f64]) {
        self.continuous_symbol(f, theta);
        self.frequencies_of_matrix();
    }

    /// Frequencies and group velocities at `theta` for time step `dt` into `out`.
    pub fn evaluate(&mut self, f: &Frequencies, theta: &[f64], dt: f64, out: NodeSlots) {
        let (num, exact) = self.matched(f, theta);
        out.numerical.copy_from_slice(&num);
        out.exact.copy_from_slice(&exact);
        let disc = f.discrete(theta, &num, dt);
        write_padded(out.discrete, &disc);
        let analytic = self.numerical_velocities(f, theta, &num, out.group)
            && self.exact_velocities(f, theta, &exact, out.group_exact);
        if !analytic {
            self.differences(
                f,
                theta,
                dt,
                &num,
                &exact,
                &disc,
                &mut *out.group,
                &mut *out.group_exact,
                &mut *out.group_discrete,
            );
            return;
        }
        if f.problem().method.composite().is_some() {
            let g = f.discrete_group_velocities(theta, &num, &disc, dt);
            for (o, v) in out.group_discrete.iter_mut().zip(g.iter().flatten()) {
                *o = *v;
            }
            return;
        }
        self.discrete_velocities(f, theta, dt, &num, out.group_discrete);
    }

    /// Semi-discrete group velocities from the eigenvectors of L(θ); false
    /// where they are ill-conditioned.
    fn numerical_velocities(
        &mut self,
        f: &Frequencies,
        theta: &[f64],
        num: &[C64],
        group: &mut [f64],
    ) -> bool {
        if !self.decomposed.0 || !self.numerical_slopes.set(&self.values, &self.vectors) {
            return false;
        }
        let (m, d) = (self.m, theta.len());
        let i = C64::new(0.0, 1.0);
        for (w, mu) in self.raw.iter_mut().zip(&self.values) {
            *w = i * mu;
        }
        nearest_into(num, &self.raw, &mut self.numerical_index);
        for a in 0..d {
            f.operator().derivative_into(theta, a, &mut self.matrix);
            if !self.numerical_slopes.slopes(&self.matrix, &mut self.slope) {
                return false;
            }
            let h = f.problem().spacing[a];
            for j in 0..m {
                let dw = i * self.slope[self.numerical_index[j]];
                self.numerical_slope[j * d + a] = dw;
                group[j * d + a] = dw.re * h;
            }
        }
        true
    }

    /// Exact group velocities from the eigenvectors of the continuous symbol.
    fn exact_velocities(
        &mut self,
        f: &Frequencies,
        theta: &[f64],
        exact: &[C64],
        group: &mut [f64],
    ) -> bool {
        if !self.decomposed.1
            || !self
                .exact_slopes
                .set(&self.exact_values, &self.exact_vectors)
        {
            return false;
        }
        let (m, d) = (self.m, theta.len());
        let i = C64::new(0.0, 1.0);
        for (w, mu) in self.raw.iter_mut().zip(&self.exact_values) {
            *w = i * mu;
        }
        nearest_into(exact, &self.raw, &mut self.exact_index);
        self.set_wavevector(f, theta);
        for a in 0..d {
            f.problem()
                .system
                .continuous_derivative_into(&self.wavevector, a, &mut self.matrix);
            if !self.exact_slopes.slopes(&self.matrix, &mut self.slope) {
                return false;
            }
            for j in 0..m {
                group[j * d + a] = (i * self.slope[self.exact_index[j]]).re;
            }
        }
        true
    }

    /// Fully discrete group velocities of a one-step or multistep method: the
    /// principal frequency ω_d(ω) differentiated along dω/dθ_d (no
    /// eigenproblem). A one-step method has ω_d = i ln R(z)/Δt with z = −iωΔt,
    /// so dω_d/dθ_d = R′(z)/R(z) · dω/dθ_d in closed form; a multistep one
    /// takes a central difference of the scalar map ω → ω_d.
    fn discrete_velocities(
        &mut self,
        f: &Frequencies,
        theta: &[f64],
        dt: f64,
        num: &[C64],
        group: &mut [f64],
    ) {
        let d = theta.len();
        if let Scheme::OneStep(os) = &f.problem().method.scheme {
            for (j, w) in num.iter().enumerate() {
                let ratio = os.log_derivative(C64::new(0.0, -1.0) * w * dt);
                for a in 0..d {
                    let slope = ratio * self.numerical_slope[j * d + a];
                    group[j * d + a] = slope.re * f.problem().spacing[a];
                }
            }
            return;
        }
        for (j, w) in num.iter().enumerate() {
            for a in 0..d {
                let step = self.numerical_slope[j * d + a] * DELTA;
                let (plus, minus) = (f.principal(w + step, dt), f.principal(w - step, dt));
                group[j * d + a] = discrete_difference(plus.re, minus.re, dt) / (2.0 * DELTA)
                    * f.problem().spacing[a];
            }
        }
    }

    /// Group velocities by central differences in θ (the reference
    /// implementation's, with fewer eigenproblems).
    #[allow(clippy::too_many_arguments)]
    fn differences(
        &mut self,
        f: &Frequencies,
        theta: &[f64],
        dt: f64,
        num: &[C64],
        exact: &[C64],
        disc: &[C64],
        group: &mut [f64],
        group_exact: &mut [f64],
        group_discrete: &mut [f64],
    ) {
        let m = self.m;
        let d = theta.len();
        let mut shifted = std::mem::take(&mut self.shifted);
        for ax in 0..d {
            let h = f.problem().spacing[ax];
            shifted.copy_from_slice(theta);
            for side in 0..2 {
                shifted[ax] = theta[ax] + if side == 0 { DELTA } else { -DELTA };
                self.numerical_raw(f, &shifted);
                let slots = pick(&mut self.plus, &mut self.minus, side);
                pair_into(num, &self.raw, &mut slots[0]);
                self.exact_raw(f, &shifted);
                let slots = pick(&mut self.plus, &mut self.minus, side);
                pair_into(exact, &self.raw, &mut slots[1]);
                let w = f.discrete(&shifted, &slots[0], dt);
                pair_into(&disc[..m], &w[..m], &mut slots[2]);
            }
            for j in 0..m {
                let at = j * d + ax;
                let slope =
                    |k: usize| (self.plus[k][j].re - self.minus[k][j].re) / (2.0 * DELTA) * h;
                group[at] = slope(0);
                group_exact[at] = slope(1);
                let (plus, minus) = (self.plus[2][j].re, self.minus[2][j].re);
                group_discrete[at] = discrete_difference(plus, minus, dt) / (2.0 * DELTA) * h;
            }
        }
        self.shifted = shifted;
    }

    /// [`Frequencies::matched`] with the exact symbol decomposed once.
    fn matched(&mut self, f: &Frequencies, theta: &[f64]) -> (Vec<C64>, Vec<C64>) {
        self.continuous_symbol(f, theta);
        let exact_ok = self
            .solver
            .eigenvalues_and_vectors(
                &self.matrix,
                &mut self.exact_values,
                &mut self.exact_vectors,
            )
            .is_ok();
        f.operator().symbol_into(theta, &mut self.matrix);
        let numerical_ok = self
            .solver
            .eigenvalues_and_vectors(&self.matrix, &mut self.values, &mut self.vectors)
            .is_ok();
        self.decomposed = (numerical_ok, exact_ok);
        if !exact_ok {
            return f.matched(theta);
        }
        let raw = if f.homogeneous() {
            // the eigenvalues alone, as `Frequencies::exact_raw` takes them (the
            // same bits, so the same order inside clusters of equal frequency)
            self.exact_raw(f, theta);
            self.raw.clone()
        } else {
            Vec::new()
        };
        let mut exact = f.exact_in_ray_order(theta, raw);
        if let Some(named) = f.named_with(&exact, &self.exact_values, &self.exact_vectors) {
            exact = named;
        }
        let shaped = numerical_ok
            .then(|| {
                f.paired_with(
                    &exact,
                    &self.exact_values,
                    &self.exact_vectors,
                    &self.values,
                    &self.vectors,
                )
            })
            .flatten();
        // the eigenvalues-only kernel again, as `Frequencies::numerical_by_ray`
        // takes them (the same bits as the reference implementation)
        let sorted = || {
            f.ascending_at(theta)
                .then(|| {
                    self.numerical_raw(f, theta);
                    super::frequencies::ascending(self.raw.clone())
                })
                .flatten()
        };
        let num = match shaped.or_else(sorted) {
            Some(num) => num,
            None => super::frequencies::follow_ray(theta, |point, out| {
                self.numerical_raw(f, point);
                out.clear();
                out.extend_from_slice(&self.raw);
            }),
        };
        (num, exact)
    }
}

/// For each wanted value, the nearest index into `have` not taken by an
/// earlier one, into `out`. `wanted` holds the same eigenvalues as `have` (to
/// rounding), so each finds its own; inside a cluster of equal values which
/// member goes where does not matter (a cluster's slopes are shared out in a
/// fixed order anyway).
fn nearest_into(wanted: &[C64], have: &[C64], out: &mut [usize]) {
    let mut taken = 0u64;
    for (w, o) in wanted.iter().zip(out.iter_mut()) {
        let mut best = (usize::MAX, f64::INFINITY);
        for (j, h) in have.iter().enumerate() {
            let d = (w - h).norm_sqr();
            if taken & (1 << j) == 0 && (best.0 == usize::MAX || d < best.1) {
                best = (j, d);
            }
        }
        taken |= 1 << best.0;
        *o = best.0;
    }
}

/// The paired spectra of side 0 (θ + δ) or side 1 (θ − δ).
fn pick<'a>(
    plus: &'a mut [Vec<C64>; 3],
    minus: &'a mut [Vec<C64>; 3],
    side: usize,
) -> &'a mut [Vec<C64>; 3] {
    if side == 0 {
        plus
    } else {
        minus
    }
}

/// Copies `values` into `slot`, NaN where `values` is short.
fn write_padded(slot: &mut [C64], values: &[C64]) {
    for (k, s) in slot.iter_mut().enumerate() {
        *s = values
            .get(k)
            .copied()
            .unwrap_or(C64::new(f64::NAN, f64::NAN));
    }
}
