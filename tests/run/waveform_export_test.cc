#include "run/waveform_export.h"

#include <gtest/gtest.h>

#include <cmath>

namespace zvsmap {
namespace {

EdgeMeasurement Edge(const std::string& edge, double margin, double v_on, double limit) {
  EdgeMeasurement m;
  m.cell = "leg";
  m.edge = edge;
  m.metrics = {{"v_turn_on_v", v_on}, {"v_residual_limit_v", limit}, {"zvs_energy_margin", margin}};
  return m;
}

PointResult Ok(size_t index, std::vector<EdgeMeasurement> edges) {
  PointResult r;
  r.index = index;
  r.status = PointStatus::kOk;
  r.edges = std::move(edges);
  return r;
}

const double kNaN = std::nan("");

// The selection rule is the brief's own definition (lowest energy margin,
// else highest residual above the limit). // common practice, no source
TEST(WaveformExportTest, WorstByMarginPerEdge) {
  std::vector<PointResult> results = {
      Ok(0, {Edge("high_on", 0.5, 1, 4.8), Edge("low_on", 3, 0.1, 4.8)}),
      Ok(1, {Edge("high_on", -0.2, 30, 4.8), Edge("low_on", 2, 0.1, 4.8)}),
      Ok(2, {Edge("high_on", 0.1, 2, 4.8), Edge("low_on", 1.5, 0.1, 4.8)}),
  };
  PointResult failed;
  failed.index = 3;  // failed points are never chosen, whatever they hold
  failed.edges = {Edge("high_on", -9, 48, 4.8)};
  results.push_back(failed);
  EXPECT_EQ(WorstPoints(results), (std::vector<size_t>{1, 2}));
}

TEST(WaveformExportTest, WorstByResidualWhenNoMargin) {
  std::vector<PointResult> results = {
      Ok(0, {Edge("high_on", kNaN, 10, 4.8)}),
      Ok(1, {Edge("high_on", kNaN, 3, 1.0)}),   // excess 2 V
      Ok(2, {Edge("high_on", kNaN, 12, 4.8)}),  // excess 7.2 V: worst
  };
  EXPECT_EQ(WorstPoints(results), (std::vector<size_t>{2}));
  EXPECT_TRUE(WorstPoints({}).empty());
}

TEST(WaveformExportTest, ParsesSelections) {
  bool worst = false;
  std::vector<size_t> idx;
  std::string error;
  ASSERT_TRUE(ParseWaveformSelection("worst", &worst, &idx, &error));
  EXPECT_TRUE(worst);
  EXPECT_TRUE(idx.empty());
  ASSERT_TRUE(ParseWaveformSelection("3, 7,worst", &worst, &idx, &error));
  EXPECT_TRUE(worst);
  EXPECT_EQ(idx, (std::vector<size_t>{3, 7}));
  EXPECT_FALSE(ParseWaveformSelection("3,x", &worst, &idx, &error));
  EXPECT_EQ(error, "waveform selection '3,x': 'x' is neither a point index nor 'worst'");
  EXPECT_FALSE(ParseWaveformSelection("", &worst, &idx, &error));
  EXPECT_EQ(error, "waveform selection is empty (give point indices or 'worst')");
}

}  // namespace
}  // namespace zvsmap
