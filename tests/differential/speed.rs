//! The reference speed s = max over unit directions n of ρ(Σ_d n_d A_d), computed
//! independently: the largest |eigenvalue| of Σ n_d A_d (real eigenvalues for
//! the hyperbolic systems generated here) sampled over directions, then refined
//! by golden-section search (2-D) or a shrinking pattern search (3-D).

use crate::scheme::Mat;
use std::f64::consts::PI;

/// Spectral radius of a real matrix with real eigenvalues (complex-safe).
fn radius(a: &Mat) -> f64 {
    a.complex_eigenvalues()
        .iter()
        .map(|z| z.norm())
        .fold(0.0, f64::max)
}

fn along(flux: &[Mat], n: &[f64]) -> Mat {
    let m = flux[0].nrows();
    flux.iter()
        .zip(n)
        .fold(Mat::zeros(m, m), |acc, (a, x)| acc + a * *x)
}

fn golden_max(f: &impl Fn(f64) -> f64, mut a: f64, mut b: f64) -> f64 {
    let g = 0.5 * (5f64.sqrt() - 1.0);
    let (mut c, mut d) = (b - g * (b - a), a + g * (b - a));
    let (mut fc, mut fd) = (f(c), f(d));
    for _ in 0..120 {
        if fc > fd {
            (b, d, fd) = (d, c, fc);
            c = b - g * (b - a);
            fc = f(c);
        } else {
            (a, c, fc) = (c, d, fd);
            d = a + g * (b - a);
            fd = f(d);
        }
    }
    fc.max(fd)
}

/// max_n ρ(Σ n_d A_d) over unit n.
pub fn reference_speed(flux: &[Mat]) -> f64 {
    match flux.len() {
        1 => radius(&flux[0]),
        2 => {
            let f = |t: f64| radius(&along(flux, &[t.cos(), t.sin()]));
            let n = 2000;
            let h = PI / n as f64;
            let mut best = (0.0, f64::MIN);
            for i in 0..n {
                let v = f(i as f64 * h);
                if v > best.1 {
                    best = (i as f64 * h, v);
                }
            }
            golden_max(&f, best.0 - h, best.0 + h).max(best.1)
        }
        _ => {
            let f = |x: &[f64; 2]| {
                let (st, ct) = x[0].sin_cos();
                let (sp, cp) = x[1].sin_cos();
                radius(&along(flux, &[st * cp, st * sp, ct]))
            };
            let mut best = ([0.0, 0.0], f64::MIN);
            for i in 0..=60 {
                for j in 0..120 {
                    let x = [PI * i as f64 / 60.0, 2.0 * PI * j as f64 / 120.0];
                    let v = f(&x);
                    if v > best.1 {
                        best = (x, v);
                    }
                }
            }
            let mut step = PI / 60.0;
            while step > 1e-12 {
                let mut moved = false;
                for k in 0..2 {
                    for sgn in [-1.0, 1.0] {
                        let mut x = best.0;
                        x[k] += sgn * step;
                        let v = f(&x);
                        if v > best.1 {
                            best = (x, v);
                            moved = true;
                        }
                    }
                }
                if !moved {
                    step *= 0.5;
                }
            }
            best.1
        }
    }
}
