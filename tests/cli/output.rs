//! A successful run: the files of the output folder, their shapes and contents,
//! manifest.json, summary.json and strict JSON (README: Commands, Output folder).

use super::*;

#[test]
fn run_writes_every_interface_file_of_the_radius_and_limit_analyses() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let files = listing(&out);
    for f in [
        "theta_x.npy",
        "theta_y.npy",
        "radius.npy",
        "directions.npy",
        "limit_by_direction.npy",
        "manifest.json",
        "summary.json",
    ] {
        assert!(files.contains(&f.to_string()), "{f} missing from {files:?}");
    }
    // Shapes from README (Output folder): [N_d] per axis, the grid in axis order, [D].
    let shape = |f: &str| npy_header(&out.join(f)).2;
    assert_eq!(shape("theta_x.npy"), vec![33]);
    assert_eq!(shape("theta_y.npy"), vec![17]);
    assert_eq!(shape("radius.npy"), vec![33, 17]);
    // scan.directions = 36, rounded up to 40 (a multiple of 8: axes and diagonals)
    assert_eq!(shape("directions.npy"), vec![40]);
    assert_eq!(shape("limit_by_direction.npy"), vec![40]);
    for f in files.iter().filter(|f| f.ends_with(".npy")) {
        let (descr, fortran, _) = npy_header(&out.join(f));
        assert!(
            descr == "<f8" || descr == "<c16",
            "{f}: little-endian float64/complex128, got {descr}"
        );
        assert!(!fortran, "{f}: C order");
    }
}

#[test]
fn theta_coordinates_follow_the_interface_formula() {
    // README (Output folder): θ_d = −π + 2π·i/(N_d − 1), both ends included.
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    for (file, n) in [("theta_x.npy", 33usize), ("theta_y.npy", 17)] {
        let th = read_npy(&out.join(file));
        assert_eq!(th.len(), n);
        for (i, t) in th.iter().enumerate() {
            let want = -PI + 2.0 * PI * i as f64 / (n - 1) as f64;
            support::assert_close_to_scale(*t, want, 4.0 * EPS, PI, &format!("{file}[{i}]"));
        }
    }
}

#[test]
fn radius_map_is_one_at_zero_wavevector_and_its_maximum_is_reported() {
    // G(θ = 0) = R(0)·I = I for a consistent method, so ρ = 1 there (common practice).
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let radius = read_npy(&out.join("radius.npy"));
    assert_close(radius[[16, 8]], 1.0, 4.0 * EPS, "ρ(G(0))");
    let max = radius.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let s = read_json(&out.join("summary.json"));
    assert_eq!(
        s["radius"]["max"].as_f64(),
        Some(max),
        "summary max = array max"
    );
}

#[test]
fn the_inventory_sums_are_those_of_the_files_read_back() {
    // arrays are summed as they are written, everything else read back: each
    // listed size and SHA-256 must be that of the file on disk
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let manifest = read_json(&out.join("manifest.json"));
    let files = manifest["files"].as_object().expect("manifest.files");
    let npys = listing(&out)
        .into_iter()
        .filter(|f| f.ends_with(".npy"))
        .count();
    assert!(
        npys > 0 && files.len() > npys,
        "{} files listed, {npys} arrays",
        files.len()
    );
    for (name, entry) in files {
        let (size, sum) = kgain::destination::marker::checksum(&out.join(name)).expect("readable");
        assert_eq!(entry["size"].as_u64(), Some(size), "{name}: size");
        assert_eq!(
            entry["sha256"].as_str(),
            Some(sum.as_str()),
            "{name}: sha256"
        );
    }
    assert_eq!(kgain::destination::marker::verify(&out), Ok(()));
}

#[test]
fn manifest_describes_every_array_in_the_folder() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let manifest = read_json(&out.join("manifest.json"));
    let arrays = manifest["arrays"]
        .as_object()
        .expect("manifest.arrays is an object");
    let npys: Vec<String> = listing(&out)
        .into_iter()
        .filter(|f| f.ends_with(".npy"))
        .collect();
    let listed: Vec<String> = arrays
        .values()
        .map(|e| e["file"].as_str().expect("file is a string").to_string())
        .collect();
    for f in &npys {
        assert!(listed.contains(f), "{f} is not in manifest.json");
    }
    for (name, e) in arrays {
        for key in [
            "file",
            "shape",
            "dtype",
            "dims",
            "coords",
            "units",
            "long_name",
        ] {
            assert!(e.get(key).is_some(), "manifest entry {name} lacks `{key}`");
        }
        let file = e["file"].as_str().unwrap();
        let (descr, _, shape) = npy_header(&out.join(file));
        let listed_shape: Vec<usize> = e["shape"]
            .as_array()
            .unwrap()
            .iter()
            .map(|x| x.as_u64().unwrap() as usize)
            .collect();
        assert_eq!(listed_shape, shape, "{name}: manifest shape vs file");
        let dtype = e["dtype"].as_str().unwrap();
        let want_descr = match dtype {
            "float64" => "<f8",
            "complex128" => "<c16",
            other => panic!("{name}: dtype {other}"),
        };
        assert_eq!(descr, want_descr, "{name}: dtype vs file");
        assert_eq!(
            e["dims"].as_array().unwrap().len(),
            shape.len(),
            "{name}: one dim per axis"
        );
        for (dim, coord) in e["coords"].as_object().unwrap() {
            if let Some(f) = coord.as_str() {
                assert!(
                    out.join(f).exists(),
                    "{name}: coords of {dim} in missing {f}"
                );
            }
        }
    }
    // The grid arrays name the wavevector axes and their coordinate files.
    let radius = &arrays["radius"];
    assert_eq!(radius["dims"], serde_json::json!(["theta_x", "theta_y"]));
    assert_eq!(radius["coords"]["theta_x"], "theta_x.npy");
}

#[test]
fn summary_has_the_required_keys_and_values_from_the_definitions() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let s = read_json(&out.join("summary.json"));
    for key in [
        "name",
        "dims",
        "variables",
        "dt",
        "courant",
        "reference_speed",
        "reference_spacing",
        "radius",
        "limit",
        "cautions",
    ] {
        assert!(s.get(key).is_some(), "summary.json lacks `{key}`");
    }
    for key in ["max", "wavevector", "stable"] {
        assert!(s["radius"].get(key).is_some(), "radius lacks `{key}`");
    }
    for key in [
        "kind",
        "dt_max",
        "courant_max",
        "diffusion_number_max",
        "wavevector",
        "direction_deg",
    ] {
        assert!(s["limit"].get(key).is_some(), "limit lacks `{key}`");
    }
    // README definitions: name defaults to the file stem; s = |a|; h = min h_d;
    // ν = sΔt/h, so Δt = ν h/s.
    assert_eq!(s["name"], "tiny");
    assert_eq!(s["dims"], 2);
    assert_eq!(s["variables"], serde_json::json!(["q"]));
    let num = |v: &Value| v.as_f64().unwrap_or_else(|| panic!("{v} is not a number"));
    assert_close(
        num(&s["reference_speed"]),
        1.0,
        4.0 * EPS,
        "s = |(0.6, 0.8)|",
    );
    assert_close(num(&s["reference_spacing"]), 0.5, 0.0, "h = min h_d");
    assert_close(num(&s["courant"]), 0.5, 4.0 * EPS, "ν as given");
    assert_close(num(&s["dt"]), 0.5 * 0.5 / 1.0, 4.0 * EPS, "Δt = ν h / s");
    assert_eq!(s["limit"]["kind"], "bounded");
    assert_close(num(&s["limit"]["dt_max"]), tiny_dt_max(), 1e-9, "Δt_max");
    assert_close(
        num(&s["limit"]["courant_max"]),
        tiny_dt_max() / 0.5,
        1e-9,
        "ν_max = sΔt_max/h",
    );
    assert!(s["limit"]["diffusion_number_max"].is_null(), "no diffusion");
    assert_eq!(s["radius"]["stable"], true, "ν = 0.5 is inside the limit");
    assert!(s["cautions"].as_array().is_some_and(|c| !c.is_empty()));
}

#[test]
fn json_is_strict_for_bounded_unconditional_and_unstable_results() {
    // README (Output folder): dt_max is null for "unconditional" and 0 for "none"; no NaN or
    // Infinity tokens anywhere (Crank–Nicolson is A-stable; Heun + C2 amplifies
    // every imaginary eigenvalue; Hairer & Wanner II).
    for (method, kind) in [
        ("rk4", "bounded"),
        ("crank-nicolson", "unconditional"),
        ("heun", "none"),
    ] {
        let text = TINY.replace("method = \"rk4\"", &format!("method = \"{method}\""));
        let cf = CaseFile::new("tiny", &text);
        let (out, _) = run_ok(&cf, &[]);
        let s = read_json(&out.join("summary.json"));
        read_json(&out.join("manifest.json"));
        assert_eq!(s["limit"]["kind"], kind, "{method}");
        match kind {
            "unconditional" => assert!(s["limit"]["dt_max"].is_null(), "{method}: dt_max null"),
            "none" => assert_eq!(
                s["limit"]["dt_max"].as_f64(),
                Some(0.0),
                "{method}: dt_max 0"
            ),
            _ => assert!(s["limit"]["dt_max"].as_f64().is_some()),
        }
    }
}

#[test]
fn three_dimensional_run_writes_unit_direction_vectors() {
    // README (Output folder): in 3D directions.npy is [D, 3], unit vectors; the grid is
    // [N_x, N_y, N_z] with coordinates in theta_x/y/z.npy.
    let text = r#"
[grid]
spacing = [1.0, 2.0, 0.5]
[model]
kind = "advection"
velocity = [0.3, -0.2, 0.1]
[time]
method = "rk4"
courant = 0.5
[scan]
points = [9, 7, 5]
directions = 50
"#;
    let cf = CaseFile::new("cube", text);
    let (out, _) = run_ok(&cf, &[]);
    assert_eq!(npy_header(&out.join("radius.npy")).2, vec![9, 7, 5]);
    assert_eq!(npy_header(&out.join("theta_z.npy")).2, vec![5]);
    let dirs = read_npy(&out.join("directions.npy"));
    assert_eq!(dirs.shape(), &[50, 3]);
    for i in 0..50 {
        let n2: f64 = (0..3).map(|k| dirs[[i, k]] * dirs[[i, k]]).sum();
        assert_close(n2, 1.0, 8.0 * EPS, &format!("|n_{i}|²"));
    }
    assert_eq!(npy_header(&out.join("limit_by_direction.npy")).2, vec![50]);
}

#[test]
fn reported_direction_is_the_angle_of_the_reported_wavevector() {
    let cf = CaseFile::new("tiny", TINY);
    let (out, _) = run_ok(&cf, &[]);
    let s = read_json(&out.join("summary.json"));
    let w: Vec<f64> = s["limit"]["wavevector"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    let want = w[1].atan2(w[0]).to_degrees().rem_euclid(360.0);
    let got = s["limit"]["direction_deg"].as_f64().unwrap();
    support::assert_close_to_scale(
        got,
        want,
        16.0 * EPS,
        360.0,
        "direction_deg = atan2(θy, θx)",
    );
    // RK4 + C2 with positive speeds: worst wavevector ±(π/2, π/2), i.e. 45° or 225°.
    let off = (got - 45.0).abs().min((got - 225.0).abs());
    support::assert_close_to_scale(off, 0.0, 16.0 * EPS.sqrt(), 360.0, "direction 45° or 225°");
}
