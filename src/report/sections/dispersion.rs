//! Dispersion and dissipation: frequencies, derived maps, group velocities and
//! the curves by direction as arrays; the `dispersion` key of summary.json; the
//! resolution and spurious-mode rows.

use super::grid::grid_dims;
use super::Section;
use crate::analysis::dispersion::resolution::{Requirement, Resolution, SLOW_FRACTION};
use crate::analysis::Results;
use crate::problem::Problem;
use crate::report::format::{direction_deg, num, sig3, vec_num};
use crate::report::npy::{axis, plain, Array};
use serde_json::{json, Map, Value};

/// Dispersion.
pub struct Dispersion;

impl Section for Dispersion {
    fn arrays<'a>(&self, _p: &Problem, r: &'a Results, out: &mut Vec<Array<'a>>) {
        let Some(d) = &r.dispersion else {
            return;
        };
        let m = d.names.len();
        let dims = r.grid.points.len();
        let mut shape = r.grid.points.clone();
        shape.push(m);
        let mut mdims = grid_dims(r);
        mdims.push(plain("mode"));
        let names = json!(d.names);
        out.push(
            Array::complex(
                "frequency",
                &shape,
                &d.numerical[..],
                mdims.clone(),
                "rad s-1",
                "semi-discrete angular frequency omega = i eig L, per physical mode",
            )
            .with("labels", names.clone()),
        );
        out.push(
            Array::complex(
                "frequency_exact",
                &shape,
                &d.exact[..],
                mdims.clone(),
                "rad s-1",
                "angular frequency of the continuous system, per physical mode",
            )
            .with("labels", names.clone()),
        );
        let mm = d.discrete_modes;
        let mut dshape = r.grid.points.clone();
        dshape.push(mm);
        // the fully discrete modes (principal + computational) are a dimension of their own
        let mut ddims = grid_dims(r);
        ddims.push(plain("discrete_mode"));
        let mut labels = d.names.clone();
        labels.extend((0..mm - m).map(|k| format!("computational{}", k + 1)));
        out.push(
            Array::complex(
                "frequency_discrete",
                &dshape,
                &d.discrete[..],
                ddims,
                "rad s-1",
                "fully discrete omega from eig G (lambda = exp(-i omega dt)), physical modes then computational modes",
            )
            .with("labels", json!(labels)),
        );
        let dm = &d.maps;
        let maps: [(&str, &'a [f64], &'static str); 12] = [
            ("phase_speed_ratio", &dm.phase_speed_ratio, "semi-discrete phase speed over exact phase speed"),
            ("phase_speed_ratio_discrete", &dm.phase_speed_ratio_discrete, "fully discrete phase speed over exact phase speed"),
            ("group_speed_ratio", &dm.group_speed_ratio, "semi-discrete group velocity along the exact one, over the exact group speed"),
            ("group_angle_error", &dm.group_angle_error, "angle between semi-discrete and exact group velocities"),
            ("group_speed_ratio_discrete", &dm.group_speed_ratio_discrete, "fully discrete group velocity along the exact one, over the exact group speed"),
            ("group_angle_error_discrete", &dm.group_angle_error_discrete, "angle between fully discrete and exact group velocities"),
            ("amplitude_per_period", &dm.amplitude_per_period, "semi-discrete amplitude factor over one period of the exact wave"),
            ("amplitude_per_period_discrete", &dm.amplitude_per_period_discrete, "fully discrete amplitude factor over one period of the exact wave"),
            ("amplitude_per_unit_travel", &dm.amplitude_per_unit_travel, "semi-discrete amplitude factor over one unit of length travelled at the exact group speed"),
            ("amplitude_per_unit_travel_discrete", &dm.amplitude_per_unit_travel_discrete, "fully discrete amplitude factor over one unit of length travelled at the exact group speed"),
            ("decay_rate_ratio", &dm.decay_rate_ratio, "semi-discrete decay rate over the exact decay rate, Im omega_num / Im omega_exact (NaN where the exact mode is not damped)"),
            ("decay_rate_ratio_discrete", &dm.decay_rate_ratio_discrete, "fully discrete decay rate over the exact decay rate (NaN where the exact mode is not damped)"),
        ];
        for (name, data, long_name) in maps {
            let units = if name.starts_with("group_angle_error") {
                "radian"
            } else {
                "1"
            };
            out.push(
                Array::real(name, &shape, data, mdims.clone(), units, long_name)
                    .with("labels", names.clone()),
            );
        }
        let mut gshape = shape.clone();
        gshape.push(dims);
        let mut gdims = mdims.clone();
        gdims.push(plain("axis"));
        for (name, src, long_name) in [
            (
                "group_velocity",
                &d.group,
                "semi-discrete group velocity d omega / d k",
            ),
            (
                "group_velocity_exact",
                &d.group_exact,
                "exact group velocity d omega / d k",
            ),
            (
                "group_velocity_discrete",
                &d.group_discrete,
                "fully discrete group velocity d omega / d k of the principal roots",
            ),
        ] {
            out.push(
                Array::real(name, &gshape, &src[..], gdims.clone(), "m s-1", long_name)
                    .with("labels", names.clone()),
            );
        }
        let nd = d.directions.len();
        let k = d.ppw.len();
        out.push(Array::real(
            "dispersion_directions",
            &[nd, dims],
            d.directions.iter().flatten().copied().collect::<Vec<f64>>(),
            vec![plain("curve_direction"), plain("axis")],
            "1",
            "physical wave directions (unit vectors in k-space) of the dispersion curves",
        ));
        out.push(Array::real(
            "dispersion_ppw",
            &[k],
            &d.ppw[..],
            vec![axis("curve_sample", "dispersion_ppw.npy")],
            "1",
            "points per wavelength 2 pi / max_d |theta_d| of the curve samples (cells per wavelength along the least-resolved axis), the same along every direction",
        ));
        for (name, src, long_name) in [
            (
                "phase_speed_ratio_by_direction",
                &d.phase_curves,
                "semi-discrete phase speed ratio along each direction",
            ),
            (
                "phase_speed_ratio_by_direction_discrete",
                &d.phase_curves_discrete,
                "fully discrete phase speed ratio along each direction",
            ),
            (
                "group_speed_ratio_by_direction",
                &d.group_curves,
                "semi-discrete group speed ratio along each direction",
            ),
            (
                "decay_rate_ratio_by_direction",
                &d.decay_curves,
                "semi-discrete decay rate ratio along each direction",
            ),
            (
                "decay_rate_ratio_by_direction_discrete",
                &d.decay_curves_discrete,
                "fully discrete decay rate ratio along each direction",
            ),
        ] {
            let data: Vec<f64> = src
                .iter()
                .flat_map(|dir| dir.iter().flat_map(|s| s[..m].iter().copied()))
                .collect();
            let dims = vec![
                // dispersion_directions.npy holds unit vectors, not a 1-D coordinate
                plain("curve_direction"),
                axis("curve_sample", "dispersion_ppw.npy"),
                plain("mode"),
            ];
            out.push(
                Array::real(name, &[nd, k, m], data, dims, "1", long_name)
                    .with("labels", names.clone()),
            );
        }
    }

    fn summary(&self, p: &Problem, r: &Results, s: &mut Map<String, Value>) {
        let Some(d) = &r.dispersion else {
            return;
        };
        let spacing = &p.spacing;
        let requirement = |q: &Option<Requirement>| match q {
            None => json!(null),
            Some(q) => {
                let (deg, el) = direction_deg(&d.directions[q.worst.direction]);
                json!({
                    "ppw": num(q.ppw()),
                    "shortest_wavelength": num(q.wavelength),
                    "cells_per_wavelength_by_axis": vec_num(&q.cells_by_axis(spacing)),
                    "worst_physical_direction_deg": deg,
                    "worst_physical_elevation_deg": el,
                    "theta_at_threshold": vec_num(&q.worst.theta),
                })
            }
        };
        let modes: Vec<Value> = d
            .names
            .iter()
            .zip(&d.resolution)
            .zip(&d.parasitic_fraction)
            .map(|((name, res), parasitic)| {
                let (deg, el) = direction_deg(&d.directions[res.worst_direction()]);
                let semi = res.semi_ppw();
                json!({
                    "name": name,
                    "ppw_required": semi.map(num),
                    "ppw_required_discrete": res.discrete_ppw().map(num),
                    "worst_direction_deg": semi.map(|_| deg),
                    "worst_elevation_deg": semi.and(el),
                    "semi_discrete": requirement(&res.semi),
                    "fully_discrete": requirement(&res.discrete),
                    "slow_directions_excluded": res.excluded.len(),
                    "decay_ppw_required": res.decay_ppw().map(num),
                    "decay_ppw_required_discrete": res.decay_discrete_ppw().map(num),
                    "decay": requirement(&res.decay),
                    "decay_discrete": requirement(&res.decay_discrete),
                    "weakly_damped_directions_excluded": res.decay_excluded.len(),
                    "parasitic_fraction": parasitic,
                })
            })
            .collect();
        let excluded: usize = d.resolution.iter().map(|r| r.excluded.len()).sum();
        let mut out = json!({
            "phase_tolerance": d.tolerance,
            "curve_directions": d.directions.len(),
            "modes": modes,
            "computational_modes": d.computational,
            "definitions": {
                "ppw_required": "points per wavelength 2 pi / max_d |theta_d| (cells per wavelength along the least-resolved grid axis) above which |c_num/c_exact - 1| <= phase_tolerance in every physical curve direction where the mode moves; the crossing is found by bisection on the phase error between curve samples (to 1e-10 in ln k); null when the mode does not propagate",
                "ppw_required_discrete": "the same for the fully discrete phase speed (with the time method at the case's dt)",
                "worst_direction_deg": "physical direction (angle of the wavevector k in physical space, not in theta-space) needing the most points per wavelength",
                "shortest_wavelength": "the shortest wavelength (units of grid.spacing) kept within phase_tolerance in every included direction: the longest of the per-direction threshold wavelengths",
                "cells_per_wavelength_by_axis": "shortest_wavelength / spacing_d: how many cells along each axis that wavelength spans",
                "slow_directions_excluded": "curve directions left out because the mode's exact long-wave phase speed there is below 10 % of its fastest (a wave crossing a mean flow almost at right angles hardly moves, and its relative phase error is ill-conditioned)",
                "decay_ppw_required": "points per wavelength (as for ppw_required) above which the decay-rate error |Im omega_num / Im omega_exact - 1| <= phase_tolerance in every physical curve direction where the mode is damped (diffusion accuracy); null when the exact mode is not damped",
                "decay_ppw_required_discrete": "the same for the fully discrete decay rate (with the time method at the case's dt)",
                "weakly_damped_directions_excluded": "curve directions left out of the decay requirement because the mode's exact long-wave decay rate over |k|^2 there is below 10 % of its largest",
                "parasitic_fraction": "share of grid wavevectors where the numerical group velocity opposes the exact one",
                "computational_modes": "fully discrete eigenvalues with no semi-discrete partner (extra roots of multistep methods)",
            },
        });
        if excluded > 0 {
            out["caution"] = json!(format!(
                "{excluded} mode-direction pair(s) excluded from the resolution requirement as near-zero phase speed (below {} % of the mode's fastest); see slow_directions_excluded",
                100.0 * SLOW_FRACTION
            ));
        }
        s.insert("dispersion".into(), out);
    }

    fn rows(&self, p: &Problem, r: &Results, rows: &mut Vec<(String, String)>) {
        let Some(d) = &r.dispersion else {
            return;
        };
        type Need = fn(&Resolution) -> Option<f64>;
        let rows_of: [(&str, &str, Need, Need); 2] = [
            (
                "resolution",
                "phase",
                Resolution::semi_ppw,
                Resolution::discrete_ppw,
            ),
            (
                "diffusion",
                "decay-rate",
                Resolution::decay_ppw,
                Resolution::decay_discrete_ppw,
            ),
        ];
        for (label, quantity, semi, discrete) in rows_of {
            let parts: Vec<String> = d
                .names
                .iter()
                .zip(&d.resolution)
                .filter_map(|(n, res)| {
                    semi(res).map(|a| match discrete(res) {
                        Some(b) => format!("{n} {} ({} with time stepping)", sig3(a), sig3(b)),
                        None => format!("{n} {}", sig3(a)),
                    })
                })
                .collect();
            if !parts.is_empty() {
                rows.push((
                    label.into(),
                    format!(
                        "points per wavelength (along the least-resolved axis) for {:.1}% {quantity} error: {}",
                        100.0 * d.tolerance,
                        parts.join(", ")
                    ),
                ));
            }
        }
        // the longest of the modes' shortest well-resolved wavelengths, with time stepping
        let longest = d
            .names
            .iter()
            .zip(&d.resolution)
            .filter_map(|(n, res)| res.discrete.as_ref().or(res.semi.as_ref()).map(|q| (n, q)))
            .max_by(|a, b| a.1.wavelength.total_cmp(&b.1.wavelength));
        if let Some((name, q)) = longest {
            let axes = ["x", "y", "z"];
            let cells: Vec<String> = q
                .cells_by_axis(&p.spacing)
                .iter()
                .zip(axes)
                .map(|(c, a)| format!("{} cells along {a}", sig3(*c)))
                .collect();
            rows.push((
                "wavelength".into(),
                format!(
                    "shortest well-resolved wavelength {} m ({name}, with time stepping): {}",
                    sig3(q.wavelength),
                    cells.join(", ")
                ),
            ));
        }
        let excluded: usize = d.resolution.iter().map(|r| r.excluded.len()).sum();
        if excluded > 0 {
            rows.push((
                "caution".into(),
                format!(
                    "{excluded} mode-direction pair(s) left out of the resolution: phase speed below {} % of the mode's fastest",
                    100.0 * SLOW_FRACTION
                ),
            ));
        }
        if d.computational > 0 {
            rows.push((
                "spurious".into(),
                format!(
                    "{} computational mode(s) of the time method",
                    d.computational
                ),
            ));
        }
    }
}
