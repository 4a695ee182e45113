//! Polynomials in z = Δt·λ and the presets run in their published low-storage
//! forms on y' = λy: each stage evaluation F(y) is multiplication by z. This
//! gives each scheme's stability polynomial without any Butcher tableau.

/// p + q.
pub fn add(p: &[f64], q: &[f64]) -> Vec<f64> {
    let n = p.len().max(q.len());
    (0..n)
        .map(|i| p.get(i).unwrap_or(&0.0) + q.get(i).unwrap_or(&0.0))
        .collect()
}

/// s·p.
pub fn scale(s: f64, p: &[f64]) -> Vec<f64> {
    p.iter().map(|x| s * x).collect()
}

/// z·p.
pub fn times_z(p: &[f64]) -> Vec<f64> {
    std::iter::once(0.0).chain(p.iter().copied()).collect()
}

/// Williamson's 2N recurrence: dU ← A_j dU + z U; U ← U + B_j dU.
pub fn two_register(a: &[f64], b: &[f64]) -> Vec<f64> {
    let mut u = vec![1.0];
    let mut du = vec![0.0];
    for (aj, bj) in a.iter().zip(b) {
        du = add(&scale(*aj, &du), &times_z(&u));
        u = add(&u, &scale(*bj, &du));
    }
    u
}

/// The one-register form u^(j) = u^n + β_j z u^(j−1).
pub fn one_register(beta: &[f64]) -> Vec<f64> {
    let mut u = vec![1.0];
    for bj in beta {
        u = add(&[1.0], &scale(*bj, &times_z(&u)));
    }
    u
}

/// Ketcheson's two-register SSPRK(10,4) algorithm (SIAM J. Sci. Comput. 30,
/// 2008; as recalled from memory).
pub fn ketcheson_10_4() -> Vec<f64> {
    let euler = |q: &[f64]| add(q, &scale(1.0 / 6.0, &times_z(q)));
    let mut q1 = vec![1.0];
    let mut q2 = vec![1.0];
    for _ in 0..5 {
        q1 = euler(&q1);
    }
    q2 = add(&scale(1.0 / 25.0, &q2), &scale(9.0 / 25.0, &q1));
    q1 = add(&scale(15.0, &q2), &scale(-5.0, &q1));
    for _ in 0..4 {
        q1 = euler(&q1);
    }
    add(&add(&q2, &scale(0.6, &q1)), &scale(0.1, &times_z(&q1)))
}

/// |R(z)|² − 1 for the polynomial R at a complex z = (re, im).
pub fn excess(p: &[f64], re: f64, im: f64) -> f64 {
    let (mut sr, mut si) = (0.0, 0.0);
    for c in p.iter().rev() {
        let (r, i) = (sr * re - si * im + c, sr * im + si * re);
        sr = r;
        si = i;
    }
    sr * sr + si * si - 1.0
}
