#!/usr/bin/env bash
# `ember run` as users run it: the summary and its files, thread independence, the cache (hits,
# misses, damage, two processes at once), a computed greybody table, kill and resume, refusals.
# Usage: test_run.sh EMBER_BINARY SOURCE_DIR
set -u
ember=$1
src=$2
source "$(dirname "$0")/helpers.sh"
mkdir -p "$work/json"
json_count=0
json_ok() { json_count=$((json_count + 1)); cp "$work/out" "$work/json/$json_count.json"; echo "$1" >"$work/json/$json_count.name"; }

# --- run ------------------------------------------------------------------------------------------
sed -e 's/points: 31/points: 4/' -e 's|directory: ember-out/demo|directory: unused|' \
  -e 's/^scan:$/scan:\n  thresholds: {points: 3, tolerance: 0.2}/' "$src/configs/demo.yaml" >"$work/demo-small.yaml"
run "run demo" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/run"
stdout_has "run demo" "survivors: holes formed above 5.31e+14 g survive today"
stdout_has "run demo" "EXCLUDED"
stdout_has "run demo" "caution: The constraint disappears if new physics stabilises"
stdout_has "run demo" "semiclassical floor"
stderr_has "run demo" "0 from the cache in $work/cache"
for f in summary.json constraint.csv decay.csv resolved.yaml rates.csv potential.csv; do
  [[ -s "$work/run/$f" ]] || fail "run demo: no $f"
done
grep -qiE '(^|[,:[ ])-?(nan|inf|infinity)([],} ]|$)' "$work/run/"*.csv "$work/run/summary.json" && fail "run demo: NaN or inf in the outputs"
grep -q '^# scenario .*hash' "$work/run/constraint.csv" || fail "run demo: constraint.csv lacks the hash line"
cp "$work/run/summary.json" "$work/run-summary.json"
# The top-mass thresholds: printed, in summary.json, and consistent with the samples they came from
# (the verdict is allowed just below the threshold and excluded just above it, sampled both sides).
stdout_has "run demo" "thresholds in top_mass"
stdout_has "run demo" "absolutely stable below the critical top mass"
[[ -s "$work/run/sensitivity.csv" ]] || fail "run demo: no sensitivity.csv"
/usr/bin/python3 - "$work/run" <<'PY' || fail "run demo: thresholds disagree with sensitivity.csv"
import csv, json, sys
d = sys.argv[1]
s = json.load(open(d + "/summary.json"))
rows = [r for r in csv.DictReader(l for l in open(d + "/sensitivity.csv") if not l.startswith("#"))]
assert s["sensitivity"]["top_mass"]["samples"] == "sensitivity.csv"
crit = s["sensitivity"]["top_mass"]["critical_top_mass_GeV"]
tol = s["sensitivity"]["top_mass"]["root_tolerance_GeV"]
cap = float([l for l in open(d + "/sensitivity.csv") if l.startswith("# max_decays:")][0].split(":")[1])
seen = 0
for name, p in s["prescriptions"].items():
    t = p["top_mass_threshold_GeV"]
    if t is None:
        continue
    seen += 1
    assert t > crit, (name, t, crit)  # no seeded decay at all below the critical mass
    n = [(float(r["value"]), float(r["N_lightcone"])) for r in rows
         if r["prescription"] == name and r["N_lightcone"] != ""]
    below = [v for v, N in n if v < t - tol and N > cap]
    above = [v for v, N in n if v > t + tol and N <= cap]
    assert not below and not above, (name, t, below, above)
    assert any(v < t and N <= cap for v, N in n) and any(v > t and N > cap for v, N in n), name
assert seen >= 1
PY
run "run resolved checks" 0 -- "$ember" check "$work/run/resolved.yaml"
if /usr/bin/python3 -c 'import matplotlib' 2>/dev/null; then
  for f in constraint rates potential contributions sensitivity; do
    [[ -s "$work/run/$f.png" && -s "$work/run/$f.pdf" ]] || fail "run demo: plot $f missing"
  done
fi
ls -a "$work/run" | grep -q '\.tmp\.' && fail "run demo: temporary file left behind"
run "run json" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/run2" --json --no-plots --threads 1 --no-cache

json_ok "run json"
# The same files whatever the thread count (summary.json differs only in its timing).
run "run two threads" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/run3" --no-plots --threads 2 --quiet --no-cache
# same_results NAME DIR: DIR holds the files of run2 (summary.json differing only in its timing).
same_results() {
  for f in constraint.csv decay.csv rates.csv potential.csv resolved.yaml; do
    cmp -s "$work/run2/$f" "$2/$f" || fail "$1: $f differs from the uncached single-thread run"
  done
  diff <(grep -v '"seconds"' "$work/run2/summary.json") <(grep -v '"seconds"' "$2/summary.json") >/dev/null ||
    fail "$1: summary.json differs beyond timing"
}
same_results "run two threads" "$work/run3"
# The cache: a second run reads every table and gives the same bytes; a damaged entry is rebuilt;
# a changed input misses.
[[ $(ls "$work/cache" | wc -l) -ge 4 ]] || fail "cache: expected the first run's tables in $work/cache"
run "run cached" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/run4" --no-plots
stderr_has "run cached" ", 0 built"
same_results "run cached" "$work/run4"
for f in "$work/cache"/*; do sed -i '5s/0x1/0x3/' "$f"; done
run "run damaged cache" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/run5" --no-plots
stderr_has "run damaged cache" "0 from the cache"
same_results "run damaged cache" "$work/run5"
sed -e 's/top_mass: 172.57 GeV/top_mass: 172.0 GeV/' "$work/demo-small.yaml" >"$work/demo-top.yaml"
grep -q 'top_mass: 172.0 GeV' "$work/demo-top.yaml" || fail "cache: the test scenario has no top_mass line to change"
# Two processes starting at once on an empty cache: both finish, agree, and leave whole entries.
"$ember" run "$work/demo-small.yaml" -o "$work/conc1" --no-plots --quiet --cache-dir "$work/cache2" >/dev/null 2>&1 &
first=$!
"$ember" run "$work/demo-small.yaml" -o "$work/conc2" --no-plots --quiet --cache-dir "$work/cache2" >/dev/null 2>&1 ||
  fail "concurrent runs: the second failed"
wait $first || fail "concurrent runs: the first failed"
same_results "concurrent run 1" "$work/conc1"
same_results "concurrent run 2" "$work/conc2"
ls -a "$work/cache2" | grep -q '\.tmp\.' && fail "concurrent runs: temporary cache file left behind"
run "run after concurrent" 0 -- "$ember" run "$work/demo-small.yaml" -o "$work/conc3" --no-plots --cache-dir "$work/cache2"
stderr_has "run after concurrent" ", 0 built"
run "run changed input" 0 -- "$ember" run "$work/demo-top.yaml" -o "$work/run6" --no-plots
stderr_has "run changed input" "0 from the cache"
# A greybody table computed by this binary: built once, then read from the cache; the results equal
# the shipped table's (data/greybody.tsv is what `ember greybody --rebuild` writes, checked above).
{ cat "$work/demo-small.yaml"; printf 'evaporation:\n  greybody_table: computed\n'; } >"$work/demo-computed.yaml"
run "run computed greybody" 0 -- "$ember" run "$work/demo-computed.yaml" -o "$work/run7" --no-plots --cache-dir "$work/cache3"
stderr_has "run computed greybody" "greybody table: built"
stdout_has "run computed greybody" "greybody table: computed by this binary, 161 points per mode"
run "run computed greybody cached" 0 -- "$ember" run "$work/demo-computed.yaml" -o "$work/run8" --no-plots --cache-dir "$work/cache3"
stderr_has "run computed greybody cached" "greybody table: from the cache"
for f in constraint.csv decay.csv rates.csv potential.csv; do
  cmp -s "$work/run7/$f" "$work/run8/$f" || fail "computed greybody: $f differs between the built and the cached table"
  diff <(grep -v '^# scenario' "$work/run2/$f") <(grep -v '^# scenario' "$work/run7/$f") >/dev/null ||
    fail "computed greybody: $f differs from the run with the shipped table"
done
# Kill and resume: 14 work items (the B(M) tables of the central point and a 3 x 2 band, one
# prescription, then one chunk of formation masses per table), killed (SIGKILL, nothing caught)
# once two are checkpointed, then rerun with the same command; the files must equal an
# uninterrupted run's, and the rerun must compute only the items the killed run had not finished.
cat >"$work/band.yaml" <<'YAML'
title: "resume test (invented numbers)"
population:
  spectrum: {shape: monochromatic, mass: 1e9 g}
  abundance: {measure: beta, value: 1e-22}
tunnelling:
  prescriptions: [probe_field]
scan:
  thresholds: {inputs: []}  # not what this test checks; they cost a B(M) table per evaluation
  masses: {from: 1 g, to: 1e12 g, points: 4}
  band:
    top_mass: {points: 3}
    higgs_mass: {points: 2}
YAML
run "band uninterrupted" 0 -- "$ember" run "$work/band.yaml" -o "$work/band-whole" --no-plots --quiet
[[ -e "$work/band-whole/.ember-checkpoint" ]] && fail "band uninterrupted: checkpoint left after a finished run"
"$ember" run "$work/band.yaml" -o "$work/band-killed" --no-plots --quiet --no-cache --threads 1 >/dev/null 2>&1 &
kill_when_checkpointed $! "$work/band-killed/.ember-checkpoint" 2
finished=$checkpointed
tables_done=$(ls "$work/band-killed/.ember-checkpoint" 2>/dev/null | grep -c '^item-00000[0-6]\.txt$')
[[ $finished -ge 2 && $finished -lt 14 ]] || fail "kill and resume: $finished of 14 items checkpointed at the kill; expected 2 to 13"
[[ -e "$work/band-killed/summary.json" ]] && fail "kill and resume: a killed run wrote summary.json"
run "band resumed" 0 -- "$ember" run "$work/band.yaml" -o "$work/band-killed" --no-plots --no-cache --threads 1
stderr_has "band resumed" "resumed $finished finished work items"
stderr_has "band resumed" "0 from the cache (off), $((7 - tables_done)) built"
for f in constraint.csv decay.csv rates.csv potential.csv resolved.yaml; do
  cmp -s "$work/band-whole/$f" "$work/band-killed/$f" || fail "kill and resume: $f differs from the uninterrupted run"
done
diff <(grep -v '"seconds"' "$work/band-whole/summary.json") <(grep -v '"seconds"' "$work/band-killed/summary.json") >/dev/null ||
  fail "kill and resume: summary.json differs beyond timing"
[[ -e "$work/band-killed/.ember-checkpoint" ]] && fail "kill and resume: checkpoint left after the finished run"
# A checkpoint of another scenario is refused unless --restart.
mkdir -p "$work/other/.ember-checkpoint"
echo "scenario 0000000000000000" >"$work/other/.ember-checkpoint/job.identity"
run "resume other scenario" 2 -- "$ember" run "$work/band.yaml" -o "$work/other" --no-plots --quiet
stderr_has "resume other scenario" "--restart"
[[ -e "$work/other/summary.json" ]] && fail "resume other scenario: wrote output"
run "restart other scenario" 0 -- "$ember" run "$work/band.yaml" -o "$work/other" --no-plots --quiet --restart
cmp -s "$work/band-whole/constraint.csv" "$work/other/constraint.csv" || fail "restart: constraint.csv differs"
run "run bad scenario" 2 -- "$ember" run "$src/tests/data/bad/unknown_key.yaml" -o "$work/never-run"
[[ -e "$work/never-run" ]] && fail "run bad scenario: wrote output"
run "run unwritable folder" 2 -- "$ember" run "$work/demo-small.yaml" -o "$src/configs/demo.yaml" --no-plots
stderr_has "run unwritable folder" "cannot write"


python3 - "$work" <<'PY' || failures=$((failures + 1))
import csv, json, pathlib, sys
work = pathlib.Path(sys.argv[1])
bad = 0
for f in sorted((work / "json").glob("*.json")):
    try:
        assert isinstance(json.loads(f.read_text()), dict)
    except Exception as e:
        print(f"FAIL: {f.with_suffix('.name').read_text().strip()}: stdout is not one JSON object ({e})")
        bad += 1
# beta is an energy fraction: a bound at or above 1 is no constraint and must be an empty cell
# (derived; before this rule the demo's hot_bubble column read ~1e144).
rows = [l for l in (work / "run" / "constraint.csv").read_text().splitlines() if not l.startswith("#")]
for row in csv.DictReader(rows):
    for key, value in row.items():
        if key.startswith("beta_max_") and value and not float(value) < 1:
            print(f"FAIL: constraint.csv {key} = {value} at {row['mass_g']} g: a bound >= 1 is no constraint")
            bad += 1
r = json.loads((work / "run-summary.json").read_text())
for key in ("ember_version", "scenario_hash", "scenario", "cautions", "prescriptions", "unseeded_baseline", "band"):
    if key not in r:
        print(f"FAIL: summary.json lacks {key}")
        bad += 1
for name, p in r.get("prescriptions", {}).items():
    for key in ("N_lightcone", "N_hubble", "survival_probability", "excluded"):
        if key not in p:
            print(f"FAIL: summary.json prescription {name} lacks {key}")
            bad += 1
sys.exit(1 if bad else 0)
PY

# --- the output folder belongs to the run ---------------------------------------------------------
# A rerun with a smaller file set leaves none of the old set's other files, and never touches a
# file no run of Ember wrote.
echo "my notes" >"$work/run4/notes.txt"
sed -e 's|directory: unused|directory: unused\n  files: [summary]|' "$work/demo-small.yaml" >"$work/demo-summary-only.yaml"
grep -q 'files: \[summary\]' "$work/demo-summary-only.yaml" || fail "folder: the test scenario has no output.files line"
run "rerun smaller set" 0 -- "$ember" run "$work/demo-summary-only.yaml" -o "$work/run4" --no-plots --quiet
for f in constraint.csv decay.csv resolved.yaml rates.csv potential.csv; do
  [[ -e "$work/run4/$f" ]] && fail "rerun smaller set: the old run's $f is still there"
done
[[ -s "$work/run4/summary.json" ]] || fail "rerun smaller set: no summary.json"
[[ $(cat "$work/run4/notes.txt") == "my notes" ]] || fail "rerun smaller set: a file Ember did not write was touched"
grep -qx 'summary.json' "$work/run4/.ember-files" || fail "rerun smaller set: the manifest does not list summary.json"
# A non-empty folder no run of Ember wrote is refused (bad input, exit 2), unless adopted.
mkdir -p "$work/foreign" && echo "thesis draft" >"$work/foreign/chapter1.tex"
run "foreign folder" 2 -- "$ember" run "$work/demo-summary-only.yaml" -o "$work/foreign" --no-plots --quiet
stderr_has "foreign folder" "no run of Ember wrote"
[[ $(ls -A "$work/foreign") == "chapter1.tex" ]] || fail "foreign folder: something was written there"
run "adopted folder" 0 -- "$ember" run "$work/demo-summary-only.yaml" -o "$work/foreign" --no-plots --quiet --adopt-folder
[[ -s "$work/foreign/summary.json" && $(cat "$work/foreign/chapter1.tex") == "thesis draft" ]] ||
  fail "adopted folder: expected the summary beside the untouched file"

# --- spinning holes -------------------------------------------------------------------------------
# The shipped spinning scenario, cut down: holes at 6.2e14 g end today only when born spinning
# (`ember evaporate --lifetime "13.787 Gyr"`: 5.31e14 g at a* = 0, 6.41e14 g at a* = 0.9).
spin_small() {  # FILE SPIN_BLOCK: the scenario with its hole_spin block replaced
  sed -e 's/points: 29/points: 3/' -e 's/from: 1e14 g/from: 5e14 g/' -e 's/to: 1.5e15 g/to: 7e14 g/' \
    -e 's/mass: 6.5e14 g/mass: 6.2e14 g/' -e 's/\[entropy_drop, probe_field\]/[probe_field]/' \
    -e 's|directory: ember-out/spinning|directory: unused|' -e '/^  hole_spin:/,/^$/d' \
    -e 's/^scan:$/scan:\n  thresholds: {inputs: []}/' "$src/configs/spinning_matter_era.yaml" >"$1"
  [[ -n "${2:-}" ]] && sed -i "s|^  abundance:|  hole_spin: $2\n  abundance:|" "$1"
  return 0
}
spin_small "$work/spin.yaml" "{distribution: fixed, value: 0.9}"
spin_small "$work/still.yaml" ""
run "spinning run" 0 -- "$ember" run "$work/spin.yaml" -o "$work/spin" --no-plots --quiet
stdout_has "spinning run" "hole spin: a* = 0.9 for every hole"
stdout_has "spinning run" "No prescription in Ember treats spinning seeds"
stdout_has "spinning run" "EXCLUDED"
run "still run" 0 -- "$ember" run "$work/still.yaml" -o "$work/still" --no-plots --quiet
stdout_has "still run" "allowed"
grep -q "hole spin" "$work/out" && fail "still run: a hole-spin line for holes born without spin"
grep -qiE '(^|[,:[ ])-?(nan|inf|infinity)([],} ]|$)' "$work/spin/"*.csv "$work/spin/summary.json" && fail "spinning run: NaN or inf in the outputs"
grep -q "^formation_mass_g,.*,spin_gate_mass_g,hole_spin_at_crossover,spinning_crossover_share$" "$work/spin/decay.csv" ||
  fail "spinning run: decay.csv lacks the spin columns"
grep -q "spin_gate_mass_g" "$work/still/decay.csv" && fail "still run: decay.csv has spin columns"
/usr/bin/python3 - "$work/spin" "$work/still" <<'PY' || fail "spinning run: summary.json"
import json, sys
spin, still = (json.load(open(d + "/summary.json")) for d in sys.argv[1:3])
p = spin["prescriptions"]["probe_field"]
assert spin["hole_spin"]["spin_limit"] == 0.1, spin["hole_spin"]
assert p["share_of_N_from_spinning_crossovers"] == 0.0, p  # the crossover comes near 30 g
assert p["excluded"] and p["N_lightcone"] > 1, p
assert not still["prescriptions"]["probe_field"]["excluded"]
assert "hole_spin" not in still and "share_of_N_from_spinning_crossovers" not in still["prescriptions"]["probe_field"]
# Spin shortens the life (Page, PRD 14 (1976) 3260): born at a* = 0.9 the hole that ends today is
# heavier (measured 6.41e14 g against 5.31e14 g).
assert spin["survivors"]["mass_g"] > 1.15 * still["survivors"]["mass_g"], (spin["survivors"], still["survivors"])
PY
# a* = 0 written out is the default: the same resolved scenario, the same numbers.
spin_small "$work/zero.yaml" "{distribution: fixed, value: 0}"
run "zero spin run" 0 -- "$ember" run "$work/zero.yaml" -o "$work/zero" --no-plots --quiet
for f in constraint.csv decay.csv; do  # the numbers; the comment lines name the scenario file
  cmp -s <(grep -v '^#' "$work/zero/$f") <(grep -v '^#' "$work/still/$f") || fail "zero spin run: $f differs from the default's"
done
# Two runs' curves on one figure.
if /usr/bin/python3 -c "import matplotlib" 2>/dev/null; then
  run "compare" 0 -- /usr/bin/python3 "$src/scripts/plot" "$work/spin" --compare "$work/still" --formats png
  [[ -s "$work/spin/compare.png" ]] || fail "compare: no compare.png"
fi
printf '0.5 1\n0.3 1\n' >"$work/bad_spins.tsv"
spin_small "$work/bad_spin.yaml" "{distribution: table, file: $work/bad_spins.tsv}"
run "bad spin table" 2 -- "$ember" run "$work/bad_spin.yaml" -o "$work/bad_spin" --no-plots --quiet
stderr_has "bad spin table" "bad_spins.tsv:2"
[[ -e "$work/bad_spin/summary.json" ]] && fail "bad spin table: an output was written"

finish "ember run"
