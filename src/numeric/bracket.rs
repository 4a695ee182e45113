//! Locating where a yes/no property changes along a line, by bisection.
//!
//! [`bisect`] keeps a bracket [lo, hi] with the property true at lo and false at
//! hi and halves it; it returns both ends, so a caller can report a certified
//! bracket (for a stability limit: stable at lo, unstable at hi) rather than one
//! point of unknown side.

/// Halves [lo, hi] — `holds(lo)` true and `holds(hi)` false are assumed — until
/// hi − lo ≤ `rel`·|hi| (or the midpoint no longer differs from an end, or after
/// `max_steps` halvings). Returns the final (lo, hi).
pub fn bisect(
    holds: impl Fn(f64) -> bool,
    mut lo: f64,
    mut hi: f64,
    rel: f64,
    max_steps: usize,
) -> (f64, f64) {
    for _ in 0..max_steps {
        if (hi - lo).abs() <= rel * hi.abs() {
            break;
        }
        let mid = 0.5 * (lo + hi);
        if mid <= lo.min(hi) || mid >= lo.max(hi) {
            break;
        }
        if holds(mid) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    (lo, hi)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bracket_encloses_the_change_and_is_tight() {
        let (lo, hi) = bisect(|x| x * x <= 2.0, 0.0, 2.0, 1e-15, 200);
        assert!(lo * lo <= 2.0 && hi * hi > 2.0);
        assert!(hi - lo <= 4.0 * f64::EPSILON * 2.0);
    }

    #[test]
    fn bracket_works_when_the_property_holds_at_the_upper_end() {
        // Descending: true at lo = 3 (x ≥ 1.5), false at hi = 0.
        let (lo, hi) = bisect(|x| x >= 1.5, 3.0, 0.0, 1e-12, 200);
        assert!(lo >= 1.5 && hi < 1.5 && lo - hi <= 1e-11);
    }
}
