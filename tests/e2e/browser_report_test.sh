#!/bin/sh
# index.html in a real browser (headless Chromium, Debian package `chromium`),
# for the demo and for a 2-D sweep with failed points: every image loads, no
# console error, the tables hold summary.xml's numbers, a click on a header
# sorts its table, and operating points are printed with units
# (browser_report_check.py). Screenshots stay in OUT_DIR for a person to look
# at. Exit 77 (skipped) when Chromium is not installed.
#
# The failures come through the test-only binary zvsmap_faulty (the same
# command line with the fault plan in ZVSMAP_TEST_FAULT).
#
#   browser_report_test.sh ZVSMAP_BINARY SOURCE_DIR OUT_DIR ZVSMAP_FAULTY_BINARY
set -eu
bin=$1 src=$2 out=$3 faulty=$4
browser=$(command -v chromium || command -v chromium-browser || true)
[ -n "$browser" ] || { echo "browser-report: chromium not installed; skipped"; exit 77; }
rm -rf "$out" && mkdir -p "$out"
profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT
flags="--headless --no-sandbox --disable-gpu --disable-quic --no-first-run
  --disable-background-networking --disable-component-update --disable-sync
  --user-data-dir=$profile --virtual-time-budget=5000"

# The demo (exit 0 or 3: requirements may fail) and a sweep where point 3
# crashes and point 4's engine stops (exit 4).
rc=0; "$bin" run "$src/sweeps/demo_buck_48v_pol.xml" --out "$out/demo" -j 2 -q >"$out/demo.log" 2>&1 || rc=$?
[ "$rc" = 0 ] || [ "$rc" = 3 ] || { cat "$out/demo.log"; echo "browser-report: demo exit $rc"; exit 1; }
rc=0; ZVSMAP_TEST_FAULT=segv:3,exitcb:4 "$faulty" run "$src/tests/e2e/fixtures/small_buck.xml" \
  --out "$out/failures" -j 2 -q >"$out/failures.log" 2>&1 || rc=$?
[ "$rc" = 4 ] || { cat "$out/failures.log"; echo "browser-report: failures sweep exit $rc, not 4"; exit 1; }

probe='<script>(function(){var errs=[];var ce=console.error;console.error=function(){errs.push(Array.prototype.join.call(arguments," "));ce.apply(console,arguments);};window.addEventListener("error",function(e){errs.push("load error: "+(e.message||(e.target&&(e.target.src||e.target.href))||"?"));},true);window.addEventListener("load",function(){var i=document.images,n=0;for(var k=0;k<i.length;k++){if(i[k].complete&&i[k].naturalWidth>0)n++;}document.body.setAttribute("data-images",n+"/"+i.length);document.body.setAttribute("data-errors",errs.join("; "));'
# Sorting: on the first sortable table, click the header of the first column
# whose data-value cells differ three times (ascending, descending, the
# report's order) and record the column's values and the row order each time.
probe="$probe"'var t=document.querySelector("table.sortable");if(!t)return;var b=t.tBodies[0],hs=t.tHead.rows[0].cells,col=-1;function vals(c){return Array.prototype.map.call(b.rows,function(r){return r.cells[c]?r.cells[c].getAttribute("data-value"):null;});}function order(){return Array.prototype.map.call(b.rows,function(r){return r.getAttribute("data-order");}).join(",");}for(var c=0;c<hs.length&&col<0;c++){var v=vals(c),d={};v.forEach(function(x){if(x!==null&&x!=="")d[x]=1;});if(Object.keys(d).length>1)col=c;}if(col<0)return;var r={table:t.className,column:hs[col].textContent,before:order()};hs[col].click();r.asc=vals(col);r.ascOrder=order();r.ascState=hs[col].getAttribute("aria-sort");hs[col].click();r.desc=vals(col);r.descOrder=order();hs[col].click();r.after=order();document.body.setAttribute("data-sort",JSON.stringify(r));'
probe="$probe"'});})();</script>'
printf '%s\n' "$probe" >"$out/probe.js.html"
status=0
for name in demo failures; do
  dir=$(cd "$out/$name" && pwd)
  # shellcheck disable=SC2086
  "$browser" $flags --window-size=1200,3000 --screenshot="$out/$name.png" "file://$dir/index.html" \
    >/dev/null 2>&1
  [ -s "$out/$name.png" ] || { echo "browser-report: no screenshot of $name"; status=1; }
  sed "/<head>/r $out/probe.js.html" "$dir/index.html" >"$dir/.probe.html"
  # shellcheck disable=SC2086
  "$browser" $flags --enable-logging=stderr --v=0 --dump-dom "file://$dir/.probe.html" \
    >"$out/$name.dom.html" 2>"$out/$name.console.log" || true
  rm -f "$dir/.probe.html"
  if grep -i "CONSOLE" "$out/$name.console.log" | grep -qi "error"; then
    grep -i "CONSOLE" "$out/$name.console.log"; echo "browser-report: console error in $name"; status=1
  fi
  # The demo sweeps L and Iout: its operating points must read in µH and A.
  units=""; [ "$name" = demo ] && units="µH,A"
  python3 "$src/tests/e2e/browser_report_check.py" "$out/$name.dom.html" "$dir/summary.xml" \
    "$units" || status=1
done
echo "browser-report: screenshots $out/demo.png $out/failures.png"
exit "$status"
