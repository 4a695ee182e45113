//! A case built from fuzzed numbers: a user first-derivative stencil (explicit
//! or compact), optionally a user second-derivative stencil with diffusion, and
//! a Butcher tableau, on a 1-D or 2-D advection or acoustics model.
//!
//! Purely random weights almost never pass the Taylor-moment consistency check,
//! so by default the weights are projected (least squares) onto the consistent
//! ones: Σ w o^n = 0 for n < d and Σ w o^d / d! = Σ a (the implicit weights),
//! and the last tableau weight is set so that Σ b = 1. A flag per part keeps the
//! raw numbers instead, so the refusals are fuzzed too.

use crate::toml_text::{float, floats, rows};
use arbitrary::Arbitrary;

/// A fuzzed number: mostly small and exact, sometimes any float at all.
#[derive(Debug, Clone, Copy, Arbitrary)]
pub enum Number {
    /// A half-integer in [−64, 63.5].
    Half(i8),
    /// A ratio p/q.
    Ratio(i16, u8),
    /// Any bit pattern.
    Any(f64),
}

impl Number {
    /// Its value.
    pub fn value(self) -> f64 {
        match self {
            Number::Half(i) => i as f64 / 2.0,
            Number::Ratio(p, q) => p as f64 / (q.max(1) as f64),
            Number::Any(x) => x,
        }
    }
}

/// A fuzzed user stencil.
#[derive(Debug, Clone, Arbitrary)]
pub struct StencilInput {
    /// Offsets of the right-hand side.
    pub offsets: Vec<Number>,
    /// Raw weights of the right-hand side.
    pub weights: Vec<Number>,
    /// A compact left-hand side (offsets, weights).
    pub implicit: Option<(Vec<Number>, Vec<Number>)>,
    /// Keep the raw weights (and lengths) instead of consistent ones.
    pub raw: bool,
    /// Write this derivative instead of the stencil's own.
    pub derivative: Option<i64>,
}

/// A fuzzed Butcher tableau.
#[derive(Debug, Clone, Arbitrary)]
pub struct TableauInput {
    /// Stages (capped at [`MAX_STAGES`]).
    pub stages: u8,
    /// Entries of a, by rows, recycled as needed.
    pub a: Vec<Number>,
    /// Weights b.
    pub b: Vec<Number>,
    /// Write c as the row sums of a.
    pub with_c: bool,
    /// Keep the raw weights and shapes instead of Σ b = 1 and s×s.
    pub raw: bool,
}

/// Everything a fuzzed user case is built from.
#[derive(Debug, Clone, Arbitrary)]
pub struct UserCaseInput {
    /// Model and dimension: advection or acoustics, 1-D or 2-D.
    pub layout: u8,
    /// The first-derivative stencil.
    pub first: StencilInput,
    /// A second-derivative stencil with diffusion (advection only).
    pub second: Option<StencilInput>,
    /// The time method.
    pub tableau: TableauInput,
    /// The Courant number.
    pub courant: Number,
}

/// Most stencil points and compact left-hand points written.
pub const MAX_POINTS: usize = 12;
/// Most tableau stages.
pub const MAX_STAGES: usize = 8;

/// The case text.
pub fn case_text(input: &UserCaseInput) -> String {
    let two_d = input.layout & 1 == 1;
    let acoustics = input.layout & 2 == 2;
    let second = input.second.as_ref().filter(|_| !acoustics);
    let mut t = String::from("name = \"fuzzed-user-case\"\n\n[grid]\n");
    t += if two_d {
        "spacing = [1.0, 0.5]\n\n"
    } else {
        "spacing = [1.0]\n\n"
    };
    t += "[model]\n";
    t += match (acoustics, two_d) {
        (false, false) => "kind = \"advection\"\nvelocity = 1.0\n",
        (false, true) => "kind = \"advection\"\nvelocity = [1.0, -0.5]\n",
        (true, false) => "kind = \"acoustics\"\nsound_speed = 2.0\nvelocity = [0.5]\n",
        (true, true) => "kind = \"acoustics\"\nsound_speed = 2.0\nvelocity = [0.5, 0.25]\n",
    };
    if second.is_some() {
        t += "diffusivity = 0.1\n";
    }
    t += "\n[space]\nfirst = \"fz1\"\n";
    if second.is_some() {
        t += "second = \"fz2\"\n";
    }
    t += &stencil_table("fz1", 1, &input.first);
    if let Some(s) = second {
        t += &stencil_table("fz2", 2, s);
    }
    t += "\n[time]\nmethod = \"tableau\"\n";
    t += &format!("courant = {}\n", float(input.courant.value()));
    t += &tableau_line(&input.tableau);
    t += "\n[scan]\npoints = 9\n";
    t
}

fn values(v: &[Number]) -> Vec<f64> {
    v.iter().take(MAX_POINTS).map(|n| n.value()).collect()
}

/// A `[space.stencils.NAME]` table.
fn stencil_table(name: &str, derivative: u32, s: &StencilInput) -> String {
    let offsets = values(&s.offsets);
    let (io, iw) = s
        .implicit
        .as_ref()
        .map_or((vec![0.0], vec![1.0]), |(o, w)| (values(o), values(w)));
    let mut weights = values(&s.weights);
    if !s.raw {
        weights.resize(offsets.len(), 1.0);
        let lhs: f64 = iw.iter().sum();
        if let Some(w) = consistent(&offsets, &weights, derivative, lhs) {
            weights = w;
        }
    }
    let mut t = format!(
        "\n[space.stencils.{name}]\nderivative = {}\noffsets = {}\nweights = {}\n",
        s.derivative.unwrap_or(derivative as i64),
        floats(&offsets),
        floats(&weights)
    );
    if s.implicit.is_some() {
        t += &format!(
            "implicit_offsets = {}\nimplicit_weights = {}\n",
            floats(&io),
            floats(&iw)
        );
    }
    t
}

/// The weights nearest `w` (least squares) with Σ w o^n = 0 for n < d and
/// Σ w o^d / d! = `lhs`; None when the moment equations are singular.
pub fn consistent(o: &[f64], w: &[f64], d: u32, lhs: f64) -> Option<Vec<f64>> {
    let m = d as usize + 1;
    if o.len() < m {
        return None;
    }
    let fact: f64 = (1..=d).map(f64::from).product();
    // Rows of the constraint matrix A (m × n) and the target e.
    let a: Vec<Vec<f64>> = (0..m)
        .map(|n| o.iter().map(|x| x.powi(n as i32)).collect())
        .collect();
    let mut e = vec![0.0; m];
    e[d as usize] = lhs * fact;
    // w' = w − Aᵀ (A Aᵀ)⁻¹ (A w − e)
    let dot = |x: &[f64], y: &[f64]| x.iter().zip(y).map(|(p, q)| p * q).sum::<f64>();
    let mut g: Vec<Vec<f64>> = (0..m)
        .map(|i| (0..m).map(|j| dot(&a[i], &a[j])).collect())
        .collect();
    let mut r: Vec<f64> = (0..m).map(|i| dot(&a[i], w) - e[i]).collect();
    let y = solve(&mut g, &mut r)?;
    let out: Vec<f64> = (0..o.len())
        .map(|k| w[k] - (0..m).map(|i| a[i][k] * y[i]).sum::<f64>())
        .collect();
    out.iter().all(|x| x.is_finite()).then_some(out)
}

/// Gaussian elimination with partial pivoting; None when singular.
fn solve(g: &mut [Vec<f64>], r: &mut [f64]) -> Option<Vec<f64>> {
    let m = r.len();
    for c in 0..m {
        let p = (c..m).max_by(|&i, &j| g[i][c].abs().total_cmp(&g[j][c].abs()))?;
        let pivot = g[p][c].abs();
        if pivot.is_nan() || pivot <= 1e-12 {
            return None;
        }
        g.swap(c, p);
        r.swap(c, p);
        let (top, below) = g.split_at_mut(c + 1);
        let prow = &top[c];
        for (k, row) in below.iter_mut().enumerate() {
            let f = row[c] / prow[c];
            for (x, y) in row[c..].iter_mut().zip(&prow[c..]) {
                *x -= f * y;
            }
            r[c + 1 + k] -= f * r[c];
        }
    }
    let mut y = vec![0.0; m];
    for i in (0..m).rev() {
        let s: f64 = (i + 1..m).map(|j| g[i][j] * y[j]).sum();
        y[i] = (r[i] - s) / g[i][i];
    }
    Some(y)
}

/// The `tableau = { a = ..., b = ..., c = ... }` line.
fn tableau_line(tb: &TableauInput) -> String {
    let s = (tb.stages as usize % MAX_STAGES) + 1;
    let entries = values_all(&tb.a);
    let (a, b) = if tb.raw {
        let a: Vec<Vec<f64>> = entries.chunks(s).take(s).map(<[f64]>::to_vec).collect();
        (a, values(&tb.b))
    } else {
        let at = |k: usize| entries.get(k).copied().unwrap_or(0.0);
        let a: Vec<Vec<f64>> = (0..s)
            .map(|i| (0..s).map(|j| at(i * s + j)).collect())
            .collect();
        let mut b: Vec<f64> = (0..s)
            .map(|i| tb.b.get(i).map_or(1.0 / s as f64, |n| n.value()))
            .collect();
        let rest: f64 = b[..s - 1].iter().sum();
        b[s - 1] = 1.0 - rest;
        (a, b)
    };
    let mut t = format!("tableau = {{ a = {}, b = {}", rows(&a), floats(&b));
    if tb.with_c {
        let c: Vec<f64> = a.iter().map(|r| r.iter().sum()).collect();
        t += &format!(", c = {}", floats(&c));
    }
    t + " }\n"
}

fn values_all(v: &[Number]) -> Vec<f64> {
    v.iter()
        .take(MAX_STAGES * MAX_STAGES)
        .map(|n| n.value())
        .collect()
}
