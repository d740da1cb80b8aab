#!/usr/bin/env bash
# Fails when a C or C++ source tracked by git differs from .clang-format (clang-format 14, Debian
# package clang-format). The build-check fixtures are left as written: their expected findings
# name line numbers. To fix: clang-format -i <file> (or every file this lists).
set -euo pipefail
cd "$(dirname "$0")/.."
mapfile -t files < <(git ls-files '*.hpp' '*.cpp' '*.h' '*.c' | grep -v '^tests/build_checks/fixtures/')
bad=()
for f in "${files[@]}"; do
  clang-format --dry-run -Werror "$f" > /dev/null 2>&1 || bad+=("$f")
done
if ((${#bad[@]})); then
  printf 'not formatted as .clang-format says (clang-format -i FILE):\n' >&2
  printf '  %s\n' "${bad[@]}" >&2
  exit 1
fi
echo "clang-format: ${#files[@]} files formatted as .clang-format says"
