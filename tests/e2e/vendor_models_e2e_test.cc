// End-to-end: models brought as a user brings them, at default settings.
// A vendor-style VDMOS subcircuit (tests/e2e/fixtures/vendor, invented) in a
// user-written template; the bundled superjunction-like switch in a 400 V
// half bridge, whose hard edges need the convergence ladder; and the wiring
// mistakes refused before anything runs (exit 2, README "Exit status").
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::Source;
using zvsmap_e2e::ReadText;

// A fresh folder for one test.
std::string Scratch(const std::string& name) {
  fs::path dir = fs::temp_directory_path() / ("zvsmap_vendor_" + name);
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir.string();
}

// Runs `zvsmap run SWEEP --out OUT`; returns the exit status, stderr in *log.
int RunSweep(const std::string& sweep, const std::string& out, std::string* log) {
  std::string log_path = out + ".log";
  std::string command = std::string(ZVSMAP_BINARY) + " run '" + sweep + "' --out '" + out +
                        "' >/dev/null 2>'" + log_path + "'";
  int status = std::system(command.c_str());
  *log = ReadText(log_path);
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

// edges.csv as rows of named fields (no quoted commas in these fixtures' columns read).
std::vector<std::map<std::string, std::string>> Rows(const std::string& csv_path) {
  std::istringstream in(ReadText(csv_path));
  std::string line;
  std::vector<std::string> header;
  std::vector<std::map<std::string, std::string>> rows;
  auto split = [](std::string l) {
    if (!l.empty() && l.back() == '\r') l.pop_back();
    std::vector<std::string> f;
    std::string cell;
    std::istringstream s(l);
    while (std::getline(s, cell, ',')) f.push_back(cell);
    if (!l.empty() && l.back() == ',') f.push_back("");
    return f;
  };
  if (std::getline(in, line)) header = split(line);
  while (std::getline(in, line)) {
    std::vector<std::string> f = split(line);
    std::map<std::string, std::string> row;
    for (size_t i = 0; i < header.size() && i < f.size(); ++i) row[header[i]] = f[i];
    rows.push_back(row);
  }
  return rows;
}

// Copies the vendor fixtures into `dir`, applying `edit` to one file's text.
void CopyVendorFixtures(const std::string& dir, const std::string& file, const std::string& from,
                        const std::string& to) {
  for (const char* name : {"vendor_vdmos.lib", "user_buck.cir", "vendor_buck.xml"}) {
    std::string text = ReadText(Source(std::string("tests/e2e/fixtures/vendor/") + name));
    if (file == name) {
      size_t at = text.find(from);
      ASSERT_NE(at, std::string::npos) << from;
      text.replace(at, from.size(), to);
    }
    std::ofstream(dir + "/" + name, std::ios::binary) << text;
  }
}

TEST(VendorModelsE2eTest, VendorSubcircuitInAUserTemplateRunsEveryPointAtDefaults) {
  std::string out = Scratch("runs") + "/out", log;
  ASSERT_EQ(RunSweep(Source("tests/e2e/fixtures/vendor/vendor_buck.xml"), out, &log), 0) << log;
  auto rows = Rows(out + "/edges.csv");
  ASSERT_EQ(rows.size(), 18u);  // 9 points x 2 edges
  for (const auto& r : rows) {
    EXPECT_EQ(r.at("status"), "ok") << r.at("reason");
    EXPECT_FALSE(r.at("solver_aid").empty());
  }
  // The sense source reads the inductor current out of the phase node: at
  // ILOAD = 6 A the low-side turn-on commutates the peak current, positive
  // (the margins and classes depend on this sign; common practice).
  bool positive = false;
  for (const auto& r : rows) {
    if (r.at("ILOAD") == "6" && r.at("edge") == "low_on") {
      positive = positive || std::stod(r.at("i_commutated_a")) > 6;
    }
  }
  EXPECT_TRUE(positive);
  EXPECT_NE(ReadText(out + "/summary.xml").find("<solver-aids setting=\"auto\""),
            std::string::npos);
}

TEST(VendorModelsE2eTest, SuperjunctionHalfBridgeRunsItsHardEdgesAtTheDefaultReltol) {
  std::string out = Scratch("sj") + "/out", log;
  ASSERT_EQ(RunSweep(Source("tests/e2e/fixtures/sj_400v_buck.xml"), out, &log), 0) << log;
  auto rows = Rows(out + "/edges.csv");
  ASSERT_EQ(rows.size(), 8u);
  int hard = 0, aided = 0;
  for (const auto& r : rows) {
    EXPECT_EQ(r.at("status"), "ok") << r.at("reason");
    hard += r.at("zvs_class") == "hard" ? 1 : 0;
    aided += r.at("solver_aid") != "none" ? 1 : 0;
  }
  EXPECT_GE(hard, 2);  // valley current +3 A and +7 A: hard high-side turn-on
  EXPECT_NE(log.find("ran with a solver aid"), std::string::npos) << log;
  // With the ladder off the same points stop ngspice: the aid is what made them run.
  std::string dir = Scratch("sj_off");
  std::string sweep = ReadText(Source("tests/e2e/fixtures/sj_400v_buck.xml"));
  const std::string setting = "<simulation settle-periods=\"20\"/>";
  size_t at = sweep.find(setting);
  ASSERT_NE(at, std::string::npos);
  sweep.replace(at, setting.size(), "<simulation settle-periods=\"20\" solver-aid=\"off\"/>");
  size_t tmpl = sweep.find("../../../netlists/");
  sweep.replace(tmpl, 18, Source("netlists/"));
  std::ofstream(dir + "/off.xml") << sweep;
  int status = RunSweep(dir + "/off.xml", dir + "/out", &log);
  if (aided > 0) {
    EXPECT_EQ(status, 4) << log;  // some points failed
  }
}

TEST(VendorModelsE2eTest, ReversedSenseSourceIsRefusedBeforeAnythingRuns) {
  std::string dir = Scratch("reversed"), log;
  CopyVendorFixtures(dir, "user_buck.cir", "VISNS PHASE PH_L 0", "VISNS PH_L PHASE 0");
  EXPECT_EQ(RunSweep(dir + "/vendor_buck.xml", dir + "/out", &log), 2);
  EXPECT_NE(log.find("user_buck.cir:32: cell 'ph': the sense source 'visns' is reversed"),
            std::string::npos)
      << log;
  EXPECT_FALSE(fs::exists(dir + "/out/edges.csv"));
}

TEST(VendorModelsE2eTest, GateDrainSwapInThePinMapIsRefusedBeforeAnythingRuns) {
  std::string dir = Scratch("swap"), log;
  CopyVendorFixtures(dir, "vendor_buck.xml", "D=d G=g", "D=g G=d");
  EXPECT_EQ(RunSweep(dir + "/vendor_buck.xml", dir + "/out", &log), 2);
  EXPECT_NE(log.find("gate and drain swapped"), std::string::npos) << log;
  EXPECT_FALSE(fs::exists(dir + "/out/edges.csv"));
}

TEST(VendorModelsE2eTest, DrainSourceSwapThatConductsAtTheRailIsRefused) {
  std::string dir = Scratch("ds"), log;
  CopyVendorFixtures(dir, "vendor_buck.xml", "S=s D=d", "S=d D=s");
  EXPECT_EQ(RunSweep(dir + "/vendor_buck.xml", dir + "/out", &log), 2);
  EXPECT_NE(log.find("its body diode would conduct at the rail"), std::string::npos) << log;
}

}  // namespace
