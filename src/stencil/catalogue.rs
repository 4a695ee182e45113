//! The built-in stencils, one entry each, on a unit grid.
//!
//! Biased (upwind) stencils are written for a positive speed: they lean on the
//! upstream side (negative offsets); the operator mirrors them for negative speeds.
//! Sources: standard central and one-sided differences (common practice; any
//! numerical-PDE text), the compact schemes of Lele, J. Comput. Phys. 103 (1992),
//! and the dispersion-relation-preserving stencil of Tam & Webb, J. Comput. Phys.
//! 107 (1993) (coefficients as commonly quoted to eight digits).

use super::Stencil;

struct Entry {
    name: &'static str,
    derivative: u32,
    offsets: &'static [f64],
    weights: &'static [f64],
    implicit: Option<(&'static [f64], &'static [f64])>,
    summary: &'static str,
}

const C: &[Entry] = &[
    Entry {
        name: "central2",
        derivative: 1,
        offsets: &[-1.0, 1.0],
        weights: &[-0.5, 0.5],
        implicit: None,
        summary: "second-order central difference",
    },
    Entry {
        name: "central4",
        derivative: 1,
        offsets: &[-2.0, -1.0, 1.0, 2.0],
        weights: &[1.0 / 12.0, -2.0 / 3.0, 2.0 / 3.0, -1.0 / 12.0],
        implicit: None,
        summary: "fourth-order central difference",
    },
    Entry {
        name: "central6",
        derivative: 1,
        offsets: &[-3.0, -2.0, -1.0, 1.0, 2.0, 3.0],
        weights: &[
            -1.0 / 60.0,
            3.0 / 20.0,
            -0.75,
            0.75,
            -3.0 / 20.0,
            1.0 / 60.0,
        ],
        implicit: None,
        summary: "sixth-order central difference",
    },
    Entry {
        name: "central8",
        derivative: 1,
        offsets: &[-4.0, -3.0, -2.0, -1.0, 1.0, 2.0, 3.0, 4.0],
        weights: &[
            1.0 / 280.0,
            -4.0 / 105.0,
            0.2,
            -0.8,
            0.8,
            -0.2,
            4.0 / 105.0,
            -1.0 / 280.0,
        ],
        implicit: None,
        summary: "eighth-order central difference",
    },
    Entry {
        name: "upwind1",
        derivative: 1,
        offsets: &[-1.0, 0.0],
        weights: &[-1.0, 1.0],
        implicit: None,
        summary: "first-order one-sided (upwind) difference",
    },
    Entry {
        name: "upwind2",
        derivative: 1,
        offsets: &[-2.0, -1.0, 0.0],
        weights: &[0.5, -2.0, 1.5],
        implicit: None,
        summary: "second-order one-sided (upwind) difference",
    },
    Entry {
        name: "upwind3",
        derivative: 1,
        offsets: &[-2.0, -1.0, 0.0, 1.0],
        weights: &[1.0 / 6.0, -1.0, 0.5, 1.0 / 3.0],
        implicit: None,
        summary: "third-order upwind-biased difference",
    },
    Entry {
        name: "upwind5",
        derivative: 1,
        offsets: &[-3.0, -2.0, -1.0, 0.0, 1.0, 2.0],
        weights: &[-1.0 / 30.0, 0.25, -1.0, 1.0 / 3.0, 0.5, -0.05],
        implicit: None,
        summary: "fifth-order upwind-biased difference",
    },
    Entry {
        name: "compact4",
        derivative: 1,
        offsets: &[-1.0, 1.0],
        weights: &[-0.75, 0.75],
        implicit: Some((&[-1.0, 0.0, 1.0], &[0.25, 1.0, 0.25])),
        summary: "Pade compact fourth order, alpha = 1/4 (Lele 1992)",
    },
    Entry {
        name: "compact6",
        derivative: 1,
        offsets: &[-2.0, -1.0, 1.0, 2.0],
        weights: &[-1.0 / 36.0, -7.0 / 9.0, 7.0 / 9.0, 1.0 / 36.0],
        implicit: Some((&[-1.0, 0.0, 1.0], &[1.0 / 3.0, 1.0, 1.0 / 3.0])),
        summary: "compact sixth order, alpha = 1/3 (Lele 1992)",
    },
    Entry {
        name: "drp7",
        derivative: 1,
        offsets: &[-3.0, -2.0, -1.0, 1.0, 2.0, 3.0],
        weights: &[
            -0.02651995,
            0.18941314,
            -0.79926643,
            0.79926643,
            -0.18941314,
            0.02651995,
        ],
        implicit: None,
        summary: "dispersion-relation-preserving 7-point (Tam & Webb 1993)",
    },
    Entry {
        name: "central2",
        derivative: 2,
        offsets: &[-1.0, 0.0, 1.0],
        weights: &[1.0, -2.0, 1.0],
        implicit: None,
        summary: "second-order central second difference",
    },
    Entry {
        name: "central4",
        derivative: 2,
        offsets: &[-2.0, -1.0, 0.0, 1.0, 2.0],
        weights: &[-1.0 / 12.0, 4.0 / 3.0, -2.5, 4.0 / 3.0, -1.0 / 12.0],
        implicit: None,
        summary: "fourth-order central second difference",
    },
    Entry {
        name: "central6",
        derivative: 2,
        offsets: &[-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0],
        weights: &[
            1.0 / 90.0,
            -3.0 / 20.0,
            1.5,
            -49.0 / 18.0,
            1.5,
            -3.0 / 20.0,
            1.0 / 90.0,
        ],
        implicit: None,
        summary: "sixth-order central second difference",
    },
];

fn build(e: &Entry) -> Stencil {
    Stencil::new(
        e.name,
        e.derivative,
        e.offsets.to_vec(),
        e.weights.to_vec(),
        e.implicit.map(|(o, w)| (o.to_vec(), w.to_vec())),
    )
    .expect("built-in stencils are consistent")
}

/// A built-in stencil by name for the given derivative.
pub fn builtin(name: &str, derivative: u32) -> Option<Stencil> {
    C.iter()
        .find(|e| e.name == name && e.derivative == derivative)
        .map(build)
}

/// Names of the built-in stencils for a derivative.
pub fn names(derivative: u32) -> Vec<&'static str> {
    C.iter()
        .filter(|e| e.derivative == derivative)
        .map(|e| e.name)
        .collect()
}

/// Every built-in stencil with its one-line description.
pub fn all() -> Vec<(Stencil, &'static str)> {
    C.iter().map(|e| (build(e), e.summary)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_builtin_has_its_nominal_order() {
        let want = [
            ("central2", 1, 2),
            ("central4", 1, 4),
            ("central6", 1, 6),
            ("central8", 1, 8),
            ("upwind1", 1, 1),
            ("upwind2", 1, 2),
            ("upwind3", 1, 3),
            ("upwind5", 1, 5),
            ("compact4", 1, 4),
            ("compact6", 1, 6),
            ("drp7", 1, 4),
            ("central2", 2, 2),
            ("central4", 2, 4),
            ("central6", 2, 6),
        ];
        for (name, d, order) in want {
            assert_eq!(builtin(name, d).unwrap().order, order, "{name} d{d}");
        }
    }
}
