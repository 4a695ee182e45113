//! Level curves of a sampled field by marching squares.
//!
//! Each grid cell whose four corners straddle the level contributes one or two
//! straight segments between linearly interpolated edge crossings (W. E.
//! Lorensen and H. E. Cline's cube table reduced to squares); the two saddle
//! configurations are resolved by the mean of the four corners. Cells with a
//! non-finite corner contribute nothing, so gaps in the data stay gaps.

/// A straight piece of a level curve, in the field's coordinates.
pub type Segment = [(f64, f64); 2];

/// The segments of the level curve `v = level` of `values` (row-major,
/// `values[i * ys.len() + j]` at `(xs[i], ys[j])`).
pub fn level_segments(xs: &[f64], ys: &[f64], values: &[f64], level: f64) -> Vec<Segment> {
    let (nx, ny) = (xs.len(), ys.len());
    assert_eq!(values.len(), nx * ny, "one value per grid node");
    let at = |i: usize, j: usize| values[i * ny + j];
    let mut out = Vec::new();
    for i in 0..nx.saturating_sub(1) {
        for j in 0..ny.saturating_sub(1) {
            // corners counter-clockwise from the lower left
            let corner = [
                (xs[i], ys[j], at(i, j)),
                (xs[i + 1], ys[j], at(i + 1, j)),
                (xs[i + 1], ys[j + 1], at(i + 1, j + 1)),
                (xs[i], ys[j + 1], at(i, j + 1)),
            ];
            if corner.iter().any(|c| !c.2.is_finite()) {
                continue;
            }
            let above = corner.map(|c| c.2 > level);
            // edge e runs from corner e to corner e + 1
            let cross = |e: usize| -> Option<(f64, f64)> {
                let (p, q) = (corner[e], corner[(e + 1) % 4]);
                if above[e] == above[(e + 1) % 4] {
                    return None;
                }
                let t = (level - p.2) / (q.2 - p.2);
                Some((p.0 + t * (q.0 - p.0), p.1 + t * (q.1 - p.1)))
            };
            let hits: Vec<(usize, (f64, f64))> =
                (0..4).filter_map(|e| cross(e).map(|pt| (e, pt))).collect();
            match hits.len() {
                2 => out.push([hits[0].1, hits[1].1]),
                4 => {
                    let mean = corner.iter().map(|c| c.2).sum::<f64>() / 4.0;
                    let pt = |e: usize| hits[e].1;
                    if (mean > level) == above[0] {
                        // corners 1 and 3 are cut off
                        out.push([pt(0), pt(1)]);
                        out.push([pt(2), pt(3)]);
                    } else {
                        // corners 0 and 2 are cut off
                        out.push([pt(3), pt(0)]);
                        out.push([pt(1), pt(2)]);
                    }
                }
                _ => {}
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn axis(n: usize) -> Vec<f64> {
        (0..n)
            .map(|i| -2.0 + 4.0 * i as f64 / (n - 1) as f64)
            .collect()
    }

    #[test]
    fn circle_level_curve_lies_on_the_circle() {
        let xs = axis(41);
        let values: Vec<f64> = xs
            .iter()
            .flat_map(|x| xs.iter().map(move |y| (x * x + y * y).sqrt()))
            .collect();
        let segs = level_segments(&xs, &xs, &values, 1.0);
        assert!(segs.len() > 40);
        let h = 0.1;
        for s in &segs {
            for (x, y) in s {
                let r = (x * x + y * y).sqrt();
                // linear interpolation of r across a cell of width h errs by O(h²)
                assert!((r - 1.0).abs() < h * h, "point at radius {r}");
            }
        }
    }

    #[test]
    fn saddle_cells_give_two_segments_and_gaps_stay_gaps() {
        let xs = [0.0, 1.0];
        // diagonal corners above the level: a saddle
        let saddle = level_segments(&xs, &xs, &[2.0, 0.0, 0.0, 2.0], 1.0);
        assert_eq!(saddle.len(), 2);
        let gap = level_segments(&xs, &xs, &[2.0, f64::NAN, 0.0, 2.0], 1.0);
        assert!(gap.is_empty());
        let flat = level_segments(&xs, &xs, &[0.0; 4], 1.0);
        assert!(flat.is_empty());
    }
}
