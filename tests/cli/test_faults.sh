#!/usr/bin/env bash
# Faults while writing results: a full disk, a read-only file system, a cache or checkpoint that
# cannot be written. Each needs a small file system of its own: a tmpfs, mounted as root, or as
# root of a user namespace (unshare -rm) otherwise. Where neither is allowed the test is skipped
# (exit 77), saying why.
# Usage: test_faults.sh path/to/ember path/to/source
set -uo pipefail
ember=$1
src=$2
if ((EUID != 0)) && [[ -z "${EMBER_FAULTS_NAMESPACE:-}" ]]; then
  if unshare -rm true 2>/dev/null; then
    EMBER_FAULTS_NAMESPACE=1 exec unshare -rm bash "$0" "$@"
  fi
  echo "SKIP: not root, and user namespaces are not allowed here (unshare -rm): no tmpfs to fill"
  exit 77
fi
source "$(dirname "$0")/helpers.sh"
mounts=()
trap 'for m in "${mounts[@]}"; do umount "$m" 2>/dev/null; done; rm -rf "$work"' EXIT
# tmpfs NAME SIZE [ro]: a fresh file system at $work/NAME.
tmpfs() {
  mkdir -p "$work/$1"
  mount -t tmpfs -o "size=$2${3:+,$3}" tmpfs "$work/$1" || { echo "SKIP: cannot mount a tmpfs here"; exit 77; }
  mounts+=("$work/$1")
}
grid="$src/tests/data/hostile/grid_one.yaml"
# The same scenario over 400 formation masses: its results take about 150 kB.
sed -e 's/points: 1}/points: 400}/' -e 's/to: 1e9 g/to: 1e11 g/' -e 's/^scan:$/scan:\n  thresholds: {inputs: []}/' "$grid" >"$work/grid400.yaml"
grep -q 'points: 400' "$work/grid400.yaml" || fail "setup: the 400-row scenario was not made"
# entries FOLDER: its entries, hidden ones included, one per line.
entries() { ls -A "$1" 2>/dev/null; }

# --- a full disk: exit 4, the folder named, no result files; the finished work resumes ------------
# The run's checkpoint (in the results folder) fills the disk first: checkpointing stops with a
# warning, the run goes on, and writing the results fails. The units saved before resume the run
# once there is room.
tmpfs full 64k
run "disk full" 4 -- "$ember" run "$work/grid400.yaml" -o "$work/full/out" --no-plots --quiet
stderr_has "disk full" "$work/full/out: cannot write the results"
stderr_has "disk full" "No space left on device"
stderr_has "disk full" "rerunning the same command resumes"
grep -q '\.ember-staging\|item-[0-9]' "$work/err" && fail "disk full: the message names an internal file"
[[ "$(entries "$work/full/out")" == ".ember-checkpoint" ]] ||
  fail "disk full: expected only the checkpoint in the folder, found: $(entries "$work/full/out" | tr '\n' ' ')"
mount -o remount,size=1m "$work/full" || fail "disk full: cannot grow the tmpfs"
run "disk freed" 0 -- "$ember" run "$work/grid400.yaml" -o "$work/full/out" --no-plots
stderr_has "disk freed" "resumed"
run "uninterrupted" 0 -- "$ember" run "$work/grid400.yaml" -o "$work/whole" --no-plots --quiet
for f in constraint.csv decay.csv rates.csv potential.csv resolved.yaml; do
  cmp -s "$work/whole/$f" "$work/full/out/$f" || fail "disk freed: $f differs from an uninterrupted run"
done
[[ ! -e "$work/full/out/.ember-checkpoint" ]] || fail "disk freed: checkpoint left after the finished run"

# --- a full disk after a whole earlier set: the earlier set stays, whole -------------------------
tmpfs kept 128k
run "small set" 0 -- "$ember" run "$grid" -o "$work/kept/out" --no-plots --quiet
cp -r "$work/kept/out" "$work/first"
run "larger set, disk full" 4 -- "$ember" run "$work/grid400.yaml" -o "$work/kept/out" --no-plots --quiet
# Beside the earlier set, only the failed run's checkpoint (no staging folder, no new file).
diff -r -x .ember-checkpoint "$work/first" "$work/kept/out" >/dev/null || fail "disk full: the earlier set was changed"
[[ "$(entries "$work/kept/out" | grep -v '^\.ember-checkpoint$')" == "$(entries "$work/first")" ]] ||
  fail "disk full: something besides the checkpoint was left: $(entries "$work/kept/out" | tr '\n' ' ')"

# --- a read-only file system: refused before the computation, exit 4 ------------------------------
tmpfs ro 64k ro
run "read-only" 4 -- "$ember" run "$grid" -o "$work/ro/out" --no-plots --quiet
stderr_has "read-only" "$work/ro/out: cannot write the results"
stderr_has "read-only" "Read-only file system"

# --- a cache that cannot be written: the run goes on, with one warning -----------------------------
run "cache read-only" 0 -- "$ember" run "$grid" -o "$work/cache-ro" --no-plots --quiet --cache-dir "$work/ro/cache"
[[ $(grep -c 'warning: the cache' "$work/err") == 1 ]] || fail "cache read-only: expected one warning, got: $(cat "$work/err")"
stderr_has "cache read-only" "the cache in $work/ro/cache cannot be written"
[[ -s "$work/cache-ro/summary.json" ]] || fail "cache read-only: no results"

# --- a checkpoint that cannot be written: an error, exit 4, nothing in the results folder --------
run "checkpoint read-only" 4 -- "$ember" run "$grid" -o "$work/ckpt-out" --no-plots --quiet --checkpoint "$work/ro/ckpt"
stderr_has "checkpoint read-only" "$work/ro/ckpt: cannot write the checkpoint"
[[ -z "$(entries "$work/ckpt-out")" ]] || fail "checkpoint read-only: results written: $(entries "$work/ckpt-out")"

finish "faults while writing"
