#include "report/csv_writer.h"

#include <gtest/gtest.h>

#include <cmath>
#include <sstream>

namespace zvsmap {
namespace {

// Quoting rules of RFC 4180 ("Common Format and MIME Type for CSV Files",
// Shafranovich 2005, section 2, rules 5-7).
TEST(CsvWriterTest, QuotesPerRfc4180) {
  EXPECT_EQ(CsvField("plain"), "plain");
  EXPECT_EQ(CsvField("a,b"), "\"a,b\"");
  EXPECT_EQ(CsvField("say \"hi\""), "\"say \"\"hi\"\"\"");
  EXPECT_EQ(CsvField("two\nlines"), "\"two\nlines\"");
  EXPECT_EQ(CsvNumber(std::nan("")), "");
  EXPECT_EQ(CsvNumber(2.5e-9), "2.5e-09");
}

TEST(CsvWriterTest, OneRowPerEdgeAndOneForAFailedPoint) {
  std::vector<Point> points = {{0, {{"Iout", 1}, {"L", 1e-6}}}, {1, {{"Iout", 2}, {"L", 1e-6}}}};
  std::vector<PointResult> results(2);
  results[0].index = 0;
  results[0].status = PointStatus::kOk;
  EdgeMeasurement e;
  e.cell = "leg";
  e.edge = "high_on";
  e.zvs = ZvsClass::kFull;
  e.metrics = {{"v_turn_on_v", -0.5}, {"t_transition_s", 2e-8}};
  results[0].edges = {e};
  e.edge = "low_on";
  e.zvs = ZvsClass::kHard;
  e.metrics = {{"v_turn_on_v", 48}};
  results[0].edges.push_back(e);
  results[0].solver_aid = "rshunt";
  results[1].index = 1;
  results[1].status = PointStatus::kFailed;
  results[1].reason = "engine error: Timestep too small, at t=1e-6";
  std::ostringstream out;
  WriteEdgesCsv(out, points, results);
  EXPECT_EQ(out.str(),
            "point,Iout,L,cell,edge,zvs_class,v_turn_on_v,t_transition_s,status,reason,solver_aid,"
            "wall_time_s\r\n"
            "0,1,1e-06,leg,high_on,full,-0.5,2e-08,ok,,rshunt,0\r\n"
            "0,1,1e-06,leg,low_on,hard,48,,ok,,rshunt,0\r\n"
            "1,2,1e-06,,,,,,failed,\"engine error: Timestep too small, at t=1e-6\",,0\r\n");
}

}  // namespace
}  // namespace zvsmap
