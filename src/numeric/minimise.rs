//! Derivative-free local minimisation: golden-section search on an interval, a
//! compass search and a Hooke–Jeeves pattern search in a few dimensions. Both suit the functions kgain
//! minimises — minima over modes of first-exit times, smooth per mode with kinks
//! where modes cross (Nocedal & Wright, Numerical Optimization, §9; Kolda, Lewis
//! & Torczon, SIAM Review 45, 2003, for the compass search).

/// Golden-section search for a maximum of a unimodal `f` on [a, b]: (x, f(x)),
/// stopping when the interval is below 1e-13 or after 100 reductions.
pub fn golden_max(f: &dyn Fn(f64) -> f64, mut a: f64, mut b: f64) -> (f64, f64) {
    let g = 0.5 * (5f64.sqrt() - 1.0);
    let mut c = b - g * (b - a);
    let mut d = a + g * (b - a);
    let (mut fc, mut fd) = (f(c), f(d));
    for _ in 0..100 {
        if (b - a).abs() < 1e-13 {
            break;
        }
        if fc > fd {
            b = d;
            d = c;
            fd = fc;
            c = b - g * (b - a);
            fc = f(c);
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + g * (b - a);
            fd = f(d);
        }
    }
    let t = 0.5 * (a + b);
    (t, f(t))
}

/// Golden-section search for a minimum of `f` on [a, b]; returns (x, f(x)).
pub fn golden_min(f: &dyn Fn(f64) -> f64, a: f64, b: f64) -> (f64, f64) {
    let (t, v) = golden_max(&|x| -f(x), a, b);
    (t, -v)
}

/// Compass search for a local minimum of `f` from `x0`, initial step `step`,
/// stopping when the step falls below `min_step` or after `max_evals`
/// evaluations. A successful step is repeated while it keeps improving.
/// Returns the best point and value.
pub fn compass_min(
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

/// Hooke–Jeeves pattern search for a local minimum of `f` from `x0` (Hooke &
/// Jeeves, J. ACM 8, 1961): an exploratory move polls ±h along each axis in
/// turn, keeping every improvement; after a successful one the pattern move
/// jumps by the same displacement again and explores there, repeatedly while it
/// improves, so that the search runs along a narrow valley oblique to the axes
/// (where a compass search stalls after a few steps); otherwise h halves. Stops
/// when h falls below `min_step` or after `max_evals` evaluations; returns the
/// best point and value (never worse than `x0`).
pub fn pattern_min(
    f: &dyn Fn(&[f64]) -> f64,
    x0: &[f64],
    step: f64,
    min_step: f64,
    max_evals: usize,
) -> (Vec<f64>, f64) {
    let evals = std::cell::Cell::new(0usize);
    let eval = |x: &[f64]| {
        evals.set(evals.get() + 1);
        f(x)
    };
    let explore = |start: &[f64], f_start: f64, h: f64| -> (Vec<f64>, f64) {
        let mut x = start.to_vec();
        let mut fx = f_start;
        for k in 0..x.len() {
            for sign in [1.0, -1.0] {
                x[k] += sign * h;
                let ft = eval(&x);
                if ft < fx {
                    fx = ft;
                    break;
                }
                x[k] -= sign * h;
            }
        }
        (x, fx)
    };
    let mut base = x0.to_vec();
    let mut f_base = eval(&base);
    let mut h = step;
    while h > min_step && evals.get() < max_evals {
        let (mut x, mut fx) = explore(&base, f_base, h);
        if fx >= f_base {
            h *= 0.5;
            continue;
        }
        while evals.get() < max_evals {
            let jump: Vec<f64> = x.iter().zip(&base).map(|(a, b)| 2.0 * a - b).collect();
            base.clone_from(&x);
            f_base = fx;
            let f_jump = eval(&jump);
            let (y, fy) = explore(&jump, f_jump, h);
            if fy < f_base {
                (x, fx) = (y, fy);
            } else {
                break;
            }
        }
    }
    (base, f_base)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compass_finds_interior_minimum_of_a_quadratic() {
        let f = |x: &[f64]| (x[0] - 0.3).powi(2) + 2.0 * (x[1] + 1.2).powi(2) + 5.0;
        let (x, v) = compass_min(&f, &[0.0, 0.0], 0.1, 1e-12, 10_000);
        assert!((x[0] - 0.3).abs() < 1e-9 && (x[1] + 1.2).abs() < 1e-9);
        assert!((v - 5.0).abs() < 1e-15);
    }

    #[test]
    fn pattern_search_follows_a_narrow_oblique_valley() {
        // Rosenbrock's banana valley (minimum 0 at (1, 1)), from the usual start
        let f = |x: &[f64]| 100.0 * (x[1] - x[0] * x[0]).powi(2) + (1.0 - x[0]).powi(2);
        let (x, v) = pattern_min(&f, &[-1.2, 1.0], 0.1, 1e-12, 200_000);
        assert!(v < 1e-12, "{x:?} {v}");
        assert!((x[0] - 1.0).abs() < 1e-6 && (x[1] - 1.0).abs() < 1e-6);
        // a compass search with the same budget stalls well above it
        let (_, vc) = compass_min(&f, &[-1.2, 1.0], 0.1, 1e-12, 2_000);
        let (_, vp) = pattern_min(&f, &[-1.2, 1.0], 0.1, 1e-12, 2_000);
        assert!(vp < vc, "pattern {vp} compass {vc}");
    }

    #[test]
    fn golden_section_finds_the_maximum_of_sine() {
        let (x, v) = golden_max(&f64::sin, 0.0, 3.0);
        assert!((x - std::f64::consts::FRAC_PI_2).abs() < 1e-7);
        assert!((v - 1.0).abs() < 1e-14);
    }
}
