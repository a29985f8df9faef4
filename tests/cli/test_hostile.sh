#!/usr/bin/env bash
# Hostile and extreme input: each case ends with a result or a clear refusal (exit 2,
# naming the file, line and key), never a crash, a NaN or a half-written folder. Then: the same
# scenario run twice gives identical files apart from timing fields, and no output of this test
# holds a NaN or an inf.
# Usage: test_hostile.sh path/to/ember path/to/source
set -uo pipefail
ember=$1
src=$2
data="$src/tests/data/hostile"
source "$(dirname "$0")/helpers.sh"
nothing_in() { [[ ! -e "$2" ]] || [[ -z "$(ls -A "$2")" ]] || fail "$1: something was written to $2"; }
# run_ok NAME SCENARIO: a run that must succeed, into $work/results/NAME.
run_ok() { run "$1" 0 -- "$ember" run "$data/$2" -o "$work/results/$1" --no-plots --quiet; }
# The value of one prescription's N_lightcone in a summary.json.
lightcone() {
  python3 -c 'import json,sys; print(json.load(open(sys.argv[1]))["prescriptions"][sys.argv[2]]["N_lightcone"])' "$1" "$2"
}

# --- masses at 1e-10 g and 1e50 g ------------------------------------------------------------------
run "mass 1e-10 g" 2 -- "$ember" run "$data/mass_tiny.yaml" -o "$work/results/tiny"
stderr_has "mass 1e-10 g" "mass_tiny.yaml:3:"
stderr_has "mass 1e-10 g" "population.spectrum.mass: 1e-10 g is out of range"
nothing_in "mass 1e-10 g" "$work/results/tiny"
run_ok "mass 1e50 g" mass_huge.yaml
# A 1e50 g hole outlives the universe by ~1e107 ages: nothing decays, nothing is constrained.
[[ $(lightcone "$work/results/mass 1e50 g/summary.json" probe_field) == 0.0 ]] || fail "mass 1e50 g: decays counted"
stdout_has "mass 1e50 g" "tightest scan bound (monochromatic populations at each scan mass): none"
run "evaporate 1e-10 g" 0 -- "$ember" evaporate --mass "1e-10 g" --json
grep -q '"warnings"' "$work/out" || fail "evaporate 1e-10 g: no warnings in the JSON"
grep -q 'below the Planck mass' "$work/out" || fail "evaporate 1e-10 g: no Planck-mass warning"
run "evaporate 1e50 g" 0 -- "$ember" evaporate --mass "1e50 g" --json
cp "$work/out" "$work/results/evaporate-1e50.json"
run "bounce 1e-10 g" 0 -- "$ember" bounce --seed-mass "1e-10 g" --prescriptions probe_field --json
grep -q 'below_semiclassical_floor' "$work/out" || fail "bounce 1e-10 g: not flagged below the semiclassical floor"
cp "$work/out" "$work/results/bounce-tiny.json"
run "bounce 1e50 g" 0 -- "$ember" bounce --seed-mass "1e50 g" --prescriptions probe_field --json
cp "$work/out" "$work/results/bounce-huge.json"

# --- abundances of 0 and 1 -------------------------------------------------------------------------
run_ok "beta 0" beta_zero.yaml
[[ $(lightcone "$work/results/beta 0/summary.json" probe_field) == 0.0 ]] || fail "beta 0: decays counted"
stdout_has "beta 0" "allowed"
run_ok "beta 1" beta_one.yaml
stdout_has "beta 1" "EXCLUDED"
run_ok "f_pbh 0" f_pbh_zero.yaml
stdout_has "f_pbh 0" "allowed"

# --- grids of one point and of 1e5 points ---------------------------------------------------------
run_ok "grid of 1" grid_one.yaml
[[ $(grep -vc '^#' "$work/results/grid of 1/constraint.csv") == 2 ]] || fail "grid of 1: expected one row and the column line"
# The 1e5-point grid is in the long tier (tests/cli/test_large_grid.sh).

# --- top masses: lambda never negative; lambda negative below 1e6 GeV -----------------------------
run_ok "stable top mass" top_stable.yaml
stdout_has "stable top mass" "no constraint: the Higgs potential is stable"
stdout_has "stable top mass" "tightest scan bound (monochromatic populations at each scan mass): none"
run_ok "low instability" top_low_instability.yaml
stdout_has "low instability" "instability at 1.5"
stdout_has "low instability" "excluded on their own"
run "higgs low instability" 0 -- "$ember" higgs --mt 185 --json
grep -q '"verdict": "unstable"' "$work/out" || fail "higgs M_t = 185 GeV: not unstable"
python3 -c 'import json,sys; s=json.load(open(sys.argv[1]))["instability_scale_GeV"]; sys.exit(0 if s < 1e6 else 1)' "$work/out" ||
  fail "higgs M_t = 185 GeV: instability scale not below 1e6 GeV"
cp "$work/out" "$work/results/higgs-185.json"

# --- empty and degenerate mass functions; a missing table -----------------------------------------
for case in "table_empty:0 rows; expected at least 2" "table_zero:psi integrates to 0" "table_one_row:1 rows; expected at least 2" \
            "power_law_point:is not above min_mass" "table_missing:no file at"; do
  name=${case%%:*}
  run "$name" 2 -- "$ember" run "$data/$name.yaml" -o "$work/results/$name"
  stderr_has "$name" "${case#*:}"
  stderr_has "$name" "$name.yaml:"
  nothing_in "$name" "$work/results/$name"
  run "$name check" 2 -- "$ember" check "$data/$name.yaml"
done
stderr_has "table_missing check" "population.spectrum.file"

# --- an output folder that cannot be written; a file that is a directory --------------------------
echo "a file" >"$work/plain"
run "output under a file" 2 -- "$ember" run "$data/grid_one.yaml" -o "$work/plain/sub"
stderr_has "output under a file" "$work/plain/sub"
run "output is a file" 2 -- "$ember" run "$data/grid_one.yaml" -o "$work/plain"
stderr_has "output is a file" "$work/plain"
[[ $(cat "$work/plain") == "a file" ]] || fail "output is a file: the file was changed"
mkdir -p "$work/ro"
chmod 500 "$work/ro"
if [[ ! -w "$work/ro" ]]; then  # root can write anywhere; then this case says nothing
  run "read-only output" 4 -- "$ember" run "$data/grid_one.yaml" -o "$work/ro/out"
  stderr_has "read-only output" "$work/ro/out"
fi
run "scenario is a directory" 2 -- "$ember" run "$data" -o "$work/results/dir"
stderr_has "scenario is a directory" "is a directory"
run "check a directory" 2 -- "$ember" check "$work"
stderr_has "check a directory" "is a directory"
run "greybody table is a directory" 2 -- "$ember" greybody --spin 0 --l 0 --x 0.1 --table "$work"
stderr_has "greybody table is a directory" "is a directory"

# --- YAML bombs: refused with a message, in bounded memory ----------------------------------------
python3 - "$work" <<'PY'
import sys
work = sys.argv[1]
open(f"{work}/deep.yaml", "w").write("population: " + "[" * 100000 + "]" * 100000 + "\n")
open(f"{work}/deep_block.yaml", "w").write("".join("  " * i + f"k{i}:\n" for i in range(300)) + "  " * 300 + "v\n")
lines = ["x-bomb:", "  a0: &a0 [lol, lol, lol, lol, lol, lol, lol, lol, lol, lol]"]
for i in range(1, 10):
    lines.append(f"  a{i}: &a{i} [" + ", ".join([f"*a{i-1}"] * 10) + "]")
lines.append("tunnelling:\n  prescriptions: *a9")
open(f"{work}/laughs.yaml", "w").write("\n".join(lines) + "\n")
open(f"{work}/huge.yaml", "w").write("title: '" + "x" * (5 << 20) + "'\n")
PY
for bomb in deep:"nested" deep_block:"nested" laughs:"expands to more than 100000 values" huge:"bytes"; do
  name=${bomb%%:*}
  # 1 GB of address space (ASan reserves far more, so the limit applies to plain builds only).
  if [[ -z "${EMBER_SANITIZED:-}" ]]; then limit="ulimit -v 1000000;"; else limit=""; fi
  run "bomb $name" 2 -- bash -c "$limit exec \"\$0\" check \"\$1\"" "$ember" "$work/$name.yaml"
  stderr_has "bomb $name" "${bomb#*:}"
  stderr_has "bomb $name" "$name.yaml"
done

# --- determinism: the same scenario twice gives the same files, timing fields apart --------------
sed -e 's/points: 31/points: 3/' -e 's/^scan:$/scan:\n  thresholds: {points: 4, tolerance: 0.2}/' "$src/configs/demo.yaml" >"$work/demo3.yaml"
for i in 1 2; do
  run "determinism $i" 0 -- "$ember" run "$work/demo3.yaml" -o "$work/results/same$i" --no-cache --quiet
  grep -v '^  results in ' "$work/out" >"$work/results/same$i.stdout"
done
for f in "$work/results/same1"/*; do
  name=$(basename "$f")
  if [[ $name == summary.json ]]; then
    diff <(grep -v '"seconds"' "$f") <(grep -v '"seconds"' "$work/results/same2/$name") >/dev/null ||
      fail "determinism: summary.json differs beyond its timing field"
  else
    cmp -s "$f" "$work/results/same2/$name" || fail "determinism: $name differs between two runs"
  fi
done
cmp -s "$work/results/same1.stdout" "$work/results/same2.stdout" || fail "determinism: the printed summary differs"

# --- no NaN or inf in any output of this test -----------------------------------------------------
python3 "$src/tests/cli/scan_non_finite.py" "$work/results" || failures=$((failures + 1))

if ((failures)); then
  echo "$failures failure(s)"
  exit 1
fi
echo "hostile input: all cases passed"
