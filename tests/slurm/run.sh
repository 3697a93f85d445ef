#!/usr/bin/env bash
# Real cluster test of `dropcut sweep --slurm-script`: starts a one-node Slurm (../shared/slurm-single-node.sh,
# Debian's packages, needs root), submits a small sweep as a job array with the generated batch script
# (`bash job.sh --wait`: array + merge job with --dependency=afterok), and checks that the merged summary.csv
# equals a local single-machine run byte for byte; then checks that a failing array task makes
# `bash job.sh --wait` fail (the merge job is cancelled) instead of hanging or reporting success.
#
#   bash tests/slurm/run.sh        # from the repository; uses ${CARGO_TARGET_DIR:-target}/release/dropcut
#
# Environment: SLURM_SINGLE_NODE (path of slurm-single-node.sh, default ../shared/ beside the repository),
# SLURM_TEST_TIMEOUT (seconds for the whole job array + merge, default 300).
# Skips (exit 0, with a SKIPPED line) only when the Slurm packages cannot be installed.
set -euo pipefail

REPO=$(cd "$(dirname "$0")/../.." && pwd)
SLURM_SH=${SLURM_SINGLE_NODE:-$REPO/../shared/slurm-single-node.sh}
TIMEOUT=${SLURM_TEST_TIMEOUT:-300}
log() { printf '[tests/slurm] %s\n' "$*" >&2; }

[ -f "$SLURM_SH" ] || { log "FAIL: $SLURM_SH not found (set SLURM_SINGLE_NODE)"; exit 1; }

cd "$REPO"
cargo build --release --quiet
TARGET=${CARGO_TARGET_DIR:-target}
case $TARGET in /*) ;; *) TARGET=$REPO/$TARGET ;; esac
BIN=$TARGET/release/dropcut
[ -x "$BIN" ] || { log "FAIL: $BIN was not built"; exit 1; }

if [ "$(id -u)" != 0 ]; then
  log "SKIPPED: installing and starting Slurm needs root; the cluster test did not run"
  exit 0
fi

if ! bash "$SLURM_SH" up; then
  if ! command -v sbatch >/dev/null 2>&1 || ! command -v slurmctld >/dev/null 2>&1 || ! command -v munged >/dev/null 2>&1; then
    log "SKIPPED: the Slurm packages (slurmctld slurmd slurm-client munge) could not be installed; the cluster test did not run"
    exit 0
  fi
  log "FAIL: the Slurm packages are installed but the one-node cluster did not start"
  exit 1
fi
WORK=$(mktemp -d -t dropcut-slurm-test.XXXXXX)
cleanup() {
  local rc=$?
  bash "$SLURM_SH" down || true
  if [ $rc -eq 0 ]; then rm -rf "$WORK"; else log "files kept in $WORK"; fi
}
trap cleanup EXIT

cp "$REPO/tests/data/ten-component.toml" "$WORK/"
cat >"$WORK/spec.toml" <<'SPEC'
name = "slurm test"
fuels = ["n-decane", "ten-component.toml"]
zipped = [["diameter", "velocity"]]
[conditions]
ambient-temperature = { from = "600K", to = "1000K", steps = 3 }
pressure = ["1bar", "5bar"]
diameter = ["10um", "20um"]
velocity = [0, 5]
max-time = "1s"
SPEC

log "local reference run"
"$BIN" sweep "$WORK/spec.toml" --out "$WORK/local" --threads 2 >/dev/null

log "generating the batch script (3 shards, 1 CPU each) and submitting it"
"$BIN" sweep "$WORK/spec.toml" --slurm-script --shards 3 --cpus-per-task 1 --out "$WORK/cluster" >"$WORK/job.sh"
grep -q '^#SBATCH --array=0-2$' "$WORK/job.sh" || { log "FAIL: no '#SBATCH --array=0-2' line in the script"; exit 1; }
start=$SECONDS
if ! (cd "$WORK" && timeout "$TIMEOUT" bash job.sh --wait); then
  log "FAIL: the job array or the merge job failed (logs follow)"
  tail -n 20 "$WORK"/cluster/logs/*.out >&2 || true
  exit 1
fi
log "job array + merge job finished in $((SECONDS - start)) s"

for k in 0 1 2; do
  grep -q "^# shard: $k/3 " "$WORK/cluster/shard-$k/summary.csv" || { log "FAIL: shard-$k/summary.csv is not shard $k/3"; exit 1; }
done
if ! cmp "$WORK/local/summary.csv" "$WORK/cluster/summary.csv"; then
  log "FAIL: the merged summary differs from the local run"
  diff "$WORK/local/summary.csv" "$WORK/cluster/summary.csv" | head -20 >&2 || true
  exit 1
fi
log "a failing array task must make 'bash job.sh --wait' fail, not hang or report success"
"$BIN" sweep "$WORK/spec.toml" --slurm-script --shards 2 --cpus-per-task 1 --out "$WORK/failing" >"$WORK/failing.sh"
if (cd "$WORK" && DROPCUT=/bin/false timeout "$TIMEOUT" bash failing.sh --wait); then
  log "FAIL: the script reported success although every array task failed"
  exit 1
fi
[ ! -e "$WORK/failing/summary.csv" ] || { log "FAIL: a merged summary appeared although the tasks failed"; exit 1; }

log "PASS: merged summary of the Slurm job array equals the local run byte for byte ($(($(grep -vc '^#' "$WORK/local/summary.csv") - 1)) cases)"
