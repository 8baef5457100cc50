#include "report/junit_xml.h"

#include <gtest/gtest.h>

#include <sstream>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::AddRequirement;
using testing_report::MakeGrid;

// Element and attribute names follow the JUnit XML form that Jenkins and
// GitLab read (testsuites/testsuite/testcase/failure with message). // from memory
TEST(JunitXmlTest, ParsedBackWithExpectedCasesAndFailures) {
  auto s = MakeGrid({{"Iout", {0, 1, 2, 3, 4}}}, [](const auto& v) { return v[0] - 2.5; });
  s.results[0].status = PointStatus::kFailed;
  s.results[0].reason = "timestep too small";
  s.results[0].edges.clear();
  s.results[1].status = PointStatus::kFailed;
  s.results[1].reason = "timestep too small";
  s.results[1].edges.clear();
  AddRequirement(&s, R"(<require edge="leg.high_on" class="full" where="Iout >= 3"/>)", 5);
  AddRequirement(&s, R"(<require edge="leg.high_on" class="full" where="Iout >= 2"/>)", 6);
  auto input = s.Input();
  pugi::xml_document built;
  BuildJunitXml(input, EvaluateRequirements(input), &built);
  std::ostringstream text;
  built.save(text);

  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(text.str().c_str()));
  pugi::xml_node root = doc.child("testsuites");
  EXPECT_EQ(root.attribute("tests").as_int(), 3);
  EXPECT_EQ(root.attribute("failures").as_int(), 2);
  pugi::xml_node reqs = root.find_child_by_attribute("testsuite", "name", "requirements");
  ASSERT_TRUE(reqs);
  EXPECT_EQ(reqs.attribute("tests").as_int(), 2);
  EXPECT_EQ(reqs.attribute("failures").as_int(), 1);
  pugi::xml_node first = reqs.child("testcase");
  EXPECT_STREQ(first.attribute("name").value(),
               "sweeps/synthetic.xml:5: leg.high_on full ZVS where Iout >= 3");
  EXPECT_FALSE(first.child("failure"));
  pugi::xml_node failure = first.next_sibling("testcase").child("failure");
  ASSERT_TRUE(failure);
  EXPECT_STREQ(failure.attribute("message").value(),
               "1 of 3 checked points break it");  // Iout = 2, 3, 4 checked
  EXPECT_NE(std::string(failure.text().get()).find("point 2 (Iout=2): leg.high_on class partial"),
            std::string::npos);

  pugi::xml_node points = root.find_child_by_attribute("testsuite", "name", "points");
  ASSERT_TRUE(points);
  EXPECT_EQ(points.attribute("tests").as_int(), 1);  // both failures share a reason
  pugi::xml_node group = points.child("testcase");
  EXPECT_STREQ(group.attribute("name").value(), "failed: timestep too small");
  EXPECT_STREQ(group.child("failure").attribute("message").value(), "2 point(s) failed");
  EXPECT_STREQ(group.child("failure").text().get(), "point 0 (Iout=0)\npoint 1 (Iout=1)\n");
}

TEST(JunitXmlTest, AllRanNoRequirements) {
  auto s = MakeGrid({{"Iout", {0, 1}}}, [](const auto&) { return 1.0; });
  auto input = s.Input();
  pugi::xml_document doc;
  BuildJunitXml(input, {}, &doc);
  pugi::xml_node root = doc.child("testsuites");
  EXPECT_EQ(root.attribute("tests").as_int(), 1);
  EXPECT_EQ(root.attribute("failures").as_int(), 0);
  EXPECT_STREQ(root.find_child_by_attribute("testsuite", "name", "points")
                   .child("testcase")
                   .attribute("name")
                   .value(),
               "every point ran");
}

}  // namespace
}  // namespace zvsmap
