#!/usr/bin/env bash
# End-to-end, real ngspice: adaptive refinement (<refine>) finds the ZVS
# boundaries of the full fine grid within the resolution at no more than 30 %
# of its simulations, on the 2-axis demo-style sweep and on a 3-axis one
# (Vin x Iout x L); a rerun recomputes the rounds from the store and runs
# nothing; shards run each round's share, and merging, copying the merged
# store back and running the shards again until the merge is complete gives
# the single run's edges.csv.
#   refine_boundary_test.sh ZVSMAP_BINARY SOURCE_DIR
set -euo pipefail
zvsmap=$1
src=$2
work=$(mktemp -d /tmp/zvsmap-refine-test-XXXXXX)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }
compare=$src/tests/e2e/refine_compare.py
strip_timing() { awk -F, 'BEGIN{OFS=","} {NF=NF-1; print}' "$1"; }

check_sweep() {
  local name=$1 sweep=$2
  "$zvsmap" run "$sweep" --out "$work/$name-refined" -j 2 -q 2>"$work/$name-refined.log" \
    || fail "$name refined run: $(tail -n 5 "$work/$name-refined.log")"
  grep -q "zvsmap: refinement: .* complete" "$work/$name-refined.log" \
    || fail "$name: no refinement line: $(cat "$work/$name-refined.log")"
  head -n 1 "$work/$name-refined/edges.csv" | grep -q "^point,refine_round," \
    || fail "$name: edges.csv has no refine_round column"
  python3 "$compare" fine-sweep "$sweep" "$work/$name-refined/summary.xml" "$work/$name-fine.xml"
  "$zvsmap" run "$work/$name-fine.xml" --out "$work/$name-fine" -j 2 -q 2>"$work/$name-fine.log" \
    || fail "$name fine run: $(tail -n 5 "$work/$name-fine.log")"
  local verdict
  verdict=$(python3 "$compare" compare "$work/$name-refined/summary.xml" \
    "$work/$name-fine/summary.xml") || fail "$name: boundaries differ"
  echo "$name: $verdict"
}

check_sweep demo "$src/sweeps/demo_refine_buck.xml"
check_sweep 3axis "$src/sweeps/demo_refine_buck_3d.xml"

# Resume: the rounds come back from the store, nothing runs again.
sweep=$src/sweeps/demo_refine_buck.xml
"$zvsmap" run "$sweep" --out "$work/demo-refined" -j 2 2>"$work/resume.log" \
  || fail "rerun: $(tail -n 5 "$work/resume.log")"
grep -q "to run" "$work/resume.log" && ! grep -q ", [1-9][0-9]* to run" "$work/resume.log" \
  || fail "the rerun ran points again: $(cat "$work/resume.log")"

# Shards: each pass runs every shard's share of the rounds it can, the merge
# plans the next round; copy the merged store back and go on until complete.
mkdir -p "$work/merged"
for pass in 1 2 3 4 5 6; do
  for k in 0 1; do
    mkdir -p "$work/shard$k"
    [ -f "$work/merged/run.sqlite" ] && cp "$work/merged/run.sqlite" "$work/shard$k/run.sqlite"
    rc=0
    "$zvsmap" run "$sweep" --out "$work/shard$k" --shard "$k/2" -j 1 -q 2>"$work/shard$k.log" \
      || rc=$?
    [ "$rc" -eq 0 ] || [ "$rc" -eq 4 ] || fail "shard $k pass $pass exited $rc"
  done
  rc=0
  "$zvsmap" merge "$sweep" --out "$work/merged" "$work/shard0" "$work/shard1" \
    2>"$work/merge.log" || rc=$?
  if grep -q "zvsmap: refinement: .* complete" "$work/merge.log"; then
    [ "$rc" -eq 0 ] || fail "complete merge exited $rc"
    break
  fi
  [ "$pass" -lt 6 ] || fail "refinement by shards not complete after 6 passes"
done
diff <(strip_timing "$work/demo-refined/edges.csv") <(strip_timing "$work/merged/edges.csv") \
  || fail "sharded refinement differs from the single run"
echo "refinement end-to-end: ok (shards complete after $pass passes)"
