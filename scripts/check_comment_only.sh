#!/usr/bin/env bash
# Proves that an edit of include/ changed comments only (bash scripts/check_comment_only.sh [BASE],
# default HEAD): each header, at BASE and in the working tree, has its comments stripped by the
# compiler's preprocessor (g++ -fpreprocessed: no macro expansion, no includes) and its whitespace
# normalized; the two token streams must be identical. Fails, listing the headers, otherwise.
set -euo pipefail
base=${1:-HEAD}
cd "$(dirname "$0")/.."
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
strip() { g++ -x c++ -fpreprocessed -dD -E -P - 2>/dev/null | tr -s ' \t\n' '\n\n\n' | grep -v '^$'; }
n=0 bad=0
for f in $(git ls-files 'include/*.hpp'); do
  git cat-file -e "$base:$f" 2>/dev/null || { echo "new since $base: $f"; continue; }
  git show "$base:$f" | strip > "$tmp/old"
  strip < "$f" > "$tmp/new"
  if ! cmp -s "$tmp/old" "$tmp/new"; then
    echo "code differs: $f"; diff "$tmp/old" "$tmp/new" | head -10; bad=$((bad + 1))
  fi
  n=$((n + 1))
done
echo "$n headers compared with $base, $bad with a code difference"
((bad == 0))
