//! Time filters for leapfrog: Robert–Asselin (Asselin 1972) and
//! Robert–Asselin–Williams (Williams 2009), as the equivalent two-step linear
//! multistep method of the filtered scheme.
//!
//! One filtered leapfrog step, with the displacement d of strength γ and the
//! RAW weight a (a = 1 is Robert–Asselin):
//!
//! ```text
//! u^{n+1} = ū^{n−1} + 2Δt L ũ^n
//! d       = γ (ū^{n−1} − 2ũ^n + u^{n+1})
//! ū^n     = ũ^n + a d              (the filtered level kept for the next step)
//! ũ^{n+1} = u^{n+1} − (1 − a) d    (the level the next step differentiates)
//! ```
//!
//! (Williams writes the displacement as (ν/2)(…), so his ν is 2γ here; the
//! usual RAW weight is a = 0.53. From memory of the paper.) The three-level
//! amplification matrix on (ũ^n, ū^{n−1}) is, with Z = ΔtL,
//!
//! ```text
//! [ 2Z − 2(1−a)γ(Z − I)   (1 − 2(1−a)γ) I ]
//! [ I + 2aγ(Z − I)         2aγ I          ]
//! ```
//!
//! whose entries are affine in Z, so each eigenvalue μ of L gives the 2×2
//! characteristic polynomial ζ² − [2γ + 2(1 − (1−a)γ) z] ζ + [2aγ z − (1 − 2γ)]
//! (z = Δtμ): that of the linear multistep method α = (−(1 − 2γ), −2γ, 1),
//! β = (−2aγ, 2(1 − (1−a)γ), 0), which the sequence ũ^n satisfies exactly. The
//! filtered scheme is therefore analysed as that multistep method: the same
//! eigenvalues, limits and dispersion; its growth is that of the stacked
//! levels (ũ^n, ũ^{n−1}). At z = 0 the roots are 1 and −(1 − 2γ): the
//! computational mode is damped by the factor 1 − 2γ per step.

use super::Multistep;

/// A leapfrog time filter.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TimeFilter {
    /// Robert–Asselin, strength γ.
    RobertAsselin {
        /// γ in (0, ½).
        strength: f64,
    },
    /// Robert–Asselin–Williams, strength γ and weight a.
    Raw {
        /// γ in (0, ½).
        strength: f64,
        /// a in (0, 1] (1 is Robert–Asselin; Williams recommends 0.53).
        alpha: f64,
    },
}

/// Why a time filter was refused: the key and the reason.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TimeFilterError {
    /// γ outside (0, ½).
    #[error("must lie in (0, 0.5) (the computational mode is damped by 1 - 2*strength per step), got {0}")]
    Strength(f64),
    /// a outside (0, 1].
    #[error("must lie in (0, 1] (1 is Robert-Asselin, 0.53 the usual RAW weight), got {0}")]
    Alpha(f64),
}

impl TimeFilter {
    /// Robert–Asselin of strength γ, checked.
    pub fn robert_asselin(strength: f64) -> Result<Self, TimeFilterError> {
        check_strength(strength)?;
        Ok(Self::RobertAsselin { strength })
    }

    /// Robert–Asselin–Williams of strength γ and weight a, checked.
    pub fn raw(strength: f64, alpha: f64) -> Result<Self, TimeFilterError> {
        check_strength(strength)?;
        if !(alpha > 0.0 && alpha <= 1.0) {
            return Err(TimeFilterError::Alpha(alpha));
        }
        Ok(Self::Raw { strength, alpha })
    }

    /// (γ, a).
    pub fn parameters(&self) -> (f64, f64) {
        match *self {
            TimeFilter::RobertAsselin { strength } => (strength, 1.0),
            TimeFilter::Raw { strength, alpha } => (strength, alpha),
        }
    }

    /// Short name for method labels ("ra" or "raw").
    pub fn tag(&self) -> &'static str {
        match self {
            TimeFilter::RobertAsselin { .. } => "ra",
            TimeFilter::Raw { .. } => "raw",
        }
    }

    /// The tag with its parameters, e.g. "ra(0.1)" or "raw(0.1,0.53)".
    pub fn tag_with_parameters(&self) -> String {
        match *self {
            TimeFilter::RobertAsselin { strength } => format!("ra({strength})"),
            TimeFilter::Raw { strength, alpha } => format!("raw({strength},{alpha})"),
        }
    }

    /// The multistep method equivalent to leapfrog with this filter.
    pub fn filtered_leapfrog(&self) -> Multistep {
        let (g, a) = self.parameters();
        Multistep {
            alpha: vec![-(1.0 - 2.0 * g), -2.0 * g, 1.0],
            beta: vec![-2.0 * a * g, 2.0 * (1.0 - (1.0 - a) * g), 0.0],
        }
    }
}

fn check_strength(strength: f64) -> Result<(), TimeFilterError> {
    if strength > 0.0 && strength < 0.5 {
        Ok(())
    } else {
        Err(TimeFilterError::Strength(strength))
    }
}
