#!/usr/bin/env python3
"""Checks a report page as headless Chromium rendered it against summary.xml.

  browser_report_check.py DOM.html SUMMARY.xml [UNITS]

DOM.html is Chromium's --dump-dom of index.html with the probe script of
browser_report_test.sh (body data-images="loaded/total", data-errors, and
data-sort: a sortable table's column after one, two and three header clicks).
Checks: every image decoded, no console error or failed load; the tables
hold summary.xml's numbers: per edge the boundary values, the worst margin,
and the number of failed points; a header click sorts ascending, then
descending, then restores the report's order; every operating point reads
"name = value unit, ..." (no "L=3.3u"), and each symbol of the
comma-separated UNITS (e.g. "µH,A") occurs among them. Exit 0 when all hold,
1 otherwise.
"""
import json
import re
import sys
import xml.etree.ElementTree as ET
from html.parser import HTMLParser


class Tables(HTMLParser):
    """Collects body attributes, sections by id and their tables' cells."""

    def __init__(self):
        super().__init__()
        self.body = {}
        self.section = None
        self.table = None
        self.tables = {}  # (section id, table class) -> rows of [(text, data-value)]
        self.headers = {}  # (section id, table class) -> header texts
        self.sortable = 0
        self.cell = None
        self.ids = set()

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if "id" in a:
            self.ids.add(a["id"])
        if tag == "body":
            self.body = a
        elif tag == "section":
            self.section = a.get("id")
        elif tag == "table":
            classes = (a.get("class") or "").split()
            self.sortable += "sortable" in classes
            name = (self.section, classes[0] if classes else None)
            self.table = self.tables.setdefault(name, [])
            self.headers.setdefault(name, [])
            self.current = name
        elif tag == "tr" and self.table is not None:
            self.table.append([])
        elif tag in ("td", "th") and self.table is not None:
            self.cell = ["", a.get("data-value"), tag]

    def handle_endtag(self, tag):
        if tag in ("td", "th") and self.cell is not None:
            if self.cell[2] == "td":
                self.table[-1].append((self.cell[0].strip(), self.cell[1]))
            else:
                self.headers[self.current].append(self.cell[0].strip())
            self.cell = None
        elif tag == "table":
            self.table = None
        elif tag == "section":
            self.section = None

    def handle_data(self, data):
        if self.cell is not None:
            self.cell[0] += data


def close(a, b):
    return abs(a - b) <= 1e-6 * max(1.0, abs(a), abs(b))


def check_sorting(page, problems):
    """The probe's three clicks: ascending, descending, the report's order."""
    if not page.sortable:
        return 0
    if not page.body.get("data-sort"):
        problems.append("sortable tables but the probe found no column to sort")
        return 0
    r = json.loads(page.body["data-sort"])
    asc = [float(v) for v in r["asc"] if v not in (None, "")]
    desc = [float(v) for v in r["desc"] if v not in (None, "")]
    what = "sorting %s by '%s'" % (r["table"], r["column"])
    if asc != sorted(asc) or r.get("ascState") != "ascending":
        problems.append("%s: first click not ascending: %s" % (what, asc))
    if desc != sorted(desc, reverse=True):
        problems.append("%s: second click not descending: %s" % (what, desc))
    if r["ascOrder"] == r["before"] and r["descOrder"] == r["before"]:
        problems.append("%s: the row order never changed" % what)
    if r["after"] != r["before"]:
        problems.append("%s: third click did not restore the order (%s, was %s)"
                        % (what, r["after"], r["before"]))
    return 1


OPERATING_POINT = re.compile(r"^[A-Za-z_]\w* = [^,=]+(, [A-Za-z_]\w* = [^,=]+)*$")


def check_units(page, units, problems):
    """Operating points as 'name = value unit'; the expected symbols occur."""
    texts = []
    for name, header in page.headers.items():
        if "operating point" not in header:
            continue
        col = header.index("operating point")
        texts += [row[col][0] for row in page.tables[name] if len(row) > col]
    for t in texts:
        if not OPERATING_POINT.match(t) and t != "the single point":
            problems.append("operating point not as 'name = value unit': %r" % t)
    for unit in filter(None, units.split(",")):
        if not any(re.search(r"\d %s(,|$)" % re.escape(unit), t) for t in texts):
            problems.append("no operating point in %s" % unit)
    return len(texts)


def main(dom_path, summary_path, units=""):
    page = Tables()
    page.feed(open(dom_path, encoding="utf-8").read())
    problems = []
    images = page.body.get("data-images", "")
    loaded, _, total = images.partition("/")
    if not images or loaded != total or int(total or 0) == 0:
        problems.append("images loaded: '%s'" % images)
    if page.body.get("data-errors"):
        problems.append("console errors: " + page.body["data-errors"])

    summary = ET.parse(summary_path).getroot()
    run = summary.find("run")
    not_run = int(run.get("failed")) + int(run.get("unsettled"))
    failed_rows = [r for r in page.tables.get((None, "failed"), []) if r]
    if len(failed_rows) != not_run:
        problems.append("failed points: summary %d, table %d" % (not_run, len(failed_rows)))
    checked = 0
    for edge in summary.findall("edge"):
        sid = "edge-%s-%s" % (edge.get("cell"), edge.get("name"))
        if sid not in page.ids:
            problems.append("no section " + sid)
            continue
        expected = sorted(float(b.get("value")) for b in edge.iter("boundary"))
        rows = [r for r in page.tables.get((sid, "boundaries"), []) if r]
        shown = sorted(float(r[1][1]) for r in rows)
        if len(expected) != len(shown) or not all(map(close, expected, shown)):
            problems.append("%s boundaries: summary %s, table %s" % (sid, expected, shown))
        checked += len(expected)
        worst = edge.find("worst-margin")
        rows = [r for r in page.tables.get((sid, "worst"), []) if r]
        if worst is not None:
            if not rows or not close(float(rows[0][3][1]), float(worst.get("value"))):
                problems.append("%s worst margin: summary %s, table %s"
                                % (sid, worst.get("value"), rows[0][3] if rows else None))
            elif rows[0][0][0] != worst.get("point"):
                problems.append("%s worst point: summary %s, table %s"
                                % (sid, worst.get("point"), rows[0][0][0]))
            checked += 1
    sorted_tables = check_sorting(page, problems)
    points = check_units(page, units, problems)
    for p in problems:
        print("browser-check: " + p, file=sys.stderr)
    print("browser-check: %s images, %d numbers matched summary.xml, %d failed points, "
          "%d table sorted by click, %d operating points with units"
          % (images, checked, not_run, sorted_tables, points))
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main(*sys.argv[1:4]))
