#!/usr/bin/env bash
# Fails when any C++ file differs from what clang-format (with the project's .clang-format) makes.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
mapfile -t files < <(git ls-files '*.cpp' '*.h' 2>/dev/null || find app core ui tests -name '*.cpp' -o -name '*.h')
if ((${#files[@]} == 0)); then exit 0; fi
if ! clang-format --dry-run --Werror "${files[@]}"; then
  echo "Formatting differs: run  clang-format -i \$(git ls-files '*.cpp' '*.h')" >&2
  exit 1
fi
echo "clang-format: ${#files[@]} files clean"
