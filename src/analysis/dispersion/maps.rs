//! Maps derived from the matched frequencies at every grid node, per mode:
//! phase- and group-speed ratios against the exact wave (semi- and fully
//! discrete), the angle between numerical and exact group velocities, and the
//! amplitude factors over one period and over one unit of length travelled,
//! and the decay-rate ratio (numerical over exact damping rate).
//! Each map is node-major (C order over the grid), m modes per node.

use super::{decay_ratio, group_ratio, phase_ratio};
use num_complex::Complex64 as C64;
use std::f64::consts::PI;

/// The derived maps (each `nodes × m`, node-major).
#[derive(Debug, Clone, Default)]
pub struct DerivedMaps {
    /// Semi-discrete phase speed over the exact one.
    pub phase_speed_ratio: Vec<f64>,
    /// Fully discrete phase speed over the exact one.
    pub phase_speed_ratio_discrete: Vec<f64>,
    /// Semi-discrete group velocity along the exact one, over the exact group speed.
    pub group_speed_ratio: Vec<f64>,
    /// Angle between the semi-discrete and exact group velocities (radians).
    pub group_angle_error: Vec<f64>,
    /// Fully discrete group-speed ratio.
    pub group_speed_ratio_discrete: Vec<f64>,
    /// Angle between the fully discrete and exact group velocities.
    pub group_angle_error_discrete: Vec<f64>,
    /// Semi-discrete amplitude factor over one period of the exact wave.
    pub amplitude_per_period: Vec<f64>,
    /// Fully discrete amplitude factor over one period.
    pub amplitude_per_period_discrete: Vec<f64>,
    /// Semi-discrete amplitude factor over one unit of length travelled at the
    /// exact group speed.
    pub amplitude_per_unit_travel: Vec<f64>,
    /// Fully discrete amplitude factor over one unit of length.
    pub amplitude_per_unit_travel_discrete: Vec<f64>,
    /// Semi-discrete decay rate over the exact one (Im ω_num / Im ω_exact).
    pub decay_rate_ratio: Vec<f64>,
    /// Fully discrete decay rate over the exact one.
    pub decay_rate_ratio_discrete: Vec<f64>,
}

/// The frequencies and group velocities at one node, as the maps need them.
pub struct NodeFrequencies<'a> {
    /// Semi-discrete ω (m).
    pub numerical: &'a [C64],
    /// Exact ω (m).
    pub exact: &'a [C64],
    /// Fully discrete ω (m principal first).
    pub discrete: &'a [C64],
    /// Semi-discrete group velocities (m × d).
    pub group: &'a [Vec<f64>],
    /// Exact group velocities.
    pub group_exact: &'a [Vec<f64>],
    /// Fully discrete group velocities.
    pub group_discrete: &'a [Vec<f64>],
}

/// Amplitude factor over one period of the exact wave (NaN where it does not move).
fn per_period(wn: C64, we: C64, scale: f64) -> f64 {
    if we.re.abs() <= 1e-9 * scale {
        f64::NAN
    } else {
        (wn.im * 2.0 * PI / we.re.abs()).exp()
    }
}

/// Amplitude factor over one unit of distance travelled at the exact group speed.
fn per_unit_travel(wn: C64, ge: &[f64]) -> f64 {
    let c = ge.iter().map(|x| x * x).sum::<f64>().sqrt();
    if c == 0.0 {
        f64::NAN
    } else {
        (wn.im / c).exp()
    }
}

impl DerivedMaps {
    /// Appends the m values of one node to every map.
    pub fn push(&mut self, f: &NodeFrequencies) {
        let m = f.exact.len();
        let scale = f
            .exact
            .iter()
            .map(|z| z.norm())
            .fold(0.0, f64::max)
            .max(1e-300);
        for j in 0..m {
            let (we, ge) = (f.exact[j], &f.group_exact[j]);
            self.phase_speed_ratio
                .push(phase_ratio(f.numerical[j], we, scale));
            self.phase_speed_ratio_discrete
                .push(phase_ratio(f.discrete[j], we, scale));
            let (r, a) = group_ratio(&f.group[j], ge);
            self.group_speed_ratio.push(r);
            self.group_angle_error.push(a);
            let (r, a) = group_ratio(&f.group_discrete[j], ge);
            self.group_speed_ratio_discrete.push(r);
            self.group_angle_error_discrete.push(a);
            self.amplitude_per_period
                .push(per_period(f.numerical[j], we, scale));
            self.amplitude_per_period_discrete
                .push(per_period(f.discrete[j], we, scale));
            self.amplitude_per_unit_travel
                .push(per_unit_travel(f.numerical[j], ge));
            self.amplitude_per_unit_travel_discrete
                .push(per_unit_travel(f.discrete[j], ge));
            self.decay_rate_ratio
                .push(decay_ratio(f.numerical[j], we, scale));
            self.decay_rate_ratio_discrete
                .push(decay_ratio(f.discrete[j], we, scale));
        }
    }
}
