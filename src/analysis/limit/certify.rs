//! The certificate of a limit: what was checked, and the bracket it gives.
//!
//! Every first loss evaluated on the way is an upper bound of the limit (it is
//! unstable just above its value at that wavevector): the smallest is the
//! witness. The candidates that bound it from below are the limits approached
//! but not attained — long waves, corners and faces — each with its
//! uncertainty. The bracket is [dt_lo, dt_hi] with dt_hi the smallest upper
//! bound and dt_lo the smallest lower estimate; dt_max = dt_lo, so the reported
//! step errs only on the safe side of what was examined.

use super::longwave::LongWave;
use super::{wrap, Limit, LimitKind};

/// Evidence gathered about one limit.
#[derive(Debug, Clone, Default)]
pub struct Evidence {
    /// The smallest first loss evaluated, and where.
    pub witness: Option<(f64, Vec<f64>)>,
    /// Limits approached at points no evaluation reaches.
    pub approached: Vec<LongWave>,
}

impl Evidence {
    /// Records a first loss at θ. A value lower than the witness's only by
    /// rounding (1e-12 relative) lowers the value but keeps the witness where
    /// it is: where the first loss is flat (at θ_d = π for central
    /// differences) a refinement's rounding must not move an exact witness.
    pub fn offer(&mut self, dt: f64, theta: &[f64]) {
        if dt.is_nan() {
            return;
        }
        match &mut self.witness {
            Some(w) if dt < w.0 && dt >= w.0 * (1.0 - 1e-12) => w.0 = dt,
            Some(w) if dt >= w.0 => {}
            _ => self.witness = Some((dt, theta.to_vec())),
        }
    }

    /// Records a limit approached along a direction.
    pub fn approach(&mut self, lw: LongWave) {
        self.offer(lw.sample.0, &lw.sample.1.clone());
        self.approached.push(lw);
    }

    /// The limit and its bracket.
    pub fn conclude(&self, dims: usize) -> (Limit, Option<(f64, f64)>) {
        let (mut hi, mut theta) = self
            .witness
            .clone()
            .unwrap_or((f64::INFINITY, vec![0.0; dims]));
        let mut lo = hi;
        for lw in &self.approached {
            let (below, above) = (
                (lw.limit - lw.uncertainty).max(0.0),
                lw.limit + lw.uncertainty,
            );
            if below < lo {
                lo = below;
                theta = lw.sample.1.clone();
            }
            hi = hi.min(above);
        }
        let hi = hi.max(lo);
        let long_wave_floor = self
            .approached
            .iter()
            .map(|lw| (lw.limit - lw.uncertainty).max(0.0))
            .fold(f64::INFINITY, f64::min);
        let kind = if lo == 0.0 {
            LimitKind::None
        } else if lo.is_infinite() {
            LimitKind::Unconditional
        } else {
            LimitKind::Bounded
        };
        let limit = Limit {
            kind,
            dt_max: lo,
            wavevector: theta.iter().map(|x| wrap(*x)).collect(),
            long_wave_floor,
        };
        let bracket = (kind == LimitKind::Bounded).then_some((lo, hi));
        (limit, bracket)
    }
}
