//! Measuring G(θ) from a stepper: the base state stepped once, then one
//! perturbed step per variable (an impulse at one cell), the difference
//! transformed (discrete Fourier transform) and divided by the impulse size.

use super::field::GField;
use super::spec::ProbeSpec;
use super::stepper::{uniform, StepError, Stepper};
use ndarray::{ArrayD, Axis};

/// The base state and its image after one step.
pub struct Base {
    /// The uniform state.
    pub state: ArrayD<f64>,
    /// One step later.
    pub stepped: ArrayD<f64>,
}

impl Base {
    /// Steps the spec's base state once.
    pub fn step(spec: &ProbeSpec, stepper: &mut dyn Stepper, dt: f64) -> Result<Base, StepError> {
        let state = uniform(&spec.base, &spec.cells);
        let stepped = stepper.step(&state, dt)?;
        Ok(Base { state, stepped })
    }

    /// How far one step moves the base: max |B1 − B| over the largest base
    /// value, or absolute for a zero base.
    pub fn drift(&self) -> f64 {
        let moved = self
            .stepped
            .iter()
            .zip(&self.state)
            .fold(0.0_f64, |a, (x, y)| a.max((x - y).abs()));
        let scale = self.state.iter().fold(0.0_f64, |a, x| a.max(x.abs()));
        if scale > 0.0 {
            moved / scale
        } else {
            moved
        }
    }

    /// Rounding level of a measured entry: unit roundoff of the largest state
    /// value over the smallest impulse.
    pub fn noise(&self, spec: &ProbeSpec) -> f64 {
        let scale = self
            .stepped
            .iter()
            .chain(&self.state)
            .fold(0.0_f64, |a, x| a.max(x.abs()));
        let smallest = (0..spec.m())
            .map(|j| spec.amplitude_of(j))
            .fold(f64::INFINITY, f64::min);
        f64::EPSILON * scale.max(smallest) / smallest
    }
}

/// G(θ) at every grid wavevector from impulses of `factor` × the spec's
/// amplitude at cell `at`, with each variable's phase at its own location.
pub fn field(
    spec: &ProbeSpec,
    stepper: &mut dyn Stepper,
    dt: f64,
    base: &Base,
    at: &[usize],
    factor: f64,
) -> Result<GField, StepError> {
    let m = spec.m();
    let mut g = GField::zeros(&spec.cells, m);
    for j in 0..m {
        let a = spec.amplitude_of(j) * factor;
        let mut state = base.state.clone();
        {
            let mut var = state.index_axis_mut(Axis(0), j);
            var[at] += a;
        }
        let out = stepper.step(&state, dt)?;
        let responses: Vec<Vec<f64>> = (0..m)
            .map(|i| {
                out.index_axis(Axis(0), i)
                    .iter()
                    .zip(base.stepped.index_axis(Axis(0), i).iter())
                    .map(|(x, y)| x - y)
                    .collect()
            })
            .collect();
        g.set_column(j, &responses, at, a);
    }
    g.shift_to_locations(&spec.locations);
    Ok(g)
}

/// G(θ) at `dt` from impulses at cell 0: 1 + m steps.
pub fn measure(spec: &ProbeSpec, stepper: &mut dyn Stepper, dt: f64) -> Result<GField, StepError> {
    let base = Base::step(spec, stepper, dt)?;
    field(spec, stepper, dt, &base, &vec![0; spec.dims()], 1.0)
}
