// End-to-end tests of the sealed deck through the built binary: which points
// a rerun keeps after an edit of an included file, a model file, an
// annotation or a comment (exactly: the points that must be kept get an
// injected crash through the test-only binary zvsmap_faulty, so running one
// fails the test), and a corpus of hostile inputs, none of which may run a
// command. Scenarios are invented.
#include <fcntl.h>
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::Source;
using zvsmap_e2e::ReadText;
using zvsmap_e2e::WriteText;
using zvsmap_e2e::Replace;

// Runs zvsmap with `args` in `cwd`; returns the exit status, stderr in `log`.
int RunZvsmapIn(const std::vector<std::string>& args, const std::string& fault, std::string* log,
                const std::string& cwd = "") {
  std::string log_path =
      fs::temp_directory_path() / ("zvsmap_deck_log_" + std::to_string(getpid()));
  pid_t pid = fork();
  if (pid == 0) {
    if (!cwd.empty() && chdir(cwd.c_str()) != 0) _exit(126);
    int out = open(log_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    int null = open("/dev/null", O_WRONLY);
    dup2(out, 2);
    dup2(null, 1);
    if (fault.empty()) {
      unsetenv("ZVSMAP_TEST_FAULT");
    } else {
      setenv("ZVSMAP_TEST_FAULT", fault.c_str(), 1);
    }
    std::vector<std::string> copy = args;
    // Faults need the test-only binary (the same command line, faulty worker seams).
    std::string binary = fault.empty() ? ZVSMAP_BINARY : ZVSMAP_FAULTY_BINARY;
    std::vector<char*> argv{&binary[0]};
    for (auto& a : copy) argv.push_back(&a[0]);
    argv.push_back(nullptr);
    execv(binary.c_str(), argv.data());
    _exit(127);
  }
  int status = 0;
  waitpid(pid, &status, 0);
  *log = ReadText(log_path);
  fs::remove(log_path);
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

// The inv_sw model of tests/netlist/fixtures/reordered_switch.lib (an invented
// switch), with its body-diode model in a file the model file includes.
const char* kModel = R"(* invented switch model for the rerun test
.subckt inv_sw S D G KS TJ params: ron_ohm=10m roff_ohm=1Meg coss_f=1n vth_v=2.5 vsm_v=0.1
+ vds0_v=0 vf_v=0.7 rs_ohm=5m
vch D dch 0
bch dch S i = v(dch,S) * (1/roff_ohm + (0.5/ron_ohm)*(1 + tanh((v(G,KS) - vth_v)/vsm_v)))
cds D S {coss_f} ic={vds0_v}
dbody S D dbody_inv
rtj TJ 0 1G
.ends inv_sw
.include diode.inc
)";
const char* kDiode = "* body diode\n.model dbody_inv d(is=1e-12 n=1 rs=5m tt=0 cjo=0)\n";

// A CSV file's rows with every column whose name holds "wall" emptied.
std::string WithoutTiming(const std::string& csv) {
  std::istringstream in(csv);
  std::string out, line;
  std::getline(in, line);
  std::vector<std::string> header;
  std::stringstream h(line);
  for (std::string f; std::getline(h, f, ',');) header.push_back(f);
  while (std::getline(in, line)) {
    std::stringstream fields(line);
    size_t k = 0;
    for (std::string f; std::getline(fields, f, ','); ++k) {
      if (k < header.size() && header[k].find("wall") != std::string::npos) f.clear();
      out += f + ",";
    }
    out += "\n";
  }
  return out;
}

class DeckE2eTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("zvsmap_deck_e2e_" + std::to_string(getpid()));
    fs::remove_all(dir_);
    fs::create_directories(dir_ / "a");
    fs::create_directories(dir_ / "b");
    for (const auto& entry : fs::directory_iterator(Source("netlists")))
      fs::copy_file(entry.path(), dir_ / entry.path().filename());
    tmpl_ = ReadText(Source("netlists/buck_halfbridge.cir"));
    // The template includes a file of its own (a bleeder on the output).
    tmpl_ = Replace(tmpl_, "\n*@ period", "\n.include load.inc\n*@ period");
    WriteText(P("buck.cir"), tmpl_);
    WriteText(P("load.inc"), "* bleeder\nrbleed out 0 1Meg\n");
    for (const char* d : {"a", "b"}) {
      WriteText(P(std::string(d) + "/sw.lib"), kModel);
      WriteText(P(std::string(d) + "/diode.inc"), kDiode);
    }
    sweep_ = R"(<sweep>
  <!-- invented scenario: two copies of one user switch model as a device axis -->
  <template file="buck.cir"/>
  <device name="a" file="a/sw.lib" subckt="inv_sw" pins="S=s D=d G=g KS=s TJ=25"/>
  <device name="b" file="b/sw.lib" subckt="inv_sw" pins="S=s D=d G=g KS=s TJ=25"/>
  <set param="Vin" value="48"/>
  <set param="Vout" value="12"/>
  <set param="L" value="1u"/>
  <axis device="leg.high leg.low" values="a b"/>
  <axis param="Iout" values="0 8"/>
  <simulation warm-start="off" settle-periods="10" reltol="1e-3"/>
</sweep>
)";
    WriteText(P("s.xml"), sweep_);
  }
  void TearDown() override { fs::remove_all(dir_); }
  std::string P(const std::string& name) const { return (dir_ / name).string(); }
  // Runs the sweep into dir_/out; `keep` are the points that must be kept.
  int RunKeeping(const std::vector<int>& keep, std::string* log, const std::string& sweep = "") {
    std::string fault;
    for (int i : keep)
      fault += (fault.empty() ? "" : ",") + std::string("segv:") + std::to_string(i);
    return RunZvsmapIn({"run", sweep.empty() ? P("s.xml") : sweep, "-o", P("out"), "-j", "2"},
                       fault, log);
  }

  // What the rerun left in dir_/out equals a fresh run of the same inputs
  // into dir_/fresh, timing columns aside.
  void ExpectOutEqualsFreshRun() {
    std::string log;
    ASSERT_EQ(RunZvsmapIn({"run", P("s.xml"), "-o", P("fresh"), "-j", "2"}, "", &log), 0) << log;
    EXPECT_EQ(WithoutTiming(ReadText(P("out/edges.csv"))),
              WithoutTiming(ReadText(P("fresh/edges.csv"))));
  }

  fs::path dir_;
  std::string tmpl_, sweep_;
};


TEST_F(DeckE2eTest, RerunKeepsExactlyThePointsWhoseDeckIsUnchanged) {
  // Points: 0 = a at 0 A, 1 = a at 8 A, 2 = b at 0 A, 3 = b at 8 A.
  std::string log;
  ASSERT_EQ(RunKeeping({}, &log), 0) << log;
  EXPECT_NE(log.find("4 points: 4 ok"), std::string::npos) << log;

  // Comments and blank lines only, in the template, a model file and an include: none reruns.
  WriteText(P("buck.cir"), Replace(tmpl_, "\n*@ period", "\n* a new comment\n\n*@ period"));
  WriteText(P("a/sw.lib"), Replace(kModel, "* invented switch", "* an invented switch"));
  WriteText(P("b/diode.inc"), std::string("\n* edited\n") + kDiode);
  ASSERT_EQ(RunKeeping({0, 1, 2, 3}, &log), 0) << log;
  EXPECT_NE(log.find("4 of 4 points kept from the stored run, 0 to run"), std::string::npos) << log;

  // The file b's model file includes: b's points only.
  WriteText(P("b/diode.inc"), Replace(kDiode, "rs=5m", "rs=6m"));
  ASSERT_EQ(RunKeeping({0, 1}, &log), 0) << log;
  EXPECT_NE(log.find("2 of 4 points kept from the stored run, 2 to run"), std::string::npos) << log;

  // a's model file: a's points only.
  WriteText(P("a/sw.lib"), Replace(kModel, "coss_f=1n", "coss_f=1.2n"));
  ASSERT_EQ(RunKeeping({2, 3}, &log), 0) << log;
  EXPECT_NE(log.find("2 of 4 points kept from the stored run, 2 to run"), std::string::npos) << log;

  // The same sweep named by a relative path from another folder: all kept.
  ASSERT_EQ(RunZvsmapIn({"run", "../s.xml", "-o", P("out"), "-j", "2"},
                        "segv:0,segv:1,segv:2,segv:3", &log, P("a")),
            0)
      << log;
  EXPECT_NE(log.find("4 of 4 points kept from the stored run, 0 to run"), std::string::npos) << log;

  // The file the template includes: every point.
  WriteText(P("load.inc"), "* bleeder\nrbleed out 0 2Meg\n");
  ASSERT_EQ(RunKeeping({}, &log), 0) << log;
  EXPECT_NE(log.find("(0 kept from the stored run)"), std::string::npos) << log;

  // An annotation: every point (the annotations decide what is measured).
  WriteText(P("buck.cir"), Replace(tmpl_, "*@ period 1/fsw", "*@ period 1/(fsw)"));
  ASSERT_EQ(RunKeeping({}, &log), 0) << log;
  EXPECT_NE(log.find("(0 kept from the stored run)"), std::string::npos) << log;

  // One more value on the fastest axis: every old point is kept at its new index
  // (a0 a4 a8 b0 b4 b8: the old points are 0, 2, 3, 5), as the fixture starts
  // every point cold (warm-start="off"; the next test has warm starts).
  WriteText(P("s.xml"), Replace(sweep_, "values=\"0 8\"", "values=\"0 4 8\""));
  ASSERT_EQ(RunKeeping({0, 2, 3, 5}, &log), 0) << log;
  EXPECT_NE(log.find("4 of 6 points kept from the stored run, 2 to run"), std::string::npos) << log;

  // What the rerun kept equals a fresh run of the same inputs.
  ExpectOutEqualsFreshRun();
}

// With warm starts a point's result depends on its chain predecessor, which
// its content hash covers: after a value is inserted on the fastest axis
// (a0 a4 a8 b0 b4 b8) the chains' first points (0, 3) are kept and the 8 A
// points, now started from the new 4 A points, are redone, so the rerun
// equals a fresh run digit for digit.
TEST_F(DeckE2eTest, WarmStartedRerunRedoesPointsWhosePredecessorChanged) {
  const std::string warm = Replace(sweep_, "warm-start=\"off\"", "warm-start=\"on\"");
  WriteText(P("s.xml"), warm);
  std::string log;
  ASSERT_EQ(RunKeeping({}, &log), 0) << log;
  WriteText(P("s.xml"), Replace(warm, "values=\"0 8\"", "values=\"0 4 8\""));
  ASSERT_EQ(RunKeeping({0, 3}, &log), 0) << log;
  EXPECT_NE(log.find("2 of 6 points kept from the stored run, 4 to run"), std::string::npos) << log;
  ExpectOutEqualsFreshRun();
}

TEST_F(DeckE2eTest, EngineMessagesNameTheUsersFileAndLine) {
  // An undefined parameter in b's model file: b's points fail, their reason
  // names b/sw.lib:6 (ngspice itself only says "Netlist line no. N").
  WriteText(P("b/sw.lib"), Replace(kModel, "cds D S {coss_f}", "cds D S {coss_nope}"));
  std::string log;
  EXPECT_EQ(RunKeeping({}, &log), 4) << log;
  std::string csv = ReadText(P("out/edges.csv"));
  EXPECT_NE(csv.find("Undefined parameter [coss_nope] [" + P("b/sw.lib") + ":6]"),
            std::string::npos)
      << csv;
}

}  // namespace
