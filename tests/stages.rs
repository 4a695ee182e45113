//! Which stages of work a plan runs: the grid sweep that feeds the radius map
//! and the limit's screen runs only when one of those is asked for (growth
//! and dispersion sweep the grid themselves), and every stage that starts
//! finishes.

#[path = "support/mod.rs"]
mod support;

use kgain::analysis;
use kgain::sample::{Par, Progress, Stage};
use std::sync::Mutex;

/// Records the stages started and how many finished.
#[derive(Default)]
struct Recorder {
    started: Mutex<Vec<Stage>>,
    finished: Mutex<usize>,
}

impl Progress for Recorder {
    fn start(&self, stage: Stage, _total: u64) {
        self.started.lock().unwrap().push(stage);
    }
    fn advance(&self, _n: u64) {}
    fn finish(&self) {
        *self.finished.lock().unwrap() += 1;
    }
}

/// The stages the peer case runs for `analyses` (a TOML list).
fn stages(analyses: &str) -> Vec<Stage> {
    let text = std::fs::read_to_string("bench/peer-euler2d.toml").expect("bundled case");
    let case = support::case_with(
        &text,
        &[
            format!("scan.analyses={analyses}"),
            "scan.points=[33,33]".to_string(),
        ],
    );
    let rec = Recorder::default();
    analysis::analyse(&case.problem, &case.plan, Par::Threads(2), &rec).expect("analysis");
    let started = rec.started.into_inner().unwrap();
    assert_eq!(
        rec.finished.into_inner().unwrap(),
        started.len(),
        "{analyses}"
    );
    started
}

#[test]
fn growth_and_dispersion_alone_do_not_sweep_for_a_radius_map() {
    assert_eq!(stages(r#"["dispersion"]"#), vec![Stage::Dispersion]);
    assert_eq!(stages(r#"["growth"]"#), vec![Stage::Growth]);
    assert_eq!(
        stages(r#"["growth", "dispersion"]"#),
        vec![Stage::Growth, Stage::Dispersion]
    );
}

#[test]
fn the_radius_map_and_the_limit_sweep_the_grid_once() {
    assert_eq!(stages(r#"["radius"]"#), vec![Stage::Sweep]);
    let with_limit = stages(r#"["radius", "limit", "dispersion"]"#);
    assert_eq!(with_limit.iter().filter(|s| **s == Stage::Sweep).count(), 1);
    assert_eq!(with_limit[0], Stage::Sweep);
    assert!(with_limit.contains(&Stage::Dispersion));
}
