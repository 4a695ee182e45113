//! Optimised and low-storage Runge–Kutta presets, each kept in the form its
//! authors published and converted by code ([`super::lowstorage`]) to a
//! Butcher tableau, whose stability function comes from the general tableau
//! path. The published orders are recorded beside each set; the tests check
//! them against the order conditions ([`super::order`]) and the stability
//! polynomial.

use super::butcher::Tableau;
use super::lowstorage::{betas_from_gammas, single_register, williamson};
use super::Method;

/// What the source of a preset states about it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Published {
    /// Preset name (as in case files).
    pub name: &'static str,
    /// Stages (evaluations of the right-hand side per step).
    pub stages: usize,
    /// Order on nonlinear problems.
    pub order: u32,
    /// Order on linear problems (of the stability polynomial).
    pub linear_order: u32,
    /// Authors, year, journal.
    pub source: &'static str,
}

/// The presets, in listing order.
pub const PRESETS: [Published; 5] = [
    Published {
        name: "lsrk3",
        stages: 3,
        order: 3,
        linear_order: 3,
        source: "Williamson 1980, J. Comput. Phys. 35",
    },
    Published {
        name: "lsrk54",
        stages: 5,
        order: 4,
        linear_order: 4,
        source: "Carpenter & Kennedy 1994, NASA TM-109112",
    },
    Published {
        name: "lddrk-hhm",
        stages: 6,
        order: 2,
        linear_order: 4,
        source: "Hu, Hussaini & Manthey 1996, J. Comput. Phys. 124 (6-stage)",
    },
    Published {
        name: "lddrk-bb",
        stages: 6,
        order: 2,
        linear_order: 2,
        source: "Bogey & Bailly 2004, J. Comput. Phys. 194 (RKo6s)",
    },
    Published {
        name: "ssprk104",
        stages: 10,
        order: 4,
        linear_order: 4,
        source: "Ketcheson 2008, SIAM J. Sci. Comput. 30",
    },
];

/// Williamson (1980), "Low-storage Runge–Kutta schemes", J. Comput. Phys. 35,
/// 48–56: the third-order three-stage 2N scheme (A, B) below. The coefficients
/// were confirmed by a search of published code; Williamson's table is the
/// primary source.
const WILLIAMSON3: ([f64; 3], [f64; 3]) = (
    [0.0, -5.0 / 9.0, -153.0 / 128.0],
    [1.0 / 3.0, 15.0 / 16.0, 8.0 / 15.0],
);

/// Carpenter & Kennedy (1994), "Fourth-order 2N-storage Runge–Kutta schemes",
/// NASA TM-109112: the five-stage fourth-order 2N scheme (their solution 3),
/// coefficients as the published ratios of integers.
const CARPENTER_KENNEDY: ([f64; 5], [f64; 5]) = (
    [
        0.0,
        -567301805773.0 / 1357537059087.0,
        -2404267990393.0 / 2016746695238.0,
        -3550918686646.0 / 2091501179385.0,
        -1275806237668.0 / 842570457699.0,
    ],
    [
        1432997174477.0 / 9575080441755.0,
        5161836677717.0 / 13612068292357.0,
        1720146321549.0 / 2090206949498.0,
        3134564353537.0 / 4481467310338.0,
        2277821191437.0 / 14882151754819.0,
    ],
);

/// Hu, Hussaini & Manthey (1996), "Low-dissipation and low-dispersion
/// Runge–Kutta schemes for computational acoustics", J. Comput. Phys. 124,
/// 177–191: the single-step six-stage scheme, fourth order on linear problems
/// (γ_1..γ_4 = 1, 1/2, 1/6, 1/24) with γ_5, γ_6 optimised; second order on
/// nonlinear problems in the one-register form. γ_5 and γ_6 are quoted to six
/// digits as found in published code that names them the six-stage LDDRK; the
/// attribution to this table of the paper is from memory.
const HU_HUSSAINI_MANTHEY6: [f64; 6] = [1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0, 0.00781005, 0.00132141];

/// Bogey & Bailly (2004), "A family of low dispersive and low dissipative
/// explicit schemes for flow and noise computations", J. Comput. Phys. 194,
/// 194–214: the optimised six-stage scheme RKo6s, second order, γ_j as
/// published (confirmed by a search of published code).
const BOGEY_BAILLY6: [f64; 6] = [
    1.0,
    0.5,
    0.165919771368,
    0.040919732041,
    0.007555704391,
    0.000891421261,
];

/// Ketcheson (2008), "Highly efficient strong stability-preserving Runge–Kutta
/// methods with low-storage implementations", SIAM J. Sci. Comput. 30,
/// 2113–2136: SSPRK(10,4), SSP coefficient 6. The paper gives it as a
/// two-register algorithm (from memory):
///   q1 = q2 = u; 5× q1 ← q1 + Δt/6 F(q1); q2 ← q2/25 + 9 q1/25;
///   q1 ← 15 q2 − 5 q1; 4× q1 ← q1 + Δt/6 F(q1); u ← q2 + 3 q1/5 + Δt F(q1)/10.
/// Unrolled by hand this is the tableau built here: a_ij = 1/6 for j < i ≤ 5;
/// for i ≥ 6, a_ij = 1/15 (j ≤ 5) and 1/6 (6 ≤ j < i); b_j = 1/10. The tests
/// run the two-register algorithm itself on a linear problem and compare.
fn ketcheson104() -> Tableau {
    let s = 10;
    let a = (0..s)
        .map(|i| {
            (0..s)
                .map(|j| match (i, j) {
                    (i, j) if j >= i => 0.0,
                    (i, _) if i < 5 => 1.0 / 6.0,
                    (_, j) if j < 5 => 1.0 / 15.0,
                    _ => 1.0 / 6.0,
                })
                .collect()
        })
        .collect();
    Tableau::new(a, vec![0.1; s])
}

/// The Butcher tableau of a preset, converted from its published form.
pub fn tableau(name: &str) -> Option<Tableau> {
    Some(match name {
        "lsrk3" => williamson(&WILLIAMSON3.0, &WILLIAMSON3.1).expect("valid 2N scheme"),
        "lsrk54" => {
            williamson(&CARPENTER_KENNEDY.0, &CARPENTER_KENNEDY.1).expect("valid 2N scheme")
        }
        "lddrk-hhm" => single_register(&betas_from_gammas(&HU_HUSSAINI_MANTHEY6)),
        "lddrk-bb" => single_register(&betas_from_gammas(&BOGEY_BAILLY6)),
        "ssprk104" => ketcheson104(),
        _ => return None,
    })
}

/// What the source says about a preset.
pub fn published(name: &str) -> Option<Published> {
    PRESETS.iter().find(|p| p.name == name).copied()
}

/// The method of a preset (through its tableau).
pub fn method(name: &str) -> Option<Method> {
    let t = tableau(name)?;
    Some(t.method(name).expect("preset tableaux are consistent"))
}
