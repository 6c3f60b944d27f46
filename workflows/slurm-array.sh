#!/usr/bin/env bash
# hotfield on a Slurm cluster: an array of N tasks, each reporting one share
# of the manifest's cases (hotfield batch --shard K/N), then one job, started
# when every task has ended, that rebuilds the cohort files (hotfield cohort).
#
# Usage:   workflows/slurm-array.sh MANIFEST OUT [N]
# Example: workflows/slurm-array.sh /data/nightly/cases.csv /data/nightly/reports 8
#
# Environment (all optional):
#   HOTFIELD           the hotfield command (default: hotfield, see README "Install")
#   HOTFIELD_OPTIONS   report options for every case, e.g. "--scheme canine-mct-2tier"
#   SBATCH_OPTIONS     extra sbatch options for the array, e.g. "--partition=short"
#
# Each task writes case folders only; a task whose cases partly fail exits 1,
# and the cohort job still runs (afterany), so the index lists every case
# that succeeded. Tasks read and write OUT on a shared file system.
# Resubmitting the same command completes a run that was cut short: cases
# already done are skipped.
set -euo pipefail

usage() { echo "usage: $0 MANIFEST OUT [N]" >&2; exit 2; }
[ $# -ge 2 ] && [ $# -le 3 ] || usage
manifest=$(realpath "$1")
out=$(realpath -m "$2")
n=${3:-8}
case "$n" in '' | *[!0-9]* | 0) echo "$0: N must be a whole number ≥ 1: got \"$n\"" >&2; exit 2 ;; esac
hotfield=${HOTFIELD:-hotfield}
options=${HOTFIELD_OPTIONS:-}

q() { printf '%q' "$1"; }

# shellcheck disable=SC2086 # SBATCH_OPTIONS holds several options on purpose
array_job=$(sbatch --parsable ${SBATCH_OPTIONS:-} \
  --job-name=hotfield-shard --array="1-$n" --cpus-per-task=2 --mem=2G \
  --output="$out.slurm-%A_%a.log" \
  --wrap="$hotfield batch $(q "$manifest") --out $(q "$out") $options \
--shard \$SLURM_ARRAY_TASK_ID/$n --workers \${SLURM_CPUS_PER_TASK:-1} --quiet")

sbatch --parsable --job-name=hotfield-cohort --dependency="afterany:$array_job" \
  --output="$out.slurm-cohort-%j.log" \
  --wrap="$hotfield cohort $(q "$out")"
