#!/usr/bin/env python3
"""Checks a report page as headless Chromium rendered it against summary.xml.

  browser_report_check.py DOM.html SUMMARY.xml

DOM.html is Chromium's --dump-dom of index.html with the probe script of
browser_report_test.sh (body data-images="loaded/total", data-errors).
Checks: every image decoded, no console error or failed load, and the tables
hold summary.xml's numbers: per edge the boundary values, the worst margin,
and the number of failed points. Exit 0 when all hold, 1 otherwise.
"""
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
            self.table = self.tables.setdefault((self.section, a.get("class")), [])
        elif tag == "tr" and self.table is not None:
            self.table.append([])
        elif tag in ("td", "th") and self.table is not None:
            self.cell = ["", a.get("data-value"), tag]

    def handle_endtag(self, tag):
        if tag in ("td", "th") and self.cell is not None:
            if self.cell[2] == "td":
                self.table[-1].append((self.cell[0].strip(), self.cell[1]))
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


def main(dom_path, summary_path):
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
    for p in problems:
        print("browser-check: " + p, file=sys.stderr)
    print("browser-check: %s images, %d numbers matched summary.xml, %d failed points"
          % (images, checked, not_run))
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1], sys.argv[2]))
