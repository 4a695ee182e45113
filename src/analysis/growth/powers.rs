//! Norms of the powers Tⁿ of a small upper triangular matrix, without
//! allocation: the powers are formed in place with a running scale (so they
//! cannot overflow or underflow), and at each n a certified bracket
//! lower ≤ ‖Tⁿ‖₂ ≤ upper is read off cheaply; the exact 2-norm (one SVD) is
//! taken only where the caller asks for it.
//!
//! Bounds (Golub & Van Loan, Matrix Computations, 4th ed., §2.3): with Tⁿ = D + N,
//! D its diagonal and N its strictly upper part,
//! ‖Tⁿ‖₂ ≤ min(‖Tⁿ‖_F, max|d_i| + ‖N‖_F) — the second is tight when T is nearly
//! normal, where the Frobenius norm overestimates by up to √m — and
//! ‖Tⁿ‖₂ ≥ max(largest column norm, largest row norm, max|d_i|).
//!
//! Where the bracket cannot rule out that ‖Tⁿ‖₂ exceeds the caller's
//! threshold b, a Cholesky factorisation of b'²I − (Tⁿ)ᴴTⁿ decides it before
//! any SVD: b'² is b² less a margin for the rounding of the product and of the
//! factorisation (Higham, Accuracy and Stability of Numerical Algorithms, 2nd
//! ed., Thm 10.3: the computed factor is exact for a matrix within
//! γ_{m+1}|Rᴴ||R| of the one factored), so a factorisation that completes with
//! positive pivots proves ‖Tⁿ‖₂ ≤ b, and only the rest need the exact norm.
//! About m³/3 complex multiply-adds against an SVD's several Jacobi sweeps.

use crate::linalg::nonnormal::frobenius;
use crate::linalg::SvdSolver;
use num_complex::Complex64 as C64;

/// Rescale the running power when its Frobenius norm leaves [1e-100, 1e100].
const RESCALE: f64 = 1e100;

/// Relative margin on the tail bound for the rounding of the computed powers.
const TAIL_MARGIN: f64 = 1e-10;

/// Reusable buffers for the powers of an m×m triangular matrix.
pub struct PowerWorkspace {
    m: usize,
    power: Vec<C64>,
    next: Vec<C64>,
    rows: Vec<f64>,
    cols: Vec<f64>,
    gram: Vec<C64>,
    svd: SvdSolver,
}

/// The cheap certified bracket of ‖Tⁿ‖₂ at one n.
#[derive(Debug, Clone, Copy)]
pub struct Bracket {
    /// A lower bound.
    pub lower: f64,
    /// An upper bound.
    pub upper: f64,
}

impl PowerWorkspace {
    /// Buffers for m×m matrices (m ≥ 1).
    pub fn new(m: usize) -> Self {
        Self {
            m,
            power: vec![C64::new(0.0, 0.0); m * m],
            next: vec![C64::new(0.0, 0.0); m * m],
            rows: vec![0.0; m],
            cols: vec![0.0; m],
            gram: vec![C64::new(0.0, 0.0); m * m],
            svd: SvdSolver::new(m),
        }
    }

    /// The matrix size.
    pub fn size(&self) -> usize {
        self.m
    }

    /// Walks n = 0..=steps over the powers of the row-major upper triangular `t`
    /// (strict lower part ignored). At each n, `want(n, bracket)` says whether
    /// the exact ‖Tⁿ‖₂ is needed: `None` for no, `Some(b)` for "unless it is
    /// proved at most b" (the Cholesky test of the module docs; b ≤ 0 always
    /// asks); where it is needed `exact(n, value)` receives it (NaN when the
    /// SVD fails).
    ///
    /// The walk ends early when the rest cannot matter: at checkpoints n = 2ᵏ,
    /// every later power Tʲ = (Tⁿ)^q Tʳ (q ≥ 1, r < n) has
    /// ‖Tʲ‖₂ ≤ u_n · max_{r<n} u_r (u the upper bounds) when u_n ≤ 1, and when
    /// that tail bound is at most `floor(n)` — the caller's smallest value of
    /// interest over the steps after n — the remaining steps are skipped.
    pub fn walk(
        &mut self,
        t: &[C64],
        steps: usize,
        mut want: impl FnMut(usize, Bracket) -> Option<f64>,
        mut exact: impl FnMut(usize, f64),
        floor: impl Fn(usize) -> f64,
    ) {
        let m = self.m;
        assert_eq!(
            t.len(),
            m * m,
            "triangular factor slice has the wrong length"
        );
        let zero = C64::new(0.0, 0.0);
        self.power.fill(zero);
        for i in 0..m {
            self.power[i * m + i] = C64::new(1.0, 0.0);
        }
        let mut log_scale = 0.0f64;
        let mut widest_before = 0.0f64;
        for n in 0..=steps {
            if n > 0 {
                triangular_product(&self.power, t, &mut self.next, m);
                std::mem::swap(&mut self.power, &mut self.next);
            }
            let (mut b, mut f) = bracket(&self.power, m, &mut self.rows, &mut self.cols);
            if !f.is_finite() {
                // squares overflowed: the scaled (two-pass) Frobenius norm
                f = frobenius(self.power.iter().copied());
            }
            if f.is_finite() && f > RESCALE || (f < 1.0 / RESCALE && f > 0.0) {
                let inv = 1.0 / f;
                for z in self.power.iter_mut() {
                    *z *= inv;
                }
                log_scale += f.ln();
                (b, f) = bracket(&self.power, m, &mut self.rows, &mut self.cols);
            }
            let s = log_scale.exp();
            let scaled = Bracket {
                lower: b.lower * s,
                upper: b.upper * s,
            };
            if let Some(threshold) = want(n, scaled) {
                let bound = threshold / s;
                if !(bound > 0.0 && at_most(&self.power, m, bound, f, &mut self.gram)) {
                    let v = self.svd.norm2(&self.power).map_or(f64::NAN, |v| v * s);
                    exact(n, v);
                }
            }
            if n >= 1 && n.is_power_of_two() && n < steps && scaled.upper <= 1.0 {
                let tail = scaled.upper * widest_before * (1.0 + TAIL_MARGIN);
                if tail <= floor(n) {
                    return;
                }
            }
            widest_before = widest_before.max(scaled.upper);
        }
    }
}

/// Whether ‖P‖₂ ≤ `bound` is proved for the row-major upper triangular P
/// (Frobenius norm `frob`): the Cholesky factorisation of
/// (bound² − margin)·I − PᴴP completes with positive pivots. The margin,
/// 4m²ε(bound² + ‖P‖_F²), covers the rounding of PᴴP (at most mε‖P‖_F² in
/// each entry's modulus sum) and the factorisation's backward error (at most
/// γ_{m+1}·m·‖A‖₂ in norm for the matrix A factored), so success means
/// λ_max(PᴴP) ≤ bound². `gram` (m×m) is workspace; false when unsure.
fn at_most(p: &[C64], m: usize, bound: f64, frob: f64, gram: &mut [C64]) -> bool {
    let b2 = bound * bound;
    let margin = 4.0 * (m * m) as f64 * f64::EPSILON * (b2 + frob * frob);
    let shift = b2 - margin;
    if !(shift > 0.0 && shift.is_finite()) {
        return false;
    }
    // the upper triangle of A = shift·I − PᴴP (P upper triangular: column i of
    // P is zero below row i, so (PᴴP)_ij sums over k ≤ min(i, j) = i)
    for i in 0..m {
        for j in i..m {
            let dot: C64 = (0..=i).map(|k| p[k * m + i].conj() * p[k * m + j]).sum();
            gram[i * m + j] = if i == j {
                C64::new(shift - dot.re, 0.0)
            } else {
                -dot
            };
        }
    }
    // A = RᴴR in place (R upper triangular, row by row)
    for i in 0..m {
        let d = gram[i * m + i].re - (0..i).map(|k| gram[k * m + i].norm_sqr()).sum::<f64>();
        if d.is_nan() || d <= 0.0 {
            return false;
        }
        let r = d.sqrt();
        gram[i * m + i] = C64::new(r, 0.0);
        for j in i + 1..m {
            let dot: C64 = (0..i)
                .map(|k| gram[k * m + i].conj() * gram[k * m + j])
                .sum();
            gram[i * m + j] = (gram[i * m + j] - dot) / r;
        }
    }
    true
}

/// out = p·t for row-major upper triangular p and t (only the upper triangle
/// of out is written; its strict lower part is set to zero).
fn triangular_product(p: &[C64], t: &[C64], out: &mut [C64], m: usize) {
    for i in 0..m {
        for j in 0..m {
            out[i * m + j] = if j < i {
                C64::new(0.0, 0.0)
            } else {
                (i..=j).map(|k| p[i * m + k] * t[k * m + j]).sum()
            };
        }
    }
}

/// The cheap bracket of ‖P‖₂ for a row-major upper triangular P and its
/// Frobenius norm, in one pass of plain sums of squares: the running power is
/// kept within [1e-100, 1e100] in Frobenius norm, so its squared entries
/// neither overflow nor lose the largest one to underflow.
fn bracket(p: &[C64], m: usize, rows: &mut [f64], cols: &mut [f64]) -> (Bracket, f64) {
    rows.fill(0.0);
    cols.fill(0.0);
    let (mut diag, mut strict) = (0.0f64, 0.0f64);
    for i in 0..m {
        for j in i..m {
            let a = p[i * m + j].norm_sqr();
            rows[i] += a;
            cols[j] += a;
            if j == i {
                diag = diag.max(a);
            } else {
                strict += a;
            }
        }
    }
    let full = rows.iter().sum::<f64>();
    let widest = rows
        .iter()
        .chain(cols.iter())
        .fold(0.0f64, |a, b| a.max(*b));
    let b = Bracket {
        lower: widest.max(diag).sqrt(),
        upper: full.sqrt().min(diag.sqrt() + strict.sqrt()),
    };
    (b, full.sqrt())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn exact_all(t: &[C64], m: usize, steps: usize) -> Vec<(Bracket, f64)> {
        let mut ws = PowerWorkspace::new(m);
        let mut brackets = Vec::new();
        let mut values = Vec::new();
        ws.walk(
            t,
            steps,
            |_, b| {
                brackets.push(b);
                Some(0.0)
            },
            |_, v| values.push(v),
            |_| 0.0,
        );
        brackets.into_iter().zip(values).collect()
    }

    #[test]
    fn brackets_hold_the_exact_norm_of_a_jordan_block() {
        // J = [[λ, 1], [0, λ]]: Jⁿ = [[λⁿ, nλⁿ⁻¹], [0, λⁿ]], whose 2-norm for
        // |λ| = 1 is (n + √(n² + 4))/2 (closed form of the 2×2 singular values).
        let l = C64::from_polar(1.0, 0.3);
        let t = [l, C64::new(1.0, 0.0), C64::new(0.0, 0.0), l];
        for (n, (b, v)) in exact_all(&t, 2, 40).into_iter().enumerate() {
            let n = n as f64;
            let closed = (n + (n * n + 4.0).sqrt()) / 2.0;
            assert!(
                (v - closed).abs() <= 1e-12 * closed,
                "n {n}: {v} vs {closed}"
            );
            assert!(b.lower <= v * (1.0 + 1e-14) && v <= b.upper * (1.0 + 1e-14));
        }
    }

    #[test]
    fn the_upper_bound_is_tight_for_a_diagonal_matrix() {
        let t = [
            C64::new(0.9, 0.1),
            C64::new(0.0, 0.0),
            C64::new(0.0, 0.0),
            C64::new(0.0, -0.5),
        ];
        for (b, v) in exact_all(&t, 2, 10) {
            assert!((b.upper - v).abs() <= 1e-15 * v.max(1e-300));
            assert!((b.lower - v).abs() <= 1e-15 * v.max(1e-300));
        }
    }

    #[test]
    fn entries_whose_squares_overflow_are_scaled() {
        let t = [
            C64::new(1e200, 0.0),
            C64::new(1e200, 0.0),
            C64::new(0.0, 0.0),
            C64::new(1e-300, 0.0),
        ];
        let first = exact_all(&t, 2, 1)[1];
        let closed = 2f64.sqrt() * 1e200;
        assert!((first.1 - closed).abs() <= 1e-14 * closed, "{}", first.1);
        assert!(
            first.0.lower <= first.1 * (1.0 + 1e-14) && first.1 <= first.0.upper * (1.0 + 1e-14)
        );
    }

    #[test]
    fn huge_powers_are_scaled_not_overflowed() {
        let t = [C64::new(1e3, 0.0)];
        // 1e3^100 = 1e300 is finite, the running power passes 1e100 twice.
        let last = exact_all(&t, 1, 100).pop().unwrap();
        assert!(
            (last.1.ln() - 100.0 * 1e3f64.ln()).abs() < 1e-9,
            "{}",
            last.1
        );
    }
}

#[cfg(test)]
mod exclusion {
    use super::*;
    use crate::linalg::SvdSolver;

    /// A small deterministic generator (xorshift), entries in [−1, 1).
    fn triangular(seed: &mut u64, m: usize, strict: f64) -> Vec<C64> {
        let mut next = || {
            *seed ^= *seed << 13;
            *seed ^= *seed >> 7;
            *seed ^= *seed << 17;
            (*seed >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
        };
        let mut p = vec![C64::new(0.0, 0.0); m * m];
        for i in 0..m {
            for j in i..m {
                let scale = if i == j { 1.0 } else { strict };
                p[i * m + j] = C64::new(next(), next()) * scale;
            }
        }
        p
    }

    #[test]
    fn the_cholesky_test_never_passes_a_bound_below_the_norm() {
        // against the SVD's 2-norm: every bound 1e-12 below it is refused,
        // and bounds 1e-6 above it are proved (normal-ish and strongly
        // non-normal triangular matrices, m = 1..6)
        let mut seed = 0x2545_f491_4f6c_dd1d_u64;
        let mut proved = 0;
        let mut cases = 0;
        for m in 1..=6 {
            let mut svd = SvdSolver::new(m);
            let mut gram = vec![C64::new(0.0, 0.0); m * m];
            for strict in [1e-9, 0.3, 3.0, 100.0] {
                for _ in 0..200 {
                    let p = triangular(&mut seed, m, strict);
                    let frob = p.iter().map(|z| z.norm_sqr()).sum::<f64>().sqrt();
                    let norm = svd.norm2(&p).unwrap();
                    assert!(!at_most(&p, m, norm * (1.0 - 1e-12), frob, &mut gram));
                    cases += 1;
                    if at_most(&p, m, norm * (1.0 + 1e-6), frob, &mut gram) {
                        proved += 1;
                    }
                }
            }
        }
        assert_eq!(proved, cases, "bounds 1e-6 above the norm not proved");
    }

    #[test]
    fn a_jordan_block_is_proved_below_its_closed_form_only() {
        // J = [[1, 1], [0, 1]]: ‖J‖₂ = (1 + √5)/2
        let one = C64::new(1.0, 0.0);
        let j = [one, one, C64::new(0.0, 0.0), one];
        let golden = (1.0 + 5f64.sqrt()) / 2.0;
        let mut gram = vec![C64::new(0.0, 0.0); 4];
        let frob = 3f64.sqrt();
        assert!(at_most(&j, 2, golden * (1.0 + 1e-9), frob, &mut gram));
        assert!(!at_most(&j, 2, golden * (1.0 - 1e-9), frob, &mut gram));
        assert!(!at_most(&j, 2, 0.0, frob, &mut gram));
    }
}

#[cfg(test)]
mod tail {
    use super::*;

    #[test]
    fn a_contraction_stops_once_its_tail_is_below_the_floor() {
        // T = diag(0.5, 0.25) + 0.1 e₁e₂ᵀ: ‖T‖₂ < 1, so the tail bound falls
        // below a floor of 1 at the first checkpoint, n = 1.
        let t = [
            C64::new(0.5, 0.0),
            C64::new(0.1, 0.0),
            C64::new(0.0, 0.0),
            C64::new(0.25, 0.0),
        ];
        let mut seen = Vec::new();
        PowerWorkspace::new(2).walk(
            &t,
            50,
            |n, _| {
                seen.push(n);
                None
            },
            |_, _| {},
            |_| 1.0,
        );
        assert_eq!(seen, vec![0, 1]);
    }

    #[test]
    fn a_jordan_block_on_the_circle_never_stops_early() {
        let l = C64::new(1.0, 0.0);
        let t = [l, C64::new(1e-3, 0.0), C64::new(0.0, 0.0), l];
        let mut last = 0;
        PowerWorkspace::new(2).walk(
            &t,
            64,
            |n, _| {
                last = n;
                None
            },
            |_, _| {},
            |_| 1.0,
        );
        assert_eq!(last, 64);
    }
}
