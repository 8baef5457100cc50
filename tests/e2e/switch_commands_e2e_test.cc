// End-to-end tests of the switch-model commands: zvsmap calibrate,
// zvsmap characterize, and a run whose device axis swaps the buck's switches.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::Source;
using zvsmap_e2e::ReadText;

// Runs the binary through the shell; returns its exit status, stdout and stderr.
int Zvsmap(const std::string& args, std::string* out, std::string* err) {
  fs::path dir = fs::temp_directory_path() / ("zvsmap_sw_e2e_" + std::to_string(getpid()));
  fs::create_directories(dir);
  std::string o = (dir / "out.txt").string(), e = (dir / "err.txt").string();
  int status =
      std::system((std::string(ZVSMAP_BINARY) + " " + args + " >" + o + " 2>" + e).c_str());
  *out = ReadText(o);
  *err = ReadText(e);
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

class SwitchCommandsE2eTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("zvsmap_sw_e2e_out_" + std::to_string(getpid()));
    fs::remove_all(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }
  fs::path dir_;
};

TEST_F(SwitchCommandsE2eTest, CalibratePrintsTheExponentOfTheRatioAndPasteableParameters) {
  std::string out, err;
  ASSERT_EQ(Zvsmap("calibrate -V 48 --co-tr 452p --co-er 298p --m 0.6", &out, &err), 0) << err;
  double r = 452.0 / 298.0, g = (2 * r - 2) / (2 * r - 1);  // netlists/references.md sec. 6
  char expected[64];
  std::snprintf(expected, sizeof expected, "g = %.6g", g);
  EXPECT_NE(out.find(expected), std::string::npos) << out;
  EXPECT_NE(out.find("zsw_junction parameters: c0_f="), std::string::npos) << out;
  EXPECT_EQ(Zvsmap("calibrate -V 48 --co-tr 452p", &out, &err), 2);
  EXPECT_EQ(err, "zvsmap: error: give one of --co-tr/--qoss and one of --co-er/--eoss\n");
}

TEST_F(SwitchCommandsE2eTest, CharacterizeWritesTheJunctionTable) {
  std::string out, err;
  ASSERT_EQ(Zvsmap("characterize --model zsw_junction --vmax 48 --rows 2 --reverse-rows 2 --out " +
                       dir_.string(),
                   &out, &err),
            0)
      << err;
  std::istringstream csv(ReadText((dir_ / "coss.csv").string()));
  std::string header, row1, row2;
  std::getline(csv, header);
  std::getline(csv, row1);
  std::getline(csv, row2);
  EXPECT_EQ(header, "v_ds_v,coss_f,qoss_c,eoss_j,co_tr_f,co_er_f\r");
  double v = 0, c = 0, q = 0;
  ASSERT_EQ(std::sscanf(row2.c_str(), "%lf,%lf,%lf", &v, &c, &q), 3) << row2;
  EXPECT_DOUBLE_EQ(v, 48);
  // Junction Q(V) = C0 Vj/(1-m) [(1 + V/Vj)^(1-m) - 1] with the library defaults
  // C0 = 4 nF, Vj = 0.7 V, m = 0.5 (netlists/references.md sec. 6).
  double expected = 4e-9 * 0.7 / 0.5 * (std::sqrt(1 + 48 / 0.7) - 1);
  EXPECT_NEAR(q, expected, 0.01 * expected);
  EXPECT_EQ(ReadText((dir_ / "reverse.csv").string()).substr(0, 17), "i_rev_a,v_rev_v\r\n");
}

TEST_F(SwitchCommandsE2eTest, CharacterizeNamesAMissingSubcircuit) {
  std::string out, err;
  EXPECT_EQ(Zvsmap("characterize --file " + Source("tests/netlist/fixtures/reordered_switch.lib") +
                       " --subckt nosuch --pins 'd g s'",
                   &out, &err),
            2);
  EXPECT_EQ(err, "zvsmap: error: device 'dut': subcircuit 'nosuch' not found in '" +
                     Source("tests/netlist/fixtures/reordered_switch.lib") +
                     "' (it defines: inv_sw, plain_sw, zsw_lin_copy)\n");
}

TEST_F(SwitchCommandsE2eTest, DeviceAxisNamesTheModelInTheCsv) {
  std::string out, err;
  ASSERT_EQ(Zvsmap("run " + Source("tests/netlist/fixtures/pin_map_buck.xml") + " --quiet --out " +
                       dir_.string(),
                   &out, &err),
            0)
      << err;
  std::istringstream csv(ReadText((dir_ / "edges.csv").string()));
  std::string header, line;
  std::getline(csv, header);
  EXPECT_EQ(header.substr(0, 33), "point,L,Iout,leg.high,leg.low,cel");
  int mine = 0;
  while (std::getline(csv, line)) mine += line.find(",mine,mine,leg,") != std::string::npos;
  EXPECT_EQ(mine, 4);  // two points x two edges
}

}  // namespace
