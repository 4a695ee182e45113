#!/bin/sh
# A Slurm job array that runs one shard of a kgain sweep per array task:
#
#     sbatch docs/sweep/slurm-sweep.sh            # 4 tasks, 4 shard folders
#     kgain merge shards/* --out tunnel-sweep     # afterwards, anywhere
#
# Each task writes shards/<task id>/; the merge checks that all four belong to
# the same sweep and that none is missing. KGAIN selects the binary (default:
# kgain on the PATH), SHARDS the folder of shard folders (default: shards).
# Outside Slurm it runs as a stand-in with the task id set by hand:
#     SLURM_ARRAY_TASK_ID=2 SLURM_ARRAY_TASK_COUNT=4 sh docs/sweep/slurm-sweep.sh
#SBATCH --job-name=kgain-sweep
#SBATCH --array=1-4
#SBATCH --cpus-per-task=2
#SBATCH --time=00:30:00
set -eu
: "${SLURM_ARRAY_TASK_ID:?run under sbatch --array, or set SLURM_ARRAY_TASK_ID}"
count=${SLURM_ARRAY_TASK_COUNT:-4}
shards=${SHARDS:-shards}
mkdir -p "$shards"
"${KGAIN:-kgain}" sweep cases/tunnel-euler-mach.toml \
    --vary model.mach=0:0.9:10 --vary model.flow_angle_deg=0:45:10 \
    --figures limit.courant_max,limit.dt_max,limit.physical_direction_deg \
    --threads "${SLURM_CPUS_PER_TASK:-1}" --quiet \
    --shard "$SLURM_ARRAY_TASK_ID/$count" --out "$shards/$SLURM_ARRAY_TASK_ID"
