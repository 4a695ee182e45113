//! The value axis of the growth curve: linear, or logarithmic when the values
//! span more than a factor [`LOG_RANGE`].
//!
//! A log axis is linear in log₁₀ of the value; its ticks are every k-th decade
//! (about eight ticks), or 1–2–5 within each decade when the axis spans fewer
//! than two decades, labelled as plain numbers or, when the axis reaches
//! beyond 0.001..10⁴, as powers of ten. Values the axis cannot show are
//! clipped to its edges: +∞ to the top, non-positive values on a log axis and
//! −∞ to the bottom; NaN has no place at all.

use super::style;

/// Above this ratio of the largest to the smallest plotted value the y axis
/// is logarithmic.
pub const LOG_RANGE: f64 = 10.0;

/// The y axis: linear in the value, or linear in log₁₀ of the value.
#[derive(Debug, Clone)]
pub enum YAxis {
    /// Values over `lo..hi`, ticks `step` apart.
    Linear {
        /// Bottom of the axis.
        lo: f64,
        /// Top of the axis.
        hi: f64,
        /// Tick values.
        ticks: Vec<f64>,
        /// Tick spacing.
        step: f64,
    },
    /// log₁₀ values over `lo..hi`, ticks at these log₁₀ values.
    Log {
        /// Bottom of the axis (log₁₀).
        lo: f64,
        /// Top of the axis (log₁₀).
        hi: f64,
        /// Tick positions (log₁₀).
        ticks: Vec<f64>,
        /// Whether decades are labelled as powers of ten (the axis reaches
        /// beyond 0.001..10⁴).
        powers: bool,
    },
}

impl YAxis {
    /// The axis for these values (non-finite and, on a log axis, non-positive
    /// ones are clipped, not used for the range).
    pub fn for_values(values: &[f64]) -> YAxis {
        let finite: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
        let positive = finite.iter().copied().filter(|v| *v > 0.0);
        let (plo, phi) = positive.fold((f64::INFINITY, 0.0f64), |(a, b), v| (a.min(v), b.max(v)));
        if phi > 0.0 && phi / plo > LOG_RANGE {
            let (a, b) = (plo.log10(), phi.log10());
            let pad = 0.04 * (b - a);
            let (lo, hi) = (a - pad, b + pad);
            let ticks = log_ticks(lo, hi);
            let powers = ticks.iter().any(|t| !(-3.0..=4.0).contains(t));
            return YAxis::Log {
                lo,
                hi,
                ticks,
                powers,
            };
        }
        YAxis::linear(&finite)
    }

    /// A linear axis over these values (non-finite ones are clipped, not
    /// used for the range), padded by 6 % and at least a tenth of the level
    /// high; 0..2 without any finite value.
    pub fn linear(values: &[f64]) -> YAxis {
        let (lo, hi) = values
            .iter()
            .filter(|v| v.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
                (a.min(*v), b.max(*v))
            });
        let (lo, hi) = if lo > hi { (0.0, 2.0) } else { (lo, hi) };
        // at least a tenth of the level on a (nearly) flat envelope, so that
        // roundoff does not fill the axis with six-decimal ticks
        let span = (hi - lo).max(0.1 * hi.abs().max(1.0));
        let mid = 0.5 * (lo + hi);
        let (lo, hi) = (
            lo.min(mid - 0.5 * span) - 0.06 * span,
            hi.max(mid + 0.5 * span) + 0.06 * span,
        );
        let (ticks, step) = style::nice_ticks(lo, hi, 7);
        YAxis::Linear {
            lo,
            hi,
            ticks,
            step,
        }
    }

    /// The plotted coordinate of a value, clipped to the axis; `None` for NaN.
    pub fn place(&self, v: f64) -> Option<f64> {
        if v.is_nan() {
            return None;
        }
        Some(match self {
            YAxis::Linear { lo, hi, .. } => v.clamp(*lo, *hi),
            YAxis::Log { lo, hi, .. } if v > 0.0 => v.log10().clamp(*lo, *hi),
            YAxis::Log { lo, .. } => *lo,
        })
    }

    /// Whether a value lies inside the axis (needs no clipping).
    pub fn contains(&self, v: f64) -> bool {
        match self {
            YAxis::Linear { lo, hi, .. } => v.is_finite() && (*lo..=*hi).contains(&v),
            YAxis::Log { lo, hi, .. } => {
                v > 0.0 && v.is_finite() && (*lo..=*hi).contains(&v.log10())
            }
        }
    }

    /// Bottom, top and ticks, in plotted coordinates.
    pub fn range(&self) -> (f64, f64, Vec<f64>) {
        match self {
            YAxis::Linear { lo, hi, ticks, .. } | YAxis::Log { lo, hi, ticks, .. } => {
                (*lo, *hi, ticks.clone())
            }
        }
    }

    /// The label of a tick at plotted coordinate `t`.
    pub fn label(&self, t: f64) -> String {
        match self {
            YAxis::Linear { lo, hi, step, .. } => {
                style::tick_label(t, *step, lo.abs().max(hi.abs()))
            }
            YAxis::Log { powers, .. } => log_label(t, *powers),
        }
    }
}

/// Ticks of a log axis over log₁₀ values `lo..hi`: every k-th decade for about
/// eight ticks, with 2 and 5 between decades when the axis spans fewer than
/// two decades.
fn log_ticks(lo: f64, hi: f64) -> Vec<f64> {
    let (first, last) = ((lo - 1e-9).ceil() as i64, (hi + 1e-9).floor() as i64);
    let decades = (last - first + 1).max(0);
    let mut ticks: Vec<f64> = if decades <= 2 {
        (first - 1..=last)
            .flat_map(|k| [1.0f64, 2.0, 5.0].map(|m| k as f64 + m.log10()))
            .filter(|t| (lo..=hi).contains(t))
            .collect()
    } else {
        let every = ((decades as f64) / 8.0).ceil().max(1.0) as i64;
        (first..=last)
            .filter(|k| k.rem_euclid(every) == 0)
            .map(|k| k as f64)
            .collect()
    };
    ticks.dedup();
    ticks
}

/// The label of a log tick: plain digits, or with `powers` every decade but 1
/// as a power of ten.
fn log_label(t: f64, powers: bool) -> String {
    let k = t.round();
    if powers && (t - k).abs() < 1e-6 && k != 0.0 {
        return style::power_of_ten(k as i32);
    }
    style::num(10f64.powf(t), 1)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_ranges_get_a_linear_axis_and_large_ones_a_log_axis() {
        assert!(matches!(
            YAxis::for_values(&[1.0, 1.5, 3.2]),
            YAxis::Linear { .. }
        ));
        assert!(matches!(YAxis::for_values(&[1.0, 40.0]), YAxis::Log { .. }));
        assert!(matches!(YAxis::for_values(&[1.0, 1e-4]), YAxis::Log { .. }));
        // nothing finite: a default linear axis
        assert!(matches!(
            YAxis::for_values(&[f64::NAN, f64::INFINITY]),
            YAxis::Linear { .. }
        ));
    }

    #[test]
    fn non_finite_values_are_clipped_or_dropped() {
        let axis = YAxis::for_values(&[1.0, 2.0]);
        let (_, hi, _) = axis.range();
        assert_eq!(axis.place(f64::INFINITY), Some(hi));
        assert_eq!(axis.place(f64::NAN), None);
        let log = YAxis::for_values(&[1.0, 1e6]);
        let (lo, _, _) = log.range();
        assert_eq!(log.place(0.0), Some(lo));
        assert_eq!(log.place(-1.0), Some(lo));
    }

    #[test]
    fn log_ticks_are_decades_or_one_two_five() {
        let t = log_ticks(-0.1, 1.2);
        let labels: Vec<String> = t.iter().map(|x| log_label(*x, false)).collect();
        assert_eq!(labels, ["1", "2", "5", "10"]);
        let t = log_ticks(-0.2, 30.4);
        assert!(t.len() <= 9 && t.len() >= 4, "{t:?}");
        assert_eq!(log_label(12.0, true), "10¹²");
        assert_eq!(log_label(-5.0, true), "10⁻⁵");
        assert_eq!(log_label(2.0, true), "10²");
        assert_eq!(log_label(0.0, true), "1");
        assert_eq!(log_label(2.0, false), "100");
        assert_eq!(log_label(-2.0, false), "0.01");
    }
}
