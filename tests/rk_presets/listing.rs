//! `kgain list methods`: a row per preset with its order (and the linear order
//! where it differs), stages and the two axis limits the engine computes.

use kgain::time::order::order;
use kgain::time::presets::{self, PRESETS};

fn listing() -> String {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_kgain"))
        .args(["list", "methods"])
        .output()
        .expect("run kgain");
    assert!(out.status.success());
    String::from_utf8(out.stdout).unwrap()
}

#[test]
fn every_preset_is_listed_with_order_stages_and_limits() {
    let text = listing();
    for p in PRESETS {
        let line = text
            .lines()
            .find(|l| l.split_whitespace().next() == Some(p.name))
            .unwrap_or_else(|| panic!("{} not listed:\n{text}", p.name));
        let cols: Vec<&str> = line.split_whitespace().collect();
        let n = cols.len();
        let m = super::preset(p.name);
        let imag: f64 = cols[n - 2].parse().unwrap();
        let real: f64 = cols[n - 1].parse().unwrap();
        assert!((imag - m.imaginary_limit()).abs() < 1e-9, "{line}");
        assert!((real - m.real_limit()).abs() < 1e-9, "{line}");
        assert_eq!(cols[n - 5], p.stages.to_string(), "{line}");
        let t = presets::tableau(p.name).unwrap();
        assert_eq!(order(&t), p.order, "{}", p.name);
        let want = if p.order == p.linear_order {
            format!("{}", p.order)
        } else {
            format!("{} (lin. {})", p.order, p.linear_order)
        };
        assert!(line.contains(&format!(" {want} ")), "{line}: order {want}");
    }
    assert!(
        text.contains("2 (lin. 4)"),
        "the LDDRK of Hu et al. shows both orders"
    );
}
