//! Fuzz target: arbitrary bytes as the text of a case file. UTF-8 text goes
//! straight to the case reader and, when valid, through a tiny scan of the
//! analyses (`kgain_fuzz::tiny`); other bytes are written to a scratch file and
//! loaded from disk, so the reader's refusal of non-UTF-8 text is fuzzed too.
//! Any panic, abort or hang is a finding.
#![no_main]

use kgain::case::Case;
use kgain_fuzz::tiny;
use libfuzzer_sys::fuzz_target;
use std::path::PathBuf;
use std::sync::OnceLock;

/// One scratch file per fuzzing process, for the bytes that are not UTF-8.
fn scratch() -> &'static PathBuf {
    static PATH: OnceLock<PathBuf> = OnceLock::new();
    PATH.get_or_init(|| {
        std::env::temp_dir().join(format!("kgain-fuzz-{}.toml", std::process::id()))
    })
}

fuzz_target!(|data: &[u8]| {
    match std::str::from_utf8(data) {
        Ok(text) => {
            tiny::run(text, &[]);
        }
        Err(_) => {
            let path = scratch();
            std::fs::write(path, data).expect("the scratch file is writable");
            let refused = Case::load(path, &[]);
            assert!(refused.is_err(), "non-UTF-8 case text was accepted");
        }
    }
});
