//! The seeded random scheme generator: 1–3 axes, anisotropic spacings, scalar
//! advection(–diffusion) or a 2×2/3×3 `linear` system, catalogue or random user
//! stencils per axis, characteristic or Rusanov upwinding, optional dissipation,
//! and every time method the case file accepts. One seed gives one scheme, on
//! every machine.

use crate::rng::Rng;
use crate::scheme::{Dissipation, Method, Scheme, Upwind};
use crate::stencils::{catalogue_first, catalogue_second, random_first, FIRST_NAMES};
use crate::systems;

/// The scheme of one seed.
pub fn scheme(seed: u64) -> Scheme {
    let mut rng = Rng::new(seed);
    let dims = *rng.pick(&[1, 1, 1, 1, 2, 2, 2, 2, 3, 3]);
    let base = 10f64.powf(rng.uniform(-1.0, 0.5));
    let spacing: Vec<f64> = (0..dims).map(|_| base * rng.uniform(0.5, 2.0)).collect();
    let system = match rng.int(0, 9) {
        0..=4 => systems::advection(&mut rng, &spacing),
        5..=7 => systems::linear(&mut rng, &spacing, 2),
        _ => systems::linear(&mut rng, &spacing, 3),
    };
    let same_first = rng.chance(0.6);
    let mut first: Vec<crate::scheme::Stencil> = Vec::new();
    for d in 0..dims {
        let st = if d > 0 && same_first {
            first[0].clone()
        } else if rng.chance(0.3) {
            random_first(&mut rng, &format!("mine{d}"))
        } else {
            {
                let name: &&str = rng.pick(&FIRST_NAMES[..]);
                catalogue_first(name)
            }
        };
        first.push(st);
    }
    let second_name = *rng.pick(&["central2", "central2", "central4", "central6"]);
    let second = vec![catalogue_second(second_name); dims];
    let upwind = if rng.chance(0.6) {
        Upwind::Characteristic
    } else {
        Upwind::Rusanov
    };
    let dissipation = rng.chance(0.25).then(|| Dissipation {
        order: *rng.pick(&[2, 4, 4, 6, 8]),
        strength: 10f64.powf(rng.uniform(-6.0, -1.0)),
    });
    let method = method(&mut rng, system.size());
    let points = match dims {
        1 => rng.int(33, 65),
        2 => rng.int(33, 49),
        _ => rng.int(13, 17),
    };
    let directions = rng.int(16, 36);
    Scheme {
        seed,
        spacing,
        system,
        first,
        second,
        upwind,
        dissipation,
        method,
        points,
        directions,
        symbol_bound: 0.0,
    }
    .finished()
}

/// A one-step method (also the inner method of a splitting).
fn one_step(rng: &mut Rng) -> Method {
    let poly = |name, coeffs: &[f64]| Method::Polynomial {
        name,
        coeffs: coeffs.to_vec(),
    };
    match rng.int(0, 7) {
        0 => poly("euler", &[1.0, 1.0]),
        1 => poly("heun", &[1.0, 1.0, 0.5]),
        2 => poly("ssprk3", &[1.0, 1.0, 0.5, 1.0 / 6.0]),
        3 => poly("rk4", &[1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0]),
        4 => Method::Theta {
            name: "backward-euler",
            theta: 1.0,
        },
        5 => Method::Theta {
            name: "crank-nicolson",
            theta: 0.5,
        },
        6 => Method::Theta {
            name: "theta",
            theta: (rng.uniform(0.0, 1.0) * 64.0).round() / 64.0,
        },
        _ => random_tableau(rng),
    }
}

/// A random explicit Runge–Kutta tableau of 2–4 stages (weights summing to 1).
fn random_tableau(rng: &mut Rng) -> Method {
    let s = rng.int(2, 4);
    let a = (0..s)
        .map(|i| {
            (0..s)
                .map(|j| if j < i { rng.uniform(0.0, 1.0) } else { 0.0 })
                .collect()
        })
        .collect();
    let raw: Vec<f64> = (0..s).map(|_| rng.uniform(0.1, 1.0)).collect();
    let total: f64 = raw.iter().sum();
    let mut b: Vec<f64> = raw.iter().map(|x| x / total).collect();
    let rest: f64 = b[1..].iter().sum();
    b[0] = 1.0 - rest;
    Method::Tableau { a, b }
}

fn method(rng: &mut Rng, m: usize) -> Method {
    let multi = |name, alpha: &[f64], beta: &[f64]| Method::Multistep {
        name,
        alpha: alpha.to_vec(),
        beta: beta.to_vec(),
    };
    match rng.int(0, 13) {
        0..=2 => one_step(rng),
        3 => multi("ab2", &[0.0, -1.0, 1.0], &[-0.5, 1.5, 0.0]),
        4 => multi(
            "ab3",
            &[0.0, 0.0, -1.0, 1.0],
            &[5.0 / 12.0, -16.0 / 12.0, 23.0 / 12.0, 0.0],
        ),
        5 => multi("leapfrog", &[-1.0, 0.0, 1.0], &[0.0, 2.0, 0.0]),
        6 => multi(
            "bdf2",
            &[1.0 / 3.0, -4.0 / 3.0, 1.0],
            &[0.0, 0.0, 2.0 / 3.0],
        ),
        7 if m >= 2 => {
            let count = rng.int(1, m - 1);
            let mut first: Vec<usize> = (0..m).collect();
            while first.len() > count {
                let k = rng.int(0, first.len() - 1);
                first.remove(k);
            }
            Method::ForwardBackward { first }
        }
        7 | 8 => Method::ImexEuler,
        9 => Method::ImexCnab2,
        10 => Method::LaxWendroff,
        11 => Method::LaxFriedrichs,
        _ => Method::Split {
            strang: rng.chance(0.5),
            inner: Box::new(one_step(rng)),
        },
    }
}
