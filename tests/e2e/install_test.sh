#!/usr/bin/env bash
# End-to-end: `cmake --install` into a temporary prefix, the prefix moved
# elsewhere, and the installed binary run on the installed demo with the
# checkout out of reach (ZVSMAP_NO_SOURCE_DIR=1 turns off the compiled-in
# source directory, the working directory is outside the checkout): it finds
# its templates and the switch library through ../share/zvsmap.
#   install_test.sh CMAKE_COMMAND BUILD_DIR
set -euo pipefail
cmake=$1
build=$2
work=$(mktemp -d /tmp/zvsmap-install-test-XXXXXX)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

"$cmake" --install "$build" --prefix "$work/prefix" >"$work/install.log" 2>&1 \
  || fail "install: $(tail -5 "$work/install.log")"
mv "$work/prefix" "$work/moved"
root=$work/moved
for f in bin/zvsmap share/zvsmap/netlists/switches.lib share/zvsmap/netlists/buck_halfbridge.cir \
         share/zvsmap/netlists/fullbridge_psm.cir share/zvsmap/netlists/boost_halfbridge.cir \
         share/zvsmap/sweeps/demo_buck_48v_pol.xml share/zvsmap/sweeps/schema/zvsmap-summary.xsd; do
  [ -f "$root/$f" ] || fail "not installed: $f"
done

cd "$work"
unset ZVSMAP_DATA_DIR
export ZVSMAP_NO_SOURCE_DIR=1
demo=$root/share/zvsmap/sweeps/demo_buck_48v_pol.xml
"$root/bin/zvsmap" run "$demo" --out "$work/demo" -q 2>"$work/demo.log" \
  || fail "installed demo: $(tail -5 "$work/demo.log")"
[ -f "$work/demo/summary.xml" ] || fail "no summary.xml"

# A switch from the installed library (<device model=...>) is found without the checkout.
sed -e 's#<axis param="L"#<device name="lin" model="zsw_linear" params="ron_ohm=10m roff_ohm=1Meg coss_f=1n vf_v=0.7 vth_v=2.5"/>\n  <axis device="leg.low" values="lin"/>\n  <axis param="L"#' \
    -e 's#values="0.68u 1u 1.5u 2.2u 3.3u"#values="1u"#' -e 's#from="0" to="8" step="2"#values="4"#' \
    -e 's#<require[^>]*/>##; /<require/,/>/d' \
    "$demo" >"$root/share/zvsmap/sweeps/library_check.xml"
"$root/bin/zvsmap" run "$root/share/zvsmap/sweeps/library_check.xml" --out "$work/lib" -q \
  2>"$work/lib.log" || fail "installed switch library: $(tail -5 "$work/lib.log")"
head -1 "$work/lib/edges.csv" | grep -q "leg.low" || fail "the device axis did not reach edges.csv"

# The data directory can be named outright.
ZVSMAP_DATA_DIR=$work/nowhere "$root/bin/zvsmap" run "$root/share/zvsmap/sweeps/library_check.xml" \
  --out "$work/bad" -q 2>"$work/bad.log" && fail "a missing data directory was not noticed"
grep -q "nowhere/netlists/switches.lib" "$work/bad.log" || fail "the error does not name the file: $(cat "$work/bad.log")"
echo "ok: the installed copy runs the demo and finds its switch library"
