// End-to-end tests of the up-front checks (README "Checked before a run"):
// the binary refuses a bad sweep with exit status 2 and a file:line message
// before anything is simulated (the output folder is never created).
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::ReadText;

class ChecksE2eTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("zvsmap_checks_e2e_" + std::to_string(getpid()) + "_" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  // The invented 48 V -> 12 V buck at 500 kHz; `body` starts on line 4.
  std::string WriteSweep(const std::string& body) const {
    std::string path = (dir_ / "s.xml").string();
    std::ofstream(path) << "<sweep>\n  <template file=\"" << ZVSMAP_SOURCE_DIR
                        << "/netlists/buck_halfbridge.cir\"/>\n"
                        << "  <set param=\"Vin\" value=\"48\"/>\n"
                        << body << "</sweep>\n";
    return path;
  }
  // `zvsmap SUBCOMMAND s.xml ...`; returns the exit status, fills err_.
  int Zvsmap(const std::string& subcommand, const std::string& body,
             const std::string& extra = "") {
    std::string sweep = WriteSweep(body);
    std::string e = (dir_ / "err.txt").string();
    std::string command = std::string(ZVSMAP_BINARY) + " " + subcommand + " " + sweep + " " +
                          extra + " >/dev/null 2>" + e;
    int status = std::system(command.c_str());
    err_ = ReadText(e);
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  }
  // A run that must be refused: exit 2, nothing simulated.
  void ExpectRefusedRun(const std::string& body, const std::string& message) {
    std::string out = (dir_ / "out").string();
    EXPECT_EQ(Zvsmap("run", body, "-o " + out + " -j 1"), 2) << err_;
    EXPECT_NE(err_.find(message), std::string::npos) << err_;
    EXPECT_EQ(err_.rfind("zvsmap: error: ", 0), 0u) << err_;
    EXPECT_FALSE(fs::exists(out)) << "the run went as far as creating its output folder";
  }

  fs::path dir_;
  std::string err_;
};

TEST_F(ChecksE2eTest, FrequencyWrittenAsMegahertzIsRefused) {
  ExpectRefusedRun("  <set param=\"fsw\" value=\"0.5MHz\"/>\n",
                   "s.xml:4: in attribute 'value': '0.5MHz' is 0.5 milli (0.0005) in SPICE, "
                   "which reads 'M' as milli; write '0.5meg' for mega or '0.5m' for milli");
}

TEST_F(ChecksE2eTest, ZeroFrequencyIsRefusedNamingThePointAndTheAxis) {
  ExpectRefusedRun("  <axis param=\"fsw\" values=\"500k 0\"/>\n",
                   "at 1 of 2 points: point 1 (Vin=48 fsw=0) [values set at " +
                       (dir_ / "s.xml").string() + ":3 (Vin), " + (dir_ / "s.xml").string() +
                       ":4 (fsw)]");
}

TEST_F(ChecksE2eTest, DeadTimeLongerThanTheOnTimeIsRefused) {
  // D = 12/48 = 0.25 of 2 us is 500 ns of high-side on-time, less than 600 ns.
  ExpectRefusedRun(
      "  <set param=\"Vout\" value=\"12\"/>\n  <set param=\"td_lh\" value=\"600n\"/>\n",
      "command source vcmdh (cell leg, high_cmd): its PULSE "
      "width 'D/fsw - td_lh - tedge' must be >= 0: is a dead time longer than the "
      "interval it sits in? at 1 of 1 points: point 0 (Vin=48 Vout=12 td_lh=600n): width -1.01e-07 "
      "s with "
      "td_lh = 6e-07 s, td_hl = 4e-08 s, period 2e-06 s");
  // At the template's command line (file:line), whatever its number.
  EXPECT_NE(err_.find("netlists/buck_halfbridge.cir:"), std::string::npos) << err_;
}

TEST_F(ChecksE2eTest, RequirementNamingAnUnknownMetricIsRefused) {
  ExpectRefusedRun("  <require edge=\"leg.high_on\" metric=\"v_turnon_v\" max=\"1\"/>\n",
                   "s.xml:4: <require> names metric 'v_turnon_v', which no high_on edge has (did "
                   "you mean 'v_turn_on_v'? metrics: rail_v, ");
}

TEST_F(ChecksE2eTest, TooShortALeadIsRefused) {
  ExpectRefusedRun("  <simulation measure-lead=\"0.01\"/>\n",
                   "s.xml:4: 'measure-lead' must be at least 0.05, got '0.01' (periods; the "
                   "states not set at t = 0 need time to settle before a measurement)");
}

// A sweep file written for the older attribute learns what replaced it.
TEST_F(ChecksE2eTest, TheReplacedMeasuredPeriodCountIsExplained) {
  ExpectRefusedRun("  <simulation measure-periods=\"2\"/>\n",
                   "s.xml:4: 'measure-periods' was replaced by 'measure-lead': the periods "
                   "simulated before the measured one (measure-periods=\"N\" measured after a "
                   "lead of N - 1 periods)");
}

TEST_F(ChecksE2eTest, UnitLettersAreAWarningNotAnError) {
  EXPECT_EQ(Zvsmap("points", "  <set param=\"L\" value=\"1uH\"/>\n"), 0) << err_;
  EXPECT_EQ(err_, "zvsmap: warning: " + (dir_ / "s.xml").string() +
                      ":4: in attribute 'value': '1uH' is read as 1u (1e-06): SPICE ignores the "
                      "unit letters 'H', and zvsmap does not check them against the parameter\n"
                      "  <set param=\"L\" value=\"1uH\"/>\n"
                      "                 ^\n");
}

}  // namespace
