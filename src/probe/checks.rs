//! Checks that the probed program is what the analysis assumes: linear (a
//! second impulse of opposite sign and half the size gives the same G),
//! translation-invariant (an impulse at a second cell gives the same G) and
//! linearised about a steady state (one step leaves the base where it was).
//! Each check is a figure, compared with a tolerance.

use super::field::GField;
use super::measure::{field, Base};
use super::spec::ProbeSpec;
use super::stepper::{StepError, Stepper};

/// One check: its figure and whether it is within the tolerance.
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    /// Relative figure (see each check).
    pub figure: f64,
    /// figure ≤ tolerance.
    pub passed: bool,
}

/// The three checks at the probe's Δt.
#[derive(Debug, Clone, PartialEq)]
pub struct Checks {
    /// max |G(−a/2) − G(a)| / max |G(a)|.
    pub linearity: Check,
    /// max |G(second cell) − G(cell 0)| / max |G|.
    pub translation: Check,
    /// Drift of the base in one step (relative to the largest base value, or
    /// absolute for a zero base).
    pub steady: Check,
    /// The second impulse cell.
    pub second_cell: Vec<usize>,
    /// Tolerance of the checks.
    pub tolerance: f64,
    /// Rounding level of the measured entries (unit roundoff × state / impulse).
    pub noise: f64,
}

impl Checks {
    /// Whether the program is linear and translation-invariant (the steady
    /// check alone only changes what the matrices mean).
    pub fn valid(&self) -> bool {
        self.linearity.passed && self.translation.passed
    }
}

/// The cell of the translation check: about a third of the way along each axis.
pub fn second_cell(cells: &[usize]) -> Vec<usize> {
    cells.iter().map(|&n| (n / 3).max(1)).collect()
}

fn relative(a: &GField, b: &GField) -> f64 {
    let scale = a.max_abs().max(f64::MIN_POSITIVE);
    a.largest_difference(b).0 / scale
}

/// Runs the checks against `g`, measured at `dt` from impulses at cell 0
/// (2m more steps).
pub fn run(
    spec: &ProbeSpec,
    stepper: &mut dyn Stepper,
    dt: f64,
    base: &Base,
    g: &GField,
    tolerance: f64,
) -> Result<Checks, StepError> {
    let zero = vec![0; spec.dims()];
    let opposite = field(spec, stepper, dt, base, &zero, -0.5)?;
    let cell = second_cell(&spec.cells);
    let moved = field(spec, stepper, dt, base, &cell, 1.0)?;
    let check = |figure: f64| Check {
        figure,
        passed: figure <= tolerance,
    };
    Ok(Checks {
        linearity: check(relative(g, &opposite)),
        translation: check(relative(g, &moved)),
        steady: check(base.drift()),
        second_cell: cell,
        tolerance,
        noise: base.noise(spec),
    })
}
