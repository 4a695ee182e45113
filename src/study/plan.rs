//! A sweep as a plan: the Cartesian product of the varied keys (C order, the
//! last key fastest), the overrides of each combination, the deterministic
//! slice a shard runs, and the fingerprint that ties shards to one sweep.

use super::vary::Axis;
use sha2::{Digest, Sha256};
use std::ops::Range;

/// Most combinations one sweep may hold.
pub const MAX_COMBINATIONS: usize = 1_000_000;

/// The varied keys and the recorded figures.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepSpec {
    /// The varied keys, in the order of the arrays' axes.
    pub axes: Vec<Axis>,
    /// The summary.json paths recorded per combination.
    pub figures: Vec<String>,
}

/// Why a sweep plan was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PlanError {
    /// No --vary.
    #[error("a sweep needs at least one --vary KEY=VALUES")]
    NothingVaried,
    /// One key varied twice.
    #[error("--vary: '{0}' is varied twice")]
    Twice(String),
    /// Too many combinations.
    #[error("the sweep has {0} combinations; at most {MAX_COMBINATIONS}")]
    TooMany(u128),
    /// A bad --shard.
    #[error("--shard '{0}': expected I/N with 1 <= I <= N, e.g. --shard 3/8")]
    Shard(String),
    /// No figures.
    #[error("--figures: give at least one summary key, e.g. limit.courant_max")]
    NoFigures,
}

impl SweepSpec {
    /// A checked plan.
    pub fn new(axes: Vec<Axis>, figures: Vec<String>) -> Result<Self, PlanError> {
        if axes.is_empty() {
            return Err(PlanError::NothingVaried);
        }
        if figures.is_empty() {
            return Err(PlanError::NoFigures);
        }
        for (i, a) in axes.iter().enumerate() {
            if axes[..i].iter().any(|b| b.key == a.key) {
                return Err(PlanError::Twice(a.key.clone()));
            }
        }
        let total = axes
            .iter()
            .fold(1u128, |n, a| n.saturating_mul(a.levels.len() as u128));
        if total > MAX_COMBINATIONS as u128 {
            return Err(PlanError::TooMany(total));
        }
        Ok(Self { axes, figures })
    }

    /// Values per varied key.
    pub fn shape(&self) -> Vec<usize> {
        self.axes.iter().map(|a| a.levels.len()).collect()
    }

    /// Number of combinations.
    pub fn len(&self) -> usize {
        self.shape().iter().product()
    }

    /// Whether there is no combination (never, once checked).
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The value index of each key for combination `i` (C order).
    pub fn unravel(&self, mut i: usize) -> Vec<usize> {
        let shape = self.shape();
        let mut idx = vec![0; shape.len()];
        for (d, n) in shape.iter().enumerate().rev() {
            idx[d] = i % n;
            i /= n;
        }
        idx
    }

    /// The `--set` overrides of combination `i`.
    pub fn overrides(&self, i: usize) -> Vec<String> {
        self.axes
            .iter()
            .zip(self.unravel(i))
            .map(|(a, j)| format!("{}={}", a.key, a.levels[j].toml()))
            .collect()
    }

    /// "key=value, key=value" of combination `i`, for messages.
    pub fn describe(&self, i: usize) -> String {
        self.axes
            .iter()
            .zip(self.unravel(i))
            .map(|(a, j)| format!("{}={}", a.key, a.levels[j].label()))
            .collect::<Vec<_>>()
            .join(", ")
    }

    /// SHA-256 (hex) of everything that decides the sweep's numbers: the case
    /// text, the user's own overrides, the varied keys and values, the
    /// figures and the kgain version.
    pub fn fingerprint(&self, case_text: &str, overrides: &[String]) -> String {
        let mut h = Sha256::new();
        let mut field = |s: &str| {
            h.update((s.len() as u64).to_le_bytes());
            h.update(s.as_bytes());
        };
        field("kgain sweep");
        field(env!("CARGO_PKG_VERSION"));
        field(case_text);
        for o in overrides {
            field(o);
        }
        for a in &self.axes {
            field(&a.key);
            for l in &a.levels {
                field(&l.toml());
            }
        }
        for f in &self.figures {
            field(f);
        }
        format!("{:x}", h.finalize())
    }
}

/// A shard: the I-th of N slices.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Shard {
    /// 1-based index.
    pub index: usize,
    /// Number of shards.
    pub count: usize,
}

impl Shard {
    /// Parses `I/N`.
    pub fn parse(text: &str) -> Result<Shard, PlanError> {
        let bad = || PlanError::Shard(text.to_string());
        let (i, n) = text.split_once('/').ok_or_else(bad)?;
        let index: usize = i.trim().parse().map_err(|_| bad())?;
        let count: usize = n.trim().parse().map_err(|_| bad())?;
        if index == 0 || index > count || count > MAX_COMBINATIONS {
            return Err(bad());
        }
        Ok(Shard { index, count })
    }

    /// The combinations of this shard out of `total`: contiguous, sizes
    /// differing by at most one, shard 1 first.
    pub fn range(&self, total: usize) -> Range<usize> {
        let start = |k: usize| (total as u128 * k as u128 / self.count as u128) as usize;
        start(self.index - 1)..start(self.index)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::study::vary::parse;

    #[test]
    fn shards_cover_every_combination_once_in_order() {
        for total in [1, 7, 100] {
            for count in [1, 3, 8] {
                let mut next = 0;
                for index in 1..=count {
                    let r = Shard { index, count }.range(total);
                    assert_eq!(r.start, next);
                    next = r.end;
                }
                assert_eq!(next, total);
            }
        }
        assert!(Shard::parse("0/4").is_err() && Shard::parse("5/4").is_err());
        assert!(Shard::parse("x").is_err());
        assert_eq!(Shard::parse("2/4").unwrap(), Shard { index: 2, count: 4 });
    }

    #[test]
    fn combinations_are_in_c_order_and_fingerprints_see_every_input() {
        let axes = vec![
            parse("model.mach=0,0.5").unwrap(),
            parse("time.method=rk4,ssprk3,heun").unwrap(),
        ];
        let s = SweepSpec::new(axes, vec!["limit.dt_max".into()]).unwrap();
        assert_eq!(s.len(), 6);
        assert_eq!(s.overrides(4), ["model.mach=0.5", "time.method=\"ssprk3\""]);
        let f = s.fingerprint("text", &[]);
        assert_ne!(f, s.fingerprint("text2", &[]));
        assert_ne!(f, s.fingerprint("text", &["a=1".into()]));
        let t = SweepSpec::new(s.axes.clone(), vec!["radius.max".into()]).unwrap();
        assert_ne!(f, t.fingerprint("text", &[]));
    }
}
