#!/usr/bin/env bash
# Our C++ sources keep to .clang-format. Usage: test_format.sh CLANG_FORMAT SOURCE_DIR
set -u
cd "$2" || exit 1
mapfile -t files < <(git ls-files '*.cpp' '*.hpp' 2>/dev/null || find src include tests -name '*.[ch]pp')
(( ${#files[@]} > 0 )) || mapfile -t files < <(find src include tests -name '*.[ch]pp')
"$1" --dry-run --Werror "${files[@]}" || { echo "run: $1 -i <files> (or scripts/format)"; exit 1; }
