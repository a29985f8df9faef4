#!/usr/bin/env bash
# ember-mpi against ember: 2 ranks on this machine write the serial run's files byte for byte
# (summary.json apart from its timing), and errors end every rank with the serial exit code.
# Usage: test_mpi.sh EMBER EMBER_MPI MPIEXEC
set -u
ember=$1
ember_mpi=$2
mpiexec=$3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export EMBER_CACHE_DIR="$work/cache"
failures=0
fail() { echo "FAIL: $*"; failures=$((failures + 1)); }
ranks() {
  local n=$1
  shift
  local extra=(--oversubscribe)
  ((EUID == 0)) && extra+=(--allow-run-as-root)
  timeout 300 "$mpiexec" "${extra[@]}" -np "$n" "$ember_mpi" "$@"
}

cat >"$work/band.yaml" <<'YAML'
title: "MPI test (invented numbers)"
population:
  spectrum: {shape: lognormal, peak_mass: 1e9 g, width: 0.7}
  abundance: {measure: beta, value: 1e-22}
tunnelling:
  prescriptions: [probe_field, no_seed]
scan:
  thresholds: {inputs: []}  # not what this test checks; they cost a B(M) table per evaluation
  masses: {from: 1 g, to: 1e12 g, points: 4}
  band:
    top_mass: {points: 3}
YAML
"$ember" run "$work/band.yaml" -o "$work/serial" --no-plots --quiet --no-cache --threads 1 >"$work/serial.out" 2>&1 ||
  fail "serial run: exit $?"
ranks 2 run "$work/band.yaml" -o "$work/mpi" --no-plots --quiet --no-cache --threads 1 >"$work/mpi.out" 2>&1 ||
  fail "2 ranks: exit $?; $(head -c 600 "$work/mpi.out")"
for f in constraint.csv decay.csv rates.csv potential.csv resolved.yaml; do
  cmp -s "$work/serial/$f" "$work/mpi/$f" || fail "2 ranks: $f differs from the serial run"
done
diff <(grep -v '"seconds"' "$work/serial/summary.json") <(grep -v '"seconds"' "$work/mpi/summary.json") >/dev/null ||
  fail "2 ranks: summary.json differs from the serial run beyond timing"
# The terminal summary is printed once, by rank 0, and says the same as the serial one.
[[ $(grep -c '^Ember run:' "$work/mpi.out") == 1 ]] || fail "2 ranks: the summary should be printed once"
diff <(grep -v 'results in' "$work/serial.out") <(grep -v 'results in' "$work/mpi.out") >/dev/null ||
  fail "2 ranks: the printed summary differs from the serial one"
# Two threads on each of two ranks, resuming nothing: still the same bytes.
ranks 2 run "$work/band.yaml" -o "$work/mpi2" --no-plots --quiet --no-cache --threads 2 >/dev/null 2>&1 ||
  fail "2 ranks x 2 threads: exit $?"
cmp -s "$work/serial/constraint.csv" "$work/mpi2/constraint.csv" || fail "2 ranks x 2 threads: constraint.csv differs"

# A bad scenario: exit 2 from every rank, one message, nothing written.
ranks 2 run "$(dirname "$0")/../data/bad/unknown_key.yaml" -o "$work/never" >"$work/bad.out" 2>&1
code=$?
[[ $code == 2 ]] || fail "bad scenario under MPI: exit $code, expected 2"
[[ $(grep -c 'unknown key' "$work/bad.out") == 1 ]] || fail "bad scenario under MPI: expected the message once"
[[ -e "$work/never" ]] && fail "bad scenario under MPI: wrote output"
# A foreign checkpoint stops rank 0 before the units; the other rank must not wait for work.
mkdir -p "$work/foreign/.ember-checkpoint"
echo "scenario 0000000000000000" >"$work/foreign/.ember-checkpoint/job.identity"
ranks 2 run "$work/band.yaml" -o "$work/foreign" --no-plots --quiet >"$work/foreign.out" 2>&1
code=$?
[[ $code == 2 ]] || fail "foreign checkpoint under MPI: exit $code, expected 2"
grep -q -- '--restart' "$work/foreign.out" || fail "foreign checkpoint under MPI: no --restart hint"

# No output of the MPI runs holds a NaN or an inf ; *.out are captured messages.
python3 "$(dirname "$0")/scan_non_finite.py" "$work/serial" "$work/mpi2" || failures=$((failures + 1))

if ((failures > 0)); then
  echo "$failures failure(s)"
  exit 1
fi
echo "test_mpi: all checks passed"
