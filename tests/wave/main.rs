//! Second-order-in-time wave equations u_tt = L u (README: Second-order-in-time
//! waves): the central-difference scheme and the Newmark family on the `wave`
//! model, through the library and the command line, on tiny grids.
//!
//! Closed forms are derived beside each test; the Newmark critical frequency is
//! quoted from memory (Hughes, *The Finite Element Method*, ch. 9) and
//! re-derived in the test from the characteristic polynomial.

mod cli;
mod companion;
mod growth;
mod limits;
mod radius;

use kgain::analysis::{LimitParams, Plan};
use kgain::problem::Problem;
use kgain::{analyse, NoProgress, Par, Results};

/// A wave problem u_tt = Σ c_d² u_dd with C2, the given method and Courant number.
pub fn problem(
    spacing: &[f64],
    speed: &[f64],
    method: &str,
    beta_gamma: Option<(f64, f64)>,
    courant: f64,
) -> Problem {
    let mut b = Problem::builder()
        .spacing(spacing)
        .system(kgain::physics::wave(speed))
        .second("central2")
        .method(method)
        .courant(courant);
    if let Some((beta, gamma)) = beta_gamma {
        b = b.newmark_beta(beta).newmark_gamma(gamma);
    }
    b.build().expect("a valid wave problem")
}

/// The radius map and the limit on a grid of `n` points per axis (θ = ±π included).
pub fn run(p: &Problem, n: usize) -> Results {
    let plan = Plan::new(&vec![n; p.dims()])
        .with_radius()
        .with_limit(LimitParams { directions: 8 });
    analyse(p, &plan, Par::Seq, &NoProgress).expect("the analyses run")
}

/// |got − want| ≤ rel·|want|.
#[track_caller]
pub fn close(got: f64, want: f64, rel: f64) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "got {got:.17e}, want {want:.17e} (relative {:.2e})",
        (got - want).abs() / want.abs()
    );
}
