//! Pictures of a probe, drawn with the sweep charts' line and heat-map
//! layouts: the spectral-radius map over the grid's wavevectors (a line over
//! θ in 1-D, a heat map over (θx, θy) in 2-D, the θz = 0 plane in 3-D), the
//! growth envelope against n, the phase-speed ratio of the least accurate mode
//! and the limit search's max ρ against Δt.

use super::ReportError;
use crate::case::probe::ProbeCase;
use crate::probe::field::theta_axis;
use crate::probe::ProbeResults;
use crate::report::plot::sweep_chart::{write_chart, ChartAxis, ChartSpec};
use std::path::Path;

fn numeric(key: &str, unit: &str, values: &[f64], case_value: Option<f64>) -> ChartAxis {
    ChartAxis {
        key: key.into(),
        unit: unit.into(),
        labels: values.iter().map(|v| format!("{v}")).collect(),
        numbers: values.to_vec(),
        case_value: case_value.map(|v| format!("{v}")),
    }
}

/// The axes and values of a map over the grid: all of it in 1-D and 2-D, the
/// θz = 0 plane in 3-D.
fn grid_chart(
    cells: &[usize],
    values: &[f64],
    stride: usize,
    offset: usize,
) -> (Vec<ChartAxis>, Vec<f64>) {
    let names = ["theta_x", "theta_y"];
    let axes: Vec<ChartAxis> = cells
        .iter()
        .take(2)
        .enumerate()
        .map(|(d, &n)| numeric(names[d], "rad", &theta_axis(n), None))
        .collect();
    let pick = |node: usize| values[node * stride + offset];
    let v = match cells.len() {
        3 => {
            let (nx, ny, nz) = (cells[0], cells[1], cells[2]);
            let mid = nz / 2;
            (0..nx * ny).map(|k| pick(k * nz + mid)).collect()
        }
        _ => (0..values.len() / stride).map(pick).collect(),
    };
    (axes, v)
}

/// Writes the pictures; returns their file names.
pub fn write(dir: &Path, case: &ProbeCase, r: &ProbeResults) -> Result<Vec<String>, ReportError> {
    let cells = &case.spec.cells;
    let title = format!("{} - probe of its time-step program", case.name);
    let plane = if cells.len() == 3 {
        ", plane theta_z = 0"
    } else {
        ""
    };
    let grid: Vec<String> = cells.iter().map(|n| n.to_string()).collect();
    let subtitle = format!(
        "{} periodic cells{plane}, dt = {:.4e}, variables {}",
        grid.join(" x "),
        case.plan.dt,
        case.spec.variables.join(", ")
    );
    let mut specs: Vec<(&str, ChartSpec)> = Vec::new();
    if let Some(rad) = &r.radius {
        let (axes, values) = grid_chart(cells, &rad.map, 1, 0);
        specs.push((
            "radius.png",
            ChartSpec {
                title: title.clone(),
                subtitle: subtitle.clone(),
                figure: "radius".into(),
                figure_label: "spectral radius max |lambda| of the measured G".into(),
                figure_unit: String::new(),
                axes,
                values,
            },
        ));
    }
    if let Some(g) = &r.growth {
        let steps: Vec<f64> = (0..g.envelope.len()).map(|n| n as f64).collect();
        specs.push((
            "growth.png",
            ChartSpec {
                title: title.clone(),
                subtitle: subtitle.clone(),
                figure: "growth".into(),
                figure_label: "max over the grid of ||G^n||_2".into(),
                figure_unit: String::new(),
                axes: vec![numeric("step n", "", &steps, None)],
                values: g.envelope.clone(),
            },
        ));
    }
    if let (Some(d), Some(w)) = (
        &r.dispersion,
        r.dispersion
            .as_ref()
            .and_then(|d| d.worst_phase_error.clone()),
    ) {
        let m = case.spec.m();
        let worst = (0..m)
            .max_by(|&a, &b| w[a].1.total_cmp(&w[b].1))
            .unwrap_or(0);
        if let Some(p) = &d.phase_ratio {
            let (axes, values) = grid_chart(cells, p, m, worst);
            specs.push((
                "dispersion.png",
                ChartSpec {
                    title: title.clone(),
                    subtitle: format!("{subtitle}; mode {worst} against the exact relation"),
                    figure: "phase_speed_ratio".into(),
                    figure_label: format!("phase-speed ratio of mode {worst} (numerical / exact)"),
                    figure_unit: String::new(),
                    axes,
                    values,
                },
            ));
        }
    }
    if let Some(l) = &r.limit {
        let mut pairs = l.evaluations.clone();
        pairs.sort_by(|a, b| a.0.total_cmp(&b.0));
        pairs.dedup_by(|a, b| a.0 == b.0);
        let dts: Vec<f64> = pairs.iter().map(|p| p.0).collect();
        specs.push((
            "limit_search.png",
            ChartSpec {
                title,
                subtitle: format!("{subtitle}; each point a fresh probe"),
                figure: "max_radius".into(),
                figure_label: "max spectral radius over the grid".into(),
                figure_unit: String::new(),
                axes: vec![numeric("dt", "units of probe.dt", &dts, Some(case.plan.dt))],
                values: pairs.iter().map(|p| p.1).collect(),
            },
        ));
    }
    let mut written = Vec::new();
    for (file, spec) in &specs {
        let path = dir.join(file);
        let drawn = write_chart(&path, spec).map_err(|message| ReportError::Plot {
            path: path.display().to_string(),
            message,
        })?;
        if drawn {
            written.push(file.to_string());
        }
    }
    Ok(written)
}
