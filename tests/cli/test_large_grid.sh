#!/usr/bin/env bash
# The long tier (scripts/test --long; label "long"): a grid of 1e5 formation masses runs, writes
# every row, bounds its checkpoint to hundreds of files (JobOptions::max_chunks), resumes after a
# kill to the same bytes, and holds no NaN or inf.
# Usage: test_large_grid.sh path/to/ember path/to/source
set -uo pipefail
ember=$1
src=$2
source "$(dirname "$0")/helpers.sh"
grid="$src/tests/data/hostile/grid_huge.yaml"
run "grid of 1e5" 0 -- "$ember" run "$grid" -o "$work/whole" --no-plots --quiet
[[ $(grep -vc '^#' "$work/whole/constraint.csv") == 100001 ]] || fail "grid of 1e5: expected 1e5 rows"
# Killed once part of the work is checkpointed, then resumed: the same files.
"$ember" run "$grid" -o "$work/killed" --no-plots --quiet --threads 1 >/dev/null 2>&1 &
kill_when_checkpointed $! "$work/killed/.ember-checkpoint" 20
files=$checkpointed
[[ $files -ge 20 ]] || fail "grid of 1e5: only $files checkpoint files at the kill"
run "grid of 1e5 resumed" 0 -- "$ember" run "$grid" -o "$work/killed" --no-plots
stderr_has "grid of 1e5 resumed" "resumed $files finished work items"
for f in constraint.csv decay.csv rates.csv potential.csv resolved.yaml; do
  cmp -s "$work/whole/$f" "$work/killed/$f" || fail "grid of 1e5: $f differs after the resume"
done
finish "large grid"
