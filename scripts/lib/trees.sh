# Sourced by scripts/test, scripts/fuzz, scripts/bench and scripts/demo: the build trees, each
# configured in one place. Call from the repository root.
#   release_tree          build/            GCC, Release, -Werror: the binary users run
#   sanitize_tree         build-sanitize/   clang-14, ASan + UBSan, and the libFuzzer targets:
#                                           one tree for the sanitizer suite and the fuzzers
#   gcc_sanitize_tree     build-sanitize-gcc/  GCC, ASan + UBSan (the long tier: another
#                                           compiler's instrumentation, and the MPI build too)
# Each prints nothing on success and leaves the tree's path in $tree.

# ccache, where installed, keeps object files between builds of the same tree path (CI clones to
# one path); a miss costs little.
_launcher() {
  if command -v ccache >/dev/null 2>&1; then
    export CCACHE_BASEDIR="$PWD" CCACHE_NOHASHDIR=1
    echo "-DCMAKE_CXX_COMPILER_LAUNCHER=ccache"
  fi
}

release_tree() {
  tree=build
  cmake -S . -B "$tree" -DCMAKE_BUILD_TYPE=Release -DEMBER_WERROR=ON $(_launcher) >/dev/null
}

sanitize_tree() {
  tree=build-sanitize
  # Without MPI: this is also the check that the project builds and passes every test where MPI is
  # not installed (the Release tree tests ember-mpi).
  CC=clang-14 CXX=clang++-14 cmake -S . -B "$tree" -DCMAKE_BUILD_TYPE=Release -DEMBER_WERROR=ON -DEMBER_SANITIZE=ON \
    -DEMBER_FUZZ=ON -DEMBER_MPI=OFF $(_launcher) >/dev/null
}

gcc_sanitize_tree() {
  tree=build-sanitize-gcc
  cmake -S . -B "$tree" -DCMAKE_BUILD_TYPE=Release -DEMBER_WERROR=ON -DEMBER_SANITIZE=ON $(_launcher) >/dev/null
}

# The sanitizers' run-time settings: any report fails the test it is in; leaks count too.
sanitizer_environment() {
  export ASAN_OPTIONS="abort_on_error=0:detect_leaks=1:halt_on_error=1"
  export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1"
  export LSAN_OPTIONS="suppressions=$PWD/tests/sanitize/lsan.supp:print_suppressions=0"
}
