// End-to-end tests: the built zvsmap binary on small fixture sweeps, with
// real ngspice in its worker processes. Faults (hang:N, segv:N, exitcb:N)
// come through the test-only binary zvsmap_faulty: the same command line with
// the plan in its environment variable ZVSMAP_TEST_FAULT, put into the
// workers' simulator and job seams (tests/testing/fault_injection.h).
#include <fcntl.h>
#include <gtest/gtest.h>
#include <signal.h>
#include <sqlite3.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::Source;
using zvsmap_e2e::ReadText;
using zvsmap_e2e::WriteText;
using zvsmap_e2e::Replace;

// Starts zvsmap with `args`; stderr goes to `log_path`, stdout to /dev/null.
pid_t Start(const std::vector<std::string>& args, const std::string& log_path,
            const std::string& fault = "") {
  pid_t pid = fork();
  if (pid == 0) {
    int log = open(log_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    int null = open("/dev/null", O_WRONLY);
    dup2(log, 2);
    dup2(null, 1);
    if (fault.empty()) {
      unsetenv("ZVSMAP_TEST_FAULT");
    } else {
      setenv("ZVSMAP_TEST_FAULT", fault.c_str(), 1);
    }
    std::vector<char*> argv;
    // Faults need the test-only binary (the same command line, faulty worker seams).
    std::string binary = fault.empty() ? ZVSMAP_BINARY : ZVSMAP_FAULTY_BINARY;
    argv.push_back(&binary[0]);
    std::vector<std::string> copy = args;
    for (auto& a : copy) argv.push_back(&a[0]);
    argv.push_back(nullptr);
    execv(binary.c_str(), argv.data());
    _exit(127);
  }
  return pid;
}

// Exit status, or 128 + signal (as a shell reports it).
int Wait(pid_t pid) {
  int status = 0;
  waitpid(pid, &status, 0);
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

// Stored point rows: total and distinct indices.
std::pair<int, int> StoredPoints(const std::string& db_path) {
  sqlite3* db = nullptr;
  std::pair<int, int> counts{0, 0};
  if (sqlite3_open_v2(db_path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK) {
    sqlite3_busy_timeout(db, 2000);
    sqlite3_stmt* q = nullptr;
    if (sqlite3_prepare_v2(db, "SELECT COUNT(*), COUNT(DISTINCT idx) FROM points", -1, &q,
                           nullptr) == SQLITE_OK &&
        sqlite3_step(q) == SQLITE_ROW) {
      counts = {sqlite3_column_int(q, 0), sqlite3_column_int(q, 1)};
    }
    sqlite3_finalize(q);
  }
  sqlite3_close(db);
  return counts;
}

// Waits until the store holds at least `n` points (or gives up after 60 s).
bool WaitForStoredPoints(const std::string& db_path, int n) {
  auto until = std::chrono::steady_clock::now() + std::chrono::seconds(60);
  while (std::chrono::steady_clock::now() < until) {
    if (fs::exists(db_path) && StoredPoints(db_path).first >= n) return true;
    std::this_thread::sleep_for(std::chrono::milliseconds(50));
  }
  return false;
}

// edges.csv rows split into fields (no quoted commas occur in these fixtures'
// ok rows; reasons are compared whole per row below).
std::vector<std::vector<std::string>> CsvRows(const std::string& path) {
  std::vector<std::vector<std::string>> rows;
  std::istringstream in(ReadText(path));
  std::string line;
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    std::vector<std::string> fields;
    std::string field;
    bool quoted = false;
    for (char c : line) {
      if (c == '"') {
        quoted = !quoted;
      } else if (c == ',' && !quoted) {
        fields.push_back(field);
        field.clear();
      } else {
        field += c;
      }
    }
    fields.push_back(field);
    rows.push_back(fields);
  }
  return rows;
}

// edges.csv with the timing column blanked: the part that must not depend on
// how the run was scheduled.
std::string CsvWithoutTiming(const std::string& path) {
  auto rows = CsvRows(path);
  if (rows.empty()) return "";
  size_t wall = rows[0].size();
  for (size_t i = 0; i < rows[0].size(); ++i) {
    if (rows[0][i] == "wall_time_s") wall = i;
  }
  std::string out;
  for (auto& row : rows) {
    if (wall < row.size()) row[wall] = "";
    for (const auto& f : row) out += f + "|";
    out += "\n";
  }
  return out;
}

// Column `name` of every row whose `point` column is `point`.
std::vector<std::string> Column(const std::string& path, const std::string& point,
                                const std::string& name) {
  auto rows = CsvRows(path);
  std::vector<std::string> values;
  if (rows.empty()) return values;
  size_t col = 0;
  for (size_t i = 0; i < rows[0].size(); ++i) {
    if (rows[0][i] == name) col = i;
  }
  for (size_t r = 1; r < rows.size(); ++r) {
    if (rows[r][0] == point && col < rows[r].size()) values.push_back(rows[r][col]);
  }
  return values;
}

class RunE2eTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-e2e-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = pattern;
    sweep_ = Source("tests/e2e/fixtures/small_buck.xml");
  }
  void TearDown() override {
    if (!HasFailure()) fs::remove_all(dir_);
  }
  std::string Out(const std::string& name) const { return dir_ + "/" + name; }
  int RunZvsmap(const std::vector<std::string>& args, const std::string& fault = "",
                std::string* log = nullptr) {
    std::string log_path = dir_ + "/log" + std::to_string(runs_++) + ".txt";
    int rc = Wait(Start(args, log_path, fault));
    if (log) *log = ReadText(log_path);
    return rc;
  }
  std::string dir_, sweep_;
  int runs_ = 0;
};

TEST_F(RunE2eTest, OneAndTwoWorkersGiveIdenticalEdgesApartFromTiming) {
  std::string log;
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("j1"), "-j", "1"}, "", &log), 0) << log;
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("j2"), "-j", "2"}, "", &log), 0) << log;
  std::string a = CsvWithoutTiming(Out("j1/edges.csv"));
  EXPECT_EQ(a, CsvWithoutTiming(Out("j2/edges.csv")));
  EXPECT_EQ(CsvRows(Out("j1/edges.csv")).size(), 1u + 6 * 2);  // header + 6 points x 2 edges
}

// Warm starts make a point's result depend on its chain predecessor; the
// chains are fixed by the grid and each runs in one worker, so -j 1 and -j 2
// still agree digit for digit.
TEST_F(RunE2eTest, WarmStartedOneAndTwoWorkersGiveIdenticalEdgesApartFromTiming) {
  const std::string warm = Source("tests/e2e/fixtures/small_buck_warm.xml");
  std::string log;
  ASSERT_EQ(RunZvsmap({"run", warm, "-o", Out("w1"), "-j", "1"}, "", &log), 0) << log;
  ASSERT_EQ(RunZvsmap({"run", warm, "-o", Out("w2"), "-j", "2"}, "", &log), 0) << log;
  std::string a = CsvWithoutTiming(Out("w1/edges.csv"));
  EXPECT_EQ(a, CsvWithoutTiming(Out("w2/edges.csv")));
  EXPECT_EQ(CsvRows(Out("w1/edges.csv")).size(), 1u + 6 * 2);
}

TEST_F(RunE2eTest, HangCrashAndEngineExitFailOnlyTheirPoints) {
  std::string log;
  int rc = RunZvsmap({"run", sweep_, "-o", Out("f"), "-j", "2", "--timeout", "3"},
                     "hang:1,segv:3,exitcb:4", &log);
  EXPECT_EQ(rc, 4) << log;  // kExitPointsFailed
  std::string csv = Out("f/edges.csv");
  EXPECT_EQ(Column(csv, "1", "reason"), std::vector<std::string>{"timeout after 3 s"});
  EXPECT_EQ(Column(csv, "3", "reason"), std::vector<std::string>{"crash (signal 11)"});
  EXPECT_EQ(Column(csv, "4", "reason"),
            std::vector<std::string>{"engine error: ngspice stopped (exit callback; test fault)"});
  for (const char* ok : {"0", "2", "5"}) {
    EXPECT_EQ(Column(csv, ok, "status"), (std::vector<std::string>{"ok", "ok"})) << ok;
  }
  EXPECT_NE(log.find("zvsmap: 6 points: 3 ok, 3 failed"), std::string::npos) << log;
  EXPECT_EQ(StoredPoints(Out("f/run.sqlite")), std::make_pair(6, 6));
}

TEST_F(RunE2eTest, KillNineMidSweepThenRerunEqualsAnUninterruptedRun) {
  std::string log;
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("ref"), "-j", "2"}, "", &log), 0) << log;
  pid_t pid = Start({"run", sweep_, "-o", Out("k"), "-j", "2"}, Out("k.log"));
  ASSERT_TRUE(WaitForStoredPoints(Out("k/run.sqlite"), 2));
  kill(pid, SIGKILL);
  EXPECT_EQ(Wait(pid), 128 + SIGKILL);
  int stored = StoredPoints(Out("k/run.sqlite")).first;
  EXPECT_GE(stored, 2);
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("k"), "-j", "2"}, "", &log), 0) << log;
  EXPECT_NE(log.find("points kept from the stored run"), std::string::npos) << log;
  EXPECT_EQ(StoredPoints(Out("k/run.sqlite")), std::make_pair(6, 6));  // each exactly once
  EXPECT_EQ(CsvWithoutTiming(Out("k/edges.csv")), CsvWithoutTiming(Out("ref/edges.csv")));
}

TEST_F(RunE2eTest, RerunSimulatesNothingWhenAllPointsAreStoredOk) {
  std::string log;
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("r"), "-j", "2"}, "", &log), 0) << log;
  // Every point would crash if simulated again: exit 0 proves none was.
  const std::string all = "segv:0,segv:1,segv:2,segv:3,segv:4,segv:5";
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("r"), "-j", "2"}, all, &log), 0) << log;
  EXPECT_NE(log.find("6 of 6 points kept from the stored run, 0 to run"), std::string::npos) << log;
  // --rerun forces them all.
  EXPECT_EQ(RunZvsmap({"run", sweep_, "-o", Out("r"), "-j", "2", "--rerun"}, "segv:2", &log), 4);
  EXPECT_EQ(Column(Out("r/edges.csv"), "2", "reason"),
            std::vector<std::string>{"crash (signal 11)"});
}

TEST_F(RunE2eTest, FailedPointsAreRetriedUnlessAskedNotTo) {
  std::string log;
  EXPECT_EQ(RunZvsmap({"run", sweep_, "-o", Out("x"), "-j", "2"}, "segv:5", &log), 4) << log;
  // Kept as failed: nothing runs, the failure stays.
  EXPECT_EQ(RunZvsmap({"run", sweep_, "-o", Out("x"), "--no-retry-failed"}, "segv:0", &log), 4);
  EXPECT_NE(log.find("6 of 6 points kept"), std::string::npos) << log;
  // Default: the failed point runs again (and now succeeds); ok points are kept.
  EXPECT_EQ(RunZvsmap({"run", sweep_, "-o", Out("x")}, "segv:0,segv:1,segv:2,segv:3,segv:4", &log),
            0)
      << log;
  EXPECT_NE(log.find("5 of 6 points kept from the stored run, 1 to run"), std::string::npos) << log;
}

TEST_F(RunE2eTest, SigintStopsCleanlyAndTheNextRunResumes) {
  pid_t pid = Start({"run", sweep_, "-o", Out("s"), "-j", "1"}, Out("s.log"));
  ASSERT_TRUE(WaitForStoredPoints(Out("s/run.sqlite"), 1));
  kill(pid, SIGINT);
  EXPECT_EQ(Wait(pid), 130);  // kExitInterrupted
  std::string log = ReadText(Out("s.log"));
  EXPECT_NE(log.find("interrupted; run the same command again to resume"), std::string::npos)
      << log;
  // Reports were written from what is stored; the rest is "not run".
  auto rows = CsvRows(Out("s/edges.csv"));
  EXPECT_FALSE(Column(Out("s/edges.csv"), "5", "reason").empty());
  EXPECT_EQ(Column(Out("s/edges.csv"), "5", "reason"), std::vector<std::string>{"not run"});
  ASSERT_EQ(RunZvsmap({"run", sweep_, "-o", Out("s"), "-j", "2"}, "", &log), 0) << log;
  EXPECT_EQ(StoredPoints(Out("s/run.sqlite")), std::make_pair(6, 6));
}

TEST_F(RunE2eTest, ChangedSweepOrTemplateRerunsOnlyPointsWhoseNetlistChanged) {
  // A private copy of the fixture and its template.
  std::string tmpl = ReadText(Source("netlists/buck_halfbridge.cir"));
  std::string tmpl_path = Out("buck.cir");
  WriteText(tmpl_path, tmpl);
  // switches.lib may be included by the template: keep relative includes working.
  for (const auto& entry : fs::directory_iterator(Source("netlists"))) {
    fs::copy_file(entry.path(), Out(entry.path().filename().string()),
                  fs::copy_options::skip_existing);
  }
  std::string sweep =
      Replace(ReadText(sweep_), "../../../netlists/buck_halfbridge.cir", "buck.cir");
  std::string sweep_path = Out("sweep.xml");
  WriteText(sweep_path, sweep);
  std::string log;
  ASSERT_EQ(RunZvsmap({"run", sweep_path, "-o", Out("c"), "-j", "2"}, "", &log), 0) << log;

  // One more inductance (the slowest axis): points 0-5 keep their netlists.
  WriteText(sweep_path, Replace(sweep, "values=\"1u 2.2u\"", "values=\"1u 2.2u 3.3u\""));
  const std::string old_points = "segv:0,segv:1,segv:2,segv:3,segv:4,segv:5";
  ASSERT_EQ(RunZvsmap({"run", sweep_path, "-o", Out("c"), "-j", "2"}, old_points, &log), 0) << log;
  EXPECT_NE(log.find("6 of 9 points kept from the stored run, 3 to run"), std::string::npos) << log;

  // A template default the sweep overrides (L) leaves every rendered netlist alone.
  WriteText(tmpl_path, Replace(tmpl, ".param L=1u", ".param L=4.7u"));
  ASSERT_EQ(RunZvsmap({"run", sweep_path, "-o", Out("c"), "-j", "2"},
                      old_points + ",segv:6,segv:7,segv:8", &log),
            0)
      << log;
  EXPECT_NE(log.find("the sweep or its template changed"), std::string::npos) << log;
  // A value every point uses (the output capacitor) reruns them all.
  WriteText(tmpl_path, Replace(tmpl, ".param Cout=22u", ".param Cout=33u"));
  EXPECT_EQ(RunZvsmap({"run", sweep_path, "-o", Out("c"), "-j", "2"}, "segv:7", &log), 4) << log;
  EXPECT_NE(log.find("9 points: 8 ok, 1 failed"), std::string::npos) << log;
}

TEST_F(RunE2eTest, MissingSweepFileIsBadInput) {
  std::string log;
  EXPECT_EQ(RunZvsmap({"run", Out("absent.xml"), "-o", Out("b")}, "", &log), 2) << log;
  EXPECT_FALSE(fs::exists(Out("b/run.sqlite")));
}

}  // namespace
