// The envelope's dead time in the reports: summary.xml (against the XSD),
// deadtime_schedule.csv, index.html's slot, the dead-time chart, the
// requirement forms and their JUnit cases. Windows from the resonant arc of
// netlists/references.md sec. 2 (tests/report/resonant_window.h).
#include <gtest/gtest.h>

#include <sstream>

#include "report/deadtime_chart.h"
#include "report/deadtime_schedule.h"
#include "report/html_tables.h"
#include "report/junit_xml.h"
#include "report/summary_xml.h"
#include "report_fixture.h"
#include "resonant_window.h"

namespace zvsmap {
namespace {

using testing_report::AddRequirement;
using testing_report::BuckEnvelope;
using testing_report::Synthetic;
using testing_report::TempDir;
using testing_report::ValidateSummary;

pugi::xml_document Summary(const Synthetic& s, const std::string& name) {
  ReportBasis input = s.Input();
  pugi::xml_document doc;
  BuildSummaryXml(input, EvaluateRequirements(input), &doc);
  std::string path = TempDir("envelope") + "/" + name + ".xml";
  EXPECT_TRUE(doc.save_file(path.c_str()));
  EXPECT_EQ(ValidateSummary(path), 0) << path;
  return doc;
}

pugi::xml_node HighOn(const pugi::xml_document& doc) {
  return doc.child("zvs-summary").find_child_by_attribute("edge", "name", "high_on");
}

TEST(DeadTimeReportsTest, SummaryCarriesTheRecommendation) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6});
  pugi::xml_document doc = Summary(s, "holds");
  pugi::xml_node env = HighOn(doc).child("dead-time-envelope");
  ASSERT_TRUE(env);
  EXPECT_TRUE(env.attribute("single-value").as_bool());
  EXPECT_EQ(env.attribute("windows").as_int(), 16);
  // 72 V, 6 A binds both ends (point 15): [38.49, 88.73] ns (sec. 2).
  pugi::xml_node in = env.child("intersection");
  EXPECT_NEAR(in.attribute("earliest").as_double(), 38.49e-9, 0.01e-9);
  EXPECT_NEAR(in.attribute("latest").as_double(), 88.73e-9, 0.01e-9);
  EXPECT_EQ(in.attribute("early-point").as_int(), 15);
  EXPECT_STREQ(in.attribute("late-end").value(), "ring-back");
  pugi::xml_node rec = env.child("recommended");
  EXPECT_STREQ(rec.attribute("choice").value(), "midpoint");
  EXPECT_NEAR(rec.attribute("value").as_double(), 63.61e-9, 0.01e-9);
  EXPECT_NEAR(rec.attribute("margin-early").as_double(), 25.12e-9, 0.01e-9);
  EXPECT_EQ(env.child("schedule").attribute("bins").as_int(), 1);
  // The low-side edge of the fixture has no probe columns: no window at all.
  pugi::xml_node low = doc.child("zvs-summary").find_child_by_attribute("edge", "name", "low_on");
  EXPECT_EQ(low.child("dead-time-envelope").attribute("unprobed").as_int(), 16);
  EXPECT_FALSE(low.child("dead-time-envelope").child("intersection"));
}

TEST(DeadTimeReportsTest, SummaryNamesConflictsImpossiblePointsAndBins) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6, 7});
  // One more load at 48 V beyond the ZVS limit (|Iv| < 1.518 A, sec. 8).
  s.results[9].edges[0].metrics =
      testing_report::ProbeMetrics(testing_report::BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, 8));
  pugi::xml_document doc = Summary(s, "empty");
  pugi::xml_node env = HighOn(doc).child("dead-time-envelope");
  EXPECT_FALSE(env.attribute("single-value").as_bool());
  EXPECT_FALSE(env.child("recommended"));
  EXPECT_EQ(env.attribute("impossible").as_int(), 1);
  pugi::xml_node imp = env.child("impossible");
  EXPECT_EQ(imp.attribute("point").as_int(), 9);
  EXPECT_TRUE(imp.find_child_by_attribute("at", "param", "Vin"));
  // 35 V, 7 A (point 4) against 48 V 7 A is gone (point 9 is impossible now):
  // 60 V 7 A, 72 V 6 A and 72 V 7 A remain.
  EXPECT_EQ(env.attribute("conflicts").as_int(), 3);
  for (pugi::xml_node c : env.children("conflict")) {
    EXPECT_EQ(c.attribute("early-point").as_int(), 4);
    EXPECT_GT(c.attribute("t-min").as_double(), c.attribute("t-max").as_double());
  }
  pugi::xml_node schedule = env.child("schedule");
  EXPECT_GE(schedule.attribute("bins").as_int(), 2);
  for (pugi::xml_node bin : schedule.children("bin")) {
    EXPECT_EQ(bin.attribute("single-value").as_bool(), static_cast<bool>(bin.child("recommended")));
    EXPECT_TRUE(bin.find_child_by_attribute("span", "param", "Vin"));
    EXPECT_TRUE(bin.find_child_by_attribute("span", "param", "Iout"));
  }
}

TEST(DeadTimeReportsTest, ScheduleCsvOneRowPerBin) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6, 7});
  std::ostringstream out;
  WriteDeadTimeScheduleCsv(out, s.Input());
  std::vector<std::string> lines;
  std::string line;
  std::istringstream in(out.str());
  while (std::getline(in, line)) lines.push_back(line);
  ASSERT_EQ(lines.size(), 4u);  // header, 2 bins of high_on, 1 of low_on (no window)
  EXPECT_EQ(lines[0],
            "cell,edge,bin,Vin_from,Vin_to,Iout_from,Iout_to,points,impossible,single_value,"
            "t_dead_earliest_s,t_dead_latest_s,late_end,t_dead_recommended_s,choice,"
            "timing_margin_early_s,timing_margin_late_s,early_point,late_point\r");
  EXPECT_EQ(lines[1].rfind("leg,high_on,0,35,35,0,7,5,0,1,", 0), 0u) << lines[1];
  EXPECT_NE(lines[1].find(",ring-back,"), std::string::npos);
  EXPECT_NE(lines[1].find(",midpoint,"), std::string::npos);
  EXPECT_EQ(lines[2].rfind("leg,high_on,1,48,72,0,7,15,0,1,", 0), 0u) << lines[2];
  EXPECT_EQ(lines[3].rfind("leg,low_on,0,35,72,0,7,0,0,0,,,,,,,,,\r", 0), 0u) << lines[3];
  std::ostringstream none;
  WriteDeadTimeScheduleCsv(none, testing_report::MakeGrid({{"x", {0, 1}}}, [](const auto&) {
                                   return 1.0;
                                 }).Input());
  EXPECT_TRUE(none.str().empty());
}

TEST(DeadTimeReportsTest, IndexSlotGivesValueMarginsAndBindingPoints) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6});
  std::string h = HtmlRecommendedDeadTime(s.Input());
  EXPECT_NE(h.find("id=\"recommended-leg-high_on\">Set <strong>63.6 ns</strong>"),
            std::string::npos)
      << h;
  EXPECT_NE(h.find("25.1 ns early"), std::string::npos);
  EXPECT_NE(h.find("Vin = 72 V, Iout = 6 A"), std::string::npos);  // the binding point
  EXPECT_EQ(h.find("class=\"schedule\""), std::string::npos);     // one value: no table

  Synthetic empty = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6, 7});
  h = HtmlRecommendedDeadTime(empty.Input());
  EXPECT_NE(h.find("No single dead time</strong>"), std::string::npos);
  EXPECT_NE(h.find("class=\"conflicts sortable\""), std::string::npos);
  EXPECT_NE(h.find("class=\"schedule\""), std::string::npos);
  EXPECT_NE(h.find("92 ns"), std::string::npos);  // the 35 V bin
  EXPECT_NE(h.find("68.1 ns"), std::string::npos);  // 48 V - 72 V

  Synthetic plain = testing_report::MakeGrid({{"x", {0, 1}}}, [](const auto&) { return 1.0; });
  EXPECT_NE(HtmlRecommendedDeadTime(plain.Input()).find("carry no probe window"),
            std::string::npos);
}

int CountMarks(const std::string& svg, const std::string& what) {
  int n = 0;
  for (size_t at = svg.find(what); at != std::string::npos; at = svg.find(what, at + 1)) ++n;
  return n;
}

TEST(DeadTimeReportsTest, ChartDrawsTheRecommendationAndFailedRowsHonestly) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6});
  // The whole Iout = 2 A row fails, and 60 V, 4 A fails alone.
  for (size_t i : {1u, 5u, 9u, 13u, 10u}) {
    s.results[i].status = PointStatus::kFailed;
    s.results[i].edges.clear();
  }
  ReportBasis input = s.Input();
  std::vector<Plot> charts = DeadTimeCharts(input);
  ASSERT_EQ(charts.size(), 2u);
  const std::string& svg = charts[0].svg;
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(svg.c_str()));
  // x = Vin, one series per Iout: 0 A and 6 A bands whole, 4 A split in two
  // runs around 60 V (a band and a lone bar), the 2 A series nothing.
  int polygons = 0;
  for (pugi::xml_node p : doc.child("svg").children("polygon")) polygons += p ? 1 : 0;
  EXPECT_EQ(polygons, 3);
  EXPECT_NE(svg.find("Iout = 2 A (no point ran)"), std::string::npos);
  EXPECT_NE(svg.find("point failed / edge not measured"), std::string::npos);
  EXPECT_NE(svg.find("recommended (envelope)"), std::string::npos);
  // A cross (two lines) per failed point: 5 points, 10 lines of width 2 in
  // the series colours (the 72 V, 4 A run is a lone window: one bar of width 6).
  EXPECT_GE(CountMarks(svg, "stroke-width=\"2.00\""), 10);
  EXPECT_EQ(CountMarks(svg, "stroke-width=\"6.00\""), 1);
}

TEST(DeadTimeReportsTest, RequirementFormsJudgeTheProbeWindow) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6});
  // The fixture sets 40 ns: inside [38.49, 88.73] ns at 72 V, 6 A and every
  // wider window (sec. 2).
  AddRequirement(&s, R"(<require edge="leg.high_on" dead-time-within-window="true"/>)", 3);
  AddRequirement(&s, R"(<require edge="high_on" dead-time="63n" within-window="true"/>)", 4);
  AddRequirement(&s, R"(<require edge="high_on" dead-time="97n" within-window="true"/>)", 5);
  AddRequirement(
      &s, R"(<require edge="high_on" dead-time="95n" within-window="true" where="Iout &lt; 6"/>)",
      6);
  ReportBasis input = s.Input();
  std::vector<RequirementVerdict> v = EvaluateRequirements(input);
  ASSERT_EQ(v.size(), 4u);
  EXPECT_TRUE(v[0].held) << v[0].message;
  EXPECT_TRUE(v[1].held) << v[1].message;
  EXPECT_EQ(v[1].checked, 16);
  EXPECT_FALSE(v[2].held);
  // 97 ns is past the ring-back at 6 A at 60 V and 72 V (109.7, 104.7,
  // 96.1, 88.7 ns): only 60 V and 72 V break it.
  EXPECT_EQ(v[2].failing, 2);
  ASSERT_FALSE(v[2].details.empty());
  EXPECT_NE(v[2].details[0].find("dead time 97ns outside [probe_t_min_s="), std::string::npos)
      << v[2].details[0];
  EXPECT_TRUE(v[3].held) << v[3].message;
  EXPECT_EQ(v[3].title, "sweeps/synthetic.xml:6: every cell's high_on dead time 95ns within the "
                        "probe's window where Iout < 6");

  pugi::xml_document junit;
  BuildJunitXml(input, v, &junit);
  pugi::xml_node reqs =
      junit.child("testsuites").find_child_by_attribute("testsuite", "name", "requirements");
  EXPECT_EQ(reqs.attribute("tests").as_int(), 4);
  EXPECT_EQ(reqs.attribute("failures").as_int(), 1);
  pugi::xml_node failed = reqs.find_child_by_attribute(
      "testcase", "name",
      "sweeps/synthetic.xml:5: every cell's high_on dead time 97ns within the probe's window over "
      "the whole grid");
  ASSERT_TRUE(failed);
  EXPECT_STREQ(failed.child("failure").attribute("message").value(),
               "2 of 16 checked points break it");
}

TEST(DeadTimeReportsTest, ImpossiblePointFailsBothFormsWithItsValley) {
  Synthetic s = BuckEnvelope({48}, {0, 8});  // 8 A: |Iv| = 1 A < 1.518 A (sec. 8)
  AddRequirement(&s, R"(<require edge="leg.high_on" dead-time-within-window="true"/>)", 3);
  AddRequirement(&s, R"(<require edge="leg.high_on" dead-time="30n" within-window="true"/>)", 4);
  std::vector<RequirementVerdict> v = EvaluateRequirements(s.Input());
  for (const RequirementVerdict& r : v) {
    EXPECT_FALSE(r.held);
    EXPECT_EQ(r.failing, 1);
    ASSERT_FALSE(r.details.empty());
    EXPECT_NE(r.details[0].find("ZVS impossible at any dead time: lowest v_ds"),
              std::string::npos)
        << r.details[0];
  }
}

TEST(DeadTimeReportsTest, GivenDeadTimeWithoutProbeColumnsFailsAndSaysWhy) {
  Synthetic s = testing_report::MakeGrid({{"Iout", {0, 1}}}, [](const auto&) { return 1.0; });
  AddRequirement(&s, R"(<require edge="leg.high_on" dead-time="30n" within-window="true"/>)", 9);
  std::vector<RequirementVerdict> v = EvaluateRequirements(s.Input());
  ASSERT_EQ(v.size(), 1u);
  EXPECT_FALSE(v[0].held);
  EXPECT_EQ(v[0].message,
            "sweeps/synthetic.xml:9: the results have no probe window (probe_t_min_s, "
            "probe_t_max_s), so a given dead time cannot be judged against the window");
}

}  // namespace
}  // namespace zvsmap
