#include "report/waveform_plot.h"

#include <gtest/gtest.h>

#include <cmath>
#include <sstream>
#include <pugixml.hpp>
#include <string>
#include <vector>

namespace zvsmap {
namespace {

CellSpec Cell(bool gates) {
  CellSpec c;
  c.name = "leg";
  c.node = "sw";
  c.rail_high = "in";
  c.rail_low = "0";
  c.current = "vsense";
  c.high = "xhs";
  c.low = "xls";
  c.high_cmd = "cmd_h";
  c.low_cmd = "cmd_l";
  if (gates) {
    c.high_gate = "gh";
    c.high_source = "sw";
    c.low_gate = "gl";
    c.low_source = "0";
  }
  return c;
}

// 1 us of data at 1 ns steps: low switch off at 100 ns, node rises linearly
// to 48 V by 120 ns, high switch on at 140 ns.
Waveforms Edge() {
  Waveforms w;
  std::vector<double> t, sw, in, ch, cl, gh, gl, i;
  for (int k = 0; k <= 1000; ++k) {
    double s = k * 1e-9;
    t.push_back(s);
    sw.push_back(s < 100e-9 ? 0 : s < 120e-9 ? 48 * (s - 100e-9) / 20e-9 : 48);
    in.push_back(48);
    cl.push_back(s < 100e-9 ? 1 : 0);
    ch.push_back(s >= 140e-9 ? 1 : 0);
    gl.push_back(10 * cl.back());
    gh.push_back(sw.back() + 10 * ch.back());
    i.push_back(-4 + 8 * s / 1e-6);
  }
  w.SetTime(t);
  w.Set("v(sw)", sw);
  w.Set("v(in)", in);
  w.Set("v(cmd_h)", ch);
  w.Set("v(cmd_l)", cl);
  w.Set("v(gh)", gh);
  w.Set("v(gl)", gl);
  w.Set("i(vsense)", i);
  return w;
}

EdgeTiming Timing() {
  EdgeTiming e;
  e.edge = "high_on";
  e.incoming_high = true;
  e.t_off_s = 100e-9;
  e.t_on_s = 140e-9;
  e.t_end_s = 900e-9;
  return e;
}

// Well-formedness per XML 1.0 (W3C) as pugixml checks it; SVG root and
// namespace per SVG 1.1 (W3C). // from memory
TEST(WaveformPlotTest, WellFormedWithThreePanelsOfData) {
  Plot plot = EdgeWaveformPlot(Edge(), Cell(true), Timing(), "point 3 leg high_on",
                               "point_3_leg_high_on.svg");
  EXPECT_EQ(plot.file, "point_3_leg_high_on.svg");
  pugi::xml_document doc;
  pugi::xml_parse_result r = doc.load_string(plot.svg.c_str());
  ASSERT_TRUE(r) << r.description();
  pugi::xml_node svg = doc.child("svg");
  EXPECT_STREQ(svg.attribute("xmlns").value(), "http://www.w3.org/2000/svg");
  EXPECT_STREQ(svg.child("title").text().get(), "point 3 leg high_on");
  // Traces: v(sw) and v(in); two gate-source voltages; the current.
  int polylines = 0;
  size_t longest = 0;
  for (pugi::xml_node p : svg.children("polyline")) {
    ++polylines;
    std::string pts = p.attribute("points").value();
    longest = std::max<size_t>(longest, std::count(pts.begin(), pts.end(), ' ') + 1);
  }
  EXPECT_EQ(polylines, 5);
  // Every trace stays inside the frame: the first line drawn is the first
  // panel's time axis. // common practice, no source
  pugi::xml_node axis = svg.child("line");
  double left = axis.attribute("x1").as_double(), right = axis.attribute("x2").as_double();
  for (pugi::xml_node p : svg.children("polyline")) {
    std::istringstream pts(p.attribute("points").value());
    std::string xy;
    while (pts >> xy) {
      double x = std::stod(xy.substr(0, xy.find(',')));
      EXPECT_GE(x, left - 1e-6);
      EXPECT_LE(x, right + 1e-6);
    }
  }
  EXPECT_GT(longest, 50u);  // the window holds ~90 samples of 1 ns
  std::vector<std::string> labels;
  for (pugi::xml_node t : svg.children("text")) labels.push_back(t.text().get());
  for (const char* want : {"v(sw)", "v_gs xhs", "v_gs xls", "i(vsense)", "off", "on",
                           "time from the turn-off command (ns)"}) {
    EXPECT_NE(std::find(labels.begin(), labels.end(), want), labels.end()) << want;
  }
}

TEST(WaveformPlotTest, CommandsWhenTheCellNamesNoGates) {
  Plot plot = EdgeWaveformPlot(Edge(), Cell(false), Timing(), "t", "f.svg");
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(plot.svg.c_str()));
  std::vector<std::string> labels;
  for (pugi::xml_node t : doc.child("svg").children("text")) labels.push_back(t.text().get());
  EXPECT_NE(std::find(labels.begin(), labels.end(), "cmd xhs"), labels.end());
  EXPECT_NE(std::find(labels.begin(), labels.end(), "command (V)"), labels.end());
}

// The window as the header states it: one dead time before the turn-off
// command, two after the turn-on, at least 0.2 % / 0.4 % of the span. // header contract
TEST(WaveformPlotTest, WindowAroundTheEdge) {
  double t0 = 0, t1 = 0;
  EdgePlotWindow(Edge(), Timing(), &t0, &t1);
  // dead 40 ns: before max(40, 2) = 40 ns, after max(80, 4) = 80 ns.
  EXPECT_NEAR(t0, 60e-9, 1e-15);
  EXPECT_NEAR(t1, 220e-9, 1e-15);
  EdgeTiming late = Timing();
  late.t_off_s = 990e-9;
  late.t_on_s = 990e-9;  // no dead time
  late.t_end_s = 1e-6;
  EdgePlotWindow(Edge(), late, &t0, &t1);
  EXPECT_NEAR(t0, 988e-9, 1e-15);  // 0.2 % of 1 us before
  EXPECT_NEAR(t1, 994e-9, 1e-15);  // 0.4 % of 1 us after
  late.t_end_s = 992e-9;
  EdgePlotWindow(Edge(), late, &t0, &t1);
  EXPECT_NEAR(t1, 992e-9, 1e-15);  // the incoming switch's next turn-off
}

}  // namespace
}  // namespace zvsmap
