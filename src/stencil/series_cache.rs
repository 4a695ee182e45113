//! A stencil's long-wave series ([`super::series::Series`]), prepared on first
//! use and kept with the stencil, so that evaluating the symbol near θ = 0
//! (the long-wave approaches of the limit call it thousands of times) builds
//! no polynomials. The series is kept with a copy of the weights it was made
//! from and is rebuilt whenever they differ (the stencil's fields are public).

use super::series::Series;
use std::sync::OnceLock;

/// The offsets and weights a series was made from, in one vector.
type Source = Vec<f64>;

/// A lazily prepared series (boxed: a stencil stays small); compares equal to
/// any other (it is derived from the stencil's own fields).
#[derive(Clone, Default)]
pub struct SeriesCache(OnceLock<Box<(Source, Option<Series>)>>);

impl std::fmt::Debug for SeriesCache {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("SeriesCache")
    }
}

impl PartialEq for SeriesCache {
    fn eq(&self, _: &Self) -> bool {
        true
    }
}

/// The four slices laid end to end with their lengths, so that equal
/// sources mean equal stencils.
fn source(parts: [&[f64]; 4]) -> Source {
    let mut v: Source = parts.iter().map(|p| p.len() as f64).collect();
    for p in parts {
        v.extend_from_slice(p);
    }
    v
}

fn same(kept: &[f64], parts: [&[f64]; 4]) -> bool {
    kept.len() == 4 + parts.iter().map(|p| p.len()).sum::<usize>()
        && parts.iter().zip(kept).all(|(p, n)| p.len() as f64 == *n)
        && parts
            .iter()
            .flat_map(|p| p.iter())
            .zip(&kept[4..])
            .all(|(a, b)| a.to_bits() == b.to_bits())
}

impl SeriesCache {
    /// Calls `f` with the series of these offsets and weights (explicit, then
    /// implicit side), prepared once.
    pub fn with<R>(&self, parts: [&[f64]; 4], f: impl FnOnce(Option<&Series>) -> R) -> R {
        let prepare = || Series::new(parts[0], parts[1], parts[2], parts[3]);
        let (kept, series) = &**self.0.get_or_init(|| Box::new((source(parts), prepare())));
        if same(kept, parts) {
            f(series.as_ref())
        } else {
            f(prepare().as_ref())
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The kept series answers for the weights it was made from, and weights
    /// changed afterwards get a fresh one.
    #[test]
    fn changed_weights_get_a_fresh_series() {
        let cache = SeriesCache::default();
        let (o, one, lhs) = ([-1.0, 0.0], [-1.0, 1.0], [1.0]);
        let at = |w: &[f64]| cache.with([&o, w, &[0.0], &lhs], |s| s.unwrap().symbol(0.1));
        let first = at(&[-1.0, 1.0]).unwrap().0;
        let doubled = at(&[-2.0, 2.0]).unwrap().0;
        assert_eq!(doubled, first * 2.0);
        assert_eq!(at(&one).unwrap().0, first);
    }
}
