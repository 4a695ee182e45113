//! What a probe needs to know about the user's program: its variables, the
//! periodic grid it runs on, the time step, the uniform state to linearise
//! about, the perturbation size and where each variable sits in its cell.

use crate::error::InputError;

/// Most variables a probed program may have.
pub const MAX_VARIABLES: usize = 16;
/// Most cells of the probed grid (all axes together).
pub const MAX_CELLS: usize = 1 << 22;

/// The probe of one time-step program.
#[derive(Debug, Clone, PartialEq)]
pub struct ProbeSpec {
    /// Variable names, in the order of the state array's first axis.
    pub variables: Vec<String>,
    /// Cells per axis of the periodic grid (1 to 3 axes).
    pub cells: Vec<usize>,
    /// The uniform state to linearise about, one value per variable.
    pub base: Vec<f64>,
    /// Perturbation size: relative to the base (to the largest base value for a
    /// variable whose own base is zero), absolute when the whole base is zero.
    pub amplitude: f64,
    /// Per variable, its offset inside the cell in cell widths along each axis
    /// (0.5 for a face-centred C-grid velocity), so that phases are removed.
    pub locations: Vec<Vec<f64>>,
}

impl ProbeSpec {
    /// A probe with a zero base, amplitude 1e-6 and every variable at the cell
    /// centre.
    pub fn new(variables: &[&str], cells: &[usize]) -> ProbeSpec {
        ProbeSpec {
            variables: variables.iter().map(|s| s.to_string()).collect(),
            cells: cells.to_vec(),
            base: vec![0.0; variables.len()],
            amplitude: 1e-6,
            locations: vec![vec![0.0; cells.len()]; variables.len()],
        }
    }

    /// Number of variables.
    pub fn m(&self) -> usize {
        self.variables.len()
    }

    /// Number of axes.
    pub fn dims(&self) -> usize {
        self.cells.len()
    }

    /// Number of cells (= grid wavevectors).
    pub fn nodes(&self) -> usize {
        self.cells.iter().product()
    }

    /// The perturbation given to variable `j`.
    pub fn amplitude_of(&self, j: usize) -> f64 {
        let own = self.base[j].abs();
        let largest = self.base.iter().fold(0.0_f64, |a, b| a.max(b.abs()));
        let scale = if own > 0.0 {
            own
        } else if largest > 0.0 {
            largest
        } else {
            1.0
        };
        self.amplitude * scale
    }

    /// Checks sizes and values; errors name the `probe.` key.
    pub fn check(&self) -> Result<(), InputError> {
        let m = self.m();
        if m == 0 || m > MAX_VARIABLES {
            return Err(InputError::new(
                "probe.variables",
                format!("give 1 to {MAX_VARIABLES} variable names, not {m}"),
            ));
        }
        for (i, v) in self.variables.iter().enumerate() {
            if v.trim().is_empty() {
                return Err(InputError::new("probe.variables", "a name is empty"));
            }
            if self.variables[..i].contains(v) {
                return Err(InputError::new(
                    "probe.variables",
                    format!("`{v}` is named twice"),
                ));
            }
        }
        let dims = self.dims();
        if !(1..=3).contains(&dims) {
            return Err(InputError::new(
                "probe.cells",
                format!("give 1, 2 or 3 axes, not {dims}"),
            ));
        }
        if let Some(n) = self.cells.iter().find(|&&n| n < 2) {
            return Err(InputError::new(
                "probe.cells",
                format!("every axis needs at least 2 cells, not {n}"),
            ));
        }
        let total = self
            .cells
            .iter()
            .try_fold(1usize, |a, &n| a.checked_mul(n))
            .filter(|&t| t <= MAX_CELLS);
        if total.is_none() {
            return Err(InputError::new(
                "probe.cells",
                format!("at most {MAX_CELLS} cells in all"),
            ));
        }
        if self.base.len() != m {
            return Err(InputError::new(
                "probe.base",
                format!("give one value per variable ({m}), not {}", self.base.len()),
            ));
        }
        if let Some(b) = self.base.iter().find(|b| !b.is_finite() || b.abs() > 1e150) {
            return Err(InputError::new(
                "probe.base",
                format!("{b} is not a finite value of modest size (|base| <= 1e150)"),
            ));
        }
        if !(self.amplitude > 1e-15 && self.amplitude <= 1e-1) {
            return Err(InputError::new(
                "probe.amplitude",
                format!(
                    "{} is outside [1e-15, 0.1]: too small drowns in rounding, too large leaves the linear range",
                    self.amplitude
                ),
            ));
        }
        if self.locations.len() != m {
            return Err(InputError::new(
                "probe.locations",
                format!(
                    "give one offset list per variable ({m}), not {}",
                    self.locations.len()
                ),
            ));
        }
        for loc in &self.locations {
            if loc.len() != dims {
                return Err(InputError::new(
                    "probe.locations",
                    format!("each offset list needs {dims} entries (one per axis)"),
                ));
            }
            if loc.iter().any(|x| !x.is_finite() || x.abs() > 1.0) {
                return Err(InputError::new(
                    "probe.locations",
                    "offsets are fractions of a cell, between -1 and 1",
                ));
            }
        }
        Ok(())
    }
}

/// For each probed variable, its index among `names` (a model's variables,
/// named `whose` in messages); the two sets must be equal. Errors name
/// `probe.variables`.
pub fn variable_order(
    names: &[String],
    variables: &[String],
    whose: &str,
) -> Result<Vec<usize>, InputError> {
    let order = variables
        .iter()
        .map(|v| {
            names.iter().position(|n| n == v).ok_or_else(|| {
                InputError::new(
                    "probe.variables",
                    format!(
                        "`{v}` is not a variable of {whose} (its variables: {})",
                        names.join(", ")
                    ),
                )
            })
        })
        .collect::<Result<Vec<_>, _>>()?;
    if order.len() != names.len() {
        return Err(InputError::new(
            "probe.variables",
            format!(
                "name every variable of {whose} ({}), each once",
                names.join(", ")
            ),
        ));
    }
    Ok(order)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn amplitude_is_relative_to_the_base_or_absolute_for_a_zero_base() {
        let mut s = ProbeSpec::new(&["h", "u"], &[8]);
        assert_eq!(s.amplitude_of(0), 1e-6);
        s.base = vec![50.0, 0.0];
        assert_eq!(s.amplitude_of(0), 50.0 * 1e-6);
        assert_eq!(s.amplitude_of(1), 50.0 * 1e-6);
    }

    #[test]
    fn check_names_the_key() {
        let mut s = ProbeSpec::new(&["h", "h"], &[8]);
        assert_eq!(s.check().unwrap_err().key, "probe.variables");
        s = ProbeSpec::new(&["h"], &[1]);
        assert_eq!(s.check().unwrap_err().key, "probe.cells");
        s = ProbeSpec::new(&["h"], &[8]);
        s.amplitude = 0.5;
        assert_eq!(s.check().unwrap_err().key, "probe.amplitude");
        s.amplitude = 1e-6;
        s.locations = vec![vec![0.0, 0.5]];
        assert_eq!(s.check().unwrap_err().key, "probe.locations");
    }
}
