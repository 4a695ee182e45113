//! The norm of a user's system: an automatic diagonal symmetriser of its flux
//! matrices where one exists, else the identity with the figure that says how
//! far a physical norm could differ.
//!
//! A positive diagonal D with D A_d symmetric for every axis d makes
//! ‖D^{1/2} u‖₂ an energy norm of the hyperbolic part (Friedrichs): the
//! telegraph equations v_t + i_x/C = 0, i_t + v_x/L = 0 give D = diag(1, L/C),
//! the norm √(v² + Z₀² i²) in volts. D exists exactly when every off-diagonal
//! pair has a_ij = a_ji = 0 or a_ij a_ji > 0 with the ratios a_ij/a_ji consistent
//! around every cycle of the coupling graph, for all axes at once; it is found
//! by propagating d_j = d_i a_ij/a_ji from the first variable of each connected
//! group (d = 1 there).

use nalgebra::DMatrix;
use num_complex::Complex64 as C64;

/// Relative tolerance of the symmetry and consistency tests.
const TOL: f64 = 1e-10;

/// Where the norm of the growth measures comes from.
#[derive(Debug, Clone, PartialEq)]
pub enum NormOrigin {
    /// The model's own symmetriser (or the identity for a symmetric model).
    Model,
    /// The automatic diagonal symmetriser of a user system's flux matrices.
    AutomaticDiagonal,
    /// The identity: no diagonal symmetriser exists. The figure is the largest
    /// 2-norm condition number of the flux matrices' unit-column eigenvector
    /// matrices (∞ when one is defective or has complex eigenvalues): growth in
    /// a characteristic (energy) norm can differ from growth in this one by up
    /// to that factor.
    Identity {
        /// Largest eigenvector condition number over the flux matrices.
        flux_condition: f64,
    },
}

/// The weights w_i = √d_i of a diagonal symmetriser of `flux` (first variable of
/// each coupled group weighted 1), or None when none exists.
pub fn diagonal_symmetriser(flux: &[DMatrix<C64>]) -> Option<Vec<f64>> {
    let m = flux.first()?.nrows();
    if flux
        .iter()
        .any(|a| a.iter().any(|z| z.im != 0.0 || !z.re.is_finite()))
    {
        return None;
    }
    // ratio d_j / d_i demanded by the pair (i, j), if the pair is coupled
    let ratio = |i: usize, j: usize| -> Result<Option<f64>, ()> {
        let mut out: Option<f64> = None;
        for a in flux {
            let (aij, aji) = (a[(i, j)].re, a[(j, i)].re);
            let scale = aij.abs().max(aji.abs());
            if scale == 0.0 {
                continue;
            }
            if aij.abs() <= TOL * scale || aji.abs() <= TOL * scale || aij * aji < 0.0 {
                return Err(());
            }
            let r = aij / aji;
            match out {
                Some(o) if (o - r).abs() > TOL * o.abs() => return Err(()),
                _ => out = Some(r),
            }
        }
        Ok(out)
    };
    let mut d: Vec<Option<f64>> = vec![None; m];
    for root in 0..m {
        if d[root].is_some() {
            continue;
        }
        d[root] = Some(1.0);
        let mut stack = vec![root];
        while let Some(i) = stack.pop() {
            let di = d[i]?;
            for (j, slot) in d.iter_mut().enumerate() {
                if j == i {
                    continue;
                }
                let Some(r) = ratio(i, j).ok()? else { continue };
                let want = di * r;
                match *slot {
                    Some(dj) if (dj - want).abs() > TOL * dj => return None,
                    Some(_) => {}
                    None => {
                        *slot = Some(want);
                        stack.push(j);
                    }
                }
            }
        }
    }
    d.into_iter()
        .map(|x| x.filter(|v| v.is_finite() && *v > 0.0).map(f64::sqrt))
        .collect()
}

/// The largest eigenvector condition number over the flux matrices (∞ when one
/// is defective or has a complex eigenvalue, i.e. is not diagonalisable with
/// real wave speeds).
pub fn flux_condition(flux: &[DMatrix<C64>]) -> f64 {
    flux.iter()
        .filter(|a| a.iter().any(|z| *z != C64::new(0.0, 0.0)))
        .map(|a| {
            let Some((_, t)) = crate::linalg::dense::schur(a) else {
                return f64::INFINITY;
            };
            let scale = a.iter().map(|z| z.norm()).fold(0.0, f64::max);
            if (0..t.nrows()).any(|k| t[(k, k)].im.abs() > 1e-10 * scale) {
                return f64::INFINITY;
            }
            let k = crate::linalg::dense::eigvec_condition(a, &t);
            if k.is_nan() {
                f64::INFINITY
            } else {
                k
            }
        })
        .fold(1.0, f64::max)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn real(rows: &[&[f64]]) -> DMatrix<C64> {
        let m = rows.len();
        DMatrix::from_fn(m, m, |i, j| C64::new(rows[i][j], 0.0))
    }

    #[test]
    fn the_telegraph_equations_get_the_energy_norm_in_volts() {
        // [[0, 1/C], [1/L, 0]] with L = 250 nH/m, C = 100 pF/m: Z0 = √(L/C) = 50 Ω
        let a = real(&[&[0.0, 1.0e10], &[4.0e6, 0.0]]);
        let w = diagonal_symmetriser(&[a]).expect("a symmetriser");
        assert!(
            (w[0] - 1.0).abs() < 1e-15 && (w[1] - 50.0).abs() < 1e-9,
            "{w:?}"
        );
    }

    #[test]
    fn each_flux_matrix_becomes_symmetric_and_inconsistent_ones_are_refused() {
        // 2-D acoustics in p, u, v with ρ = 2, c = 3: A1 = [[0, ρc², 0], [1/ρ, 0, 0], 0]
        let (rho, c) = (2.0, 3.0);
        let a1 = real(&[
            &[0.0, rho * c * c, 0.0],
            &[1.0 / rho, 0.0, 0.0],
            &[0.0, 0.0, 0.0],
        ]);
        let a2 = real(&[
            &[0.0, 0.0, rho * c * c],
            &[0.0, 0.0, 0.0],
            &[1.0 / rho, 0.0, 0.0],
        ]);
        let w = diagonal_symmetriser(&[a1.clone(), a2.clone()]).expect("symmetriser");
        for a in [&a1, &a2] {
            let dw = DMatrix::from_fn(3, 3, |i, j| {
                if i == j {
                    C64::new(w[i] * w[i], 0.0)
                } else {
                    C64::new(0.0, 0.0)
                }
            });
            let h = &dw * a;
            assert!((&h - h.transpose()).norm() <= 1e-12 * h.norm());
        }
        // lower-triangular coupling (one entry zero): none
        assert!(diagonal_symmetriser(&[real(&[&[1.0, 0.0], &[8.0, 1.1]])]).is_none());
        // opposite signs (a rotation, complex speeds): none
        assert!(diagonal_symmetriser(&[real(&[&[0.0, 1.0], &[-1.0, 0.0]])]).is_none());
        // ratios that differ between the axes: none
        let b1 = real(&[&[0.0, 1.0], &[1.0, 0.0]]);
        let b2 = real(&[&[0.0, 2.0], &[1.0, 0.0]]);
        assert!(diagonal_symmetriser(&[b1, b2]).is_none());
    }

    #[test]
    fn the_flux_condition_is_that_of_the_eigenvectors() {
        // eigenvectors of [[1, 0], [8, 1.1]]: (0, 1) for 1.1 and (0.1, −8)/√64.01
        // for 1; κ₂ of the unit-column matrix they form, from its singular values
        let a = real(&[&[1.0, 0.0], &[8.0, 1.1]]);
        let n = (0.01f64 + 64.0).sqrt();
        let v = nalgebra::Matrix2::new(0.0, 0.1 / n, 1.0, -8.0 / n);
        let s = v.svd(false, false).singular_values;
        let want = s[0] / s[1];
        let got = flux_condition(&[a]);
        assert!((got - want).abs() <= 1e-8 * want, "{got} vs {want}");
        assert_eq!(
            flux_condition(&[real(&[&[0.0, 1.0], &[-1.0, 0.0]])]),
            f64::INFINITY
        );
        assert_eq!(
            flux_condition(&[real(&[&[2.0, 1.0], &[0.0, 2.0]])]),
            f64::INFINITY
        );
    }
}
