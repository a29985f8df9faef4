#!/usr/bin/env bash
# `cmake --install` to a fresh prefix, as a user installs Ember: the layout, no path of this
# machine's source or build tree in any installed file, and a prefix that still works once moved
# (the binary finds its data and plotting script from its own location). Leaves the moved prefix
# in ROOT/moved for test_consumer and test_python (a CTest fixture).
# Usage: test_install.sh BUILD_DIR SOURCE_DIR ROOT
set -u
build=$1
src=$2
root=$3
failures=0
fail() { echo "FAIL: $*"; failures=$((failures + 1)); }
rm -rf "$root"
mkdir -p "$root"
export EMBER_CACHE_DIR="$root/cache"
unset EMBER_DATA_DIR
prefix="$root/prefix"

cmake --install "$build" --prefix "$prefix" >"$root/install.log" 2>&1 || {
  cat "$root/install.log"
  echo "FAIL: cmake --install"
  exit 1
}
for f in bin/ember lib/libember.so lib/cmake/Ember/EmberConfig.cmake lib/cmake/Ember/EmberConfigVersion.cmake \
  lib/cmake/Ember/EmberTargets.cmake include/ember/version.hpp include/ember/higgs/stability.hpp \
  share/ember/data/greybody.tsv share/ember/data/particles.yaml share/ember/data/relativistic_dof.tsv \
  libexec/ember/plot; do
  [[ -e "$prefix/$f" ]] || fail "install: no $f"
done
[[ -e "$prefix/include/ember/cli" ]] && fail "install: the command line's headers are installed"
[[ -x "$prefix/libexec/ember/plot" ]] || fail "install: libexec/ember/plot is not executable"
if [[ -e "$build/python" ]]; then
  ls "$prefix"/lib/python3/dist-packages/ember*.so >/dev/null 2>&1 || fail "install: no Python module"
fi

# No path of this machine: the source and build trees (as given and as resolved) appear nowhere,
# in text or binary files (not checked for instrumented builds, EMBER_INSTALL_HAS_PATHS).
[[ -n "${EMBER_INSTALL_HAS_PATHS:-}" ]] && echo "install: build paths not checked (an instrumented build)"
[[ -n "${EMBER_INSTALL_HAS_PATHS:-}" ]] || for p in "$src" "$build" "$(cd "$src" && pwd -P)" "$(cd "$build" && pwd -P)"; do
  found=$(grep -rlF -- "$p" "$prefix" 2>/dev/null)
  [[ -z "$found" ]] || fail "install: $p appears in $(echo "$found" | sed "s|$prefix/||" | tr '\n' ' ')"
done
echo "installed: $(du -sk "$prefix" | cut -f1) kB in $(find "$prefix" -type f | wc -l) files"

# Moved: everything is relative to the prefix.
mv "$prefix" "$root/moved"
moved="$root/moved"
"$moved/bin/ember" evaporate --lifetime "13.787 Gyr" --quiet --json >"$root/evaporate.json" 2>"$root/err" ||
  fail "moved: ember evaporate failed: $(head -c 300 "$root/err")"
grep -qF "$moved/share/ember/data/particles.yaml" "$root/evaporate.json" ||
  fail "moved: ember does not read its data from the moved prefix: $(head -c 300 "$root/evaporate.json")"
"$moved/bin/ember" higgs --json >"$root/higgs.json" 2>"$root/err" || fail "moved: ember higgs failed: $(head -c 300 "$root/err")"
# The explicit override (README): EMBER_DATA_DIR wins over the installed data.
mkdir -p "$root/other-data"
cp "$moved/share/ember/data/"* "$root/other-data/"
EMBER_DATA_DIR="$root/other-data" "$moved/bin/ember" evaporate --lifetime "13.787 Gyr" --quiet --json \
  >"$root/override.json" 2>"$root/err" || fail "EMBER_DATA_DIR: ember failed: $(head -c 300 "$root/err")"
grep -qF "$root/other-data/particles.yaml" "$root/override.json" || fail "EMBER_DATA_DIR: not used"
# Without data: a message naming the folder it looked in and the override, exit 2 (bad setup, not a bug).
# (Outside the build tree, whose own share/ember/data the library would find three levels up.)
bare=$(mktemp -d)
mkdir -p "$bare/bin" "$bare/lib"
cp "$moved/bin/ember" "$bare/bin/"
cp -P "$moved"/lib/libember.so* "$bare/lib/"
"$bare/bin/ember" evaporate --lifetime "13.787 Gyr" --quiet >/dev/null 2>"$root/err"
code=$?
[[ $code == 2 ]] || fail "no data: exit $code, expected 2"
grep -qF "EMBER_DATA_DIR" "$root/err" || fail "no data: the message does not name EMBER_DATA_DIR: $(cat "$root/err")"
# A rebuilt greybody table goes where the user says or into the cache, never into the install.
before=$(md5sum "$moved/share/ember/data/greybody.tsv")
"$moved/bin/ember" greybody --rebuild --quiet >"$root/out" 2>"$root/err" || fail "rebuild: $(head -c 300 "$root/err")"
[[ -s "$EMBER_CACHE_DIR/greybody.tsv" ]] || fail "rebuild: no greybody.tsv in the cache folder"
[[ "$(md5sum "$moved/share/ember/data/greybody.tsv")" == "$before" ]] || fail "rebuild: the installed table changed"
cmp -s "$EMBER_CACHE_DIR/greybody.tsv" "$src/data/greybody.tsv" || fail "rebuild: the table differs from the one that ships"
rm -rf "$bare" "$root/other-data"

if ((failures > 0)); then
  echo "$failures failure(s)"
  exit 1
fi
echo "test_install: all checks passed"
