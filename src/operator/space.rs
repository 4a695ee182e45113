//! The spatial scheme as chosen: stencils per axis, upwinding of biased
//! stencils, added dissipation and the grid arrangement with each variable's
//! offset in the cell.

use crate::stencil::Stencil;

/// How a biased stencil is applied to a system.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Upwind {
    /// Split by characteristic speeds: A± = V Λ± V⁻¹.
    Characteristic,
    /// Split by the spectral radius: A± = (A ± ρ(A) I)/2.
    Rusanov,
}

/// Artificial dissipation −σ (s/h_d) sin^p(θ_d/2) per axis.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Dissipation {
    /// Even power p.
    pub order: u32,
    /// Strength σ.
    pub strength: f64,
}

/// The spatial discretisation chosen in a case.
#[derive(Debug, Clone)]
pub struct Space {
    /// First-derivative stencil per axis.
    pub first: Vec<Stencil>,
    /// Second-derivative stencil per axis.
    pub second: Vec<Stencil>,
    /// Splitting used with biased stencils.
    pub upwind: Upwind,
    /// Optional added dissipation.
    pub dissipation: Option<Dissipation>,
    /// The grid arrangement.
    pub arrangement: Arrangement,
    /// Offset of each variable in the cell, per axis (0 or ½); empty when collocated.
    pub locations: Vec<Vec<f64>>,
}

/// Where the variables sit in the cell.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Arrangement {
    /// All variables at the cell centre.
    Collocated,
    /// Arakawa A (shallow water): all together, as collocated.
    A,
    /// Arakawa B: h at centres, u and v at corners.
    B,
    /// Arakawa C: u on x-faces, v on y-faces.
    C,
    /// Arakawa D: u on y-faces, v on x-faces.
    D,
    /// Arakawa E, analysed as the B-grid on axes turned by 45 degrees.
    E,
    /// The Yee cell (Maxwell): E on edges, H on faces.
    Yee,
}

impl Arrangement {
    /// Every arrangement with its case-file name.
    pub const ALL: [(Arrangement, &'static str); 7] = [
        (Arrangement::Collocated, "collocated"),
        (Arrangement::A, "a"),
        (Arrangement::B, "b"),
        (Arrangement::C, "c"),
        (Arrangement::D, "d"),
        (Arrangement::E, "e"),
        (Arrangement::Yee, "yee"),
    ];

    /// The case-file name.
    pub fn name(self) -> &'static str {
        Self::ALL
            .iter()
            .find(|(a, _)| *a == self)
            .map(|(_, n)| *n)
            .unwrap_or("collocated")
    }

    /// The arrangement of a case-file name.
    pub fn from_name(name: &str) -> Option<Arrangement> {
        Self::ALL.iter().find(|(_, n)| *n == name).map(|(a, _)| *a)
    }
}
