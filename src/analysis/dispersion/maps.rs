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

/// Number of derived maps.
pub const MAP_COUNT: usize = 12;

/// The frequencies and group velocities at one node, as the maps need them.
pub struct NodeFrequencies<'a> {
    /// Semi-discrete ω (m).
    pub numerical: &'a [C64],
    /// Exact ω (m).
    pub exact: &'a [C64],
    /// Fully discrete ω (m principal first).
    pub discrete: &'a [C64],
    /// Semi-discrete group velocities (m × d, mode-major).
    pub group: &'a [f64],
    /// Exact group velocities.
    pub group_exact: &'a [f64],
    /// Fully discrete group velocities.
    pub group_discrete: &'a [f64],
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

impl NodeFrequencies<'_> {
    /// Number of modes.
    pub fn modes(&self) -> usize {
        self.exact.len()
    }

    /// The frequency scale below which an exact mode counts as standing or undamped.
    pub fn scale(&self) -> f64 {
        self.exact
            .iter()
            .map(|z| z.norm())
            .fold(0.0, f64::max)
            .max(1e-300)
    }

    /// Mode j's values of the maps, in the order of [`DerivedMaps::columns_mut`].
    pub fn map_values(&self, j: usize, scale: f64) -> [f64; MAP_COUNT] {
        let d = self.group.len() / self.modes().max(1);
        let g = |v: &'_ [f64]| -> std::ops::Range<usize> { (j * d)..((j + 1) * d).min(v.len()) };
        let ge = &self.group_exact[g(self.group_exact)];
        let we = self.exact[j];
        let (wn, wd) = (self.numerical[j], self.discrete[j]);
        let (r, a) = group_ratio(&self.group[g(self.group)], ge);
        let (rd, ad) = group_ratio(&self.group_discrete[g(self.group_discrete)], ge);
        [
            phase_ratio(wn, we, scale),
            phase_ratio(wd, we, scale),
            r,
            a,
            rd,
            ad,
            per_period(wn, we, scale),
            per_period(wd, we, scale),
            per_unit_travel(wn, ge),
            per_unit_travel(wd, ge),
            decay_ratio(wn, we, scale),
            decay_ratio(wd, we, scale),
        ]
    }
}

impl DerivedMaps {
    /// Maps of `len` values each, zero until written.
    pub fn zeroed(len: usize) -> Self {
        let mut maps = DerivedMaps::default();
        for column in maps.columns_mut() {
            // zeroed pages from the allocator, first touched by the workers
            *column = vec![0.0; len];
        }
        maps
    }

    /// Every map, in the order of [`NodeFrequencies::map_values`].
    pub fn columns_mut(&mut self) -> [&mut Vec<f64>; MAP_COUNT] {
        [
            &mut self.phase_speed_ratio,
            &mut self.phase_speed_ratio_discrete,
            &mut self.group_speed_ratio,
            &mut self.group_angle_error,
            &mut self.group_speed_ratio_discrete,
            &mut self.group_angle_error_discrete,
            &mut self.amplitude_per_period,
            &mut self.amplitude_per_period_discrete,
            &mut self.amplitude_per_unit_travel,
            &mut self.amplitude_per_unit_travel_discrete,
            &mut self.decay_rate_ratio,
            &mut self.decay_rate_ratio_discrete,
        ]
    }

    /// Appends the m values of one node to every map.
    pub fn push(&mut self, f: &NodeFrequencies) {
        let scale = f.scale();
        for j in 0..f.modes() {
            let values = f.map_values(j, scale);
            for (column, v) in self.columns_mut().into_iter().zip(values) {
                column.push(v);
            }
        }
    }
}
