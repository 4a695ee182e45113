//! Helpers shared by the fuzz targets in `fuzz_targets/`: [`tiny`] runs case
//! text through the library on a shrunken scan (also used, by path, by
//! `tests/fuzz_regressions.rs`), [`toml_text`] writes numbers and lists as TOML,
//! and [`user_case`] builds a case with user stencils and a Butcher tableau from
//! fuzzed numbers.

pub mod tiny;
pub mod toml_text;
pub mod user_case;
