//! Which terms of L(θ) have no real part by construction.
//!
//! A flux term whose factors are a central difference (an exactly imaginary
//! symbol: the weights at ±o are opposite and are summed in pairs) times
//! two-point averages (real), with a real matrix, is *neutral*; so is a real
//! skew-symmetric source or constant part (Coriolis). Added dissipation
//! (−σ (s/h) sin^p(θ/2) I) and diffusion with a matrix that is a real multiple of
//! the identity and a central second difference are *scalar real*: they shift
//! every eigenvalue by the same real amount. Anything else (biased stencils,
//! matrix diffusion, damping sources, complex coefficients) is *other*.
//!
//! When no term is *other*, the eigenvalues of L are those of the neutral part —
//! whose real parts are roundoff and may be put on the imaginary axis — plus the
//! scalar real part computed exactly, however small
//! ([`super::spectrum`]). This is the "imaginary-axis rule", applied only where
//! it is true by construction.

use super::{Factor, Operator, Term, TermKind};
use num_complex::Complex64 as C64;

/// The class of a term.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TermClass {
    /// Purely imaginary spectrum by construction (central flux, skew source).
    Neutral,
    /// c·I times a real factor: shifts every eigenvalue by a real amount.
    ScalarReal(f64),
    /// Anything else.
    Other,
}

fn is_real(m: &[C64]) -> bool {
    m.iter().all(|z| z.im == 0.0)
}

fn is_skew(m: &[C64], n: usize) -> bool {
    is_real(m) && (0..n).all(|i| (0..n).all(|j| m[i * n + j].re == -m[j * n + i].re))
}

/// c when the row-major n×n `m` is c·I with c real.
fn scalar(m: &[C64], n: usize) -> Option<f64> {
    let c = m[0];
    let diag_ok = (0..n).all(|i| m[i * n + i] == c);
    let off_ok = (0..n).all(|i| (0..n).all(|j| i == j || m[i * n + j] == C64::new(0.0, 0.0)));
    (c.im == 0.0 && diag_ok && off_ok).then_some(c.re)
}

/// Whether every factor is real except exactly one central first difference.
fn imaginary_factors(t: &Term) -> bool {
    let mut centrals = 0;
    for (_, f) in &t.factors {
        match f {
            Factor::Average => {}
            // (a compact stencil's left-hand side is symmetric, so real by pairing)
            Factor::Stencil { stencil, .. } if stencil.derivative == 1 && stencil.is_central() => {
                centrals += 1
            }
            _ => return false,
        }
    }
    centrals == 1
}

/// Whether every factor is real by construction.
fn real_factors(t: &Term) -> bool {
    t.factors.iter().all(|(_, f)| match f {
        Factor::Average | Factor::Dissipation { .. } => true,
        Factor::Stencil { stencil, .. } => stencil.derivative == 2 && stencil.is_central(),
    })
}

/// The class of one term of an m-variable operator.
pub fn classify(t: &Term, m: usize) -> TermClass {
    match t.kind {
        TermKind::Flux if is_real(&t.matrix) && imaginary_factors(t) => TermClass::Neutral,
        TermKind::Source if is_skew(&t.matrix, m) && real_factors(t) => TermClass::Neutral,
        TermKind::Dissipation | TermKind::Diffusion if real_factors(t) => {
            scalar(&t.matrix, m).map_or(TermClass::Other, TermClass::ScalarReal)
        }
        _ => TermClass::Other,
    }
}

impl Operator {
    /// The class of each term, in the order of `terms` (computed once per
    /// operator).
    pub fn term_classes(&self) -> &[TermClass] {
        self.term_classes
            .get_or_init(|| self.terms.iter().map(|t| classify(t, self.m)).collect())
    }

    /// Whether L splits into a neutral part and a scalar real part (no term of
    /// class *other*, and a zero or real skew constant part).
    pub fn splits(&self) -> bool {
        self.constant_splits() && self.term_classes().iter().all(|c| *c != TermClass::Other)
    }

    /// Whether L(θ) is neutral by construction at every θ (the constant part
    /// and every term [`TermClass::Neutral`]): every eigenvalue is imaginary,
    /// and no search for a positive real part can find one.
    pub fn neutral_everywhere(&self) -> bool {
        self.constant_splits() && self.term_classes().iter().all(|c| *c == TermClass::Neutral)
    }

    /// Whether the constant part is zero or real skew-symmetric (neutral).
    pub fn constant_splits(&self) -> bool {
        self.constant.iter().all(|z| *z == C64::new(0.0, 0.0)) || is_skew(&self.constant, self.m)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::problem::Problem;

    /// The classes are those of [`classify`], term by term, computed once and
    /// shared by every later call (and by every evaluator built on the
    /// operator): advection with central2 is neutral, its diffusion with a
    /// scalar coefficient scalar-real.
    #[test]
    fn term_classes_are_computed_once_per_operator() {
        let p = Problem::builder()
            .spacing(&[0.4])
            .system(crate::physics::advection(&[1.7], &[0.23]))
            .method("euler")
            .dt(1e-3)
            .build()
            .unwrap();
        let op = p.operator();
        let first = op.term_classes();
        let fresh: Vec<TermClass> = op.terms.iter().map(|t| classify(t, op.m)).collect();
        assert_eq!(first, fresh.as_slice());
        assert_eq!(first[0], TermClass::Neutral);
        assert!(matches!(first[1], TermClass::ScalarReal(_)), "{first:?}");
        assert!(std::ptr::eq(first, op.term_classes()));
    }
}
