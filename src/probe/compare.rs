//! "Does my code implement my scheme": the probed G against the G of a
//! case-file description of the intended scheme at the same wavevectors and
//! Δt, with the largest difference and where it is.

use super::field::GField;
use super::spec::variable_order;
use crate::analysis::amplification_at;
use crate::error::InputError;
use crate::problem::Problem;
use num_complex::Complex64 as C64;

/// Where the probed and the described matrices differ most.
#[derive(Debug, Clone, PartialEq)]
pub struct Comparison {
    /// max |G_probe − G_case| over wavevectors and entries.
    pub largest: f64,
    /// That over max |G_case|.
    pub relative: f64,
    /// The wavevector.
    pub theta: Vec<f64>,
    /// The row variable.
    pub row: String,
    /// The column variable.
    pub column: String,
    /// The probed entry there.
    pub probed: C64,
    /// The described entry there.
    pub described: C64,
}

/// The case-file G at the probe's wavevectors and `dt`, in the probe's
/// variable order (`variables`); refused when the case's state is not the
/// probe's variables.
pub fn described(
    problem: &Problem,
    variables: &[String],
    cells: &[usize],
    dt: f64,
) -> Result<GField, InputError> {
    let op = problem.operator();
    let mut field = GField::zeros(cells, variables.len());
    let order = variable_order(&problem.system.variables, variables, "the case's model")?;
    if problem.dims() != cells.len() {
        return Err(InputError::new(
            "probe.cells",
            format!(
                "the probe's grid has {} axes, the case {}",
                cells.len(),
                problem.dims()
            ),
        ));
    }
    let m = order.len();
    for node in 0..field.nodes() {
        let theta = field.theta(node);
        let g = amplification_at(problem, &op, &theta, dt);
        if g.nrows() != m {
            return Err(InputError::new(
                "time.method",
                format!(
                    "the case's method steps {} values per wavevector ({} time levels), the probed program {}; compare one-level schemes",
                    g.nrows(),
                    g.nrows() / m.max(1),
                    m
                ),
            ));
        }
        for i in 0..m {
            for j in 0..m {
                field.g[(node * m + i) * m + j] = g[(order[i], order[j])];
            }
        }
    }
    Ok(field)
}

/// The largest difference between `probed` and `described`.
pub fn compare(probed: &GField, described: &GField, variables: &[String]) -> Comparison {
    let (largest, node, i, j) = probed.largest_difference(described);
    let m = probed.m;
    let k = (node * m + i) * m + j;
    Comparison {
        largest,
        relative: largest / described.max_abs().max(f64::MIN_POSITIVE),
        theta: probed.theta(node),
        row: variables[i].clone(),
        column: variables[j].clone(),
        probed: probed.g[k],
        described: described.g[k],
    }
}
