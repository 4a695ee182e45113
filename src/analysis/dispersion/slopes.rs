//! First derivatives of the eigenvalues of a matrix A(t) along a parameter,
//! from its eigenvectors (standard first-order perturbation theory, e.g.
//! Wilkinson, The Algebraic Eigenvalue Problem, 1965, ch. 2 — cited from
//! memory): with X the right eigenvectors, the derivatives of simple
//! eigenvalues are the diagonal of X⁻¹ A′ X, and those of a cluster of equal
//! eigenvalues of a diagonalisable A are the eigenvalues of the cluster's block
//! of X⁻¹ A′ X. Where X is ill-conditioned (a defective or nearly defective A,
//! whose eigenvalues are not differentiable) no slopes are given and the caller
//! falls back to differences.

use crate::linalg::{multiply_into, EigSolver, LuSolver};
use num_complex::Complex64 as C64;

/// Eigenvalues closer than this fraction of the largest one form a cluster.
const CLUSTER: f64 = 1e-9;
/// Largest condition number κ₁(X) of the eigenvectors accepted.
const MAX_CONDITION: f64 = 1e6;

/// Workspace for one matrix size.
pub struct Slopes {
    m: usize,
    lu: LuSolver,
    inverse: Vec<C64>,
    vectors: Vec<C64>,
    values: Vec<C64>,
    product: Vec<C64>,
    members: Vec<usize>,
    block: Vec<C64>,
    block_values: Vec<C64>,
    /// For each eigenvalue, the bit set of its cluster (found once per [`Slopes::set`];
    /// set only at the cluster's first member, 0 at the others).
    clusters: Vec<u64>,
}

impl Slopes {
    /// For m×m matrices.
    pub fn new(m: usize) -> Self {
        let zero = C64::new(0.0, 0.0);
        Slopes {
            m,
            lu: LuSolver::new(m),
            inverse: vec![zero; m * m],
            vectors: vec![zero; m * m],
            values: vec![zero; m],
            product: vec![zero; m * m],
            members: Vec::with_capacity(m),
            block: Vec::with_capacity(m * m),
            block_values: Vec::with_capacity(m),
            clusters: vec![0; m],
        }
    }

    /// Takes the eigen-decomposition (values, row-major vectors with one per
    /// column) of A; false when X is singular or κ₁(X) exceeds 10⁶.
    pub fn set(&mut self, values: &[C64], vectors: &[C64]) -> bool {
        let m = self.m;
        if m > 64 {
            return false; // the cluster bookkeeping holds one bit per eigenvalue
        }
        self.values.copy_from_slice(values);
        self.vectors.copy_from_slice(vectors);
        self.inverse.fill(C64::new(0.0, 0.0));
        for i in 0..m {
            self.inverse[i * m + i] = C64::new(1.0, 0.0);
        }
        if self.lu.solve(vectors, &mut self.inverse, m).is_err() {
            return false;
        }
        let norm1 = |a: &[C64]| {
            (0..m)
                .map(|c| (0..m).map(|r| a[r * m + c].norm()).sum::<f64>())
                .fold(0.0, f64::max)
        };
        let condition = norm1(&self.vectors) * norm1(&self.inverse);
        self.find_clusters();
        condition.is_finite() && condition <= MAX_CONDITION
    }

    /// The clusters of equal eigenvalues (within [`CLUSTER`] of the largest), as
    /// bit sets at each cluster's first member.
    fn find_clusters(&mut self) {
        let m = self.m;
        let scale = self.values.iter().map(|z| z.norm()).fold(0.0, f64::max);
        let mut done = 0u64;
        for k in 0..m {
            self.clusters[k] = 0;
            if done & (1 << k) != 0 {
                continue;
            }
            for j in k..m {
                if (self.values[j] - self.values[k]).norm() <= CLUSTER * scale {
                    self.clusters[k] |= 1 << j;
                    done |= 1 << j;
                }
            }
        }
    }

    /// The derivative of each eigenvalue (in the order of the values given to
    /// [`Slopes::set`]) for the derivative matrix A′ (row-major); false when a
    /// cluster's block has no eigenvalues.
    pub fn slopes(&mut self, derivative: &[C64], out: &mut [C64]) -> bool {
        let m = self.m;
        // product = A′ X; of X⁻¹ A′ X only the entries the clusters use (the
        // diagonal of simple eigenvalues, each cluster's block)
        multiply_into(derivative, &self.vectors, &mut self.product, m);
        let entry = |inverse: &[C64], product: &[C64], r: usize, c: usize| {
            let mut acc = C64::new(0.0, 0.0);
            for k in 0..m {
                acc += inverse[r * m + k] * product[k * m + c];
            }
            acc
        };
        for k in 0..m {
            let cluster = self.clusters[k];
            if cluster == 0 {
                continue;
            }
            self.members.clear();
            self.members
                .extend((k..m).filter(|j| cluster & (1 << j) != 0));
            let s = self.members.len();
            if s == 1 {
                out[k] = entry(&self.inverse, &self.product, k, k);
                continue;
            }
            self.block.clear();
            for &r in &self.members {
                for &c in &self.members {
                    self.block.push(entry(&self.inverse, &self.product, r, c));
                }
            }
            self.block_values.clear();
            self.block_values.resize(s, C64::new(0.0, 0.0));
            if EigSolver::new(s)
                .eigenvalues(&self.block, &mut self.block_values)
                .is_err()
            {
                return false;
            }
            // ascending real part, so that a cluster's slopes come out in a
            // fixed order whatever basis of its eigenspace the kernel chose
            self.block_values
                .sort_by(|a, b| a.re.total_cmp(&b.re).then(a.im.total_cmp(&b.im)));
            for (&j, v) in self.members.iter().zip(&self.block_values) {
                out[j] = *v;
            }
        }
        true
    }
}
