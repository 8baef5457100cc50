#!/usr/bin/env bash
# The stage order, enforced: a file in src/STAGE/ may include headers only from
# its own stage and from stages earlier in the order (DEVELOPERS.md,
# "Architecture"). Prints every include that points the wrong way (or at a
# folder that is no stage) and fails on the first one; no exceptions.
#   include_direction_test.sh SOURCE_DIR "core;result;sweep;...;cli" (or spaces)
set -euo pipefail
src=$1/src
read -r -a order <<<"${2//;/ }"
rank() {
  local i
  for i in "${!order[@]}"; do
    if [ "${order[$i]}" = "$1" ]; then echo "$i"; return; fi
  done
  echo -1
}
bad=0
checked=0
for dir in "$src"/*/; do
  stage=$(basename "$dir")
  mine=$(rank "$stage")
  if [ "$mine" -lt 0 ]; then
    echo "src/$stage: a folder that is not in the stage order" >&2
    bad=1
    continue
  fi
  while IFS=: read -r file line text; do
    target=$(sed -n 's/^[[:space:]]*#[[:space:]]*include[[:space:]]*"\([a-z_]*\)\/.*/\1/p' <<<"$text")
    [ -n "$target" ] || continue
    checked=$((checked + 1))
    theirs=$(rank "$target")
    if [ "$theirs" -lt 0 ] || [ "$theirs" -gt "$mine" ]; then
      echo "${file#"$1"/}:$line: $stage includes $target ($text)" >&2
      bad=1
    fi
  done < <(grep -rn --include='*.h' --include='*.cc' '^[[:space:]]*#[[:space:]]*include[[:space:]]*"' "$dir" || true)
done
[ "$bad" -eq 0 ] || { echo "FAIL: includes against the stage order (${order[*]})" >&2; exit 1; }
echo "ok: $checked project includes, all downward in ${order[*]}"
