#!/usr/bin/env bash
# End-to-end: the buck demo with a one-value device axis added (both switches
# set to the generic linear model with the template's own values) is the same
# circuit, so it must keep the demo's ZVS boundaries and its map: the points
# carry their grid positions from the expansion, device axes included.
#   device_axis_demo_test.sh ZVSMAP_BINARY SOURCE_DIR
set -euo pipefail
zvsmap=$1
src=$2
work=$(mktemp -d /tmp/zvsmap-device-axis-test-XXXXXX)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

demo=$src/sweeps/demo_buck_48v_pol.xml
# The same sweep beside the demo (its template path is relative), plus the axis.
copy=$work/demo_device_axis.xml
sed -e "s#\.\./netlists/#$src/netlists/#" \
    -e 's#<axis param="L"#<device name="lin" model="zsw_linear" params="ron_ohm=10m roff_ohm=1Meg coss_f=1n vf_v=0.7 vth_v=2.5"/>\n  <axis device="leg.high leg.low" values="lin"/>\n  <axis param="L"#' \
    "$demo" >"$copy"
grep -q 'axis device="leg.high leg.low"' "$copy" || fail "the device axis was not added"

"$zvsmap" run "$demo" --out "$work/plain" -q 2>"$work/plain.log" || fail "demo: $(tail -5 "$work/plain.log")"
"$zvsmap" run "$copy" --out "$work/device" -q 2>"$work/device.log" \
  || fail "demo with a device axis: $(tail -5 "$work/device.log")"

count() { grep -o '<boundary ' "$1" | wc -l; }
plain=$(count "$work/plain/summary.xml")
device=$(count "$work/device/summary.xml")
[ "$plain" -eq 8 ] || fail "the demo has $plain boundaries, expected 8"
[ "$device" -eq "$plain" ] || fail "with a one-value device axis: $device boundaries, the demo has $plain"
grep -q '<dimension param=""' "$work/device/summary.xml" && fail "a dimension without a name"

# The same map: every map SVG of the demo exists for the copy and colours the
# same number of cells of each ZVS class.
maps=$(cd "$work/plain" && ls map_*.svg 2>/dev/null || true)
[ -n "$maps" ] || fail "the demo drew no map"
for m in $maps; do
  [ -f "$work/device/$m" ] || fail "no $m with the device axis"
  colours() { grep -o '<rect[^>]*fill="#[0-9A-Fa-f]*"' "$1" | grep -o 'fill="#[0-9A-Fa-f]*"' | sort | uniq -c; }
  [ "$(colours "$work/plain/$m")" = "$(colours "$work/device/$m")" ] \
    || fail "$m differs: $(colours "$work/plain/$m") vs $(colours "$work/device/$m")"
done
echo "ok: $plain boundaries and the same maps with a one-value device axis"
