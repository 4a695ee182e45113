//! Local minimisation in continuous wavevector space: a compass (pattern) search
//! for d ≤ 3 and golden-section search on an interval. Both are derivative-free,
//! which suits the minimum over modes of first-exit times (smooth per mode, with
//! kinks where modes cross).

/// Compass search for a local minimum of `f` from `x0`, initial step `step`,
/// stopping when the step falls below `min_step` or after `max_evals` evaluations.
/// Returns the best point and value.
pub fn compass_minimise(
    f: &dyn Fn(&[f64]) -> f64,
    x0: &[f64],
    step: f64,
    min_step: f64,
    max_evals: usize,
) -> (Vec<f64>, f64) {
    let d = x0.len();
    let mut x = x0.to_vec();
    let mut fx = f(&x);
    let mut h = step;
    let mut evals = 1;
    let mut trial = x.clone();
    while h > min_step && evals < max_evals {
        let mut improved = false;
        'dirs: for k in 0..d {
            for sign in [1.0, -1.0] {
                trial.copy_from_slice(&x);
                trial[k] += sign * h;
                let ft = f(&trial);
                evals += 1;
                if ft < fx {
                    // keep going in the same direction while it helps
                    x.copy_from_slice(&trial);
                    fx = ft;
                    loop {
                        trial[k] += sign * h;
                        let ft2 = f(&trial);
                        evals += 1;
                        if ft2 < fx && evals < max_evals {
                            x.copy_from_slice(&trial);
                            fx = ft2;
                        } else {
                            break;
                        }
                    }
                    improved = true;
                    break 'dirs;
                }
            }
        }
        if !improved {
            h *= 0.5;
        }
    }
    (x, fx)
}

/// Golden-section search for a minimum of `f` on [a, b]; returns (x, f(x)).
pub fn golden_minimise(f: &dyn Fn(f64) -> f64, a: f64, b: f64) -> (f64, f64) {
    let (t, v) = crate::stencil::golden_max(&|x| -f(x), a, b);
    (t, -v)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compass_finds_interior_minimum_of_a_quadratic() {
        let f = |x: &[f64]| (x[0] - 0.3).powi(2) + 2.0 * (x[1] + 1.2).powi(2) + 5.0;
        let (x, v) = compass_minimise(&f, &[0.0, 0.0], 0.1, 1e-12, 10_000);
        assert!((x[0] - 0.3).abs() < 1e-9 && (x[1] + 1.2).abs() < 1e-9);
        assert!((v - 5.0).abs() < 1e-15);
    }
}
