//! NPY arrays (little-endian float64 / complex128, C order) and the manifest that
//! describes each: file, shape, dtype, dims, coords, units, long_name.

use super::ReportError;
use crate::analysis::modes::Measure;
use crate::analysis::Results;
use crate::problem::Problem;
use ndarray::{ArrayViewD, IxDyn};
use num_complex::Complex64 as C64;
use serde_json::{json, Map, Value};
use std::path::Path;

const AXES: [&str; 3] = ["theta_x", "theta_y", "theta_z"];

struct Writer<'a> {
    dir: &'a Path,
    entries: Map<String, Value>,
}

struct Meta<'a> {
    dims: Vec<&'a str>,
    units: &'a str,
    long_name: &'a str,
}

impl Writer<'_> {
    fn entry(&mut self, name: &str, shape: &[usize], dtype: &str, meta: Meta) {
        let coords: Map<String, Value> = meta
            .dims
            .iter()
            .map(|d| {
                let file = if AXES.contains(d) || *d == "direction" {
                    Value::from(format!(
                        "{}.npy",
                        if *d == "direction" { "directions" } else { d }
                    ))
                } else {
                    Value::Null
                };
                (d.to_string(), file)
            })
            .collect();
        self.entries.insert(
            name.to_string(),
            json!({
                "file": format!("{name}.npy"),
                "shape": shape,
                "dtype": dtype,
                "dims": meta.dims,
                "coords": coords,
                "units": meta.units,
                "long_name": meta.long_name,
            }),
        );
    }

    fn real(
        &mut self,
        name: &str,
        shape: &[usize],
        data: impl AsRef<[f64]>,
        meta: Meta,
    ) -> Result<(), ReportError> {
        let path = self.dir.join(format!("{name}.npy"));
        let arr = ArrayViewD::from_shape(IxDyn(shape), data.as_ref()).expect("shape matches data");
        ndarray_npy::write_npy(&path, &arr).map_err(|e| ReportError::Npy {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        self.entry(name, shape, "float64", meta);
        Ok(())
    }

    fn complex(
        &mut self,
        name: &str,
        shape: &[usize],
        data: impl AsRef<[C64]>,
        meta: Meta,
    ) -> Result<(), ReportError> {
        let path = self.dir.join(format!("{name}.npy"));
        let arr = ArrayViewD::from_shape(IxDyn(shape), data.as_ref()).expect("shape matches data");
        ndarray_npy::write_npy(&path, &arr).map_err(|e| ReportError::Npy {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        self.entry(name, shape, "complex128", meta);
        Ok(())
    }
}

fn write_dispersion(
    w: &mut Writer,
    r: &Results,
    d: &crate::analysis::dispersion::DispersionResult,
    grid_dims: &[&str],
) -> Result<(), ReportError> {
    let m = d.names.len();
    let dims = r.grid.points.len();
    let mut shape = r.grid.points.clone();
    shape.push(m);
    let mut mdims = grid_dims.to_vec();
    mdims.push("mode");
    let flat =
        |v: &[Vec<C64>]| -> Vec<C64> { v.iter().flat_map(|x| x[..m].iter().copied()).collect() };
    let names = serde_json::to_value(&d.names).expect("names serialise");
    let meta = |units: &'static str, long_name: &'static str| Meta {
        dims: mdims.clone(),
        units,
        long_name,
    };
    w.complex(
        "frequency",
        &shape,
        flat(&d.numerical),
        meta(
            "rad s-1",
            "semi-discrete angular frequency omega = i eig L, per physical mode",
        ),
    )?;
    w.complex(
        "frequency_exact",
        &shape,
        flat(&d.exact),
        meta(
            "rad s-1",
            "angular frequency of the continuous system, per physical mode",
        ),
    )?;
    let mm = d.discrete.first().map_or(m, |x| x.len());
    let mut dshape = r.grid.points.clone();
    dshape.push(mm);
    let all: Vec<C64> = d.discrete.iter().flatten().copied().collect();
    w.complex("frequency_discrete", &dshape, all, meta("rad s-1", "fully discrete omega from eig G (lambda = exp(-i omega dt)), physical modes then computational modes"))?;
    let mut labels = d.names.clone();
    labels.extend((0..mm - m).map(|k| format!("computational{}", k + 1)));
    w.entries["frequency_discrete"]["labels"] = serde_json::to_value(&labels).expect("labels");
    for key in ["frequency", "frequency_exact"] {
        w.entries[key]["labels"] = names.clone();
    }
    let dm = &d.maps;
    let maps: [(&str, &[f64], &'static str); 10] = [
        (
            "phase_speed_ratio",
            &dm.phase_speed_ratio,
            "semi-discrete phase speed over exact phase speed",
        ),
        (
            "phase_speed_ratio_discrete",
            &dm.phase_speed_ratio_discrete,
            "fully discrete phase speed over exact phase speed",
        ),
        (
            "group_speed_ratio",
            &dm.group_speed_ratio,
            "semi-discrete group velocity along the exact one, over the exact group speed",
        ),
        (
            "group_angle_error",
            &dm.group_angle_error,
            "angle between semi-discrete and exact group velocities",
        ),
        (
            "group_speed_ratio_discrete",
            &dm.group_speed_ratio_discrete,
            "fully discrete group velocity along the exact one, over the exact group speed",
        ),
        (
            "group_angle_error_discrete",
            &dm.group_angle_error_discrete,
            "angle between fully discrete and exact group velocities",
        ),
        (
            "amplitude_per_period",
            &dm.amplitude_per_period,
            "semi-discrete amplitude factor over one period of the exact wave",
        ),
        (
            "amplitude_per_period_discrete",
            &dm.amplitude_per_period_discrete,
            "fully discrete amplitude factor over one period of the exact wave",
        ),
        (
            "amplitude_per_unit_travel",
            &dm.amplitude_per_unit_travel,
            "semi-discrete amplitude factor over one unit of length travelled at the exact group speed",
        ),
        (
            "amplitude_per_unit_travel_discrete",
            &dm.amplitude_per_unit_travel_discrete,
            "fully discrete amplitude factor over one unit of length travelled at the exact group speed",
        ),
    ];
    for (name, data, long_name) in maps {
        let units = if name.starts_with("group_angle_error") {
            "radian"
        } else {
            "1"
        };
        w.real(name, &shape, data, meta(units, long_name))?;
        w.entries[name]["labels"] = names.clone();
    }
    let mut gshape = shape.clone();
    gshape.push(dims);
    let mut gdims = mdims.clone();
    gdims.push("axis");
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
        let data: Vec<f64> = src
            .iter()
            .flat_map(|node| node.iter().flat_map(|v| v.iter().copied()))
            .collect();
        w.real(
            name,
            &gshape,
            data,
            Meta {
                dims: gdims.clone(),
                units: "m s-1",
                long_name,
            },
        )?;
        w.entries[name]["labels"] = names.clone();
    }
    let nd = d.directions.len();
    let k = d.ppw.len();
    w.real(
        "dispersion_directions",
        &[nd, dims],
        d.directions.iter().flatten().copied().collect::<Vec<f64>>(),
        Meta {
            dims: vec!["curve_direction", "axis"],
            units: "1",
            long_name:
                "physical wave directions (unit vectors in k-space) of the dispersion curves",
        },
    )?;
    w.real(
        "dispersion_ppw",
        &[k],
        &d.ppw,
        Meta {
            dims: vec!["sample"],
            units: "1",
            long_name: "points per wavelength 2 pi/(|k| h_min) of the curve samples",
        },
    )?;
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
    ] {
        let data: Vec<f64> = src
            .iter()
            .flat_map(|dir| dir.iter().flat_map(|s| s[..m].iter().copied()))
            .collect();
        w.real(
            name,
            &[nd, k, m],
            data,
            Meta {
                dims: vec!["curve_direction", "sample", "mode"],
                units: "1",
                long_name,
            },
        )?;
        w.entries[name]["labels"] = names.clone();
        w.entries[name]["coords"]["sample"] = Value::from("dispersion_ppw.npy");
        w.entries[name]["coords"]["curve_direction"] = Value::from("dispersion_directions.npy");
    }
    Ok(())
}

/// Writes every array of the results into `dir`; returns manifest.json's content.
pub fn write_arrays(dir: &Path, problem: &Problem, r: &Results) -> Result<Value, ReportError> {
    let mut w = Writer {
        dir,
        entries: Map::new(),
    };
    let dims = r.grid.points.len();
    let grid_dims: Vec<&str> = AXES[..dims].to_vec();
    for d in 0..dims {
        w.real(
            AXES[d],
            &[r.grid.points[d]],
            &r.grid.coords[d],
            Meta {
                dims: vec![AXES[d]],
                units: "radian",
                long_name: [
                    "wavevector k_x h_x",
                    "wavevector k_y h_y",
                    "wavevector k_z h_z",
                ][d],
            },
        )?;
    }
    if let Some(rad) = &r.radius {
        w.real(
            "radius",
            &r.grid.points,
            &rad.map,
            Meta {
                dims: grid_dims.clone(),
                units: "1",
                long_name: "spectral radius of the amplification matrix at the case time step",
            },
        )?;
    }
    if let Some(dl) = r.limit.as_ref().map(|l| &l.by_direction) {
        let n = dl.directions.len();
        if dims == 3 {
            let flat: Vec<f64> = dl.directions.iter().flatten().copied().collect();
            w.real(
                "directions",
                &[n, 3],
                flat,
                Meta {
                    dims: vec!["direction", "component"],
                    units: "1",
                    long_name: "wave direction unit vectors in wavevector space",
                },
            )?;
        } else {
            let ang: Vec<f64> = dl
                .directions
                .iter()
                .map(|v| v.get(1).copied().unwrap_or(0.0).atan2(v[0]))
                .collect();
            w.real(
                "directions",
                &[n],
                ang.iter()
                    .map(|a| a.rem_euclid(std::f64::consts::TAU))
                    .collect::<Vec<f64>>(),
                Meta {
                    dims: vec!["direction"],
                    units: "radian",
                    long_name: "wave direction angle in wavevector space",
                },
            )?;
        }
        w.real(
            "limit_by_direction",
            &[n],
            &dl.dt,
            Meta {
                dims: vec!["direction"],
                units: "s",
                long_name: "largest stable time step along the wave direction (inf: unconditional)",
            },
        )?;
        let flat: Vec<f64> = dl.wavevector.iter().flatten().copied().collect();
        w.real(
            "limit_wavevector_by_direction",
            &[n, dims],
            flat,
            Meta {
                dims: vec!["direction", "axis"],
                units: "radian",
                long_name: "wavevector that sets the limit along each direction",
            },
        )?;
        if !dl.courant.is_empty() {
            w.real(
                "courant_by_direction",
                &[n],
                &dl.courant,
                Meta {
                    dims: vec!["direction"],
                    units: "1",
                    long_name: "largest stable Courant number along the wave direction",
                },
            )?;
        }
    }
    if let Some(g) = &r.growth {
        let maps = [
            ("norm", &g.norm, "2-norm of the amplification matrix"),
            (
                "departure",
                &g.departure,
                "relative Henrici departure from normality of G",
            ),
            (
                "eigvec_condition",
                &g.condition,
                "2-norm condition number of the eigenvector matrix of G (inf where defective)",
            ),
        ];
        for (name, data, long_name) in maps {
            w.real(
                name,
                &r.grid.points,
                data,
                Meta {
                    dims: grid_dims.clone(),
                    units: "1",
                    long_name,
                },
            )?;
        }
        w.real(
            "growth",
            &[g.envelope.len()],
            &g.envelope,
            Meta {
                dims: vec!["step"],
                units: "1",
                long_name: "max over the wavevector grid of ||G^n||_2, n = 0..steps",
            },
        )?;
    }
    if let Some(d) = &r.dispersion {
        write_dispersion(&mut w, r, d, &grid_dims)?;
    }
    for mode in &r.modes {
        let name = format!("mode_{}", mode.kind.as_str());
        w.complex(
            &name,
            &[mode.vector.len()],
            &mode.vector,
            Meta {
                dims: vec!["component"],
                units: "1",
                long_name: match mode.kind {
                    Measure::Radius => {
                        "eigenvector of G for the largest |lambda| at the worst wavevector"
                    }
                    Measure::Growth => {
                        "initial perturbation with the largest growth at the peak step"
                    }
                    Measure::Limit => {
                        "eigenvector of the first mode to go unstable at the limit wavevector"
                    }
                },
            },
        )?;
        w.entries[&name]["labels"] = serde_json::to_value(&mode.labels).expect("labels serialise");
        w.entries[&name]["wavevector"] = serde_json::to_value(&mode.wavevector).expect("numbers");
    }
    if let Some(s) = &r.samples {
        let k = s.index.len();
        let m = problem.system.size();
        w.real(
            "sample_index",
            &[k],
            s.index.iter().map(|&i| i as f64).collect::<Vec<_>>(),
            Meta {
                dims: vec!["sample"],
                units: "1",
                long_name: "flat C-order grid index of each sampled wavevector",
            },
        )?;
        w.real(
            "sample_theta",
            &[k, dims],
            s.theta.iter().flatten().copied().collect::<Vec<_>>(),
            Meta {
                dims: vec!["sample", "axis"],
                units: "radian",
                long_name: "sampled wavevectors",
            },
        )?;
        w.complex(
            "sample_symbol",
            &[k, m, m],
            s.symbol.iter().flatten().copied().collect::<Vec<_>>(),
            Meta {
                dims: vec!["sample", "row", "col"],
                units: "s-1",
                long_name: "spatial symbol L at the sampled wavevectors",
            },
        )?;
        w.complex(
            "sample_amplification",
            &[k, s.size, s.size],
            s.amplification
                .iter()
                .flatten()
                .copied()
                .collect::<Vec<_>>(),
            Meta {
                dims: vec!["sample", "row", "col"],
                units: "1",
                long_name:
                    "amplification matrix G at the sampled wavevectors and the case time step",
            },
        )?;
    }
    Ok(json!({
        "format": "kgain output",
        "version": 1,
        "case": problem.name,
        "arrays": Value::Object(w.entries),
    }))
}
