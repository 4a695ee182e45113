//! A compass (pattern) search that minimises a per-wavevector first-loss time:
//! try ± the step along each coordinate, move on improvement, halve the step
//! otherwise (Kolda, Lewis & Torczon, SIAM Review 45, 2003). The objective gets
//! the current best value as a cap, so that points which cannot improve on it
//! are cheap to reject.

/// Smallest step of a wavevector search, in radians.
pub const MIN_STEP: f64 = 1e-10;
/// Evaluation budget of a wavevector search.
pub const BUDGET: usize = 400;

/// Minimises `f(x, cap)` from `x0` with initial `step`; values above `ceiling`
/// are not resolved (f returns its cap there). Returns the best point found and
/// its value.
pub fn minimise(
    f: &impl Fn(&[f64], f64) -> f64,
    x0: &[f64],
    step: f64,
    ceiling: f64,
    (min_step, budget): (f64, usize),
) -> (Vec<f64>, f64) {
    let cap = |b: f64| b * (1.0 + 1e-12);
    let mut x = x0.to_vec();
    let mut fx = f(&x, ceiling);
    let mut step = step;
    let mut evaluations = 1;
    while step > min_step && evaluations < budget {
        let mut moved = false;
        'axes: for k in 0..x.len() {
            for sign in [1.0, -1.0] {
                let mut y = x.clone();
                y[k] += sign * step;
                let fy = f(&y, cap(fx));
                evaluations += 1;
                if fy < fx {
                    x = y;
                    fx = fy;
                    moved = true;
                    break 'axes;
                }
            }
        }
        if !moved {
            step *= 0.5;
        }
    }
    (x, fx)
}
