#!/bin/sh
# make-docs.sh — regenerate the pictures shown in docs/TUTORIAL.md.
#
# Usage (from anywhere inside the repository):
#
#     sh scripts/make-docs.sh
#
# What it does:
#   1. builds kgain in release mode (cargo build --release --locked);
#   2. runs it with --force --quiet on three bundled demo cases, each into its
#      own temporary folder (removed on exit):
#        cases/duct-acoustics.toml     2-D acoustics, DRP 7-point + RK4
#        cases/basin-cgrid.toml        2-D rotating shallow water, C-grid, forward-backward
#        cases/combustor-euler3d.toml  3-D linearised Euler, central4 + dissipation, RK4
#   3. copies every PNG of each run into docs/img/ as CASE-PICTURE.png, e.g.
#      docs/img/duct-acoustics-radius.png, replacing the previous copies;
#   4. runs the duct case once more above its limit (--set time.courant=1.6,
#      radius only) for docs/img/duct-acoustics-courant1.6-radius.png, the
#      tutorial's picture of an unstable map.
#
# Only POSIX sh, mktemp, cp and rm are needed besides cargo. The pictures are
# deterministic (same kgain, same case, same pixels), so a rerun after a code
# change shows in `git diff --stat docs/img` exactly which pictures changed.
# Environment: CARGO (default: cargo) selects the cargo binary.

set -eu

root=$(CDPATH= cd -- "$(dirname -- "$0")/.." && pwd)
cd "$root"

cargo=${CARGO:-cargo}
"$cargo" build --release --locked --quiet
kgain="$root/target/release/kgain"

work=$(mktemp -d "${TMPDIR:-/tmp}/kgain-docs.XXXXXX")
trap 'rm -rf "$work"' EXIT INT TERM

mkdir -p docs/img
for case in duct-acoustics basin-cgrid combustor-euler3d; do
    out="$work/$case"
    "$kgain" run "cases/$case.toml" --out "$out" --force --quiet
    found=0
    for png in "$out"/*.png; do
        [ -e "$png" ] || continue
        name=$(basename "$png")
        cp "$png" "docs/img/$case-$name"
        found=$((found + 1))
    done
    if [ "$found" -eq 0 ]; then
        echo "make-docs.sh: $case produced no pictures" >&2
        exit 1
    fi
    echo "docs/img: $found pictures of $case"
done

# the duct above its Courant limit (1.4787): the unstable lobes of the radius map
out="$work/duct-acoustics-courant1.6"
"$kgain" run cases/duct-acoustics.toml --out "$out" --force --quiet \
    --set time.courant=1.6 --set 'scan.analyses=["radius"]'
cp "$out/radius.png" docs/img/duct-acoustics-courant1.6-radius.png
echo "docs/img: 1 picture of duct-acoustics at Courant 1.6"

# filters (tutorial section 7): the duct with a compact filter once per step,
# and the rotating lake's leapfrog with a Robert-Asselin time filter
out="$work/duct-acoustics-filtered"
"$kgain" run cases/duct-acoustics.toml --out "$out" --force --quiet \
    --set 'space.filter={kind="compact", order=10, alpha=0.47}' \
    --set 'scan.analyses=["radius", "limit"]'
cp "$out/radius.png" docs/img/duct-acoustics-filtered-radius.png
out="$work/lake-rotating-waves-ra"
"$kgain" run cases/lake-rotating-waves.toml --out "$out" --force --quiet \
    --set time.filter=robert-asselin --set time.filter_strength=0.1 \
    --set 'scan.analyses=["radius", "limit"]'
cp "$out/footprint.png" docs/img/lake-rotating-waves-ra-footprint.png

# the sweep demo (README: Parameter sweeps): the largest stable Courant number of
# the tunnel case against Mach number and flow angle, run as four shards of the
# Slurm array script (with a stand-in for sbatch) and merged
for i in 1 2 3 4; do
    SLURM_ARRAY_TASK_ID=$i SLURM_ARRAY_TASK_COUNT=4 KGAIN="$kgain" SHARDS="$work/shards" \
        sh docs/sweep/slurm-sweep.sh
done
"$kgain" merge "$work"/shards/* --out "$work/tunnel-sweep" --quiet
cp "$work/tunnel-sweep/chart_limit_courant_max.png" docs/img/tunnel-euler-mach-sweep.png
cp "$work/tunnel-sweep/sweep.csv" docs/sweep/tunnel-euler-mach-sweep.csv

# second-order-in-time waves (tutorial): the quarry case with beta = 0.1,
# beyond its limit, for the footprint in z = dt^2 mu
out="$work/quarry-beta0.1"
"$kgain" run cases/quarry-seismic-newmark.toml --out "$out" --force --quiet --set time.beta=0.1
cp "$out/footprint.png" docs/img/quarry-seismic-newmark-beta0.1-footprint.png

# tutorial section 8: the duct swept over the method and the mean flow
"$kgain" sweep cases/duct-acoustics.toml --vary time.method=rk4,lsrk54,lddrk-hhm \
    --vary 'model.velocity[0]=0:100:6' --set 'scan.points=[65, 65]' \
    --out "$work/duct-sweep" --quiet
cp "$work/duct-sweep/chart_limit_courant_max.png" docs/img/duct-acoustics-sweep-methods.png

# tutorial section 8: a probe of the example C-grid program with its sign error
# (python3 + numpy)
out="$work/reservoir-signbug-probe"
(cd examples/probe && "$kgain" run cgrid-shallow-water-signbug.probe.toml --out "$out" --force \
    --quiet --set 'scan.analyses=["radius"]')
cp "$out/radius.png" docs/img/reservoir-cgrid-signbug-probe-radius.png
