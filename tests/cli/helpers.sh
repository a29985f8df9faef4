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
# kill_when_checkpointed PID FOLDER COUNT: SIGKILL (nothing caught) the run PID once FOLDER holds
# COUNT checkpointed items, or when it ends first; sets $checkpointed to how many it held then.
kill_when_checkpointed() {
  local victim=$1 folder=$2 count=$3
  for _ in $(seq 1 1200); do
    [[ $(ls "$folder" 2>/dev/null | grep -c '^item-') -ge $count ]] && break
    kill -0 "$victim" 2>/dev/null || break
    sleep 0.05
  done
  kill -9 "$victim" 2>/dev/null
  wait "$victim" 2>/dev/null
  checkpointed=$(ls "$folder" 2>/dev/null | grep -c '^item-')
}
# finish WHAT: scans the work folder for NaN and inf (err and out are captured messages, which
# quote the user's own bad input), then reports and exits.
finish() {
  python3 "$src/tests/cli/scan_non_finite.py" "$work" --skip err --skip out || failures=$((failures + 1))
  if ((failures > 0)); then
    echo "$failures failure(s)"
    exit 1
  fi
  echo "$1: all checks passed"
  exit 0
}
