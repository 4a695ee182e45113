//! What every analysis of one run shares: the problem, the plan, the assembled
//! operator, the grid, the time step, the parallelism and the progress sink; and
//! the amplification matrix G(θ, Δt) of any method.

use super::Plan;
use crate::operator::Operator;
use crate::problem::Problem;
use crate::sample::{Grid, Par, Progress, Symmetry};
use crate::time::{horner, Scheme};
use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// The shared state of one run.
pub struct Context<'a> {
    /// The problem.
    pub problem: &'a Problem,
    /// The plan.
    pub plan: &'a Plan,
    /// L(θ).
    pub op: Operator,
    /// The wavevector grid.
    pub grid: Grid,
    /// The problem's Δt.
    pub dt: f64,
    /// Parallelism.
    pub par: Par,
    /// Where progress goes.
    pub progress: &'a dyn Progress,
}

impl<'a> Context<'a> {
    /// The context of `problem` under `plan`.
    pub fn new(problem: &'a Problem, plan: &'a Plan, par: Par, progress: &'a dyn Progress) -> Self {
        Context {
            problem,
            plan,
            op: problem.operator(),
            grid: Grid::new(&plan.points),
            dt: problem.dt(),
            par,
            progress,
        }
    }

    /// Real coefficients make every quantity here even in θ (eig L(−θ) = conj
    /// eig L(θ), and every method has a real stability function), so half the
    /// grid is enough.
    pub fn symmetry(&self) -> Symmetry {
        if self.op.real_coefficients {
            Symmetry::Even
        } else {
            Symmetry::None
        }
    }

    /// Whether G is not a function of eig L (a composite scheme).
    pub fn is_composite(&self) -> bool {
        self.problem.method.composite().is_some()
    }

    /// G(θ, Δt) for any method.
    pub fn amplification(&self, theta: &[f64], dt: f64) -> DMatrix<C64> {
        amplification_at(self.problem, &self.op, theta, dt)
    }
}

/// G(θ, Δt) of a problem's method, given its operator (for second-order-in-time
/// methods the companion matrix of Z = Δt²·L on the stacked levels (u^n, u^{n−1})).
pub fn amplification_at(problem: &Problem, op: &Operator, theta: &[f64], dt: f64) -> DMatrix<C64> {
    match problem.method.composite() {
        Some(c) => crate::time::composite::amplification(
            c,
            &problem.system,
            op,
            &problem.spacing,
            theta,
            dt,
        ),
        None => {
            let step = C64::new(problem.method.step_variable(dt), 0.0);
            if let Some(g) = explicit_on_stack(problem, op, theta, step) {
                return g;
            }
            problem
                .method
                .amplification_matrix(&(op.symbol_matrix(theta) * step))
        }
    }
}

/// G of an explicit one-step method with m ≤ [`horner::MAX`] from stack
/// buffers ([`horner`]): the heap computation to rounding, with one matrix
/// product fewer and none of its allocations. None for other methods and
/// larger systems.
fn explicit_on_stack(
    problem: &Problem,
    op: &Operator,
    theta: &[f64],
    step: C64,
) -> Option<DMatrix<C64>> {
    let Scheme::OneStep(os) = &problem.method.scheme else {
        return None;
    };
    let m = op.m;
    if os.q.len() != 1 || m > horner::MAX {
        return None;
    }
    let n = m * m;
    let zero = C64::new(0.0, 0.0);
    let (mut z, mut g) = (
        [zero; horner::MAX * horner::MAX],
        [zero; horner::MAX * horner::MAX],
    );
    op.symbol_into(theta, &mut z[..n]);
    for e in &mut z[..n] {
        *e *= step;
    }
    horner::explicit_into(&os.p, os.q[0], &z[..n], m, &mut g[..n]);
    Some(DMatrix::from_row_slice(m, m, &g[..n]))
}
