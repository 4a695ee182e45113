//! Storage for the square matrices the kernels work on, behind one small trait:
//! [`Fixed`] is a stack array `[[C64; N]; N]` for m ≤ 8 (the size is a const, so
//! loops have fixed trip counts and unroll), [`Dyn`] a row-major `Vec` of
//! run-time size for larger m, allocated once per solver. The Hessenberg, QR and
//! Jacobi kernels are written once against [`Square`] (rows as slices, `h[i][j]`)
//! and monomorphised for each storage.
//!
//! [`load_scaled`] copies a caller's row-major slice in, rejecting NaN and
//! infinities and scaling by a power of two into the kernels' safe range.

use super::cplx::{max_abs1, pow2_scaling, ONE, ZERO};
use super::LinalgError;
use num_complex::Complex64 as C64;
use std::ops::{Index, IndexMut};

/// A square complex matrix whose rows are slices: `h[i][j]` is row i, column j.
pub(crate) trait Square: IndexMut<usize, Output = [C64]> {
    /// The number of rows (and columns).
    fn dim(&self) -> usize;
    /// Rows k and k + 1, both mutable.
    fn two_rows(&mut self, k: usize) -> (&mut [C64], &mut [C64]);
    /// Two distinct rows p < q, both mutable.
    fn row_pair(&mut self, p: usize, q: usize) -> (&mut [C64], &mut [C64]);
    /// All entries, row-major.
    fn flat(&self) -> &[C64];
    /// All entries, row-major, mutable.
    fn flat_mut(&mut self) -> &mut [C64];

    /// Overwrites the matrix with the identity.
    fn set_identity(&mut self) {
        let n = self.dim();
        self.flat_mut().fill(ZERO);
        for i in 0..n {
            self[i][i] = ONE;
        }
    }
}

/// A fixed-size matrix on the stack.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Fixed<const N: usize>(pub [[C64; N]; N]);

impl<const N: usize> Fixed<N> {
    /// The zero matrix.
    pub const ZERO: Self = Fixed([[ZERO; N]; N]);

    /// The matrix with the row-major entries `a` (length N²).
    #[inline(always)]
    pub fn from_row_major(a: &[C64]) -> Self {
        let a = &a[..N * N];
        Fixed(std::array::from_fn(|i| {
            std::array::from_fn(|j| a[i * N + j])
        }))
    }
}

impl<const N: usize> Index<usize> for Fixed<N> {
    type Output = [C64];
    #[inline(always)]
    fn index(&self, i: usize) -> &[C64] {
        &self.0[i]
    }
}

impl<const N: usize> IndexMut<usize> for Fixed<N> {
    #[inline(always)]
    fn index_mut(&mut self, i: usize) -> &mut [C64] {
        &mut self.0[i]
    }
}

impl<const N: usize> Square for Fixed<N> {
    #[inline(always)]
    fn dim(&self) -> usize {
        N
    }
    #[inline(always)]
    fn two_rows(&mut self, k: usize) -> (&mut [C64], &mut [C64]) {
        let (top, bottom) = self.0.split_at_mut(k + 1);
        (&mut top[k], &mut bottom[0])
    }
    #[inline(always)]
    fn row_pair(&mut self, p: usize, q: usize) -> (&mut [C64], &mut [C64]) {
        let (top, bottom) = self.0.split_at_mut(q);
        (&mut top[p], &mut bottom[0])
    }
    #[inline(always)]
    fn flat(&self) -> &[C64] {
        self.0.as_flattened()
    }
    #[inline(always)]
    fn flat_mut(&mut self) -> &mut [C64] {
        self.0.as_flattened_mut()
    }
}

/// A run-time-size matrix, row-major.
#[derive(Debug, Clone)]
pub(crate) struct Dyn {
    n: usize,
    data: Vec<C64>,
}

impl Dyn {
    /// The n×n zero matrix.
    pub fn zeros(n: usize) -> Self {
        Dyn {
            n,
            data: vec![ZERO; n * n],
        }
    }
}

impl Index<usize> for Dyn {
    type Output = [C64];
    #[inline(always)]
    fn index(&self, i: usize) -> &[C64] {
        &self.data[i * self.n..(i + 1) * self.n]
    }
}

impl IndexMut<usize> for Dyn {
    #[inline(always)]
    fn index_mut(&mut self, i: usize) -> &mut [C64] {
        &mut self.data[i * self.n..(i + 1) * self.n]
    }
}

impl Square for Dyn {
    #[inline(always)]
    fn dim(&self) -> usize {
        self.n
    }
    #[inline(always)]
    fn two_rows(&mut self, k: usize) -> (&mut [C64], &mut [C64]) {
        self.row_pair(k, k + 1)
    }
    #[inline(always)]
    fn row_pair(&mut self, p: usize, q: usize) -> (&mut [C64], &mut [C64]) {
        let n = self.n;
        let (top, bottom) = self.data.split_at_mut(q * n);
        (&mut top[p * n..(p + 1) * n], &mut bottom[..n])
    }
    #[inline(always)]
    fn flat(&self) -> &[C64] {
        &self.data
    }
    #[inline(always)]
    fn flat_mut(&mut self) -> &mut [C64] {
        &mut self.data
    }
}

/// Copies the row-major `a` into `h` (or, with `transpose`, its transpose),
/// scaled by a power of two into range. Returns the factor that undoes the
/// scaling, or `None` for the zero matrix.
#[inline(always)]
pub(crate) fn load_scaled<H: Square>(
    a: &[C64],
    h: &mut H,
    transpose: bool,
) -> Result<Option<f64>, LinalgError> {
    let n = h.dim();
    let a = &a[..n * n];
    if transpose {
        for (i, src) in a.chunks_exact(n).enumerate() {
            for (j, z) in src.iter().enumerate() {
                h[j][i] = *z;
            }
        }
    } else {
        h.flat_mut().copy_from_slice(a);
    }
    scale_in_place(h)
}

/// Checks that `h` is finite and scales it by a power of two into range.
/// Returns the factor that undoes the scaling, or `None` for the zero matrix.
#[inline(always)]
pub(crate) fn scale_in_place<H: Square>(h: &mut H) -> Result<Option<f64>, LinalgError> {
    let amax = max_abs1(h.flat())?;
    if amax == 0.0 {
        return Ok(None);
    }
    let (scale, back) = pow2_scaling(amax);
    if scale != 1.0 {
        for z in h.flat_mut() {
            *z *= scale;
        }
    }
    Ok(Some(back))
}
