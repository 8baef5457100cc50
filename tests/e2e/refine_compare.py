#!/usr/bin/env python3
"""Helpers of refine_boundary_test.sh (standard library only).

  refine_compare.py fine-sweep REFINED_SWEEP REFINED_SUMMARY OUT_SWEEP
      writes the full fine grid of a refined sweep: each refined axis as
      from/to/count of the lattice summary.xml reports, no <refine>, the
      template path made absolute.
  refine_compare.py compare REFINED_SUMMARY FINE_SUMMARY
      checks that every ZVS boundary of the fine grid has one of the refined
      run on the same line within the axis's resolution and the other way
      round, and that the refined run simulated at most 30 % of the fine
      grid's points (issue 16's target); prints the counts. Only boundaries
      along refined axes are compared.
"""
import os
import re
import sys
import xml.etree.ElementTree as ET


def fine_sweep(sweep_path, summary_path, out_path):
    text = open(sweep_path).read()
    summary = ET.parse(summary_path).getroot()
    refined = {a.get("param") for a in summary.find("refinement").findall("axis")}
    dims = {d.get("param"): d for d in summary.find("grid").findall("dimension")}
    for param in refined:
        d = dims[param]
        axis = '<axis param="%s" from="%s" to="%s" count="%s"/>' % (
            param, d.get("first"), d.get("last"), d.get("count"))
        text, n = re.subn(r'<axis param="%s"[^>]*/>' % re.escape(param), axis, text)
        assert n == 1, "axis %s not found once" % param
    text = re.sub(r"\s*<refine [^>]*/>[^\n]*", "", text)
    folder = os.path.dirname(os.path.abspath(sweep_path))
    text = re.sub(r'<template file="([^"]*)"',
                  lambda m: '<template file="%s"' % os.path.normpath(os.path.join(folder, m.group(1))),
                  text)
    open(out_path, "w").write(text)


def boundaries(summary):
    out = {}
    for edge in summary.findall("edge"):
        key = edge.get("cell") + "." + edge.get("name", edge.get("edge", ""))
        items = []
        for b in edge.find("zvs-region").findall("boundary"):
            at = tuple(sorted((a.get("param"), float(a.get("value"))) for a in b.findall("at")))
            items.append((b.get("along"), at, float(b.get("value"))))
        out[key] = items
    return out


def same_line(a, b):
    return len(a) == len(b) and all(
        p == q and abs(x - y) <= 1e-9 * max(abs(x), abs(y), 1e-30) for (p, x), (q, y) in zip(a, b))


def compare(refined_path, fine_path):
    refined = ET.parse(refined_path).getroot()
    fine = ET.parse(fine_path).getroot()
    ref = refined.find("refinement")
    resolution = {a.get("param"): float(a.get("resolution")) for a in ref.findall("axis")}
    simulated = int(ref.get("points"))
    fine_points = int(fine.find("run").get("points"))
    assert ref.get("complete") == "true", "refinement not complete"
    assert int(ref.get("fine-grid-points")) == fine_points, "fine lattice sizes differ"
    problems = []
    rb, fb = boundaries(refined), boundaries(fine)
    total = 0
    for key in sorted(set(rb) | set(fb)):
        r, f = rb.get(key, []), fb.get(key, [])
        for name, mine, theirs in (("fine", f, r), ("refined", r, f)):
            for along, at, value in mine:
                if along not in resolution:
                    continue  # an axis without <refine>: its crossings are the coarse grid's
                if name == "fine":
                    total += 1
                tol = resolution.get(along, 0) * (1 + 1e-9)
                if not any(a == along and same_line(at, t) and abs(v - value) <= tol
                           for a, t, v in theirs):
                    problems.append("%s: %s boundary along %s at %s = %g has no match" %
                                    (key, name, along, at, value))
    share = 100.0 * simulated / fine_points
    print("refinement: %d simulations against the fine grid's %d (%.1f %%); %d fine-grid "
          "boundary crossings, all matched within the resolution" % (
              simulated, fine_points, share, total) if not problems else "")
    if simulated > 0.30 * fine_points:
        problems.append("refinement simulated %.1f %% of the fine grid, above 30 %%" % share)
    if total == 0:
        problems.append("the fine grid has no boundary: nothing was checked")
    for p in problems:
        print("FAIL: " + p, file=sys.stderr)
    return 1 if problems else 0


if __name__ == "__main__":
    if sys.argv[1] == "fine-sweep":
        fine_sweep(*sys.argv[2:5])
    else:
        sys.exit(compare(*sys.argv[2:4]))
