#include "report/svg_canvas.h"

#include <cmath>
#include <cstdio>
#include <sstream>

namespace zvsmap {

namespace {

std::string Px(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.2f", v);
  return buf;
}

}  // namespace

SvgCanvas::SvgCanvas(double width, double height, const std::string& title) {
  svg_ = doc_.append_child("svg");
  svg_.append_attribute("xmlns") = "http://www.w3.org/2000/svg";
  svg_.append_attribute("width") = Px(width).c_str();
  svg_.append_attribute("height") = Px(height).c_str();
  svg_.append_attribute("viewBox") = ("0 0 " + Px(width) + " " + Px(height)).c_str();
  svg_.append_attribute("font-family") = "sans-serif";
  svg_.append_child("title").text() = title.c_str();
  Rect(0, 0, width, height, "#ffffff");
}

pugi::xml_node SvgCanvas::Add(const char* name) { return svg_.append_child(name); }

void SvgCanvas::Rect(double x, double y, double w, double h, const std::string& fill,
                     const std::string& tooltip, const DataAttributes& data) {
  pugi::xml_node r = Add("rect");
  r.append_attribute("x") = Px(x).c_str();
  r.append_attribute("y") = Px(y).c_str();
  r.append_attribute("width") = Px(w).c_str();
  r.append_attribute("height") = Px(h).c_str();
  r.append_attribute("fill") = fill.c_str();
  for (const auto& [name, value] : data) {
    r.append_attribute(("data-" + name).c_str()) = value.c_str();
  }
  if (!tooltip.empty()) r.append_child("title").text() = tooltip.c_str();
}

void SvgCanvas::Line(double x1, double y1, double x2, double y2, const std::string& stroke,
                     double width, bool dashed) {
  pugi::xml_node l = Add("line");
  l.append_attribute("x1") = Px(x1).c_str();
  l.append_attribute("y1") = Px(y1).c_str();
  l.append_attribute("x2") = Px(x2).c_str();
  l.append_attribute("y2") = Px(y2).c_str();
  l.append_attribute("stroke") = stroke.c_str();
  l.append_attribute("stroke-width") = Px(width).c_str();
  if (dashed) l.append_attribute("stroke-dasharray") = "6 4";
}

void SvgCanvas::Polyline(const std::vector<std::pair<double, double>>& points,
                         const std::string& stroke, double width, bool dashed) {
  if (points.size() < 2) return;
  std::string text;
  for (const auto& [x, y] : points) text += Px(x) + "," + Px(y) + " ";
  text.pop_back();
  pugi::xml_node p = Add("polyline");
  p.append_attribute("points") = text.c_str();
  p.append_attribute("fill") = "none";
  p.append_attribute("stroke") = stroke.c_str();
  p.append_attribute("stroke-width") = Px(width).c_str();
  if (dashed) p.append_attribute("stroke-dasharray") = "6 4";
}

void SvgCanvas::Polygon(const std::vector<std::pair<double, double>>& points,
                        const std::string& fill, double opacity) {
  if (points.size() < 3) return;
  std::string text;
  for (const auto& [x, y] : points) text += Px(x) + "," + Px(y) + " ";
  text.pop_back();
  pugi::xml_node p = Add("polygon");
  p.append_attribute("points") = text.c_str();
  p.append_attribute("fill") = fill.c_str();
  p.append_attribute("fill-opacity") = Px(opacity).c_str();
}

void SvgCanvas::Circle(double cx, double cy, double r, const std::string& fill,
                       const std::string& tooltip) {
  pugi::xml_node c = Add("circle");
  c.append_attribute("cx") = Px(cx).c_str();
  c.append_attribute("cy") = Px(cy).c_str();
  c.append_attribute("r") = Px(r).c_str();
  c.append_attribute("fill") = fill.c_str();
  c.append_attribute("stroke") = "#222222";
  c.append_attribute("stroke-width") = "0.8";
  if (!tooltip.empty()) c.append_child("title").text() = tooltip.c_str();
}

void SvgCanvas::Text(double x, double y, const std::string& text, const char* anchor, double size,
                     double rotate) {
  pugi::xml_node t = Add("text");
  t.append_attribute("x") = Px(x).c_str();
  t.append_attribute("y") = Px(y).c_str();
  t.append_attribute("text-anchor") = anchor;
  t.append_attribute("font-size") = Px(size).c_str();
  if (rotate != 0) {
    t.append_attribute("transform") =
        ("rotate(" + Px(rotate) + " " + Px(x) + " " + Px(y) + ")").c_str();
  }
  t.text() = text.c_str();
}

std::string SvgCanvas::ToString() const {
  std::ostringstream out;
  doc_.save(out, "  ", pugi::format_default | pugi::format_no_declaration);
  return out.str();
}

void PadAxisRange(double* lo, double* hi) {
  if (!std::isfinite(*lo)) *lo = 0, *hi = 1;
  if (*hi - *lo <= 0) {
    double pad = *lo == 0 ? 1 : std::fabs(*lo) * 0.1;
    *lo -= pad;
    *hi += pad;
  }
  double pad = (*hi - *lo) * 0.08;
  *lo -= pad;
  *hi += pad;
}

}  // namespace zvsmap
