//! Refused input: exit 2 with a message naming the file, the key and line:col,
//! a hint where a name is misspelt, no panic, and nothing written.

use super::*;

#[test]
fn missing_case_file_is_refused_naming_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = kgain()
        .current_dir(dir.path())
        .args(["run", "nowhere.toml", "--out", "out"])
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{stderr}");
    assert!(stderr.contains("nowhere.toml"), "{stderr}");
    assert!(!stderr.contains("panicked"), "{stderr}");
    assert!(listing(dir.path()).is_empty(), "nothing is created");
}

#[test]
fn toml_syntax_error_is_refused_with_its_line_and_column() {
    let text = TINY.replace("kind = \"advection\"", "kind = advection");
    let where_ = at(&text, "kind = advection", "advection");
    assert_refused(&text, &[], &[where_]);
}

#[test]
fn misspelt_key_is_refused_naming_it_and_listing_the_valid_key() {
    let text = TINY.replace("courant = 0.5", "corant = 0.5");
    let where_ = at(&text, "corant", "corant");
    assert_refused(&text, &[], &[where_, "corant".into(), "courant".into()]);
}

#[test]
fn wrong_array_length_for_the_dimension_is_refused() {
    let text = TINY.replace("velocity = [0.6, 0.8]", "velocity = [0.6]");
    let where_ = at(&text, "velocity", "[");
    assert_refused(&text, &[], &[where_, "model.velocity".into(), "2".into()]);
}

#[test]
fn non_positive_spacing_is_refused() {
    for bad in ["0.0", "-1.0"] {
        let text = TINY.replace("spacing = [1.0, 0.5]", &format!("spacing = [1.0, {bad}]"));
        let where_ = at(&text, "spacing", bad);
        assert_refused(
            &text,
            &[],
            &[where_, "grid.spacing.1".into(), "positive".into()],
        );
    }
}

#[test]
fn both_dt_and_courant_are_refused() {
    let text = TINY.replace("courant = 0.5", "courant = 0.5\ndt = 0.1");
    let where_ = at(&text, "dt = 0.1", "0.1");
    assert_refused(
        &text,
        &[],
        &[where_, "time.dt".into(), "time.courant".into()],
    );
}

#[test]
fn neither_dt_nor_courant_is_refused() {
    let text = TINY.replace("courant = 0.5\n", "");
    let where_ = at(&text, "[time]", "[time]");
    assert_refused(
        &text,
        &[],
        &[where_, "time.dt".into(), "time.courant".into()],
    );
}

#[test]
fn unknown_model_name_gets_a_did_you_mean_hint() {
    let text = TINY.replace("kind = \"advection\"", "kind = \"advektion\"");
    let where_ = at(&text, "advektion", "\"advektion\"");
    assert_refused(
        &text,
        &[],
        &[
            where_,
            "model.kind".into(),
            "did you mean 'advection'".into(),
        ],
    );
}

#[test]
fn unknown_stencil_name_gets_a_did_you_mean_hint() {
    let text = TINY.replace("[time]", "[space]\nfirst = \"centrl4\"\n\n[time]");
    let where_ = at(&text, "centrl4", "\"centrl4\"");
    assert_refused(
        &text,
        &[],
        &[
            where_,
            "space.first".into(),
            "did you mean 'central4'".into(),
        ],
    );
}

#[test]
fn unknown_method_name_gets_a_did_you_mean_hint() {
    let text = TINY.replace("method = \"rk4\"", "method = \"rk5\"");
    let where_ = at(&text, "rk5", "\"rk5\"");
    assert_refused(
        &text,
        &[],
        &[where_, "time.method".into(), "did you mean 'rk4'".into()],
    );
}

#[test]
fn non_finite_number_is_refused() {
    let text = TINY.replace("velocity = [0.6, 0.8]", "velocity = [0.6, inf]");
    let where_ = at(&text, "velocity", "inf");
    assert_refused(
        &text,
        &[],
        &[where_, "model.velocity.1".into(), "finite".into()],
    );
    let text = TINY.replace("courant = 0.5", "courant = nan");
    assert_refused(&text, &[], &["time.courant".into(), "finite".into()]);
}

#[test]
fn inconsistent_user_stencil_is_refused() {
    // (f_{j+1} − f_{j−1}) without the ½ approximates 2 f', not f': its first Taylor
    // moment is 2 (common practice).
    let text = TINY.replace(
        "[time]",
        "[space]\nfirst = \"mine\"\n\n[space.stencils.mine]\nderivative = 1\noffsets = [-1, 1]\nweights = [-1.0, 1.0]\n\n[time]",
    );
    let where_ = at(&text, "[space.stencils.mine]", "[");
    assert_refused(
        &text,
        &[],
        &[where_, "space.stencils.mine".into(), "consistent".into()],
    );
}

#[test]
fn scan_too_large_for_memory_is_refused_before_any_work() {
    let text = r#"
[grid]
spacing = [1.0, 1.0, 1.0]

[model]
kind = "advection"
velocity = [1.0, 0.5, 0.25]

[time]
method = "rk4"
courant = 0.5

[scan]
points = [2000, 2000, 400]
"#;
    let where_ = at(text, "points", "[");
    assert_refused(text, &[], &[where_, "scan.points".into(), "memory".into()]);
}

#[test]
fn wrong_value_type_is_refused_naming_the_key() {
    let text = TINY.replace("courant = 0.5", "courant = \"fast\"");
    let where_ = at(&text, "courant", "\"fast\"");
    assert_refused(&text, &[], &[where_, "courant".into()]);
}

#[test]
fn malformed_set_override_is_refused() {
    assert_refused(
        TINY,
        &["--set", "timecourant"],
        &["--set".into(), "timecourant".into()],
    );
}

#[test]
fn zero_threads_is_refused() {
    assert_refused(TINY, &["--threads", "0"], &["--threads".into()]);
}

#[test]
fn courant_without_a_wave_speed_is_refused() {
    // Pure diffusion has no reference speed, so ν = sΔt/h cannot define Δt.
    let text = TINY.replace(
        "velocity = [0.6, 0.8]",
        "velocity = [0.0, 0.0]\ndiffusivity = 1.0",
    );
    let where_ = at(&text, "courant", "0.5");
    assert_refused(
        &text,
        &[],
        &[where_, "time.courant".into(), "time.dt".into()],
    );
}

#[test]
fn unknown_subcommand_exits_two() {
    let out = kgain().arg("frobnicate").output().unwrap();
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn tableau_weights_that_do_not_sum_to_one_are_refused() {
    // Consistency of a Runge–Kutta method needs Σ b_i = 1 (Hairer & Wanner I).
    let text = TINY.replace(
        "method = \"rk4\"",
        "method = \"tableau\"\ntableau = { a = [[0.0]], b = [0.9] }",
    );
    let where_ = at(&text, "tableau = {", "{");
    assert_refused(
        &text,
        &[],
        &[where_, "time.tableau".into(), "sum to 1".into()],
    );
}

#[test]
fn theta_outside_the_unit_interval_is_refused() {
    let text = TINY.replace("method = \"rk4\"", "method = \"theta\"\ntheta = 1.5");
    let where_ = at(&text, "theta = 1.5", "1.5");
    assert_refused(&text, &[], &[where_, "time.theta".into()]);
}

#[test]
fn scan_settings_out_of_range_are_refused() {
    let text = TINY.replace("points = [33, 17]", "points = [33, 1]");
    let where_ = at(&text, "points", "1]");
    assert_refused(&text, &[], &[where_, "scan.points.1".into()]);
    let text = TINY.replace("directions = 36", "directions = 36\ntolerance = 0.5");
    let where_ = at(&text, "tolerance", "0.5");
    assert_refused(&text, &[], &[where_, "scan.tolerance".into()]);
    let text = TINY.replace(
        "directions = 36",
        "directions = 36\nanalyses = [\"radios\"]",
    );
    assert_refused(
        &text,
        &[],
        &["scan.analyses.0".into(), "did you mean 'radius'".into()],
    );
}
