#!/bin/sh
# sweep-shards-check.sh — the README's two ways of running a sharded sweep,
# run here with local stand-ins (CI runs this script):
#   1. the Slurm job array docs/sweep/slurm-sweep.sh, each array task started
#      by hand with SLURM_ARRAY_TASK_ID set, as sbatch would;
#   2. the GNU parallel one-liner, with `xargs -P 2` (findutils) in place of
#      GNU parallel, which a fresh machine does not have.
# Each set of shards is merged with `kgain merge` and compared byte for byte
# (diff -r, marker and manifest included) with the same sweep run unsharded.
# Usage: sh scripts/sweep-shards-check.sh   (after cargo build --release)
set -eu
root=$(CDPATH= cd -- "$(dirname -- "$0")/.." && pwd)
cd "$root"
KGAIN="$root/target/release/kgain"
export KGAIN
work=$(mktemp -d "${TMPDIR:-/tmp}/kgain-shards.XXXXXX")
trap 'rm -rf "$work"' EXIT INT TERM

# the sweep of docs/sweep/slurm-sweep.sh, unsharded
"$KGAIN" sweep cases/tunnel-euler-mach.toml \
    --vary model.mach=0:0.9:10 --vary model.flow_angle_deg=0:45:10 \
    --figures limit.courant_max,limit.dt_max,limit.physical_direction_deg \
    --threads 2 --quiet --out "$work/whole"

# 1. Slurm job array, stand-in: four tasks, two at a time
for i in 1 2 3 4; do
    SLURM_ARRAY_TASK_ID=$i SLURM_ARRAY_TASK_COUNT=4 SLURM_CPUS_PER_TASK=1 \
        SHARDS="$work/slurm" sh docs/sweep/slurm-sweep.sh &
    if [ "$i" = 2 ] || [ "$i" = 4 ]; then wait; fi
done
"$KGAIN" merge "$work"/slurm/* --out "$work/slurm-merged" --quiet
diff -r "$work/whole" "$work/slurm-merged"
echo "sweep-shards-check: Slurm array (4 shards) merged = unsharded, byte for byte"

# 2. The README's GNU parallel line with xargs -P 2 standing in for parallel
mkdir -p "$work/par"
seq 1 4 | xargs -P 2 -I{} "$KGAIN" sweep cases/tunnel-euler-mach.toml \
    --vary model.mach=0:0.9:10 --vary model.flow_angle_deg=0:45:10 \
    --figures limit.courant_max,limit.dt_max,limit.physical_direction_deg \
    --threads 1 --quiet --shard {}/4 --out "$work/par/{}"
"$KGAIN" merge "$work"/par/* --out "$work/par-merged" --quiet
diff -r "$work/whole" "$work/par-merged"
echo "sweep-shards-check: xargs -P 2 (4 shards) merged = unsharded, byte for byte"

# a missing shard and a shard of another sweep are refused with exit code 2
rm -rf "$work/par/3"
rc=0
"$KGAIN" merge "$work"/par/* --out "$work/bad" --quiet 2>"$work/err" || rc=$?
if [ "$rc" != 2 ] || [ -e "$work/bad" ]; then
    echo "sweep-shards-check: a merge with shard 3 missing gave exit $rc" >&2; exit 1
fi
grep -q "shards missing: 3 of 4" "$work/err"
echo "sweep-shards-check: a missing shard is refused ($(cat "$work/err"))"
