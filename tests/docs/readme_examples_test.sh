#!/bin/sh
# README's examples are files and commands the tests run, so they cannot rot:
#  1. each ```xml block whose first line names a file (`<!-- sweeps/NAME.xml ...`)
#     is that file's text exactly, and the file prepares (`zvsmap points`);
#     a block naming a file "(lines from ...)" has each of its lines in it;
#  2. each indented `build/zvsmap ...` command line with concrete arguments
#     (no placeholders such as SWEEP.xml, DIR, N, [options] or ...) runs and
#     exits 0 from the source folder, /tmp/ mapped to a scratch folder; a
#     `calibrate` line must not report a failed fit.
#
#   tests/docs/readme_examples_test.sh ZVSMAP_BINARY SOURCE_DIR
set -eu
bin=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
cd "${2:?usage: readme_examples_test.sh ZVSMAP_BINARY SOURCE_DIR}"
scratch=$(mktemp -d)
trap 'rm -rf "$scratch"' EXIT
status=0
fail() { echo "readme-examples: $*" >&2; status=1; }

# 1. XML blocks.
awk -v dir="$scratch" '
  /^```xml$/ { n++; inblock = 1; file = dir "/block" n ".xml"; next }
  /^```$/ && inblock { inblock = 0; next }
  inblock { print > file }' README.md
blocks=0
for block in "$scratch"/block*.xml; do
  [ -e "$block" ] || continue
  named=$(head -n 1 "$block" | sed -n 's/.*<!-- \([A-Za-z0-9_./-]*\.xml\).*/\1/p')
  lines_from=$(head -n 1 "$block" | sed -n 's/.*(lines from \([A-Za-z0-9_./-]*\)).*/\1/p')
  if [ -n "$named" ]; then
    blocks=$((blocks + 1))
    [ -f "$named" ] || { fail "README block names $named, which does not exist"; continue; }
    cmp -s "$block" "$named" || fail "README's block differs from $named"
    "$bin" points "$named" >/dev/null || fail "$named does not prepare"
  elif [ -n "$lines_from" ]; then
    blocks=$((blocks + 1))
    tail -n +2 "$block" | while IFS= read -r line; do
      grep -qxF -- "$line" "$lines_from" || { echo "readme-examples: '$line' not in $lines_from" >&2; exit 1; }
    done || status=1
  else
    fail "a README xml block names no file: $(head -n 1 "$block")"
  fi
done

# 2. Command lines (continuations joined).
awk '/^    build\/zvsmap / || cont {
    line = line $0; cont = 0
    if (/\\$/) { sub(/\\$/, "", line); cont = 1; next }
    print line; line = "" }' README.md |
  sed 's/  *# .*$//; s/^ *//' >"$scratch/commands"
ran=0
while IFS= read -r cmd; do
  case "$cmd" in
    *SWEEP*|*DIR*|*" N"*|*COMMAND*|*"..."*|*"["*|*'$'*|*"K/N"*|*sweep.xml*) continue ;;
  esac
  ran=$((ran + 1))
  # /tmp/ first: the binary's own path may lie under /tmp (a clone there).
  run=$(printf '%s\n' "$cmd" | sed "s|/tmp/|$scratch/|g; s|build/zvsmap|$bin|g")
  out=$(sh -c "$run" 2>&1) || { fail "'$cmd' failed: $(printf '%s' "$out" | tail -n 3)"; continue; }
  case "$cmd" in
    *calibrate*) case "$out" in *"is outside"*) case "$cmd" in *"-V 400"*) ;; *)
      fail "'$cmd' did not fit the junction form" ;; esac ;; esac ;;
  esac
done <"$scratch/commands"
echo "readme-examples: $blocks xml blocks, $ran commands checked"
[ "$blocks" -gt 0 ] && [ "$ran" -gt 0 ] || status=1
exit "$status"
