# Shared by the command-line tests (sourced): a fresh work folder with its own cache, a failure
# counter, and the run/assert helpers. Expects $ember and $src to be set.
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
# B(M) tables are cached between runs: keep the test's cache out of the user's.
export EMBER_CACHE_DIR="$work/cache"
failures=0

fail() { echo "FAIL: $*"; failures=$((failures + 1)); }

# run NAME EXPECTED_CODE -- command...   (stdout to $work/out, stderr to $work/err)
run() {
  local name=$1 expected=$2
  shift 3
  "$@" >"$work/out" 2>"$work/err"
  local code=$?
  [[ $code == "$expected" ]] || fail "$name: exit $code, expected $expected; stderr: $(head -c 400 "$work/err")"
}
stdout_has() { grep -qF -- "$2" "$work/out" || fail "$1: stdout lacks '$2'"; }
stderr_has() { grep -qF -- "$2" "$work/err" || fail "$1: stderr lacks '$2'"; }
stdout_empty() { [[ ! -s "$work/out" ]] || fail "$1: stdout should be empty: $(head -c 200 "$work/out")"; }
