#!/usr/bin/env bash
# End-to-end: `zvsmap waveforms` after a run writes the chosen and the worst
# points' raw files and edge plots, ngspice's own CLI loads the raw file with
# every vector and the declared number of points, `run --waveforms` does the
# same before its reports and index.html shows them; bad selections exit 2.
#   waveforms_test.sh ZVSMAP_BINARY SOURCE_DIR
set -euo pipefail
zvsmap=$1
src=$2
work=$(mktemp -d /tmp/zvsmap-waveforms-test-XXXXXX)
trap 'rm -rf "$work"' EXIT
sweep=$src/tests/e2e/fixtures/small_buck.xml
fail() { echo "FAIL: $*" >&2; exit 1; }

"$zvsmap" run "$sweep" --out "$work/run" -j 1 -q 2>"$work/run.log" || fail "run: $(cat "$work/run.log")"
"$zvsmap" waveforms "$sweep" --out "$work/run" --point 1 --worst 2>"$work/wave.log" \
  || fail "waveforms: $(cat "$work/wave.log")"
grep -q "worst points per cell and edge: " "$work/wave.log" || fail "no worst points named"
w=$work/run/waveforms
for f in point_1.raw point_1_leg_high_on.svg point_1_leg_low_on.svg; do
  [ -s "$w/$f" ] || fail "$f missing or empty"
done
for f in "$w"/*.svg; do xmllint --noout "$f" || fail "$f is not well-formed XML"; done
[ "$(ls "$w"/*.raw | wc -l)" -ge 2 ] || fail "the worst points wrote no raw file"

# ngspice's own reader: every vector present, the header's point count.
points=$(sed -n 's/^No. Points: //p' "$w/point_1.raw")
cat > "$work/load.cir" <<CIR
load check
.control
load $w/point_1.raw
print length(time) length(v(sw)) length(i(vsense)) length(v(gh))
.endc
.end
CIR
# (ngspice -b exits 1 when the deck runs no analysis, as here: judge by its output.)
(cd "$work" && HOME=$work ngspice -b load.cir >"$work/ngspice.log" 2>&1) || true
for v in "length(time)" "length(v(sw))" "length(i(vsense))" "length(v(gh))"; do
  got=$(awk -v k="$v = " 'index($0, k) == 1 { print substr($0, length(k) + 1) }' "$work/ngspice.log")
  [ -n "$got" ] || fail "ngspice did not print $v: $(cat "$work/ngspice.log")"
  awk -v a="$got" -v b="$points" 'BEGIN { exit !(a + 0 == b + 0) }' \
    || fail "$v = $got, header says $points points"
done

# run --waveforms: files written before the reports, so index.html shows them.
"$zvsmap" run "$sweep" --out "$work/run2" -j 1 -q --waveforms 2 2>"$work/run2.log" \
  || fail "run --waveforms: $(cat "$work/run2.log")"
[ -s "$work/run2/waveforms/point_2.raw" ] || fail "run --waveforms wrote no raw file"
grep -q 'src="waveforms/point_2_leg_high_on.svg"' "$work/run2/index.html" \
  || fail "index.html does not show the waveform plot"
grep -q 'href="waveforms/point_2.raw"' "$work/run2/index.html" \
  || fail "index.html does not link the raw file"

# Bad selections are bad input.
rc=0; "$zvsmap" run "$sweep" --out "$work/run2" -q --waveforms 2,x 2>/dev/null || rc=$?
[ "$rc" -eq 2 ] || fail "--waveforms 2,x exited $rc, expected 2"
rc=0; "$zvsmap" waveforms "$sweep" --out "$work/run" --point 99 2>"$work/bad.log" || rc=$?
[ "$rc" -eq 2 ] || fail "--point 99 exited $rc, expected 2"
grep -q "the sweep has points 0 to 5" "$work/bad.log" || fail "no clear message: $(cat "$work/bad.log")"
rc=0; "$zvsmap" waveforms "$sweep" --out "$work/none" --worst 2>/dev/null || rc=$?
[ "$rc" -eq 2 ] || fail "--worst without a run exited $rc, expected 2"

echo "waveforms end-to-end: ok"
