#!/usr/bin/env bash
# Fuzz smoke test: builds the cargo-fuzz targets in fuzz/ on the stable
# toolchain (libFuzzer without a sanitizer: `--sanitizer none`, so no nightly
# flag and no RUSTC_BOOTSTRAP is needed) and runs each target for 60 s on one
# core, from a scratch copy of its committed seed corpus (fuzz/corpus/TARGET,
# left unchanged). Fails on the first crash, panic, timeout (> 5 s for one
# input) or out-of-memory (> 2 GiB); libFuzzer writes the input under
# fuzz/artifacts/TARGET/. Installs cargo-fuzz when it is missing.
#
# The timeout is wall-clock time in the coverage-instrumented build, which runs
# the tiny scan about 6x slower than a release build (a 3-D one-step limit:
# 0.15 s as a release process, 0.9-1.1 s per input here), and a loaded machine
# stretches it further (one such input passed 3 s on a CI run). 5 s still
# catches a hang or a search that runs away with a tiny scan; the regression
# tests in tests/fuzz_regressions.rs bound the findings' costs in release.
#
# One libFuzzer process per target, one after the other: one core for fuzzing
# (the build uses every core). `-jobs=1 -workers=1` would also keep to one core
# but sends libFuzzer's output to ./fuzz-0.log instead of this script's log.
#
# Usage: scripts/fuzz-smoke.sh [SECONDS_PER_TARGET]   (default 60)
set -euo pipefail

cd "$(dirname "$0")/.."
seconds="${1:-60}"
targets=(case_text overrides user_stencils_and_tableaux)

if ! cargo fuzz --version >/dev/null 2>&1; then
    echo "fuzz-smoke: installing cargo-fuzz"
    cargo install --locked --version 0.13.2 cargo-fuzz
fi

echo "fuzz-smoke: building ${targets[*]}"
cargo fuzz build --sanitizer none

scratch="$(mktemp -d)"
trap 'rm -rf "$scratch"' EXIT

for t in "${targets[@]}"; do
    mkdir -p "$scratch/$t"
    cp fuzz/corpus/"$t"/* "$scratch/$t/"
    echo "fuzz-smoke: $t for ${seconds} s"
    if ! cargo fuzz run --sanitizer none "$t" "$scratch/$t" -- \
        -max_total_time="$seconds" -timeout=5 -rss_limit_mb=2048 \
        -print_final_stats=1 >"$scratch/$t.log" 2>&1; then
        tail -n 60 "$scratch/$t.log"
        echo "fuzz-smoke: $t FAILED (input saved under fuzz/artifacts/$t/)" >&2
        exit 1
    fi
    runs="$(sed -n 's/^stat::number_of_executed_units: *//p' "$scratch/$t.log")"
    echo "fuzz-smoke: $t ok, ${runs:-?} executions"
done
echo "fuzz-smoke: all targets ran ${seconds} s without a finding"
