#!/bin/bash
#SBATCH --job-name=manicule-batch
#SBATCH --array=1-8
#SBATCH --cpus-per-task=4
#SBATCH --mem=1G
#SBATCH --time=02:00:00
#SBATCH --output=manicule-batch-%A_%a.log
# Usage (the batch options name the unit; every task must be given the same):
#   job=$(sbatch --parsable examples/slurm-batch.sh ARCHIVE RESULTS --unit letter)
#   sbatch --dependency=afterok:$job --wrap "cd RESULTS && manicule merge --exact archive.sqlite shard-*-of-8.sqlite"
# (8, the number of tasks in --array: shares saved by an earlier array of another size are
# left out. The merge is one transaction under the store's lock, so an analysis of
# archive.sqlite running meanwhile makes it wait or refuse, never lose its results.)
set -euo pipefail
usage="usage: slurm-batch.sh ARCHIVE RESULTS --unit UNIT [other batch options]"
archive=${1:?$usage}
results=${2:?$usage}
shift 2
# Without --unit a task would read with the default unit (whole), a settings of its own.
# (-u may come joined to its value or among other short flags: -uletter, -qu letter.)
# A --threads given wins over the task's CPUs.
unit_given=no
threads=(--threads "${SLURM_CPUS_PER_TASK:-1}")
for arg in "$@"; do
  case $arg in --unit | --unit=*) unit_given=yes ;; --threads | --threads=*) threads=() ;; --*) ;; -*u*) unit_given=yes ;; esac
done
if [ "$unit_given" = no ]; then echo "$usage" >&2; exit 2; fi
# Share K of N: K the task's index (--array=1-N), N fixed here rather than read from the
# array, so that one failed task submitted again (sbatch --array=3 ...) still reads share 3
# of 8, not the whole archive as share 1 of 1. Keep N equal to the --array line's last
# number (or give MANICULE_SHARES, with sbatch --export=ALL,MANICULE_SHARES=N).
n=${MANICULE_SHARES:-8}
k=$SLURM_ARRAY_TASK_ID
mkdir -p "$results"
scratch=$(mktemp -d)                                  # node-local, removed when the task ends (not if it is killed outright)
trap 'rm -rf "$scratch"' EXIT
share=$results/shard-$k-of-$n.sqlite
local_store=$scratch/manicule-shard-$k-of-$n.sqlite
# Start from this share's previous store, if any: a re-run reads only what changed.
if [ -f "$share" ]; then cp "$share" "$local_store"; fi
# Copied under a name of its own (two tasks of one share, after a double submission, must
# not write into one file), then renamed into place at once.
# (mktemp makes it readable by its owner alone; it gets what the umask grants a new file.)
save() {
  local part
  part=$(mktemp "$results/.shard-$k-of-$n.XXXXXX") && cp "$local_store" "$part" &&
    chmod "$(printf '%04o' $((0666 & ~$(umask))))" "$part" && mv "$part" "$share"
}
# At the time limit Slurm sends SIGTERM to every process of the task: manicule then commits
# what it has read and exits with 143; this trap keeps the script alive to save that.
trap 'true' TERM
status=0
# (${a[@]+"${a[@]}"}: an empty array under set -u in bash before 4.4 too.)
manicule batch "$archive" --store "$local_store" --shard "$k/$n" ${threads[@]+"${threads[@]}"} --quiet "$@" ||
  status=$?
# Stopped by the time limit (143) or a cancel (130): keep what was read, so that submitting
# the job again goes on from there; the task still fails, so the merge waits.
if [ "$status" -eq 143 ] || [ "$status" -eq 130 ]; then save; exit "$status"; fi
# Exit code 1 means some files failed: they are recorded in the store, the share is usable.
if [ "$status" -gt 1 ]; then exit "$status"; fi
save
