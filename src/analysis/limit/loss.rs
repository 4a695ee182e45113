//! The first loss of stability at one wavevector: the largest Δt such that every
//! Δt' in (0, Δt] is stable at θ. Every limit is the infimum of this function
//! over a set of wavevectors, so each analysis of a limit — grid, refinement,
//! long waves, rays — works on a [`FirstLoss`].
//!
//! For one-step and linear multistep methods it is the exact first-exit time
//! min over modes of r*(arg μ)/|μ| ([`Exact`]); for composite schemes a root of
//! ρ(G(θ, Δt)) − 1 ([`super::search`]).

use super::closed_form::ClosedForm;
use super::first_exit::{min_over_modes, ExitTimes};
use crate::operator::{Operator, Spectrum};
use num_complex::Complex64 as C64;
use std::cell::RefCell;

/// The first loss at one wavevector.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Loss {
    /// The Δt (∞: stable for every Δt; 0: unstable for every Δt > 0; NaN: the
    /// kernel failed).
    pub dt: f64,
    /// Whether the value can be trusted to its rounding level (false where the
    /// sign of a real part is lost in roundoff, or where ρ − 1 crosses zero so
    /// slowly that rounding blurs where).
    pub trusted: bool,
    /// Whether Δt just above the value is verified unstable beyond rounding, so
    /// that the value bounds the true first loss from above even when it is not
    /// accurate (a composite scheme's crossing of ρ − 1 with its rounding level).
    pub bound: bool,
    /// Not trusted, but ρ − 1 rises clear of its rounding within 1e-4 of the
    /// value: then the value's relative bias (how far above the crossing
    /// rounding may put it), a sample a long-wave approach with no trusted
    /// one may use; 0 otherwise.
    pub rough: f64,
}

impl Loss {
    /// A first loss known to its rounding level.
    pub fn exact(dt: f64) -> Self {
        Loss {
            dt,
            trusted: true,
            bound: true,
            rough: 0.0,
        }
    }

    /// The value where it is trusted or a verified upper bound, +∞ otherwise
    /// (for the minimisations over θ: a value that is neither never wins, and
    /// an upper bound can only lower the limit, the safe direction).
    pub fn bound_or_inf(self) -> f64 {
        if (self.trusted || self.bound) && !self.dt.is_nan() {
            self.dt
        } else {
            f64::INFINITY
        }
    }
}

/// The first loss as a function of θ.
pub trait FirstLoss {
    /// The first loss at θ.
    fn at(&self, theta: &[f64]) -> Loss;

    /// Its limit along `origin + s n` as s → 0 in closed form, where one is
    /// known ([`super::closed_form`]), with its relative uncertainty.
    fn long_wave(&self, _origin: &[f64], _n: &[f64]) -> Option<ClosedForm> {
        None
    }
}

/// Exact first-exit times of one-step and multistep methods.
pub struct Exact<'a> {
    exits: &'a ExitTimes<'a>,
    op: &'a Operator,
    tolerance: f64,
    /// The method's (k, c) near z = 0, computed on first use.
    axis: std::cell::OnceCell<Option<(usize, f64)>>,
    /// The spectrum evaluator, the eigenvalues at θ, the exits computed at θ
    /// so far (eigenvalue, time) and the eigenvalues in the order they are
    /// taken (screening value, eigenvalue).
    work: RefCell<Work<'a>>,
}

type Work<'a> = (Spectrum<'a>, Vec<C64>, Vec<(C64, f64)>, Vec<(f64, C64)>);

/// Eigenvalues this close (relative to their modulus) share one exit
/// computation: a repeated eigenvalue (the entropy and vorticity waves of the
/// Euler equations) comes out of the eigensolver with differences of a few
/// units of rounding, below what the exit time can resolve.
const SAME_EIGENVALUE: f64 = 4.0 * f64::EPSILON;

impl<'a> Exact<'a> {
    /// For an operator, its method's exit radii and the stability tolerance.
    pub fn new(op: &'a Operator, exits: &'a ExitTimes<'a>, tolerance: f64) -> Self {
        Exact {
            exits,
            op,
            tolerance,
            axis: std::cell::OnceCell::new(),
            work: RefCell::new((
                Spectrum::new(op, tolerance),
                vec![C64::new(0.0, 0.0); op.m],
                Vec::with_capacity(op.m),
                Vec::with_capacity(op.m),
            )),
        }
    }

    /// The screening value at θ (a lower envelope from the tabulated radii).
    pub fn estimate(&self, theta: &[f64]) -> f64 {
        let mut w = self.work.borrow_mut();
        let (spectrum, eig, _, _) = &mut *w;
        match spectrum.at(theta, eig) {
            Err(_) => f64::NAN,
            Ok(_) => min_over_modes(eig, |mu| self.exits.estimate(mu)).0,
        }
    }
}

impl FirstLoss for Exact<'_> {
    fn at(&self, theta: &[f64]) -> Loss {
        let mut w = self.work.borrow_mut();
        let (spectrum, eig, done, queue) = &mut *w;
        match spectrum.at(theta, eig) {
            Err(_) => Loss {
                dt: f64::NAN,
                trusted: false,
                bound: false,
                rough: 0.0,
            },
            Ok(trusted) => {
                // the smallest exit, and the smallest of the unresolved ones
                // (−∞ for a NaN): the modes that set the value must have
                // resolved exits; each exit computed once, and once for a
                // repeated eigenvalue. The modes are taken by ascending
                // screening value, so that the first exact exit is likely the
                // smallest and the others can be certified above it.
                let (mut dt, mut unresolved, mut any) = (f64::INFINITY, f64::INFINITY, false);
                done.clear();
                queue.clear();
                queue.extend(eig.iter().map(|&mu| (self.exits.estimate(mu), mu)));
                queue.sort_by(|a, b| a.0.total_cmp(&b.0));
                for &(_, mu) in queue.iter() {
                    let near =
                        |(nu, _): &&(C64, f64)| (mu - nu).norm() <= SAME_EIGENVALUE * mu.norm();
                    let t = match done.iter().find(near) {
                        Some(&(_, t)) => t,
                        // certified not to lower the minimum: skipped
                        None if dt.is_finite() && self.exits.at_least(mu, dt) => continue,
                        None => {
                            let t = self.exits.exact(mu);
                            done.push((mu, t));
                            t
                        }
                    };
                    if t < dt {
                        dt = t;
                    }
                    if !self.exits.resolved(mu) {
                        any = true;
                        unresolved = if t.is_nan() {
                            f64::NEG_INFINITY
                        } else {
                            unresolved.min(t)
                        };
                    }
                }
                let resolved = !any || unresolved > dt;
                Loss {
                    dt,
                    trusted: trusted && resolved,
                    bound: trusted && resolved,
                    rough: 0.0,
                }
            }
        }
    }

    fn long_wave(&self, origin: &[f64], n: &[f64]) -> Option<ClosedForm> {
        use super::closed_form::{imaginary_axis, imaginary_axis_multistep, long_wave_limit_from};
        let axis = self.axis.get_or_init(|| match &self.exits.method().scheme {
            crate::time::Scheme::OneStep(os) => imaginary_axis(os),
            crate::time::Scheme::Multistep(ms) => imaginary_axis_multistep(ms),
            _ => None,
        });
        long_wave_limit_from((*axis)?, self.op, self.tolerance, origin, n)
    }
}
