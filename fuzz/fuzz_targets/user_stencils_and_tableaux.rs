//! Fuzz target: user stencils (explicit and compact, first and second
//! derivative) and Butcher tableaux built from fuzzed numbers into a case text
//! (`kgain_fuzz::user_case`), validated and, when valid, run on a tiny scan
//! (`kgain_fuzz::tiny`). Any panic, abort or hang is a finding. With
//! `KGAIN_FUZZ_PRINT` set in the environment, each built case text is printed
//! (to turn a saved input into the case file it stands for).
#![no_main]

use kgain_fuzz::{tiny, user_case};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|input: user_case::UserCaseInput| {
    let text = user_case::case_text(&input);
    if std::env::var_os("KGAIN_FUZZ_PRINT").is_some() {
        println!("{text}");
    }
    tiny::run(&text, &[]);
});
