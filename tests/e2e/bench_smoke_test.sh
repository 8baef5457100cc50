#!/bin/sh
# tools/bench in its quickest mode (two 2-point grids, 20-period reference):
# every method row, every column and every stage is printed with a figure.
# No timing is asserted (speed targets belong to the benchmark, not tests).
# Usage: bench_smoke_test.sh BUILD_DIR SOURCE_DIR
set -e
build=$1 src=$2
out=$(mktemp)
trap 'rm -f "$out"' EXIT
BUILD_DIR=$build "$src/tools/bench" --smoke >"$out" 2>/dev/null || {
  echo "tools/bench --smoke failed"; exit 1; }
fail=0
need() { grep -q -- "$1" "$out" || { echo "missing: $1"; fail=1; }; }
need "demo: 2 points"
need "dense grid: 2 points"
need "wall s  x floor periods/pt  err med  err max"
# Each measured method: two sweeps x five figures, none left blank.
for row in "(a) zvsmap run -j 1, cold starts" "(a) zvsmap, evaluation in-process" \
           "(b) zvsmap run -j 1, warm starts" "(b) warm starts, in-process" \
           "(c) plain ngspice -b batch loop" "(c) same periods, in-process" \
           "(d) one-period floor, in-process"; do
  line=$(grep -F -- "$row" "$out" || true)
  [ -n "$line" ] || { echo "missing row: $row"; fail=1; continue; }
  n=$(echo "$line" | cut -d'|' -f2-3 | tr '|' ' ' | grep -o -E '[0-9]+\.[0-9]+' | wc -l)
  [ "$n" -eq 10 ] || { echo "row '$row' has $n figures, not 10"; fail=1; }
done
need "with warm starts: "
need "faster than the plain ngspice batch loop"
for stage in render load setup stepping copy unload analysis store other; do
  grep -q -E "^$stage +[0-9.]+% +[0-9.]+%" "$out" || { echo "missing stage: $stage"; fail=1; }
done
# The engine's own count of stored time points per run (EngineTimings.samples).
grep -q -E "^samples/run +[1-9][0-9]* +[1-9][0-9]*" "$out" || { echo "missing: samples/run"; fail=1; }
grep -q "plain ngspice failed" "$out" && { echo "a plain ngspice run failed"; fail=1; }
[ $fail -eq 0 ] || cat "$out"
exit $fail
