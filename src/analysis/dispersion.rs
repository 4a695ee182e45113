//! Dispersion and dissipation by mode and direction.
//!
//! Semi-discrete frequencies ω = i·eig L(θ) (a mode e^{i(k·x − ωt)}), the
//! continuous system's ω = i·eig L_c(k) at k_d = θ_d/h_d, and fully discrete ω
//! from the eigenvalues of G, λ = e^{−iωΔt}, on the branch nearest the
//! semi-discrete ω (so the branch follows the mode continuously from small
//! wavenumbers rather than the principal logarithm).
//!
//! Modes are matched by continuation from the long-wave limit: along the ray
//! from θ = 0 to each wavevector both spectra are followed step by step (each step
//! pairs eigenvalues with the previous ones, extrapolated linearly, by the
//! cheapest assignment); at the start of the ray the numerical and exact spectra
//! agree, and the exact ones are named by the model (acoustic ±, vorticity,
//! convected, gravity ±, geostrophic, electromagnetic ±, static). A fully discrete
//! eigenvalue with no semi-discrete partner — the extra roots of a multistep
//! method — is a computational mode; a numerical mode whose group velocity
//! opposes the physical one is flagged as a parasitic (grid-scale) wave.

use crate::case::Case;
use crate::linalg::{self, EigSolver};
use crate::operator::Operator;
use crate::physics::System;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// Steps of the continuation along a ray.
const TRACK_STEPS: usize = 20;
/// Relative start of the ray (long-wave limit).
const START: f64 = 1e-4;

/// Names of the physical modes in ascending order of Re ω at long wavelengths
/// along a direction (ties keep the model's own order).
pub fn mode_names(sys: &System) -> Vec<String> {
    let m = sys.size();
    let d = sys.dims();
    let v = |s: &str| s.to_string();
    match sys.kind.as_str() {
        "advection" => vec![v("advection")],
        "acoustics" => {
            let mut n = vec![v("acoustic-")];
            n.extend((0..d - 1).map(|k| {
                format!(
                    "vorticity{}",
                    if d > 2 {
                        (k + 1).to_string()
                    } else {
                        String::new()
                    }
                )
            }));
            n.push(v("acoustic+"));
            n
        }
        "euler" => {
            let mut n = vec![v("acoustic-")];
            n.extend((0..d).map(|k| format!("convected{}", k + 1)));
            n.push(v("acoustic+"));
            n
        }
        "shallow-water" if d == 2 => vec![v("gravity-"), v("geostrophic"), v("gravity+")],
        "shallow-water" => vec![v("gravity-"), v("gravity+")],
        "maxwell" => {
            let pairs = m / 3;
            let mut n: Vec<String> = (0..pairs)
                .map(|k| format!("electromagnetic-{}", k + 1))
                .collect();
            n.extend((0..m - 2 * pairs).map(|k| format!("static{}", k + 1)));
            n.extend((0..pairs).map(|k| format!("electromagnetic+{}", k + 1)));
            n
        }
        _ => (0..m).map(|k| format!("mode{}", k + 1)).collect(),
    }
}

/// Pairs `new` with `target` by the cheapest total distance (all permutations for
/// m ≤ 4; beyond, the globally closest pair first, repeatedly); returns `new`
/// reordered.
fn assign(target: &[C64], new: &[C64]) -> Vec<C64> {
    let m = target.len();
    if m <= 4 {
        let mut perm: Vec<usize> = (0..m).collect();
        let mut best = (f64::INFINITY, perm.clone());
        permute(&mut perm, 0, &mut |p| {
            let cost: f64 = p
                .iter()
                .enumerate()
                .map(|(i, &j)| (target[i] - new[j]).norm())
                .sum();
            if cost < best.0 {
                best = (cost, p.to_vec());
            }
        });
        best.1.iter().map(|&j| new[j]).collect()
    } else {
        let mut pairs: Vec<(f64, usize, usize)> = Vec::with_capacity(m * new.len());
        for (i, t) in target.iter().enumerate() {
            for (j, n) in new.iter().enumerate() {
                pairs.push(((t - n).norm(), i, j));
            }
        }
        pairs.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut out = vec![C64::new(f64::NAN, f64::NAN); m];
        let (mut ti, mut nj) = (vec![false; m], vec![false; new.len()]);
        for (_, i, j) in pairs {
            if !ti[i] && !nj[j] {
                ti[i] = true;
                nj[j] = true;
                out[i] = new[j];
            }
        }
        out
    }
}

fn permute(p: &mut [usize], k: usize, f: &mut impl FnMut(&[usize])) {
    if k == p.len() {
        f(p);
        return;
    }
    for i in k..p.len() {
        p.swap(k, i);
        permute(p, k + 1, f);
        p.swap(k, i);
    }
}

/// Frequencies along a ray, evaluated by `freq` at fractions s of the end point.
struct Tracker<'a> {
    freq: &'a dyn Fn(&[f64]) -> Vec<C64>,
}

impl Tracker<'_> {
    /// Frequencies at `theta`, in the order they have at the start of the ray
    /// (ascending Re ω there).
    fn follow(&self, theta: &[f64]) -> Vec<C64> {
        let at = |s: f64| -> Vec<f64> { theta.iter().map(|t| t * s).collect() };
        let mut prev = (self.freq)(&at(START));
        prev.sort_by(|a, b| a.re.total_cmp(&b.re));
        // geometric steps: in the long-wave limit ω grows in proportion to s, so the
        // first prediction scales the start values and later ones extrapolate
        let ratio = (1.0 / START).powf(1.0 / TRACK_STEPS as f64);
        let mut prev2: Option<Vec<C64>> = None;
        let mut s_prev = START;
        let mut s_prev2 = START;
        for k in 1..=TRACK_STEPS {
            let s = if k == TRACK_STEPS {
                1.0
            } else {
                START * ratio.powi(k as i32)
            };
            let raw = (self.freq)(&at(s));
            let predicted: Vec<C64> = match &prev2 {
                None => prev.iter().map(|a| a * (s / s_prev)).collect(),
                Some(p2) => {
                    let slope = (s - s_prev) / (s_prev - s_prev2);
                    prev.iter()
                        .zip(p2)
                        .map(|(a, b)| a + (a - b) * slope)
                        .collect()
                }
            };
            let next = assign(&predicted, &raw);
            prev2 = Some(std::mem::replace(&mut prev, next));
            s_prev2 = s_prev;
            s_prev = s;
        }
        prev
    }
}

/// Semi-discrete and exact frequencies at θ, each in physical-mode order.
pub struct Frequencies<'a> {
    case: &'a Case,
    op: &'a Operator,
}

impl<'a> Frequencies<'a> {
    /// For a case and its operator.
    pub fn new(case: &'a Case, op: &'a Operator) -> Self {
        Self { case, op }
    }

    fn eig(&self, l: &[C64]) -> Vec<C64> {
        let m = self.op.m;
        let mut out = vec![C64::new(0.0, 0.0); m];
        if EigSolver::new(m).eigenvalues(l, &mut out).is_err() {
            out.fill(C64::new(f64::NAN, f64::NAN));
        }
        out.iter().map(|mu| C64::new(0.0, 1.0) * mu).collect()
    }

    /// Semi-discrete ω at θ (unordered).
    pub fn numerical_raw(&self, theta: &[f64]) -> Vec<C64> {
        self.eig(&self.op.symbol(theta))
    }

    /// Exact ω at the physical wavevector of θ (unordered).
    pub fn exact_raw(&self, theta: &[f64]) -> Vec<C64> {
        let k: Vec<f64> = theta
            .iter()
            .zip(&self.case.spacing)
            .map(|(t, h)| t / h)
            .collect();
        self.eig(&linalg::from_matrix(
            &self.case.system.continuous_symbol(&k),
        ))
    }

    /// (numerical, exact) ω at θ, both in physical-mode order.
    pub fn matched(&self, theta: &[f64]) -> (Vec<C64>, Vec<C64>) {
        let num = Tracker {
            freq: &|t| self.numerical_raw(t),
        }
        .follow(theta);
        let exact = Tracker {
            freq: &|t| self.exact_raw(t),
        }
        .follow(theta);
        (num, exact)
    }

    /// Group velocities (physical units) of the matched numerical and exact modes
    /// at θ, by central differences in θ.
    pub fn group_velocities(
        &self,
        theta: &[f64],
        num: &[C64],
        exact: &[C64],
    ) -> (Vec<Vec<f64>>, Vec<Vec<f64>>) {
        let m = num.len();
        let d = theta.len();
        let mut gn = vec![vec![0.0; d]; m];
        let mut ge = vec![vec![0.0; d]; m];
        let delta = 1e-6;
        for ax in 0..d {
            let mut tp = theta.to_vec();
            let mut tm = theta.to_vec();
            tp[ax] += delta;
            tm[ax] -= delta;
            let h = self.case.spacing[ax];
            let np = assign(num, &self.numerical_raw(&tp));
            let nm = assign(num, &self.numerical_raw(&tm));
            let ep = assign(exact, &self.exact_raw(&tp));
            let em = assign(exact, &self.exact_raw(&tm));
            for j in 0..m {
                gn[j][ax] = (np[j].re - nm[j].re) / (2.0 * delta) * h;
                ge[j][ax] = (ep[j].re - em[j].re) / (2.0 * delta) * h;
            }
        }
        (gn, ge)
    }

    /// Fully discrete group velocities of the principal roots at θ, by central
    /// differences of the fully discrete ω (each branch followed from θ).
    pub fn discrete_group_velocities(
        &self,
        theta: &[f64],
        num: &[C64],
        disc: &[C64],
        dt: f64,
    ) -> Vec<Vec<f64>> {
        let m = num.len();
        let d = theta.len();
        let mut g = vec![vec![0.0; d]; m];
        let delta = 1e-6;
        for ax in 0..d {
            let mut tp = theta.to_vec();
            let mut tm = theta.to_vec();
            tp[ax] += delta;
            tm[ax] -= delta;
            let h = self.case.spacing[ax];
            let near = |t: &[f64]| {
                let n = assign(num, &self.numerical_raw(t));
                let w = self.discrete(t, &n, dt);
                assign(&disc[..m], &w[..m])
            };
            let (wp, wm) = (near(&tp), near(&tm));
            for j in 0..m {
                g[j][ax] = (wp[j].re - wm[j].re) / (2.0 * delta) * h;
            }
        }
        g
    }

    /// Fully discrete ω for the matched semi-discrete modes (principal roots, in
    /// physical-mode order) followed by the computational modes.
    pub fn discrete(&self, theta: &[f64], num: &[C64], dt: f64) -> Vec<C64> {
        let g = super::amplification_at(self.case, self.op, theta, dt);
        let size = g.nrows();
        let lam = linalg::eigenvalues(&linalg::from_matrix(&g), size)
            .unwrap_or_else(|_| vec![C64::new(f64::NAN, f64::NAN); size]);
        // principal root of each mode: the eigenvalue nearest e^{−iωΔt}
        let target: Vec<C64> = num
            .iter()
            .map(|w| (C64::new(0.0, -1.0) * w * dt).exp())
            .collect();
        let mut used = vec![false; size];
        let mut out = Vec::with_capacity(size);
        for (t, w) in target.iter().zip(num) {
            let j = (0..size)
                .filter(|j| !used[*j])
                .min_by(|a, b| (lam[*a] - t).norm().total_cmp(&(lam[*b] - t).norm()))
                .unwrap_or(0);
            used[j] = true;
            out.push(log_branch(lam[j], dt, w.re));
        }
        for (j, l) in lam.iter().enumerate() {
            if !used[j] {
                out.push(log_branch(*l, dt, 0.0));
            }
        }
        out
    }
}

/// ω = i ln λ / Δt on the branch whose real part is nearest `near`.
pub fn log_branch(lam: C64, dt: f64, near: f64) -> C64 {
    if lam.norm() == 0.0 {
        return C64::new(f64::NAN, f64::NEG_INFINITY);
    }
    let base = -lam.arg() / dt;
    let period = 2.0 * PI / dt;
    let k = ((near - base) / period).round();
    C64::new(base + k * period, lam.norm().ln() / dt)
}

/// Points per wavelength of a wavevector: 2π/(|k| h_min).
pub fn points_per_wavelength(theta: &[f64], spacing: &[f64]) -> f64 {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let k = theta
        .iter()
        .zip(spacing)
        .map(|(t, hd)| (t / hd).powi(2))
        .sum::<f64>()
        .sqrt();
    2.0 * PI / (k * h)
}

/// Everything the dispersion analysis produces.
#[derive(Debug, Clone)]
pub struct DispersionResult {
    /// Physical mode names (m).
    pub names: Vec<String>,
    /// Number of computational (extra fully discrete) modes.
    pub computational: usize,
    /// Per node: semi-discrete ω (m), C order.
    pub numerical: Vec<Vec<C64>>,
    /// Per node: exact ω (m).
    pub exact: Vec<Vec<C64>>,
    /// Per node: fully discrete ω (m principal + computational).
    pub discrete: Vec<Vec<C64>>,
    /// Per node: numerical group velocity (m × d).
    pub group: Vec<Vec<Vec<f64>>>,
    /// Per node: exact group velocity (m × d).
    pub group_exact: Vec<Vec<Vec<f64>>>,
    /// Per node: fully discrete group velocity (m × d).
    pub group_discrete: Vec<Vec<Vec<f64>>>,
    /// Physical directions of the curves (unit vectors in k-space).
    pub directions: Vec<Vec<f64>>,
    /// Points per wavelength of the curve samples.
    pub ppw: Vec<f64>,
    /// Phase-speed ratio c_num/c_exact, semi-discrete [direction][sample][mode].
    pub phase_curves: Vec<Vec<Vec<f64>>>,
    /// The same, fully discrete.
    pub phase_curves_discrete: Vec<Vec<Vec<f64>>>,
    /// Group-speed ratio along the physical group velocity, semi-discrete.
    pub group_curves: Vec<Vec<Vec<f64>>>,
    /// Per mode: (semi-discrete, fully discrete) points per wavelength needed for
    /// |phase error| ≤ tolerance in the worst direction, and that direction's index.
    pub resolution: Vec<(Option<f64>, Option<f64>, usize)>,
    /// Phase tolerance used.
    pub tolerance: f64,
}

/// Phase-speed ratio Re ω_num / Re ω_exact, NaN where the exact mode does not move.
pub fn phase_ratio(num: C64, exact: C64, scale: f64) -> f64 {
    if exact.re.abs() <= 1e-9 * scale {
        f64::NAN
    } else {
        num.re / exact.re
    }
}

/// (group-speed ratio along ĉ_exact, angle between the two velocities).
pub fn group_ratio(gn: &[f64], ge: &[f64]) -> (f64, f64) {
    let e2: f64 = ge.iter().map(|x| x * x).sum();
    let n2: f64 = gn.iter().map(|x| x * x).sum();
    if e2 == 0.0 {
        return (f64::NAN, f64::NAN);
    }
    let dot: f64 = gn.iter().zip(ge).map(|(a, b)| a * b).sum();
    let cos = if n2 > 0.0 {
        (dot / (n2 * e2).sqrt()).clamp(-1.0, 1.0)
    } else {
        f64::NAN
    };
    (dot / e2, cos.acos())
}

/// Physical wave directions for the curves: ±x in 1-D, 36 angles in 2-D, a
/// Fibonacci set in 3-D.
pub fn curve_directions(dims: usize, count: usize) -> Vec<Vec<f64>> {
    match dims {
        1 => vec![vec![1.0], vec![-1.0]],
        2 => (0..36)
            .map(|j| {
                let a = 2.0 * PI * j as f64 / 36.0;
                vec![a.cos(), a.sin()]
            })
            .collect(),
        _ => crate::sample::sphere_directions(count.clamp(12, 60))
            .into_iter()
            .map(|v| v.to_vec())
            .collect(),
    }
}

/// Finest points-per-wavelength of the curves.
const PPW_FINE: f64 = 256.0;
const CURVE_SAMPLES: usize = 48;

/// The wavenumbers |k| of the curve samples along the physical direction n:
/// geometric from 256 points per wavelength (of h_min) to the grid limit of
/// that direction, where some |θ_d| reaches π.
pub fn curve_wavenumbers(n: &[f64], spacing: &[f64]) -> Vec<f64> {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let kmax = PI
        / n.iter()
            .zip(spacing)
            .map(|(a, hd)| a.abs() * hd)
            .fold(0.0, f64::max);
    let kmin = 2.0 * PI / (PPW_FINE * h);
    (0..CURVE_SAMPLES)
        .map(|j| kmin * (kmax / kmin).powf(j as f64 / (CURVE_SAMPLES - 1) as f64))
        .collect()
}

/// Points per wavelength 2π/(|k| h_min) of the curve samples along the
/// physical direction n (the `ppw` of [`DispersionResult`] is that of the
/// first direction; the grid limit differs between directions).
pub fn curve_ppw(n: &[f64], spacing: &[f64]) -> Vec<f64> {
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    curve_wavenumbers(n, spacing)
        .iter()
        .map(|kappa| 2.0 * PI / (kappa * h))
        .collect()
}

/// Dispersion curves along one physical direction n: (ppw, semi phase ratio,
/// discrete phase ratio, group ratio) per sample and mode.
pub fn curve(f: &Frequencies, n: &[f64], dt: f64) -> Curve {
    let spacing = &f.case.spacing;
    let h = spacing.iter().copied().fold(f64::INFINITY, f64::min);
    let mut ppw = Vec::new();
    let (mut ps, mut pd, mut gr) = (Vec::new(), Vec::new(), Vec::new());
    for kappa in curve_wavenumbers(n, spacing) {
        let theta: Vec<f64> = n
            .iter()
            .zip(spacing)
            .map(|(a, hd)| a * kappa * hd)
            .collect();
        let (num, exact) = f.matched(&theta);
        let scale = exact
            .iter()
            .map(|w| w.norm())
            .fold(0.0, f64::max)
            .max(1e-300);
        let disc = f.discrete(&theta, &num, dt);
        let (gn, ge) = f.group_velocities(&theta, &num, &exact);
        ppw.push(2.0 * PI / (kappa * h));
        ps.push(
            num.iter()
                .zip(&exact)
                .map(|(a, b)| phase_ratio(*a, *b, scale))
                .collect(),
        );
        pd.push(
            disc.iter()
                .zip(&exact)
                .map(|(a, b)| phase_ratio(*a, *b, scale))
                .collect(),
        );
        gr.push(
            gn.iter()
                .zip(&ge)
                .map(|(a, b)| group_ratio(a, b).0)
                .collect(),
        );
    }
    (ppw, ps, pd, gr)
}

/// Points per wavelength needed for |ratio − 1| ≤ tol at every finer sample
/// (interpolated in log ppw); None when the mode does not propagate.
pub fn required_ppw(ppw: &[f64], ratio: &[f64], tol: f64) -> Option<f64> {
    if ratio.iter().all(|r| r.is_nan()) {
        return None;
    }
    let err = |r: f64| if r.is_nan() { 0.0 } else { (r - 1.0).abs() };
    for j in 0..ppw.len() {
        if err(ratio[j]) > tol {
            if j == 0 {
                return Some(ppw[0]);
            }
            let (e0, e1) = (err(ratio[j - 1]), err(ratio[j]));
            let t = ((tol - e0) / (e1 - e0)).clamp(0.0, 1.0);
            return Some((ppw[j - 1].ln() + t * (ppw[j].ln() - ppw[j - 1].ln())).exp());
        }
    }
    Some(*ppw.last().unwrap_or(&2.0))
}

/// Curves along one direction: (ppw, semi phase ratio, discrete phase ratio, group ratio).
pub type Curve = (Vec<f64>, Vec<Vec<f64>>, Vec<Vec<f64>>, Vec<Vec<f64>>);

/// Per mode: points per wavelength needed in the worst direction, semi-discrete
/// and fully discrete, and the index of that direction.
pub fn worst_resolution(
    curves: &[Curve],
    m: usize,
    tol: f64,
) -> Vec<(Option<f64>, Option<f64>, usize)> {
    (0..m)
        .map(|j| {
            let mut worst = (None::<f64>, None::<f64>, 0usize);
            for (k, (ppw, ps, pd, _)) in curves.iter().enumerate() {
                let semi: Vec<f64> = ps.iter().map(|row| row[j]).collect();
                let disc: Vec<f64> = pd.iter().map(|row| row[j]).collect();
                let a = required_ppw(ppw, &semi, tol);
                let b = required_ppw(ppw, &disc, tol);
                if a.unwrap_or(0.0) > worst.0.unwrap_or(0.0) {
                    worst.0 = a;
                    worst.2 = k;
                }
                if b.unwrap_or(0.0) > worst.1.unwrap_or(0.0) {
                    worst.1 = b;
                }
            }
            worst
        })
        .collect()
}
