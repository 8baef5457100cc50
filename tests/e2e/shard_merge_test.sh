#!/usr/bin/env bash
# End-to-end: a sweep split into shards (by --shard and by Slurm array
# variables with a step), merged, equals a single-machine run byte for byte in
# edges.csv apart from the timing column; a store from another sweep is
# refused; a missing shard is reported.
#   shard_merge_test.sh ZVSMAP_BINARY SOURCE_DIR
set -euo pipefail
zvsmap=$1
src=$2
work=$(mktemp -d /tmp/zvsmap-shard-test-XXXXXX)
trap 'rm -rf "$work"' EXIT
sweep=$src/tests/e2e/fixtures/small_buck.xml
fail() { echo "FAIL: $*" >&2; exit 1; }

# Without the last column (wall_time_s).
strip_timing() { awk -F, 'BEGIN{OFS=","} {NF=NF-1; print}' "$1"; }

"$zvsmap" run "$sweep" --out "$work/single" -j 1 -q 2>"$work/single.log" || fail "single run"

# Shards by flag.
for k in 0 1 2; do
  "$zvsmap" run "$sweep" --out "$work/flag/$k" --shard "$k/3" -j 1 -q 2>"$work/flag$k.log" \
    || fail "shard $k/3"
done
"$zvsmap" merge "$sweep" --out "$work/flag-merged" "$work"/flag/* 2>"$work/merge.log" \
  || fail "merge: $(cat "$work/merge.log")"
diff <(strip_timing "$work/single/edges.csv") <(strip_timing "$work/flag-merged/edges.csv") \
  || fail "merged edges.csv differs from the single run"

# Shards from a Slurm job array --array=1-5:2 (tasks 1, 3, 5).
for id in 1 3 5; do
  env -u JOB_COMPLETION_INDEX SLURM_ARRAY_TASK_ID=$id SLURM_ARRAY_TASK_MIN=1 \
    SLURM_ARRAY_TASK_MAX=5 SLURM_ARRAY_TASK_STEP=2 SLURM_ARRAY_TASK_COUNT=3 \
    "$zvsmap" run "$sweep" --out "$work/slurm/$id" -j 1 2>"$work/slurm$id.log" || fail "task $id"
  grep -q "from slurm" "$work/slurm$id.log" || fail "task $id did not read its shard from Slurm"
done
"$zvsmap" merge "$sweep" --out "$work/slurm-merged" "$work"/slurm/* 2>/dev/null || fail "merge slurm"
diff <(strip_timing "$work/single/edges.csv") <(strip_timing "$work/slurm-merged/edges.csv") \
  || fail "Slurm-sharded merge differs from the single run"

# A missing shard: exit 4 and the missing points named.
rc=0
"$zvsmap" merge "$sweep" --out "$work/partial" "$work/flag/0" "$work/flag/2" 2>"$work/partial.log" || rc=$?
[ "$rc" -eq 4 ] || fail "merge with a missing shard exited $rc, expected 4"
grep -q "points are missing (a shard did not run or did not finish): 3, 4, 5" "$work/partial.log" \
  || fail "missing points not reported: $(cat "$work/partial.log")"

# A store from another sweep is refused before anything is written.
sed 's/values="0 4 8"/values="0 4 9"/' "$sweep" > "$work/other.xml"
sed -i "s|file=\"../../../netlists/|file=\"$src/netlists/|" "$work/other.xml"
"$zvsmap" run "$work/other.xml" --out "$work/other" --shard 0/3 -j 1 -q 2>/dev/null || fail "other sweep"
rc=0
"$zvsmap" merge "$sweep" --out "$work/mixed" "$work/flag/1" "$work/other" 2>"$work/mixed.log" || rc=$?
[ "$rc" -eq 2 ] || fail "merging another sweep's store exited $rc, expected 2"
grep -q "other/run.sqlite: from a different sweep" "$work/mixed.log" \
  || fail "no clear refusal: $(cat "$work/mixed.log")"

echo "shard/merge end-to-end: ok"
