//! Solving A X = B for a small complex A by Gaussian elimination with partial
//! pivoting, P A = L U (Golub & Van Loan, Matrix Computations, 4th ed.,
//! Algorithm 3.4.1; backward stable in practice, Higham, Accuracy and Stability
//! of Numerical Algorithms, §9.3).
//!
//! [`LuSolver`] keeps the factors of the last matrix: inline arrays for m ≤
//! [`MAX_FIXED`] (no heap at all), a vector allocated by the constructor above.
//! A and B are each scaled by a power of two (exact) so that their largest
//! real or imaginary part lies in [1, 2); X is scaled back at the end, and a
//! solution outside the f64 range is [`LinalgError::OutOfRange`], never an
//! infinity. A pivot with |re| + |im| at most m·ε in those units (between
//! m·ε·max|a_ij|/√2 and 2m·ε·max|a_ij|) is [`LinalgError::Singular`]: then A
//! lies within a small multiple of m²ε‖A‖ of a singular matrix (times the
//! growth factor), and X would be dominated by rounding (LAPACK's `zgetrf`
//! stops only at an exact zero).

use super::cplx::{abs1, cdiv, scale2, EPS, ZERO};
use super::small::MAX_FIXED;
use super::LinalgError;
use num_complex::Complex64 as C64;

/// Reusable LU factorisation and solve for one matrix size.
#[derive(Debug, Clone)]
pub struct LuSolver {
    m: usize,
    /// Row-major factors (L below the diagonal, unit diagonal implied; U on and
    /// above) for m ≤ [`MAX_FIXED`].
    inline: [C64; MAX_FIXED * MAX_FIXED],
    inline_pivots: [usize; MAX_FIXED],
    /// The same for m > [`MAX_FIXED`] (empty otherwise).
    heap: Vec<C64>,
    heap_pivots: Vec<usize>,
    /// ⌊log₂ max|a_ij|⌋ of the factored matrix, or `None` before a successful
    /// [`LuSolver::factor`].
    exponent: Option<i32>,
}

impl LuSolver {
    /// A solver for m×m systems (m ≥ 1).
    pub fn new(m: usize) -> Self {
        assert!(m >= 1, "matrix size must be at least 1");
        let big = m > MAX_FIXED;
        Self {
            m,
            inline: [ZERO; MAX_FIXED * MAX_FIXED],
            inline_pivots: [0; MAX_FIXED],
            heap: if big { vec![ZERO; m * m] } else { Vec::new() },
            heap_pivots: if big { vec![0; m] } else { Vec::new() },
            exponent: None,
        }
    }

    /// The matrix size this solver handles.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Factors the row-major m×m matrix `a` (P A = L U), replacing the factors
    /// held. NaN or infinite entries are [`LinalgError::NonFinite`], a
    /// (numerically) singular A [`LinalgError::Singular`].
    pub fn factor(&mut self, a: &[C64]) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(a.len(), m * m, "matrix slice has the wrong length");
        self.exponent = None;
        let Some(e) = exponent(a)? else {
            return Err(LinalgError::Singular);
        };
        let (lu, piv) = self.parts_mut();
        for (x, z) in lu.iter_mut().zip(a) {
            *x = scale2(*z, -e);
        }
        eliminate(lu, piv, m)?;
        self.exponent = Some(e);
        Ok(())
    }

    /// Overwrites the row-major m×nrhs `b` with X = A⁻¹B for the A last
    /// factored. Needs a successful [`LuSolver::factor`] first (else
    /// [`LinalgError::Singular`]); a solution outside the f64 range is
    /// [`LinalgError::OutOfRange`] (then `b` is unspecified).
    pub fn solve_in_place(&self, b: &mut [C64], nrhs: usize) -> Result<(), LinalgError> {
        let m = self.m;
        assert_eq!(
            b.len(),
            m * nrhs,
            "right-hand side slice has the wrong length"
        );
        let ea = self.exponent.ok_or(LinalgError::Singular)?;
        let Some(eb) = exponent(b)? else {
            return Ok(());
        };
        for z in b.iter_mut() {
            *z = scale2(*z, -eb);
        }
        let (lu, piv) = self.parts();
        substitute(lu, piv, m, b, nrhs);
        for z in b.iter_mut() {
            *z = scale2(*z, eb - ea);
            if !(z.re.is_finite() && z.im.is_finite()) {
                return Err(LinalgError::OutOfRange);
            }
        }
        Ok(())
    }

    /// Factors `a` and overwrites `b` (row-major m×nrhs) with A⁻¹B.
    pub fn solve(&mut self, a: &[C64], b: &mut [C64], nrhs: usize) -> Result<(), LinalgError> {
        self.factor(a)?;
        self.solve_in_place(b, nrhs)
    }

    fn parts(&self) -> (&[C64], &[usize]) {
        let m = self.m;
        if m <= MAX_FIXED {
            (&self.inline[..m * m], &self.inline_pivots[..m])
        } else {
            (&self.heap, &self.heap_pivots)
        }
    }

    fn parts_mut(&mut self) -> (&mut [C64], &mut [usize]) {
        let m = self.m;
        if m <= MAX_FIXED {
            (&mut self.inline[..m * m], &mut self.inline_pivots[..m])
        } else {
            (&mut self.heap, &mut self.heap_pivots)
        }
    }
}

/// ⌊log₂ max(|re|, |im|)⌋ over the entries (`None` if all are zero), or
/// [`LinalgError::NonFinite`]. The components, not |re| + |im|, so that the
/// largest entry scaled by 2^-e lies in [1, 2) even where |re| + |im| would
/// overflow.
fn exponent(a: &[C64]) -> Result<Option<i32>, LinalgError> {
    let mut amax = 0.0f64;
    for z in a {
        if !(z.re.is_finite() && z.im.is_finite()) {
            return Err(LinalgError::NonFinite);
        }
        amax = amax.max(z.re.abs()).max(z.im.abs());
    }
    Ok((amax > 0.0).then(|| amax.log2().floor() as i32))
}

/// In-place P A = L U of the row-major m×m `lu` (largest entry in [1, 2));
/// `piv[k]` is the row swapped with row k at step k.
fn eliminate(lu: &mut [C64], piv: &mut [usize], m: usize) -> Result<(), LinalgError> {
    let tiny = m as f64 * EPS;
    for k in 0..m {
        let mut p = k;
        let mut best = abs1(lu[k * m + k]);
        for i in k + 1..m {
            let v = abs1(lu[i * m + k]);
            if v > best {
                best = v;
                p = i;
            }
        }
        piv[k] = p;
        if best <= tiny {
            return Err(LinalgError::Singular);
        }
        if p != k {
            for j in 0..m {
                lu.swap(k * m + j, p * m + j);
            }
        }
        let inv = cdiv(C64::new(1.0, 0.0), lu[k * m + k]);
        let (top, bottom) = lu.split_at_mut((k + 1) * m);
        let pivot_row = &top[k * m..];
        for row in bottom.chunks_exact_mut(m) {
            let l = row[k] * inv;
            row[k] = l;
            if l != ZERO {
                for (x, u) in row[k + 1..].iter_mut().zip(&pivot_row[k + 1..]) {
                    *x -= l * u;
                }
            }
        }
    }
    Ok(())
}

/// B ← U⁻¹ L⁻¹ P B for the row-major m×nrhs `b`.
fn substitute(lu: &[C64], piv: &[usize], m: usize, b: &mut [C64], nrhs: usize) {
    for (k, &p) in piv.iter().enumerate() {
        if p != k {
            for j in 0..nrhs {
                b.swap(k * nrhs + j, p * nrhs + j);
            }
        }
    }
    for i in 1..m {
        let (done, rest) = b.split_at_mut(i * nrhs);
        let row = &mut rest[..nrhs];
        for k in 0..i {
            let l = lu[i * m + k];
            if l != ZERO {
                for (x, y) in row.iter_mut().zip(&done[k * nrhs..(k + 1) * nrhs]) {
                    *x -= l * y;
                }
            }
        }
    }
    for i in (0..m).rev() {
        let (head, solved) = b.split_at_mut((i + 1) * nrhs);
        let row = &mut head[i * nrhs..];
        for k in i + 1..m {
            let u = lu[i * m + k];
            if u != ZERO {
                let xk = &solved[(k - i - 1) * nrhs..(k - i) * nrhs];
                for (x, y) in row.iter_mut().zip(xk) {
                    *x -= u * y;
                }
            }
        }
        let d = lu[i * m + i];
        for x in row.iter_mut() {
            *x = cdiv(*x, d);
        }
    }
}

/// X = A⁻¹B for a row-major m×m `a` and m×nrhs `b` (allocating wrapper).
pub fn solve(a: &[C64], b: &[C64], m: usize, nrhs: usize) -> Result<Vec<C64>, LinalgError> {
    let mut x = b.to_vec();
    LuSolver::new(m).solve(a, &mut x, nrhs)?;
    Ok(x)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(re: f64, im: f64) -> C64 {
        C64::new(re, im)
    }

    #[test]
    fn two_by_two_system_has_its_cramer_solution() {
        // [[1, 2], [3, 4i]] x = [1, 0]: x = [4i, −3]/(4i − 6) by Cramer's rule.
        let a = [c(1.0, 0.0), c(2.0, 0.0), c(3.0, 0.0), c(0.0, 4.0)];
        let x = solve(&a, &[c(1.0, 0.0), ZERO], 2, 1).unwrap();
        let det = c(-6.0, 4.0);
        assert!((x[0] - c(0.0, 4.0) / det).norm() <= 4.0 * EPS);
        assert!((x[1] - c(-3.0, 0.0) / det).norm() <= 4.0 * EPS);
    }

    #[test]
    fn singular_and_unfactored_matrices_are_typed_errors() {
        let a = [c(1.0, 1.0), c(2.0, 2.0), c(0.5, 0.5), c(1.0, 1.0)];
        let mut solver = LuSolver::new(2);
        assert_eq!(solver.factor(&a), Err(LinalgError::Singular));
        let mut b = [ZERO; 2];
        assert_eq!(solver.solve_in_place(&mut b, 1), Err(LinalgError::Singular));
        assert_eq!(solver.factor(&[ZERO; 4]), Err(LinalgError::Singular));
    }
}
