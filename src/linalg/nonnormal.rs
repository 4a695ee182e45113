//! Non-normality measures from a complex Schur form A = Q T Qᴴ, on row-major
//! slices and without allocation per call: Henrici's departure from
//! normality, the unit eigenvectors of the triangular T, and the 2-norm
//! condition number of the eigenvector matrix with a rank test for defective
//! eigenvalues (Trefethen & Embree, Spectra and Pseudospectra, 2005, §48–49;
//! Henrici, Numer. Math. 4, 1962).
//!
//! The departure uses the strictly upper part of T: dep_F(A)² = ‖N‖_F² where
//! T = D + N, equal in exact arithmetic to ‖A‖_F² − Σ|λ|² and free of its
//! cancellation. The condition number works on T alone: A − μI and T − μI have
//! the same singular values, and the eigenvectors of A are Q times those of T,
//! so κ₂ is the same. Sums of squares are formed on entries divided by the
//! largest one, so no entry in the f64 range overflows them.

use super::cplx::{modulus, ZERO};
use super::eigvec::{back_substitute_in_clusters, pivot_floor};
use super::svd::SvdSolver;
use super::LinalgError;
use num_complex::Complex64 as C64;

/// Eigenvalues within this fraction of ‖T‖_F of each other form a cluster.
pub const CLUSTER: f64 = 1e-7;
/// Inside a cluster, a right-hand side of the eigenvector back-substitution at
/// most this many times ε‖T‖_F (times the vector's largest entry) is rounding:
/// the Schur form of a normal matrix has off-diagonal entries of a few ε‖T‖_F.
pub const ROUNDING: f64 = 1e3;
/// Singular values of T − μI below this fraction of ‖T‖_F count as zero in the
/// rank test of a cluster.
pub const NULLITY: f64 = 1e-6;

/// √(Σ |z|²) over `entries`, scaled by the largest modulus first.
pub fn frobenius(entries: impl Iterator<Item = C64> + Clone) -> f64 {
    let amax = entries.clone().map(modulus).fold(0.0, f64::max);
    if amax == 0.0 || !amax.is_finite() {
        return amax;
    }
    let inv = 1.0 / amax;
    amax * entries.map(|z| (z * inv).norm_sqr()).sum::<f64>().sqrt()
}

/// ‖T‖_F of a row-major m×m upper triangular matrix (the strict lower part is
/// ignored).
fn triangle_frobenius(t: &[C64], m: usize) -> f64 {
    frobenius((0..m).flat_map(move |i| t[i * m + i..(i + 1) * m].iter().copied()))
}

/// Relative Henrici departure ‖N‖_F/‖T‖_F of the row-major m×m Schur factor T
/// (0 for T = 0).
pub fn departure(t: &[C64], m: usize) -> f64 {
    assert_eq!(t.len(), m * m, "Schur factor slice has the wrong length");
    let fro = triangle_frobenius(t, m);
    if fro == 0.0 {
        return 0.0;
    }
    let off = frobenius((0..m).flat_map(move |i| t[i * m + i + 1..(i + 1) * m].iter().copied()));
    off / fro
}

/// Unit eigenvectors of the row-major m×m upper triangular T into the columns
/// of the row-major `y`: column k solves (T − t_kk I) y = 0 with y_j = 0 for
/// j > k and y_k real and positive. Pivots below ε·max|t_ij| are raised to that
/// bound, so a defective T gives finite, nearly parallel columns. Inside a
/// cluster of eigenvalues (within [`CLUSTER`]·‖T‖_F) a component whose
/// right-hand side is rounding ([`ROUNDING`]·ε‖T‖_F times the vector's size)
/// is zero rather than rounding divided by rounding, so a repeated eigenvalue
/// of a normal T gets orthonormal eigenvectors (see
/// `back_substitute_in_clusters`). `x` is a workspace of length m.
pub fn triangular_eigenvectors(t: &[C64], m: usize, x: &mut [C64], y: &mut [C64]) {
    assert!(t.len() == m * m && y.len() == m * m && x.len() == m);
    let floor = pivot_floor(t, m);
    let scale = triangle_frobenius(t, m);
    let cluster = (CLUSTER * scale, ROUNDING * f64::EPSILON * scale);
    for k in 0..m {
        back_substitute_in_clusters(t, m, k, floor, cluster, x);
        let nrm = frobenius(x[..=k].iter().copied());
        let inv = 1.0 / nrm;
        for (i, z) in x.iter().enumerate() {
            y[i * m + k] = *z * inv;
        }
    }
}

/// Workspace of [`eigvec_condition`] for one size: an SVD solver and buffers,
/// allocated once.
#[derive(Debug, Clone)]
pub struct ConditionWorkspace {
    m: usize,
    svd: SvdSolver,
    matrix: Vec<C64>,
    x: Vec<C64>,
    sigma: Vec<f64>,
    seen: Vec<bool>,
}

impl ConditionWorkspace {
    /// A workspace for m×m Schur factors (m ≥ 1).
    pub fn new(m: usize) -> Self {
        ConditionWorkspace {
            m,
            svd: SvdSolver::new(m),
            matrix: vec![ZERO; m * m],
            x: vec![ZERO; m],
            sigma: vec![0.0; m],
            seen: vec![false; m],
        }
    }

    /// The matrix size this workspace handles.
    pub fn size(&self) -> usize {
        self.m
    }
}

/// κ₂ of the unit-column eigenvector matrix of A = Q T Qᴴ from the row-major
/// m×m Schur factor T; infinite when A is defective: an eigenvalue cluster
/// (pairwise within [`CLUSTER`]·‖T‖_F of its first member) whose geometric
/// multiplicity, the number of singular values of T − μI (μ the cluster mean)
/// below [`NULLITY`]·‖T‖_F, is smaller than its size; infinite too when the
/// eigenvectors are dependent to working accuracy.
pub fn eigvec_condition(t: &[C64], ws: &mut ConditionWorkspace) -> Result<f64, LinalgError> {
    let m = ws.m;
    if defective_modulus(t, ws)?.is_some() {
        return Ok(f64::INFINITY);
    }
    triangular_eigenvectors(t, m, &mut ws.x, &mut ws.matrix);
    ws.svd.singular_values(&ws.matrix, &mut ws.sigma)?;
    let (hi, lo) = (ws.sigma[0], ws.sigma[m - 1]);
    Ok(if lo <= f64::EPSILON * hi {
        f64::INFINITY
    } else {
        hi / lo
    })
}

/// The largest modulus among the defective eigenvalue clusters of A = Q T Qᴴ
/// (clusters as in [`eigvec_condition`]), or None when no cluster is defective.
pub fn defective_modulus(
    t: &[C64],
    ws: &mut ConditionWorkspace,
) -> Result<Option<f64>, LinalgError> {
    let m = ws.m;
    assert_eq!(t.len(), m * m, "Schur factor slice has the wrong length");
    let scale = triangle_frobenius(t, m);
    if !scale.is_finite() {
        return Err(LinalgError::NonFinite);
    }
    ws.seen.fill(false);
    let mut worst: Option<f64> = None;
    for i in 0..m {
        if ws.seen[i] {
            continue;
        }
        let li = t[i * m + i];
        let mut size = 0usize;
        let mut sum = ZERO;
        for j in i..m {
            let lj = t[j * m + j];
            if !ws.seen[j] && modulus(lj - li) <= CLUSTER * scale {
                ws.seen[j] = true;
                size += 1;
                sum += lj;
            }
        }
        let mean = sum / size as f64;
        if size > 1 && nullity(t, mean, scale, ws)? < size {
            worst = Some(worst.map_or(modulus(mean), |w: f64| w.max(modulus(mean))));
        }
    }
    Ok(worst)
}

/// The number of singular values of T − μI (upper part of T) at most
/// [`NULLITY`]·`scale`.
fn nullity(
    t: &[C64],
    mu: C64,
    scale: f64,
    ws: &mut ConditionWorkspace,
) -> Result<usize, LinalgError> {
    let m = ws.m;
    for i in 0..m {
        for j in 0..m {
            ws.matrix[i * m + j] = match i.cmp(&j) {
                std::cmp::Ordering::Greater => ZERO,
                std::cmp::Ordering::Equal => t[i * m + j] - mu,
                std::cmp::Ordering::Less => t[i * m + j],
            };
        }
    }
    ws.svd.singular_values(&ws.matrix, &mut ws.sigma)?;
    Ok(ws.sigma.iter().filter(|s| **s <= NULLITY * scale).count())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(re: f64, im: f64) -> C64 {
        C64::new(re, im)
    }

    #[test]
    fn departure_of_a_huge_triangle_does_not_overflow() {
        // [[a, b], [0, d]] · 1e300: dep/‖T‖ = |b|/√(|a|² + |b|² + |d|²) = 4/√26.
        let t = [c(3e300, 0.0), c(0.0, 4e300), ZERO, c(-1e300, 0.0)];
        let want = 4.0 / 26f64.sqrt();
        assert!((departure(&t, 2) - want).abs() <= 4.0 * f64::EPSILON * want);
    }

    #[test]
    fn diagonal_matrix_has_condition_one_and_a_jordan_block_is_defective() {
        let mut ws = ConditionWorkspace::new(3);
        let diag = [
            c(1.0, 0.0),
            ZERO,
            ZERO,
            ZERO,
            c(2.0, 0.0),
            ZERO,
            ZERO,
            ZERO,
            c(0.0, 3.0),
        ];
        assert_eq!(eigvec_condition(&diag, &mut ws), Ok(1.0));
        let jordan = [
            c(1.0, 0.0),
            c(1.0, 0.0),
            ZERO,
            ZERO,
            c(1.0, 0.0),
            ZERO,
            ZERO,
            ZERO,
            c(5.0, 0.0),
        ];
        assert_eq!(eigvec_condition(&jordan, &mut ws), Ok(f64::INFINITY));
    }

    #[test]
    fn a_repeated_eigenvalue_with_rounding_coupling_has_orthonormal_eigenvectors() {
        // T normal up to rounding: equal eigenvalues (to 1e-17) coupled by 3e-17.
        // Back-substitution would divide 3e-17 by 1e-17 and return nearly
        // parallel vectors; the eigenspace is the whole plane, spanned by e₁, e₂.
        let mut ws = ConditionWorkspace::new(2);
        let t = [c(1.0, 0.0), c(3e-17, 0.0), ZERO, c(1.0 + 1e-16, 0.0)];
        assert_eq!(eigvec_condition(&t, &mut ws), Ok(1.0));
    }

    #[test]
    fn close_eigenvalues_coupled_above_rounding_keep_nearly_parallel_eigenvectors() {
        // T = [[1, 1e-8], [0, 1 + 1e-10]] (derived here): the eigenvectors are e₁
        // and (100, 1)/√10001, unit columns with cosine c = 100/√10001, so
        // κ₂(V) = √((1 + c)/(1 − c)) ≈ 200: a genuine near-defect, not rounding.
        let mut ws = ConditionWorkspace::new(2);
        let t = [c(1.0, 0.0), c(1e-8, 0.0), ZERO, c(1.0 + 1e-10, 0.0)];
        let cos = 100.0 / 10001f64.sqrt();
        let want = ((1.0 + cos) / (1.0 - cos)).sqrt();
        let got = eigvec_condition(&t, &mut ws).unwrap();
        assert!((got - want).abs() <= 1e-6 * want, "{got} vs {want}");
    }
}
