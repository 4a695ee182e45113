//! Second-order-in-time methods for u_tt = L u: the Newmark family in its
//! two-step displacement form, and the central-difference scheme.
//!
//! Eliminating the velocity and acceleration from Newmark's updates on an
//! undamped linear system (Newmark 1959; Hughes, *The Finite Element Method*,
//! ch. 9 — quoted from memory) leaves a recurrence for u alone:
//!
//!   u^{n+1} − 2u^n + u^{n−1} = Δt² L [β u^{n+1} + (1/2 − 2β + γ) u^n + (1/2 + β − γ) u^{n−1}].
//!
//! It is a linear multistep method in the variable z = Δt² μ (μ an eigenvalue
//! of L) with ρ = [1, −2, 1] and σ = [1/2 + β − γ, 1/2 − 2β + γ, β] in ascending
//! powers of ζ, so it is stored as a [`Multistep`] inside
//! [`Scheme::SecondOrder`]: every region and companion-matrix computation of the
//! multistep methods applies, in z = Δt²μ instead of Δtμ
//! ([`Method::step_variable`]). β = 0, γ = 1/2 is the central-difference scheme
//! u^{n+1} − 2u^n + u^{n−1} = Δt² L u^n.

use super::{Method, MethodError, Multistep, Scheme};

/// The names of the second-order-in-time methods, as in case files.
pub fn names() -> [&'static str; 2] {
    ["central-difference", "newmark"]
}

/// Default β and γ of `newmark`: the average-acceleration (trapezoidal) member.
pub const DEFAULT_BETA: f64 = 0.25;
/// See [`DEFAULT_BETA`].
pub const DEFAULT_GAMMA: f64 = 0.5;

fn build(name: &str, beta: f64, gamma: f64) -> Method {
    Method {
        name: name.into(),
        // second order exactly when γ = 1/2; any other γ adds first-order
        // numerical damping (Hughes, ch. 9, from memory)
        order: if gamma == 0.5 { 2 } else { 1 },
        explicit: beta == 0.0,
        scheme: Scheme::SecondOrder(Multistep {
            alpha: vec![1.0, -2.0, 1.0],
            beta: vec![0.5 + beta - gamma, 0.5 - 2.0 * beta + gamma, beta],
        }),
    }
}

/// The central-difference scheme u^{n+1} − 2u^n + u^{n−1} = Δt² L u^n.
pub fn central_difference() -> Method {
    build("central-difference", 0.0, 0.5)
}

/// The Newmark method with parameters β ≥ 0 and γ ≥ 1/2 (γ < 1/2 gives negative
/// numerical damping: every mode grows, whatever Δt).
pub fn newmark(beta: f64, gamma: f64) -> Result<Method, MethodError> {
    if !beta.is_finite() || beta < 0.0 {
        return Err(MethodError::NewmarkBeta(beta));
    }
    if !gamma.is_finite() || gamma < 0.5 {
        return Err(MethodError::NewmarkGamma(gamma));
    }
    Ok(build("newmark", beta, gamma))
}

/// A second-order method by name, with the Newmark parameters where used.
pub fn by_name(name: &str, beta: f64, gamma: f64) -> Option<Result<Method, MethodError>> {
    match name {
        "central-difference" => Some(Ok(central_difference())),
        "newmark" => Some(newmark(beta, gamma)),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn central_difference_is_newmark_with_zero_beta_and_half_gamma() {
        let cd = central_difference();
        let nm = newmark(0.0, 0.5).unwrap();
        assert_eq!(cd.scheme, nm.scheme);
        assert!(cd.explicit && cd.order == 2);
        let Scheme::SecondOrder(ms) = &cd.scheme else {
            panic!("not a second-order scheme")
        };
        assert_eq!(ms.beta, vec![0.0, 1.0, 0.0]);
    }

    #[test]
    fn sigma_sums_to_one_for_every_member() {
        // consistency: σ(1) = 1 so that (ρ − zσ) ≈ (ζ − 1)² − z near ζ = 1
        for (b, g) in [(0.25, 0.5), (0.0, 0.5), (0.3, 0.6), (1.0 / 12.0, 0.5)] {
            let Scheme::SecondOrder(ms) = newmark(b, g).unwrap().scheme else {
                panic!()
            };
            assert!((ms.beta.iter().sum::<f64>() - 1.0).abs() < 1e-15);
        }
    }

    #[test]
    fn parameters_outside_the_family_are_refused() {
        assert_eq!(newmark(-0.1, 0.5), Err(MethodError::NewmarkBeta(-0.1)));
        assert_eq!(newmark(0.25, 0.4), Err(MethodError::NewmarkGamma(0.4)));
        assert!(newmark(f64::NAN, 0.5).is_err());
    }
}
