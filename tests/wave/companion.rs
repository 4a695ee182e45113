//! The 2m × 2m amplification matrix of a second-order-in-time method (the
//! companion of the recurrence on the stacked levels (u^n, u^{n−1})) has the
//! roots of the characteristic polynomial Σ_j (ρ_j − z σ_j) ζ^j as eigenvalues.

use super::problem;
use kgain::analysis::amplification_at;
use kgain::linalg::{eigenvalues, from_matrix};
use num_complex::Complex64 as C64;

/// Roots of a ζ² + b ζ + c by the textbook formula on the raw coefficients
/// (independent of the library's shifted computation).
fn raw_roots(a: C64, b: C64, c: C64) -> [C64; 2] {
    let d = (b * b - a * c * 4.0).sqrt();
    [(-b + d) / (a * 2.0), (-b - d) / (a * 2.0)]
}

#[test]
fn eigenvalues_of_g_are_the_characteristic_roots() {
    for (method, bg) in [
        ("central-difference", None),
        ("newmark", None),
        ("newmark", Some((0.3, 0.6))),
        ("newmark", Some((0.05, 0.55))),
    ] {
        let p = problem(&[0.5, 1.0], &[1.0, 2.0], method, bg, 0.6);
        let op = p.operator();
        let (beta, gamma) = match (method, bg) {
            ("central-difference", _) => (0.0, 0.5),
            (_, Some(x)) => x,
            _ => (0.25, 0.5),
        };
        let sigma = [0.5 + beta - gamma, 0.5 - 2.0 * beta + gamma, beta];
        let dt = p.dt();
        for theta in [[0.4, 0.0], [1.3, -2.2], [3.1, 3.1], [-2.0, 0.7]] {
            let g = amplification_at(&p, &op, &theta, dt);
            assert_eq!(g.nrows(), 2 * op.m);
            let mut lam = eigenvalues(&from_matrix(&g), g.nrows()).expect("eigenvalues of G");
            let z = op.symbol_matrix(&theta)[(0, 0)] * (dt * dt);
            let coef: Vec<C64> = [1.0, -2.0, 1.0]
                .iter()
                .zip(sigma)
                .map(|(r, s)| C64::new(*r, 0.0) - z * s)
                .collect();
            let mut want = raw_roots(coef[2], coef[1], coef[0]).to_vec();
            let key = |a: &C64, b: &C64| a.im.total_cmp(&b.im).then(a.re.total_cmp(&b.re));
            lam.sort_by(key);
            want.sort_by(key);
            for (l, w) in lam.iter().zip(&want) {
                assert!(
                    (l - w).norm() < 1e-10,
                    "{method} {bg:?} {theta:?}: {lam:?} vs {want:?}"
                );
            }
            // and the library's own amplification eigenvalues agree
            let mut own = p.method.amplification_eigenvalues(z);
            own.sort_by(key);
            for (o, w) in own.iter().zip(&want) {
                assert!((o - w).norm() < 1e-12, "{own:?} vs {want:?}");
            }
        }
    }
}
