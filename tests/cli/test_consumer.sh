#!/usr/bin/env bash
# Another project using the installed package: tests/consumer, configured with
# find_package(Ember CONFIG) against the (moved) prefix test_install left, built, and run; its
# values must be the command line's (`ember higgs --json`, `ember bounce --json`) from the same
# install. Also builds and runs the README's "Use from C++" snippet exactly as printed.
# Usage: test_consumer.sh PREFIX SOURCE_DIR CXX_COMPILER [EXTRA_CMAKE_ARGS...]
set -u
prefix=$1
src=$2
cxx=$3
shift 3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export EMBER_CACHE_DIR="$work/cache"
failures=0
fail() { echo "FAIL: $*"; failures=$((failures + 1)); }

# The snippet: the first cpp block after the README's "Use from C++" heading.
awk '/^## Use from C\+\+/ {on = 1} on && /^```cpp/ {grab = 1; next} grab && /^```/ {exit} grab {print}' \
  "$src/README.md" >"$work/readme_snippet.cpp"
[[ -s "$work/readme_snippet.cpp" ]] || fail "README: no cpp block under \"Use from C++\""

cmake -S "$src/tests/consumer" -B "$work/build" -DCMAKE_BUILD_TYPE=Release -DCMAKE_PREFIX_PATH="$prefix" \
  -DCMAKE_CXX_COMPILER="$cxx" -DEMBER_README_SNIPPET="$work/readme_snippet.cpp" "$@" >"$work/configure.log" 2>&1 || {
  cat "$work/configure.log"
  echo "FAIL: configuring the consumer"
  exit 1
}
cmake --build "$work/build" -j2 >"$work/build.log" 2>&1 || {
  cat "$work/build.log"
  echo "FAIL: building the consumer"
  exit 1
}

"$work/build/consumer" >"$work/consumer.json" 2>"$work/err" || fail "consumer: $(head -c 300 "$work/err")"
"$prefix/bin/ember" higgs --json >"$work/higgs.json" 2>"$work/err" || fail "ember higgs: $(head -c 300 "$work/err")"
"$prefix/bin/ember" bounce --seed-mass "1e5 Mpl" --prescriptions entropy_drop --json >"$work/bounce.json" \
  2>"$work/err" || fail "ember bounce: $(head -c 300 "$work/err")"
# Same library, same inputs: the same numbers to the last digit JSON prints.
python3 - "$work" <<'PY' || fail "consumer values differ from the command line's"
import json, sys
w = sys.argv[1]
lib = json.load(open(f"{w}/consumer.json"))
higgs = json.load(open(f"{w}/higgs.json"))
bounce = json.load(open(f"{w}/bounce.json"))["entropy_drop"]
pairs = [("verdict", lib["verdict"], higgs["verdict"]),
         ("log10_expected_decays", lib["log10_expected_decays"], higgs["log10_expected_decays"]),
         ("critical_top_mass_GeV", lib["critical_top_mass_GeV"], higgs["critical_top_mass_GeV"]),
         ("B", lib["B"], bounce["B"]),
         ("decay_rate_per_s", lib["decay_rate_per_s"], bounce["decay_rate_per_s"]),
         ("evaporation_rate_per_s", lib["evaporation_rate_per_s"], bounce["evaporation_rate_per_s"])]
bad = [p for p in pairs if p[1] != p[2]]
for name, a, b in bad:
    print(f"  {name}: library {a}, ember {b}")
print("consumer:", ", ".join(f"{n} = {a}" for n, a, _ in pairs))
sys.exit(1 if bad else 0)
PY

"$work/build/readme_snippet" >"$work/snippet.out" 2>"$work/err" || fail "README snippet: $(head -c 300 "$work/err")"
# The verdict at the measured central inputs (what `ember higgs` prints; README, Cautions).
[[ "$(cat "$work/snippet.out")" == "metastable" ]] || fail "README snippet printed \"$(cat "$work/snippet.out")\", expected metastable"

if ((failures > 0)); then
  echo "$failures failure(s)"
  exit 1
fi
echo "test_consumer: all checks passed"
