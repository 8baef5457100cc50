// A small half-bridge template and sweep written to a temporary folder, for
// the up-front check tests (invented scenario: 48 V buck leg at 500 kHz).
#pragma once

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/template.h"
#include "sweep/point.h"
#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

class CheckFixture : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::path(::testing::TempDir()) /
           ("zvsmap_checks_" + std::to_string(getpid()) + "_" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::create_directories(dir_);
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  // Lines 1-18; `extra` goes in before ".end" (from line 18 on).
  static std::string TemplateText(const std::string& extra = "") {
    return "test template (invented scenario)\n"                                             // 1
           "*@ period 1/fsw\n"                                                               // 2
           "*@ cell leg node=sw rail_high=in rail_low=0 current=vs high=xh low=xl\n"         // 3
           "*@+ high_cmd=ch low_cmd=cl high_dead=tdh low_dead=tdl inductance=L coss=Coss\n"  // 4
           ".param fsw=500k\n"                                                               // 5
           ".param D=0.25\n"                                                                 // 6
           ".param tdh=40n\n"                                                                // 7
           ".param tdl=40n\n"                                                                // 8
           ".param L=1u\n"                                                                   // 9
           ".param Coss=1n\n"                                                                // 10
           ".param Cout=22u\n"                                                               // 11
           ".param tedge=1n\n"                                                               // 12
           "vin in 0 48\n"                                                                   // 13
           "l1 sw out {L}\n"                                                                 // 14
           "c1 out 0 {Cout}\n"                                                               // 15
           "vch ch 0 PULSE(0 1 {tdh} {tedge} {tedge} {D/fsw - tdh - tedge} {1/fsw})\n"       // 16
           "vcl cl 0 PULSE(1 0 0 {tedge} {tedge} {D/fsw + tdl - tedge} {1/fsw})\n" +         // 17
           extra +
           ".end\n";
  }

  // Writes the template and a sweep whose `body` starts on line 3; parses
  // both and expands the points.
  void Load(const std::string& body, const std::string& template_text = TemplateText()) {
    std::ofstream(TemplatePath()) << template_text;
    sweep_text_ = "<sweep>\n  <template file=\"t.cir\"/>\n" + body + "</sweep>\n";
    std::ofstream(SweepPath()) << sweep_text_;
    Diagnostic error;
    ASSERT_TRUE(ParseSweepFile(SweepPath(), &spec_, &error)) << error.Format();
    ASSERT_TRUE(LoadTemplate(spec_.template_path, &tmpl_, &error)) << error.Format();
    ASSERT_TRUE(ExpandSweep(spec_, &points_, &error)) << error.Format();
  }
  std::string SweepPath() const { return (dir_ / "s.xml").string(); }
  std::string TemplatePath() const { return (dir_ / "t.cir").string(); }

  std::filesystem::path dir_;
  std::string sweep_text_;
  SweepSpec spec_;
  Template tmpl_;
  std::vector<Point> points_;
};

}  // namespace zvsmap
