//! Low-storage Runge–Kutta schemes in the forms they are published in,
//! converted to Butcher tableaux.
//!
//! * Williamson's 2N form (Williamson, J. Comput. Phys. 35, 1980), s stages,
//!   two registers U and dU:
//!   for j = 1..s: dU ← A_j·dU + Δt·F(U); U ← U + B_j·dU (with A_1 = 0).
//!   Writing K_k = Δt·F(Y_k) for the k-th stage value Y_k, the increment after
//!   stage l is dU_l = Σ_{k≤l} e_lk K_k with e_lk = A_{k+1}···A_l, so
//!   a_jk = Σ_{l=k}^{j−1} B_l e_lk (k < j) and b_k = Σ_{l=k}^{s} B_l e_lk.
//! * The one-register form of the optimised schemes for wave problems
//!   (Hu, Hussaini & Manthey 1996; Bogey & Bailly 2004):
//!   u^(j) = u^n + β_j Δt F(u^(j−1)), j = 1..s, u^{n+1} = u^(s).
//!   Its tableau has a_{j,j−1} = β_{j−1} and b = (0, …, 0, β_s); on linear
//!   problems R(z) = 1 + Σ_k γ_k z^k with γ_k = β_s β_{s−1} ··· β_{s−k+1}.
//!   These schemes are published by their γ_k; [`betas_from_gammas`] inverts
//!   the products.

use super::butcher::Tableau;
use super::methods::MethodError;

fn bad(msg: String) -> MethodError {
    MethodError::Tableau(msg)
}

/// The tableau of the 2N scheme with coefficients `a` = (A_1..A_s) and
/// `b` = (B_1..B_s).
pub fn williamson(a: &[f64], b: &[f64]) -> Result<Tableau, MethodError> {
    let s = b.len();
    if s == 0 || a.len() != s {
        return Err(bad(format!(
            "a low-storage scheme needs as many A as B coefficients, at least one each; got {} A and {} B",
            a.len(),
            s
        )));
    }
    if a.iter().chain(b).any(|x| !x.is_finite()) {
        return Err(bad("low-storage coefficients must be finite".into()));
    }
    if a[0] != 0.0 {
        return Err(bad(format!(
            "the first A coefficient must be 0 (the first stage has no earlier increment to keep); got {}",
            a[0]
        )));
    }
    // e[l][k] = A_{k+1}···A_l (0-based: the product of a[m] for k < m ≤ l)
    let e: Vec<Vec<f64>> = (0..s)
        .map(|l| {
            let mut row = vec![0.0; s];
            row[l] = 1.0;
            for k in (0..l).rev() {
                row[k] = row[k + 1] * a[k + 1];
            }
            row
        })
        .collect();
    let weight = |k: usize, upto: usize| (k..upto).map(|l| b[l] * e[l][k]).sum::<f64>();
    let tab: Vec<Vec<f64>> = (0..s)
        .map(|j| {
            (0..s)
                .map(|k| if k < j { weight(k, j) } else { 0.0 })
                .collect()
        })
        .collect();
    let w: Vec<f64> = (0..s).map(|k| weight(k, s)).collect();
    Ok(Tableau::new(tab, w))
}

/// The tableau of the one-register scheme u^(j) = u^n + β_j Δt F(u^(j−1)).
pub fn single_register(beta: &[f64]) -> Tableau {
    let s = beta.len();
    let a: Vec<Vec<f64>> = (0..s)
        .map(|j| {
            (0..s)
                .map(|k| {
                    if j > 0 && k == j - 1 {
                        beta[j - 1]
                    } else {
                        0.0
                    }
                })
                .collect()
        })
        .collect();
    let mut b = vec![0.0; s];
    if s > 0 {
        b[s - 1] = beta[s - 1];
    }
    Tableau::new(a, b)
}

/// The β_1..β_s of a one-register scheme whose stability polynomial is
/// 1 + γ_1 z + … + γ_s z^s (`gamma` = γ_1..γ_s, all nonzero):
/// β_{s−k+1} = γ_k / γ_{k−1}, γ_0 = 1.
pub fn betas_from_gammas(gamma: &[f64]) -> Vec<f64> {
    let s = gamma.len();
    let mut beta = vec![0.0; s];
    let mut prev = 1.0;
    for (k, g) in gamma.iter().enumerate() {
        beta[s - 1 - k] = g / prev;
        prev = *g;
    }
    beta
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn williamson_third_order_scheme_has_its_known_tableau() {
        // A = (0, −5/9, −153/128), B = (1/3, 15/16, 8/15); the tableau
        // c = (0, 1/3, 3/4), a21 = 1/3, a31 = −3/16, a32 = 15/16,
        // b = (1/6, 3/10, 8/15) is the one known for this scheme (from memory),
        // and follows by hand from the recurrences above.
        let t = williamson(
            &[0.0, -5.0 / 9.0, -153.0 / 128.0],
            &[1.0 / 3.0, 15.0 / 16.0, 8.0 / 15.0],
        )
        .unwrap();
        let want_a = [
            [0.0, 0.0, 0.0],
            [1.0 / 3.0, 0.0, 0.0],
            [-3.0 / 16.0, 15.0 / 16.0, 0.0],
        ];
        for (row, want) in t.a.iter().zip(want_a) {
            for (x, w) in row.iter().zip(want) {
                assert!((x - w).abs() < 1e-15, "{:?}", t.a);
            }
        }
        for (x, w) in t.b.iter().zip([1.0 / 6.0, 3.0 / 10.0, 8.0 / 15.0]) {
            assert!((x - w).abs() < 1e-15, "{:?}", t.b);
        }
        for (x, w) in t.c.iter().zip([0.0, 1.0 / 3.0, 0.75]) {
            assert!((x - w).abs() < 1e-15, "{:?}", t.c);
        }
    }

    #[test]
    fn williamson_form_checks_its_input() {
        assert!(williamson(&[0.0], &[1.0, 2.0]).is_err());
        assert!(williamson(&[], &[]).is_err());
        assert!(williamson(&[0.5], &[1.0]).is_err());
        assert!(williamson(&[0.0], &[f64::NAN]).is_err());
    }

    #[test]
    fn gammas_and_betas_are_inverse() {
        let gamma = [1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0];
        let beta = betas_from_gammas(&gamma);
        assert_eq!(beta, vec![0.25, 1.0 / 3.0, 0.5, 1.0]);
        let t = single_register(&beta);
        assert_eq!(t.b, vec![0.0, 0.0, 0.0, 1.0]);
        assert_eq!(t.a[3][2], 0.5);
        assert_eq!(t.c, vec![0.0, 0.25, 1.0 / 3.0, 0.5]);
    }
}
