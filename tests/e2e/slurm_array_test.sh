#!/usr/bin/env bash
# End-to-end on a real Slurm: starts a single-node cluster on this machine
# (tools/slurm-local-cluster, no systemd), submits the demo sweep as a 3-task
# job array plus the dependent merge job (tools/slurm-launch), waits, and
# checks the merged edges.csv against a single-machine run. Needs root and the
# Debian packages slurmctld slurmd slurm-client munge (tools/install-deps).
# Stops the daemons afterwards, pass or fail.
#   slurm_array_test.sh ZVSMAP_BINARY SOURCE_DIR
set -euo pipefail
zvsmap=$1
src=$2
if [ "$(id -u)" -ne 0 ]; then
  echo "SKIP: the local Slurm cluster needs root" >&2
  exit 77
fi
work=$(mktemp -d /tmp/zvsmap-slurm-test-XXXXXX)
cleanup() {
  "$src/tools/slurm-local-cluster" stop "$work/cluster" || true
  rm -rf "$work"
}
trap cleanup EXIT
fail() {
  echo "FAIL: $*" >&2
  for f in "$work"/out/logs/*.log "$work"/cluster/log/*.log; do
    [ -f "$f" ] && { echo "--- $f" >&2; tail -n 20 "$f" >&2; }
  done
  exit 1
}
sweep=$src/sweeps/demo_buck_48v_pol.xml

"$src/tools/slurm-local-cluster" start "$work/cluster" || fail "cluster did not start"
export SLURM_CONF=$work/cluster/slurm.conf

read -r array_id merge_id < <("$src/tools/slurm-launch" "$sweep" "$work/out" 3 1 "$zvsmap") \
  || fail "launch"
echo "submitted array $array_id and merge $merge_id"

# Wait for the merge job to leave the queue (at most 5 minutes).
for _ in $(seq 300); do
  if ! squeue -h -j "$merge_id" 2>/dev/null | grep -q .; then break; fi
  sleep 1
done
state=$(scontrol show job "$merge_id" 2>/dev/null | sed -n 's/.*JobState=\([A-Z_]*\).*/\1/p')
[ -f "$work/out/merged/edges.csv" ] || fail "no merged edges.csv (merge job state: ${state:-gone})"

"$zvsmap" run "$sweep" --out "$work/single" -q 2>/dev/null || fail "single-machine run"
strip_timing() { awk -F, 'BEGIN{OFS=","} {NF=NF-1; print}' "$1"; }
diff <(strip_timing "$work/single/edges.csv") <(strip_timing "$work/out/merged/edges.csv") \
  || fail "the merged Slurm result differs from the single-machine run"
for k in 0 1 2; do
  [ -f "$work/out/shards/$k/run.sqlite" ] || fail "shard $k wrote no store"
done

# The tolerance demo (25 nominal points, 8 corners each) as a 3-task array:
# each shard runs whole nominal points with their variants, the merge job
# summarizes them. 4 Monte Carlo samples per point instead of the file's 200
# keep the test near a minute; the sharding does not depend on the count.
tol=$work/demo_buck_tolerances.xml
sed "s/samples=\"200\"/samples=\"4\"/; s|file=\"\.\./netlists/|file=\"$src/netlists/|" \
  "$src/sweeps/demo_buck_tolerances.xml" > "$tol"
grep -q 'samples="4"' "$tol" || fail "the tolerance demo's sample count was not found"
read -r array_id merge_id < <("$src/tools/slurm-launch" "$tol" "$work/tol" 3 1 "$zvsmap") \
  || fail "launch (tolerances)"
for _ in $(seq 600); do
  if ! squeue -h -j "$merge_id" 2>/dev/null | grep -q .; then break; fi
  sleep 1
done
[ -f "$work/tol/merged/tolerance.csv" ] || fail "no merged tolerance.csv"
"$zvsmap" run "$tol" --out "$work/tol-single" -q 2>/dev/null || fail "single-machine tolerance run"
diff "$work/tol-single/tolerance.csv" "$work/tol/merged/tolerance.csv" \
  || fail "the merged tolerance.csv differs from the single-machine run"
# 25 nominal points x 2 edges, each with 8 corners and 4 samples.
rows=$(awk -F, 'NR > 1 && $9 == 8 && $14 == 4' "$work/tol/merged/tolerance.csv" | wc -l)
[ "$rows" -eq 50 ] || fail "tolerance.csv has $rows complete rows, expected 50"
grep -q '<tolerances seed="4242" samples="4"' "$work/tol/merged/summary.xml" \
  || fail "no <tolerances> in the merged summary.xml"
echo "Slurm job array end-to-end: ok"
