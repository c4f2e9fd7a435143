#!/bin/bash
# Queues a sharded analysis of one sweep: the array job of shards, then the merge as a job that
# depends on all of them (afterok). If a shard fails, the merge is cancelled rather than left
# pending (--kill-on-invalid-dep=yes). Prints the two job ids.
#
#   RUN_DIR=/scratch/$USER/sweep42 INPUTS=/data/sweep42.tif \
#   ANALYZE_ARGS="--threshold 32767.5 --field-table field.csv --field-column H_mT --track --domains" \
#   examples/slurm/submit.sh [extra sbatch options for both jobs, e.g. --partition=short]
#
# ANALYZE_ARGS is split at spaces (no quoting inside it). The number of shards is the array size
# in analyze-shards.sbatch (--array=0-3: 4 shards); give --array=0-(N-1) among the extra options
# to change it.
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
: "${RUN_DIR:?set RUN_DIR}" "${INPUTS:?set INPUTS}"
export RUN_DIR INPUTS DOMTOPO="${DOMTOPO:-domtopo}" ANALYZE_ARGS="${ANALYZE_ARGS:---track --domains}"
mkdir -p "$RUN_DIR"
shards=$(sbatch --parsable --export=ALL "$@" "$here/analyze-shards.sbatch")
shards=${shards%%;*}                  # "jobid;cluster" on multi-cluster setups
merge_args=()
for a in "$@"; do case $a in --array=*) ;; *) merge_args+=("$a") ;; esac; done
merge=$(sbatch --parsable --export=ALL --dependency="afterok:$shards" --kill-on-invalid-dep=yes \
  "${merge_args[@]}" "$here/merge-shards.sbatch")
merge=${merge%%;*}
echo "$shards $merge"
