// Unit tests of the SQLite run store and the content hashes.
#include "store/run_store.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <limits>

#include "store/content_hash.h"

namespace zvsmap {
namespace {

bool SameBits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

class RunStoreTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-store-test-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = pattern;
    path_ = dir_ + "/run.sqlite";
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }
  std::string dir_, path_;
};

PointResult FullResult() {
  PointResult r;
  r.index = 7;
  r.status = PointStatus::kUnsettled;
  r.reason = "residual 3e-3 above 1e-3, \"quoted\", comma";
  r.log = "stdout line one\nstderr Error: something\n";
  r.settle = {SettleMethod::kShooting,
              4,
              17,
              0.1 + 0.2,
              {{"il0", -4.0000000000000009}, {"vc0", -0.0}, {"x", 1e-300}},
              {0.1, -0.2, 0.3, 1e-300, -0.0, 2.5, 1.0 / 7.0, -9.0, 4.0}};
  r.wall_s = 1.0 / 3.0;
  r.solver_aid = "rshunt";
  EdgeMeasurement e1{"leg", "high_on", ZvsClass::kPartial, "v_turn_on <= 4.8 V", {}};
  e1.metrics = {{"rail_v", 48.000000000000007},
                {"i_commutated_a", -4.0000000000000009},
                {"t_transition_s", std::numeric_limits<double>::quiet_NaN()},
                {"neg_zero", -0.0},
                {"huge", std::numeric_limits<double>::infinity()},
                {"tiny", 4.9406564584124654e-324}};
  e1.comparisons = {{"i_commutated_a", "pred", -4.25, 0.25, 0.25 / 4.25, false},
                    {"t_transition_s", "pred_energy", NAN, NAN, NAN, std::nullopt},
                    {"", "my_guess", -0.0, NAN, NAN, std::nullopt}};
  EdgeMeasurement e2{"leg", "low_on", ZvsClass::kFull, "x", {{"rail_v", 47.9}}};
  EdgeMeasurement e3{"aux", "low_on", ZvsClass::kUnknown, "", {}};
  r.edges = {e1, e2, e3};
  return r;
}

void ExpectSame(const PointResult& a, const PointResult& b) {
  EXPECT_EQ(a.index, b.index);
  EXPECT_EQ(a.status, b.status);
  EXPECT_EQ(a.reason, b.reason);
  EXPECT_EQ(a.log, b.log);
  EXPECT_EQ(a.settle.method, b.settle.method);
  EXPECT_EQ(a.settle.iterations, b.settle.iterations);
  EXPECT_EQ(a.settle.periods, b.settle.periods);
  EXPECT_TRUE(SameBits(a.settle.residual, b.settle.residual) ||
              (std::isnan(a.settle.residual) && std::isnan(b.settle.residual)));
  EXPECT_TRUE(SameBits(a.wall_s, b.wall_s));
  EXPECT_EQ(a.solver_aid, b.solver_aid);
  ASSERT_EQ(a.settle.initial_state.size(), b.settle.initial_state.size());
  for (size_t i = 0; i < a.settle.initial_state.size(); ++i) {
    EXPECT_EQ(a.settle.initial_state[i].init_param, b.settle.initial_state[i].init_param);
    EXPECT_TRUE(SameBits(a.settle.initial_state[i].value, b.settle.initial_state[i].value));
  }
  // The Jacobian too, bit for bit: a resumed run warm-starts as the
  // uninterrupted one did (run/chain_memory.h).
  ASSERT_EQ(a.settle.jacobian.size(), b.settle.jacobian.size());
  for (size_t i = 0; i < a.settle.jacobian.size(); ++i) {
    EXPECT_TRUE(SameBits(a.settle.jacobian[i], b.settle.jacobian[i])) << i;
  }
  ASSERT_EQ(a.edges.size(), b.edges.size());
  for (size_t e = 0; e < a.edges.size(); ++e) {
    EXPECT_EQ(a.edges[e].cell, b.edges[e].cell);
    EXPECT_EQ(a.edges[e].edge, b.edges[e].edge);
    EXPECT_EQ(a.edges[e].zvs, b.edges[e].zvs);
    EXPECT_EQ(a.edges[e].criterion, b.edges[e].criterion);
    ASSERT_EQ(a.edges[e].metrics.size(), b.edges[e].metrics.size());
    for (size_t k = 0; k < a.edges[e].metrics.size(); ++k) {
      const Metric& x = a.edges[e].metrics[k];
      const Metric& y = b.edges[e].metrics[k];
      EXPECT_EQ(x.column, y.column);
      // Exact bits, NaN only as NaN (IEEE 754: NaN payloads are not kept).
      EXPECT_TRUE(SameBits(x.value, y.value) || (std::isnan(x.value) && std::isnan(y.value)))
          << x.column << ": " << x.value << " vs " << y.value;
    }
    ASSERT_EQ(a.edges[e].comparisons.size(), b.edges[e].comparisons.size());
    for (size_t k = 0; k < a.edges[e].comparisons.size(); ++k) {
      const Comparison& x = a.edges[e].comparisons[k];
      const Comparison& y = b.edges[e].comparisons[k];
      EXPECT_EQ(x.metric, y.metric);
      EXPECT_EQ(x.tag, y.tag);
      for (auto [u, v] : {std::pair{x.predicted, y.predicted},
                          {x.difference, y.difference},
                          {x.relative_difference, y.relative_difference}}) {
        EXPECT_TRUE(SameBits(u, v) || (std::isnan(u) && std::isnan(v))) << x.Name();
      }
      EXPECT_EQ(x.beyond_tolerance, y.beyond_tolerance) << x.Name();
    }
  }
}

TEST_F(RunStoreTest, EveryFieldRoundTripsExactly) {
  std::string error;
  auto store = RunStore::Open(path_, &error);
  ASSERT_TRUE(store) << error;
  Point point{7, {{"Vin", 48}, {"L", 1e-6}}};
  PointResult r = FullResult();
  ASSERT_TRUE(store->SavePoint(point, "abc", r, &error)) << error;
  std::map<size_t, PointResult> loaded;
  ASSERT_TRUE(store->LoadResults(&loaded, &error)) << error;
  ASSERT_EQ(loaded.size(), 1u);
  ExpectSame(r, loaded.at(7));
}

TEST_F(RunStoreTest, ReopenedStoreKeepsCommittedPoints) {
  std::string error;
  {
    auto store = RunStore::Open(path_, &error);
    ASSERT_TRUE(store) << error;
    for (size_t i = 0; i < 3; ++i) {
      PointResult r;
      r.index = i;
      r.status = i == 1 ? PointStatus::kFailed : PointStatus::kOk;
      ASSERT_TRUE(store->SavePoint(Point{i, {}}, "h" + std::to_string(i), r, &error)) << error;
    }
    ASSERT_TRUE(store->SetMeta("sweep_identity", "0123", &error));
  }
  auto store = RunStore::Open(path_, &error);
  ASSERT_TRUE(store) << error;
  std::vector<StoredPointKey> keys;
  ASSERT_TRUE(store->ListPoints(&keys, &error)) << error;
  ASSERT_EQ(keys.size(), 3u);
  EXPECT_EQ(keys[1].content_hash, "h1");
  EXPECT_EQ(keys[1].status, PointStatus::kFailed);
  EXPECT_EQ(keys[2].status, PointStatus::kOk);
  EXPECT_EQ(store->GetMeta("sweep_identity"), "0123");
  EXPECT_EQ(store->GetMeta("absent"), "");
}

TEST_F(RunStoreTest, SavingAPointAgainReplacesItsEdges) {
  std::string error;
  auto store = RunStore::Open(path_, &error);
  ASSERT_TRUE(store) << error;
  PointResult r = FullResult();
  ASSERT_TRUE(store->SavePoint(Point{7, {}}, "a", r, &error)) << error;
  r.edges.resize(1);
  r.status = PointStatus::kOk;
  ASSERT_TRUE(store->SavePoint(Point{7, {}}, "b", r, &error)) << error;
  std::map<size_t, PointResult> loaded;
  ASSERT_TRUE(store->LoadResults(&loaded, &error)) << error;
  ExpectSame(r, loaded.at(7));
}

TEST_F(RunStoreTest, StoreUsesWriteAheadLog) {
  std::string error;
  auto store = RunStore::Open(path_, &error);
  ASSERT_TRUE(store) << error;
  ASSERT_TRUE(store->SavePoint(Point{0, {}}, "a", PointResult(), &error)) << error;
  // SQLite keeps a "-wal" file beside the database in WAL mode (sqlite.org/wal.html).
  EXPECT_TRUE(std::filesystem::exists(path_ + "-wal"));
}

TEST_F(RunStoreTest, NotADatabaseIsRejected) {
  {
    FILE* f = std::fopen(path_.c_str(), "w");
    std::fputs("this is not sqlite, just text that is long enough to fill a header\n", f);
    std::fclose(f);
  }
  std::string error;
  EXPECT_FALSE(RunStore::Open(path_, &error));
  EXPECT_NE(error.find("run.sqlite: not a usable run store"), std::string::npos) << error;
}

TEST(ContentHashTest, Fnv1aPublishedVectors) {
  // FNV-1a 64-bit test vectors (Fowler/Noll/Vo reference code, test suite):
  // "" -> cbf29ce484222325, "a" -> af63dc4c8601ec8c, "foobar" -> 85944171f73967e8.
  EXPECT_EQ(HexHash(Fnv1a64("")), "cbf29ce484222325");
  EXPECT_EQ(HexHash(Fnv1a64("a")), "af63dc4c8601ec8c");
  EXPECT_EQ(HexHash(Fnv1a64("foobar")), "85944171f73967e8");
}

TEST(ContentHashTest, PointHashFollowsNetlistAndSettings) {
  SweepSpec spec;
  Template tmpl;
  std::string a = PointContentHash("netlist A\n", spec, tmpl);
  EXPECT_EQ(a, PointContentHash("netlist A\n", spec, tmpl));
  EXPECT_NE(a, PointContentHash("netlist B\n", spec, tmpl));
  SweepSpec other = spec;
  other.zvs.value = 0.2;
  EXPECT_NE(a, PointContentHash("netlist A\n", other, tmpl));
  other = spec;
  other.simulation.timeout_s = 99;  // a time limit does not change a result
  EXPECT_EQ(a, PointContentHash("netlist A\n", other, tmpl));
}

TEST_F(RunStoreTest, UnopenableStoreNamesThePathAndTheSystemReason) {
  std::string path = dir_ + "/absent/run.sqlite";
  std::string error;
  EXPECT_FALSE(RunStore::Open(path, &error));
  EXPECT_EQ(error, path +
                       ": cannot open the run store: unable to open database file (No such "
                       "file or directory)");
}

}  // namespace
}  // namespace zvsmap
