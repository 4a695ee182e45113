//! The optimised and low-storage Runge–Kutta presets: their published orders
//! (from the Butcher order conditions and from the stability polynomial),
//! stability polynomials recomputed by running each scheme in its published
//! low-storage form on a linear problem, imaginary- and real-axis limits
//! against published figures and an independent root search, `kgain list
//! methods`, and the case-file keys for fractions and low-storage schemes.

#[path = "rk_presets/case_file.rs"]
mod case_file;
#[path = "rk_presets/limits.rs"]
mod limits;
#[path = "rk_presets/listing.rs"]
mod listing;
#[path = "rk_presets/orders.rs"]
mod orders;
#[path = "rk_presets/poly.rs"]
mod poly;
mod support;

use kgain::time::{self, Method, Scheme};

/// The stability polynomial of a built-in explicit method (panics otherwise).
fn stability_polynomial(m: &Method) -> Vec<f64> {
    let Scheme::OneStep(os) = &m.scheme else {
        panic!("{} is not a one-step method", m.name)
    };
    assert_eq!(os.q, vec![1.0], "{} is not explicit", m.name);
    os.p.clone()
}

/// A preset's method.
fn preset(name: &str) -> Method {
    time::builtin(name).unwrap_or_else(|| panic!("{name} is a built-in method"))
}
