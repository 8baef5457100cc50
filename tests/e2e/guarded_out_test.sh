#!/usr/bin/env bash
# End-to-end: the output directory is guarded. A second run (or merge, or
# waveforms) into a directory in use refuses at once, naming the holder; the
# plain progress line keeps coming while a point hangs; a store from another
# sweep is refused (exit 2) unless --rerun replaces it; `| head -1` does not
# lose the reports; a point past --worker-memory fails with that reason; a
# full disk leaves no truncated report (a small tmpfs, when allowed to mount).
# Faults (a hanging point, a memory hog) come through the test-only binary
# zvsmap_faulty: the same command line with the fault plan in ZVSMAP_TEST_FAULT.
#   guarded_out_test.sh ZVSMAP_BINARY SOURCE_DIR ZVSMAP_FAULTY_BINARY
set -euo pipefail
zvsmap=$1
src=$2
faulty=$3
work=$(mktemp -d /tmp/zvsmap-guard-test-XXXXXX)
holder=""
trap '[ -n "$holder" ] && kill -9 "$holder" 2>/dev/null; rm -rf "$work"' EXIT
sweep=$src/tests/e2e/fixtures/small_buck.xml
fail() { echo "FAIL: $*" >&2; exit 1; }

# A finished run to merge from.
ZVSMAP_TEST_FAULT=segv:0 "$zvsmap" run "$sweep" --out "$work/src" -j 2 -q 2>"$work/src.log" \
  || fail "run: $(cat "$work/src.log")"
# zvsmap itself reads no fault plan: only the test-only binary does.
grep -q "6 points: 6 ok, 0 failed" "$work/src.log" || fail "zvsmap obeyed a fault plan: $(cat "$work/src.log")"

# --- the lock, and progress while a point hangs --------------------------------
# Point 0 hangs until its 12 s timeout; meanwhile the directory is in use.
ZVSMAP_TEST_FAULT=hang:0 "$faulty" run "$sweep" --out "$work/busy" -j 1 --timeout 12 \
  2>"$work/busy.log" &
holder=$!
for _ in $(seq 100); do
  grep -q "^pid=$holder$" "$work/busy/zvsmap.lock" 2>/dev/null && break
  sleep 0.1
done
grep -q "^pid=$holder$" "$work/busy/zvsmap.lock" || fail "the first run recorded no lock holder"
expect_refusal() {  # command words...
  local rc=0 started
  started=$(date +%s)
  "$zvsmap" "$@" 2>"$work/refused.log" >/dev/null || rc=$?
  [ "$rc" -eq 2 ] || fail "'$*' into a busy directory exited $rc, expected 2: $(cat "$work/refused.log")"
  [ $(( $(date +%s) - started )) -le 5 ] || fail "'$*' waited for the lock instead of refusing"
  grep -q "zvsmap: error: $work/busy: in use by zvsmap run (pid $holder, started 20[0-9-]* [0-9:]* UTC); wait for it to finish or choose another output directory" \
    "$work/refused.log" || fail "refusal does not name the holder: $(cat "$work/refused.log")"
}
expect_refusal run "$sweep" --out "$work/busy" -j 1
expect_refusal merge "$sweep" --out "$work/busy" "$work/src"
expect_refusal waveforms "$sweep" --out "$work/busy" --point 1
rc=0
wait "$holder" || rc=$?
holder=""
[ "$rc" -eq 4 ] || fail "the run with a hanging point exited $rc, expected 4"
grep -q "point 0 (.*) failed: timeout after 12 s" "$work/busy.log" || fail "no timeout reported"
# The plain line every 5 s: at 0 s and at 5 s and 10 s while point 0 hangs
# (before this change only the first appeared until a point finished).
waiting=$(grep -c "^zvsmap: 0/6 done, 0 failed" "$work/busy.log" || true)
[ "$waiting" -ge 2 ] || fail "$waiting progress lines while the point hung: $(cat "$work/busy.log")"
# The lock died with its holder: the next run resumes at once.
"$zvsmap" run "$sweep" --out "$work/busy" -j 2 -q 2>"$work/resume.log" \
  || fail "resume after the holder ended: $(cat "$work/resume.log")"

# --- a store from another sweep ------------------------------------------------
"$zvsmap" waveforms "$sweep" --out "$work/busy" --point 1 -q 2>"$work/wave.log" \
  || fail "waveforms: $(cat "$work/wave.log")"
ls "$work/busy/waveforms/point_1.raw" >/dev/null || fail "no waveforms saved"
sed -e 's/values="0 4 8"/values="0 4 9"/' -e "s|file=\"../../../netlists/|file=\"$src/netlists/|" \
  "$sweep" >"$work/other.xml"
rc=0
"$zvsmap" run "$work/other.xml" --out "$work/busy" -j 2 2>"$work/other.log" || rc=$?
[ "$rc" -eq 2 ] || fail "a run into another sweep's store exited $rc, expected 2"
canonical=$(realpath "$sweep")
grep -qF "zvsmap: error: $work/busy/run.sqlite holds the results of another sweep ($canonical), not of $work/other.xml; run with --rerun to replace it, or choose another --out" \
  "$work/other.log" || fail "no clear refusal: $(cat "$work/other.log")"
grep -q "^5,.*,9," "$work/busy/edges.csv" && fail "the refused run wrote reports"
"$zvsmap" run "$work/other.xml" --out "$work/busy" -j 2 --rerun 2>"$work/replace.log" \
  || fail "--rerun did not replace the store: $(cat "$work/replace.log")"
grep -qF "$work/busy/run.sqlite holds the results of another sweep ($canonical), not of $work/other.xml: replaced (--rerun)" \
  "$work/replace.log" || fail "replacement not reported: $(cat "$work/replace.log")"
grep -q "6 points: 6 ok" "$work/replace.log" || fail "replacement did not run the other sweep"
ls "$work/busy/waveforms"/point_* >/dev/null 2>&1 && fail "the replaced sweep's waveforms stayed"
grep -q "waveforms/point_" "$work/busy/index.html" && fail "index.html links the replaced waveforms"
rc=0
"$zvsmap" merge "$sweep" --out "$work/busy" "$work/src" 2>"$work/merge.log" || rc=$?
[ "$rc" -eq 2 ] || fail "merge into another sweep's store exited $rc, expected 2"
grep -qF "holds the results of another sweep ($work/other.xml), not of $canonical; remove it or choose another --out" \
  "$work/merge.log" || fail "merge refusal: $(cat "$work/merge.log")"
rc=0
"$zvsmap" waveforms "$sweep" --out "$work/busy" --point 1 2>"$work/wave2.log" || rc=$?
[ "$rc" -eq 2 ] || fail "waveforms of another sweep's run exited $rc, expected 2"
grep -qF "holds the results of another sweep ($work/other.xml), not of $canonical; choose the run directory of this sweep" \
  "$work/wave2.log" || fail "waveforms refusal: $(cat "$work/wave2.log")"

# --- a closed pipe does not lose the reports --------------------------------------
rc=0
{ "$zvsmap" run "$sweep" --out "$work/pipe" -j 2 2>&1; echo "rc=$?" >"$work/pipe.rc"; } | head -1 \
  >"$work/pipe.head"
grep -q "^zvsmap: " "$work/pipe.head" || fail "head saw no line: $(cat "$work/pipe.head")"
grep -q "^rc=0$" "$work/pipe.rc" || fail "run into a closed pipe: $(cat "$work/pipe.rc")"
for f in edges.csv summary.xml junit.xml index.html; do
  [ -s "$work/pipe/$f" ] || fail "run into a closed pipe did not write $f"
done
tail -1 "$work/pipe/summary.xml" | grep -q "^</zvs-summary>$" || fail "summary.xml is not complete"
{ "$zvsmap" points "$sweep"; echo "rc=$?" >"$work/points.rc"; } | head -1 >/dev/null
grep -q "^rc=0$" "$work/points.rc" || fail "points into a closed pipe: $(cat "$work/points.rc")"

# --- the worker memory bound ---------------------------------------------------
rc=0
"$zvsmap" run "$sweep" --out "$work/mem" --worker-memory 0.5x 2>"$work/mem.log" || rc=$?
[ "$rc" -eq 2 ] || fail "a bad --worker-memory exited $rc, expected 2"
grep -qF "zvsmap: error: --worker-memory: worker memory '0.5x': unknown unit 'x' (use K, M, G or T: powers of 1024)" \
  "$work/mem.log" || fail "bad size message: $(cat "$work/mem.log")"
rc=0
ZVSMAP_TEST_FAULT=hog:2 "$faulty" run "$sweep" --out "$work/mem" -j 2 --worker-memory 256M \
  2>"$work/mem.log" || rc=$?
if grep -q "has no effect in this build" "$work/mem.log"; then
  echo "memory bound: skipped (no bound in a sanitizer build)"
else
  [ "$rc" -eq 4 ] || fail "a point past the memory bound: exit $rc, expected 4: $(cat "$work/mem.log")"
  grep -q "^2,.*memory bound: the worker reached its 256 MiB limit (--worker-memory)" \
    "$work/mem/edges.csv" || fail "no memory-bound reason in edges.csv"
  grep -q "6 points: 5 ok, 1 failed" "$work/mem.log" || fail "other points affected"
fi

# --- a full disk (a tmpfs in a private mount namespace; needs root) ---------------
if [ "$(id -u)" -eq 0 ] && unshare -m true 2>/dev/null; then
  mkdir "$work/full"
  cp "$work/pipe/run.sqlite" "$work/pipe/edges.csv" "$work/pipe/summary.xml" "$work/"
  rc=0
  unshare -m bash -c '
    set -e
    mount --make-rprivate /
    mount -t tmpfs -o size=1m tmpfs "$1/full"
    cp "$1/run.sqlite" "$1/edges.csv" "$1/full/"
    dd if=/dev/zero of="$1/full/filler" bs=4k 2>/dev/null || true
    truncate -s -40K "$1/full/filler"  # room for the lock file and the store shared memory (32K)
    rc=0
    "$2" run "$3" --out "$1/full" -j 1 2>"$1/full.log" || rc=$?
    echo "$rc" >"$1/full.rc"
    cmp -s "$1/full/edges.csv" "$1/edges.csv" && echo same >"$1/full.same"
    ls -a "$1/full" >"$1/full.ls"
  ' _ "$work" "$zvsmap" "$sweep" || fail "full disk set-up failed"
  [ "$(cat "$work/full.rc")" -eq 1 ] || fail "full disk: exit $(cat "$work/full.rc"), expected 1"
  grep -qF "zvsmap: error: $work/full/edges.csv: cannot write: No space left on device" \
    "$work/full.log" || fail "full disk message: $(cat "$work/full.log")"
  [ -f "$work/full.same" ] || fail "full disk changed the old edges.csv"
  grep -q "tmp-" "$work/full.ls" && fail "a temporary file stayed: $(cat "$work/full.ls")"
  # Too small for the store itself: the store's error names it and the reason.
  mkdir "$work/tiny"
  unshare -m bash -c '
    mount --make-rprivate /
    mount -t tmpfs -o size=200k tmpfs "$1/tiny"
    rc=0
    "$2" run "$3" --out "$1/tiny" -j 1 2>"$1/tiny.log" || rc=$?
    echo "$rc" >"$1/tiny.rc"
  ' _ "$work" "$zvsmap" "$sweep" || fail "tiny disk set-up failed"
  [ "$(cat "$work/tiny.rc")" -eq 1 ] || fail "store on a full disk: exit $(cat "$work/tiny.rc"), expected 1"
  grep -qF "zvsmap: error: $work/tiny/run.sqlite: database or disk is full (No space left on device)" \
    "$work/tiny.log" || fail "store full message: $(cat "$work/tiny.log")"
  echo "full disk: ok"
else
  echo "full disk: skipped (needs root and unshare -m to mount a small tmpfs)"
fi

echo "guarded output directory end-to-end: ok"
