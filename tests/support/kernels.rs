//! Shared helpers of the kernel tests: the scaled test ratios of the LAPACK
//! test programs for the eigen, Schur, SVD and LU kernels, and one checker that
//! runs every kernel on a matrix and returns all ratios.
//!
//! Ratios, with the 1-norm ‖·‖₁ (largest column sum of moduli) and ε =
//! `f64::EPSILON` (LAPACK's `dlamch('P')`), in the form of LAPACK's `zhst01`
//! (min(W, ‖A‖)/max(floor, ‖A‖ε)/n, which cannot overflow and is at most
//! 1/(nε)):
//! * Schur (`zhst01`): W = ‖A − QTQᴴ‖₁; unitarity (`zunt01`) ‖I − QᴴQ‖₁/(nε);
//! * eigenvectors (`zget22`): W = ‖AV − VΛ‖₁ with unit-2-norm columns; zget22
//!   also divides by ‖V‖₁ ≥ 1, so this ratio is the stricter one;
//! * SVD (`zbdt01`, `zunt01`): W = ‖A − UΣVᴴ‖₁, ‖I − UᴴU‖₁/(nε), ‖I − VᴴV‖₁/(nε),
//!   and max_i |σ_i − σ_i^ref|/(nεσ₁) against nalgebra's SVD;
//! * LU (`zget02`): ‖B − AX‖₁/(n‖A‖₁‖X‖₁ε).
//!
//! The floor differs from LAPACK's n·UNFL/ε (about n·1e-292, which would let
//! any matrix near 1e-300 pass): here it is n·2^-1074, n times the spacing of
//! subnormal numbers, so matrices near the underflow threshold are checked at
//! full accuracy and only subnormal results are allowed their rounding. Every
//! identity is homogeneous, so the ratios are computed on copies scaled by a
//! power of two into [1, 2) (exact for the stored values), which keeps the
//! check itself free of overflow and underflow.

use kgain::linalg::{reference, EigSolver, LinalgError, LuSolver, SchurSolver, SvdSolver};
use num_complex::Complex64 as C64;

const EPS: f64 = f64::EPSILON;
const ZERO: C64 = C64::new(0.0, 0.0);

/// The thresholds of the brief (LAPACK's test programs use 30 for all).
pub const EIGEN_LIMIT: f64 = 20.0;
pub const SCHUR_LIMIT: f64 = 20.0;
pub const SVD_LIMIT: f64 = 35.0;
pub const LU_LIMIT: f64 = 20.0;

/// k with max|re|,|im| of `a` times 2^k in [1, 2) (0 for a zero matrix).
pub fn exponent_to_unit(a: &[C64]) -> i32 {
    let amax = a
        .iter()
        .map(|z| z.re.abs().max(z.im.abs()))
        .fold(0.0, f64::max);
    if amax == 0.0 {
        0
    } else {
        -(amax.log2().floor() as i32)
    }
}

/// x·2^k in two exact steps (2^k itself may be out of range).
pub fn pow2(x: f64, k: i32) -> f64 {
    x * 2f64.powi(k / 2) * 2f64.powi(k - k / 2)
}

/// The entries times 2^k.
pub fn scaled(a: &[C64], k: i32) -> Vec<C64> {
    a.iter()
        .map(|z| C64::new(pow2(z.re, k), pow2(z.im, k)))
        .collect()
}

/// ‖A‖₁ of a row-major rows×cols matrix.
pub fn norm1(a: &[C64], rows: usize, cols: usize) -> f64 {
    (0..cols)
        .map(|j| (0..rows).map(|i| a[i * cols + j].norm()).sum::<f64>())
        .fold(0.0, f64::max)
}

/// The row-major product of an r×k and a k×c matrix.
pub fn matmul(a: &[C64], b: &[C64], r: usize, k: usize, c: usize) -> Vec<C64> {
    let mut out = vec![ZERO; r * c];
    for i in 0..r {
        for l in 0..k {
            let x = a[i * k + l];
            for j in 0..c {
                out[i * c + j] += x * b[l * c + j];
            }
        }
    }
    out
}

/// The conjugate transpose of a row-major n×n matrix.
pub fn adjoint(a: &[C64], n: usize) -> Vec<C64> {
    (0..n * n).map(|k| a[(k % n) * n + k / n].conj()).collect()
}

/// min(w, anorm)/max(floor, anorm·ε)/n: the zhst01 form of a residual ratio.
/// An exact residual is 0 whatever the scale (the floor may underflow to 0).
pub fn ratio(w: f64, anorm: f64, n: usize, floor: f64) -> f64 {
    if w == 0.0 {
        return 0.0;
    }
    w.min(anorm) / floor.max(anorm * EPS) / n as f64
}

/// The floor n·2^-1074 in units where the data were scaled by 2^k.
fn floor(n: usize, k: i32) -> f64 {
    n as f64 * pow2(f64::from_bits(1), k)
}

/// ‖I − QᴴQ‖₁/(nε) for a row-major n×n Q.
pub fn unitarity(q: &[C64], n: usize) -> f64 {
    let mut g = matmul(&adjoint(q, n), q, n, n, n);
    for i in 0..n {
        g[i * n + i] -= 1.0;
    }
    norm1(&g, n, n) / (n as f64 * EPS)
}

/// The Schur ratio (zhst01) of A = Q T Qᴴ.
pub fn schur_ratio(a: &[C64], t: &[C64], q: &[C64], n: usize) -> f64 {
    let k = exponent_to_unit(a);
    let (a, t) = (scaled(a, k), scaled(t, k));
    let qt = matmul(q, &t, n, n, n);
    let qtq = matmul(&qt, &adjoint(q, n), n, n, n);
    let r: Vec<C64> = a.iter().zip(&qtq).map(|(x, y)| x - y).collect();
    ratio(norm1(&r, n, n), norm1(&a, n, n), n, floor(n, k))
}

/// The eigenvector ratio (zget22 without the ‖V‖ factor) of AV = VΛ.
pub fn eigen_ratio(a: &[C64], values: &[C64], v: &[C64], n: usize) -> f64 {
    let k = exponent_to_unit(a);
    let (a, values) = (scaled(a, k), scaled(values, k));
    let mut r = matmul(&a, v, n, n, n);
    for i in 0..n {
        for j in 0..n {
            r[i * n + j] -= v[i * n + j] * values[j];
        }
    }
    ratio(norm1(&r, n, n), norm1(&a, n, n), n, floor(n, k))
}

/// The SVD ratio (zbdt01) of A = U Σ Vᴴ.
pub fn svd_ratio(a: &[C64], sigma: &[f64], u: &[C64], v: &[C64], n: usize) -> f64 {
    let k = exponent_to_unit(a);
    let a = scaled(a, k);
    let mut us = u.to_vec();
    for i in 0..n {
        for j in 0..n {
            us[i * n + j] *= pow2(sigma[j], k);
        }
    }
    let usv = matmul(&us, &adjoint(v, n), n, n, n);
    let r: Vec<C64> = a.iter().zip(&usv).map(|(x, y)| x - y).collect();
    ratio(norm1(&r, n, n), norm1(&a, n, n), n, floor(n, k))
}

/// max_i |σ_i − σ_i^ref|/(nεσ₁), floored like the residuals.
pub fn sigma_ratio(sigma: &[f64], want: &[f64], n: usize) -> f64 {
    let top = want[0].max(sigma[0]);
    let err = sigma
        .iter()
        .zip(want)
        .map(|(x, y)| (x - y).abs())
        .fold(0.0, f64::max);
    if top == 0.0 || err == 0.0 {
        return err;
    }
    let k = -(top.log2().floor() as i32);
    pow2(err, k) / floor(n, k).max(pow2(top, k) * EPS) / n as f64
}

/// The LU ratio (zget02) of AX = B for n×nrhs X and B.
pub fn lu_ratio(a: &[C64], x: &[C64], b: &[C64], n: usize, nrhs: usize) -> f64 {
    let (ka, kx) = (exponent_to_unit(a), exponent_to_unit(x));
    let (a, x, b) = (scaled(a, ka), scaled(x, kx), scaled(b, ka + kx));
    let ax = matmul(&a, &x, n, n, nrhs);
    let r: Vec<C64> = b.iter().zip(&ax).map(|(p, q)| p - q).collect();
    let scale = norm1(&a, n, n) * norm1(&x, n, nrhs);
    let w = norm1(&r, n, nrhs);
    if w == 0.0 {
        return 0.0;
    }
    w / floor(n, ka + kx).max(scale * EPS) / n as f64
}

/// All ratios of one matrix, and what the LU solve reported.
#[derive(Debug, Clone, Copy, Default)]
pub struct Ratios {
    pub eigen: f64,
    pub schur: f64,
    pub schur_unitary: f64,
    pub svd: f64,
    pub svd_u: f64,
    pub svd_v: f64,
    pub sigma_vs_reference: f64,
    /// `None` when the LU solver reported A singular (checked separately).
    pub lu: Option<f64>,
}

impl Ratios {
    /// The elementwise maximum (a missing LU ratio counts as 0).
    pub fn max(self, o: Ratios) -> Ratios {
        Ratios {
            eigen: self.eigen.max(o.eigen),
            schur: self.schur.max(o.schur),
            schur_unitary: self.schur_unitary.max(o.schur_unitary),
            svd: self.svd.max(o.svd),
            svd_u: self.svd_u.max(o.svd_u),
            svd_v: self.svd_v.max(o.svd_v),
            sigma_vs_reference: self.sigma_vs_reference.max(o.sigma_vs_reference),
            lu: Some(self.lu.unwrap_or(0.0).max(o.lu.unwrap_or(0.0))),
        }
    }

    /// Panics with `context` and the ratios if any exceeds its limit.
    #[track_caller]
    pub fn assert_within_limits(&self, context: &str) {
        let ok = self.eigen <= EIGEN_LIMIT
            && self.schur <= SCHUR_LIMIT
            && self.schur_unitary <= SCHUR_LIMIT
            && self.svd <= SVD_LIMIT
            && self.svd_u <= SVD_LIMIT
            && self.svd_v <= SVD_LIMIT
            && self.sigma_vs_reference <= SVD_LIMIT
            && self.lu.unwrap_or(0.0) <= LU_LIMIT;
        assert!(ok, "{context}: test ratio over its limit: {self:?}");
    }
}

/// Every kernel for one size, with its output buffers.
pub struct Kernels {
    pub n: usize,
    eig: EigSolver,
    schur: SchurSolver,
    svd: SvdSolver,
    lu: LuSolver,
}

impl Kernels {
    pub fn new(n: usize) -> Self {
        Kernels {
            n,
            eig: EigSolver::new(n),
            schur: SchurSolver::new(n),
            svd: SvdSolver::new(n),
            lu: LuSolver::new(n),
        }
    }

    /// Runs every kernel on `a` (LU with the right-hand sides `b`, n×nrhs) and
    /// returns the ratios; a kernel error is an `Err` naming the kernel.
    pub fn check(&mut self, a: &[C64], b: &[C64], nrhs: usize) -> Result<Ratios, String> {
        let n = self.n;
        let fail = |what: &str, e: LinalgError| format!("{what} failed on an n = {n} matrix: {e}");
        let mut values = vec![ZERO; n];
        let mut vectors = vec![ZERO; n * n];
        self.eig
            .eigenvalues_and_vectors(a, &mut values, &mut vectors)
            .map_err(|e| fail("eigenvectors", e))?;
        let (mut t, mut q) = (vec![ZERO; n * n], vec![ZERO; n * n]);
        self.schur
            .decompose(a, &mut t, &mut q)
            .map_err(|e| fail("Schur", e))?;
        for i in 0..n {
            if t[i * n..i * n + i].iter().any(|z| *z != ZERO) {
                return Err(format!("T not upper triangular in row {i}"));
            }
        }
        let (mut sigma, mut u, mut v) = (vec![0.0; n], vec![ZERO; n * n], vec![ZERO; n * n]);
        self.svd
            .decompose(a, &mut sigma, Some(&mut u), Some(&mut v))
            .map_err(|e| fail("SVD", e))?;
        if sigma.windows(2).any(|w| w[0] < w[1]) || sigma.iter().any(|s| s.is_nan() || *s < 0.0) {
            return Err(format!("singular values not descending: {sigma:?}"));
        }
        let want = reference::singular_values(a, n).map_err(|e| fail("reference SVD", e))?;
        let norm2 = self.svd.norm2(a).map_err(|e| fail("norm2", e))?;
        let smin = self.svd.sigma_min(a).map_err(|e| fail("sigma_min", e))?;
        if norm2 != sigma[0] || smin != sigma[n - 1] {
            return Err(format!(
                "norm2/sigma_min {norm2}/{smin} differ from {sigma:?}"
            ));
        }
        let mut x = b.to_vec();
        let lu = match self.lu.solve(a, &mut x, nrhs) {
            Ok(()) => Some(lu_ratio(a, &x, b, n, nrhs)),
            Err(LinalgError::Singular) => {
                check_singular_verdict(&want, a, n)?;
                None
            }
            Err(e) => return Err(fail("LU", e)),
        };
        Ok(Ratios {
            eigen: eigen_ratio(a, &values, &vectors, n),
            schur: schur_ratio(a, &t, &q, n),
            schur_unitary: unitarity(&q, n),
            svd: svd_ratio(a, &sigma, &u, &v, n),
            svd_u: unitarity(&u, n),
            svd_v: unitarity(&v, n),
            sigma_vs_reference: sigma_ratio(&sigma, &want, n),
            lu,
        })
    }
}

/// A "singular" verdict of the LU solver must come with a small σ_min (of the
/// reference SVD, `sigma`): the
/// pivot test (|u_kk| ≤ nε·max|a_ij|) and the backward error of elimination
/// (Higham, Accuracy and Stability, Thm 9.3: |ΔA| ≤ γ_n|L||U|, growth factor at
/// most 2^(n−1) with partial pivoting) put A within n·(nε + γ_n·n·2^(n−1))·max|a_ij|
/// of a singular matrix in the 2-norm.
fn check_singular_verdict(sigma: &[f64], a: &[C64], n: usize) -> Result<(), String> {
    let amax = a.iter().map(|z| z.norm()).fold(0.0, f64::max);
    let nf = n as f64;
    let gamma = nf * EPS / (1.0 - nf * EPS);
    let bound = 2.0 * nf * (nf * EPS + gamma * nf * 2f64.powi(n as i32 - 1)) * amax;
    if sigma[n - 1] <= bound {
        Ok(())
    } else {
        Err(format!(
            "LU reported singular but σ_min = {:e} > {bound:e}",
            sigma[n - 1]
        ))
    }
}
