//! The general path for sizes above the fixed-size kernels: the same Householder
//! reduction, shifted QR iteration (Golub & Van Loan, Matrix Computations, 4th
//! ed., §7.4–7.5) and back-substitution as for m ≤ 8, on run-time-size [`Dyn`]
//! matrices that a solver allocates once, so the larger multistep systems get
//! the exceptional shifts and the iteration cap too, and no allocation per call.

use super::cplx::ZERO;
use super::small::{eigenvalues_and_vectors_in, eigenvalues_in};
use super::square::Dyn;
use super::LinalgError;
use num_complex::Complex64 as C64;

/// Workspace of the general path for one size n.
#[derive(Debug, Clone)]
pub(crate) struct Workspace {
    h: Dyn,
    q: Dyn,
    work: Vec<C64>,
}

impl Workspace {
    /// A workspace for n×n matrices.
    pub fn new(n: usize) -> Self {
        Workspace {
            h: Dyn::zeros(n),
            q: Dyn::zeros(n),
            work: vec![ZERO; 2 * n],
        }
    }

    /// The Hessenberg/triangular matrix, the accumulated unitary factor and the
    /// 2n-entry vector workspace, borrowed together.
    pub fn parts(&mut self) -> (&mut Dyn, &mut Dyn, &mut [C64]) {
        (&mut self.h, &mut self.q, &mut self.work)
    }

    /// Eigenvalues of the row-major `a` into `out`.
    pub fn eigenvalues(&mut self, a: &[C64], out: &mut [C64]) -> Result<(), LinalgError> {
        eigenvalues_in(a, &mut self.h, &mut self.work, out)
    }

    /// Eigenvalues and unit eigenvectors (columns of the row-major `vectors`).
    pub fn eigenvalues_and_vectors(
        &mut self,
        a: &[C64],
        values: &mut [C64],
        vectors: &mut [C64],
    ) -> Result<(), LinalgError> {
        let Workspace { h, q, work } = self;
        eigenvalues_and_vectors_in(a, h, q, work, values, vectors)
    }
}
