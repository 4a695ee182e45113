//! Fuzz target: a bundled case (chosen by the first byte) with fuzzed
//! `--set KEY=VALUE` overrides (the remaining bytes as text, one override per
//! line, at most eight), validated and, when valid, run on a tiny scan
//! (`kgain_fuzz::tiny`). Any panic, abort or hang is a finding.
#![no_main]

use kgain_fuzz::tiny;
use libfuzzer_sys::fuzz_target;

/// The bundled cases, in the order the first byte picks them.
const CASES: [&str; 14] = [
    include_str!("../../cases/basin-agrid.toml"),
    include_str!("../../cases/basin-bgrid.toml"),
    include_str!("../../cases/basin-cgrid.toml"),
    include_str!("../../cases/cavity-yee3d.toml"),
    include_str!("../../cases/combustor-euler3d.toml"),
    include_str!("../../cases/duct-acoustics.toml"),
    include_str!("../../cases/estuary-imex.toml"),
    include_str!("../../cases/feedline-telegraph.toml"),
    include_str!("../../cases/harbour-dye.toml"),
    include_str!("../../cases/kiln-wall-heat.toml"),
    include_str!("../../cases/lake-rotating-waves.toml"),
    include_str!("../../cases/river-sediment-growth.toml"),
    include_str!("../../cases/quarry-seismic-newmark.toml"),
    include_str!("../../cases/tunnel-euler-mach.toml"),
];

/// Most overrides applied from one input.
const MAX_OVERRIDES: usize = 8;

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let case = CASES[pick as usize % CASES.len()];
    let overrides: Vec<String> = String::from_utf8_lossy(rest)
        .lines()
        .take(MAX_OVERRIDES)
        .map(str::to_string)
        .collect();
    tiny::run(case, &overrides);
});
