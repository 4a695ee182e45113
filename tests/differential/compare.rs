//! The comparison of the engine with the reference for one scheme: the engine's
//! Δt_max never above the reference by more than 1e-9 relative (the safe side),
//! not below it by more than 1e-6, kinds equal; the same for each checked wave
//! direction against the ray reference, and no direction below the engine's own
//! overall limit. An inconclusive reference is a skip, never a guess, unless the
//! engine agrees with it.

use crate::engine::{engine_limit, EngineKind, EngineLimit};
use crate::evidence::{evidence, excess_at_witness, improved_with};
use crate::generate;
use crate::radius::ROUNDOFF;
use crate::reference::{along_ray, overall};
use crate::render::case_text;
use crate::scheme::Scheme;
use crate::search::{Kind, Reference};

/// Allowed relative excess of the engine over the reference (safe side).
pub const ABOVE: f64 = 1e-9;
/// Allowed relative shortfall of the engine below the reference.
pub const BELOW: f64 = 1e-6;

/// The outcome of one check.
#[derive(Debug, Clone, PartialEq)]
pub enum Verdict {
    /// Engine and reference agree.
    Pass,
    /// The reference could not decide (why).
    Skip(String),
    /// They disagree (what).
    Fail(String),
}

/// The outcome of one scheme: overall and per checked direction.
#[derive(Debug, Clone)]
pub struct Outcome {
    /// The seed.
    pub seed: u64,
    /// Overall verdict.
    pub overall: Verdict,
    /// Verdict per checked direction.
    pub directions: Vec<Verdict>,
    /// The case text (for failure reports).
    pub case: String,
    /// Seconds spent in the engine, the overall reference and the ray references.
    pub seconds: [f64; 3],
}

impl Outcome {
    /// Every failure of this scheme, as one report with seed and case text.
    pub fn failures(&self) -> Option<String> {
        let mut lines: Vec<String> = Vec::new();
        if let Verdict::Fail(m) = &self.overall {
            lines.push(format!("overall: {m}"));
        }
        for (k, v) in self.directions.iter().enumerate() {
            if let Verdict::Fail(m) = v {
                lines.push(format!("direction #{k}: {m}"));
            }
        }
        (!lines.is_empty()).then(|| {
            format!(
                "seed {}:\n  {}\n--- case ---\n{}",
                self.seed,
                lines.join("\n  "),
                self.case
            )
        })
    }
}

fn kind_name(k: Kind) -> &'static str {
    match k {
        Kind::Bounded => "bounded",
        Kind::Unconditional => "unconditional",
        Kind::None => "none",
    }
}

/// The engine's value against a reference, by the rules above.
pub fn judge(what: &str, engine_kind: Kind, engine_dt: f64, r: &Reference) -> Verdict {
    let numbers = format!(
        "{what}: engine {} dt {engine_dt:.15e}, reference {} dt {:.15e} at θ {:?} ({})",
        kind_name(engine_kind),
        kind_name(r.kind),
        r.dt,
        r.witness,
        r.note
    );
    let rel = (engine_dt - r.dt) / r.dt;
    let u = if r.conclusive {
        r.uncertainty
    } else {
        10.0 * r.uncertainty
    };
    let decidable_bounded =
        r.kind == Kind::Bounded && engine_kind == Kind::Bounded && u.is_finite();
    if decidable_bounded && rel > ABOVE + u {
        return Verdict::Fail(format!("too large by {rel:.3e} relative; {numbers}"));
    }
    // the reference's allowance lifts its crossing: below it by that much
    // more is still within BELOW of where ρ − 1 crosses 0
    if decidable_bounded && rel < -(BELOW + u + r.allowance_bias) {
        return Verdict::Fail(format!("too small by {:.3e} relative; {numbers}", -rel));
    }
    // An inconclusive reference that the engine agrees with (both find no
    // stable Δt, or both bounded within the widened tolerance above) is a pass:
    // two independent computations give the same answer.
    let agrees = engine_kind == r.kind && (engine_kind != Kind::Bounded || decidable_bounded);
    if !r.conclusive && !agrees {
        return Verdict::Skip(format!("reference inconclusive: {numbers}"));
    }
    if engine_kind != r.kind {
        return Verdict::Fail(format!("kinds differ; {numbers}"));
    }
    Verdict::Pass
}

fn engine_kind(k: EngineKind) -> Kind {
    match k {
        EngineKind::Bounded => Kind::Bounded,
        EngineKind::Unconditional => Kind::Unconditional,
        EngineKind::None => Kind::None,
    }
}

/// A "too large" failure gets the reference's ρ − 1 at its witness at the
/// engine's Δt. Against an inconclusive reference (a tangential crossing) it
/// stands only if that excess is clear of roundoff (above 1e3 × the allowance):
/// a witness whose ρ − 1 is roundoff at every Δt (a nearly defective zero
/// eigenvalue at a corner of the box) proves nothing. Against any reference it
/// stands only if that excess is positive: a witness stable at the engine's Δt
/// by the reference's own ρ(G) says that the reference's bisection ended below
/// its crossing (IMEX CNAB2 at θ = π, seeds 2371, 9026, 9033: 6e-8 relative,
/// ρ − 1 = −6e-14 at the engine's Δt), not that the engine is too large.
fn with_evidence(v: Verdict, scheme: &Scheme, r: &Reference, dt: f64) -> Verdict {
    match v {
        Verdict::Fail(m) if m.contains("too large") => {
            let excess = excess_at_witness(scheme, r, dt);
            if excess <= 0.0 {
                return Verdict::Skip(format!(
                    "the reference's witness is stable at the engine's dt (rho - 1 = {excess:.3e}): {m}"
                ));
            }
            if !r.conclusive && excess <= 1e3 * ROUNDOFF {
                return Verdict::Skip(format!(
                    "reference inconclusive and its witness within roundoff: {m}"
                ));
            }
            Verdict::Fail(format!("{m}{}", evidence(scheme, r, dt)))
        }
        other => other,
    }
}

/// A directional value read as a kind: ∞ unconditional, 0 or NaN none.
fn direction_kind(dt: f64) -> Kind {
    if dt.is_infinite() {
        Kind::Unconditional
    } else if dt.is_nan() || dt <= 0.0 {
        Kind::None
    } else {
        Kind::Bounded
    }
}

/// Checks the engine's overall and a spread subset of `directions` of its
/// per-direction limits (all when `directions` ≥ their number).
pub fn check_seed(seed: u64, directions: usize) -> Outcome {
    let scheme = generate::scheme(seed);
    let case = case_text(&scheme);
    let clock = std::time::Instant::now();
    let engine: EngineLimit = match engine_limit(&case) {
        Ok(e) => e,
        Err(e) => {
            return Outcome {
                seed,
                overall: Verdict::Fail(e.to_string()),
                directions: Vec::new(),
                case,
                seconds: [clock.elapsed().as_secs_f64(), 0.0, 0.0],
            }
        }
    };
    let engine_seconds = clock.elapsed().as_secs_f64();
    let r = improved_with(
        &scheme,
        &overall(&scheme),
        &engine.wavevector,
        engine.dt_max,
    );
    let overall_seconds = clock.elapsed().as_secs_f64() - engine_seconds;
    let mut overall_verdict = with_evidence(
        judge("overall", engine_kind(engine.kind), engine.dt_max, &r),
        &scheme,
        &r,
        engine.dt_max,
    );
    if let (Some((lo, hi)), Verdict::Pass) = (engine.certified, &overall_verdict) {
        // the engine's dt_hi is unstable beyond its rounding; a reference stable a
        // little above it (within the accuracy asked of the limit) resolves the
        // crossing less finely, which is not a contradiction
        let above_hi = hi * (1.0 + BELOW + r.allowance_bias);
        if r.kind == Kind::Bounded && (r.dt < lo * (1.0 - ABOVE) || r.dt > above_hi) {
            overall_verdict = Verdict::Fail(format!(
                "reference {:.15e} outside the certified bracket [{lo:.15e}, {hi:.15e}]",
                r.dt
            ));
        }
    }
    let count = engine.directions.len();
    let picked: Vec<usize> = if directions >= count {
        (0..count).collect()
    } else {
        (0..directions).map(|k| k * count / directions).collect()
    };
    let mut verdicts = Vec::new();
    for i in picked {
        let n = &engine.directions[i];
        let d = engine.dt_by_direction[i];
        let what = format!("direction {n:?}");
        if direction_kind(d) == Kind::Bounded
            && engine.kind == EngineKind::Bounded
            && d < engine.dt_max * (1.0 - ABOVE)
        {
            verdicts.push(Verdict::Fail(format!(
                "{what}: engine {d:.15e} below its own overall limit {:.15e}",
                engine.dt_max
            )));
            continue;
        }
        let theta = engine
            .wavevector_by_direction
            .get(i)
            .cloned()
            .unwrap_or_default();
        let ray = improved_with(&scheme, &along_ray(&scheme, n, &r), &theta, d);
        verdicts.push(with_evidence(
            judge(&what, direction_kind(d), d, &ray),
            &scheme,
            &ray,
            d,
        ));
    }
    Outcome {
        seed,
        overall: overall_verdict,
        directions: verdicts,
        case,
        seconds: [
            engine_seconds,
            overall_seconds,
            clock.elapsed().as_secs_f64() - engine_seconds - overall_seconds,
        ],
    }
}
