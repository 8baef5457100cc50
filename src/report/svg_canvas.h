// A minimal SVG drawing surface over pugixml (so every file is well-formed
// XML and text is escaped by the XML writer, not by hand).
#pragma once

#include <pugixml.hpp>
#include <string>
#include <utility>
#include <vector>

namespace zvsmap {

/// An SVG document of a fixed pixel size; y grows downwards as in SVG.
class SvgCanvas {
 public:
  /// A `width` x `height` drawing with a white background and a <title>.
  SvgCanvas(double width, double height, const std::string& title);

  /// Extra attributes of a shape, each written as data-NAME="VALUE" (values
  /// a reader such as a test or a script can take from the file).
  using DataAttributes = std::vector<std::pair<std::string, std::string>>;

  /// A filled rectangle; `tooltip` (if not empty) becomes its <title>.
  void Rect(double x, double y, double w, double h, const std::string& fill,
            const std::string& tooltip = "", const DataAttributes& data = {});
  /// A straight line.
  void Line(double x1, double y1, double x2, double y2, const std::string& stroke, double width,
            bool dashed = false);
  /// An open polyline through `points`.
  void Polyline(const std::vector<std::pair<double, double>>& points, const std::string& stroke,
                double width, bool dashed = false);
  /// A closed filled polygon through `points`, `opacity` in 0..1, no outline.
  void Polygon(const std::vector<std::pair<double, double>>& points, const std::string& fill,
               double opacity);
  /// A filled circle with a thin dark outline.
  void Circle(double cx, double cy, double r, const std::string& fill,
              const std::string& tooltip = "");
  /// Text at (x, y); anchor "start", "middle" or "end"; `rotate` in degrees.
  void Text(double x, double y, const std::string& text, const char* anchor = "middle",
            double size = 12, double rotate = 0);

  /// The document as text.
  std::string ToString() const;

 private:
  pugi::xml_node Add(const char* name);
  pugi::xml_document doc_;
  pugi::xml_node svg_;
};

/// Makes [lo, hi] a drawable axis range: 0..1 when no finite value was seen
/// (lo = +inf), a span of 10 % around a single value (or -1..1 around 0),
/// then 8 % headroom on each side.
void PadAxisRange(double* lo, double* hi);

}  // namespace zvsmap
