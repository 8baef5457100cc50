// Merge benchmark: builds SHARDS synthetic shard stores of POINTS points each
// (two edges of ~45 metrics per point, like a buck run with hand-calculation
// columns), then times zvsmap's merge of them into one store and reports the
// store sizes. Usage: zvsmap_bench_merge [SHARDS] [POINTS_PER_SHARD] [DIR]
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <vector>

#include "store/run_store.h"
#include "store/store_merge.h"

namespace {

double Seconds(std::chrono::steady_clock::time_point since) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - since).count();
}

double MegaBytes(const std::string& path) {
  std::error_code ec;
  double size = 0;
  for (const char* suffix : {"", "-wal"}) {
    auto s = std::filesystem::file_size(path + suffix, ec);
    if (!ec) size += static_cast<double>(s);
  }
  return size / 1e6;
}

}  // namespace

int main(int argc, char** argv) {
  using namespace zvsmap;
  size_t shards = argc > 1 ? std::strtoul(argv[1], nullptr, 10) : 10;
  size_t per_shard = argc > 2 ? std::strtoul(argv[2], nullptr, 10) : 1000;
  std::string dir = argc > 3 ? argv[3] : "/tmp/zvsmap-bench-merge";
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  size_t total = shards * per_shard;

  std::vector<Point> points;
  std::vector<std::string> hashes;
  for (size_t i = 0; i < total; ++i) {
    points.push_back(Point{i, {{"L", 1e-6 + 1e-9 * i}, {"Iout", 0.001 * i}}, {}});
    hashes.push_back("hash" + std::to_string(i));
  }
  auto built = std::chrono::steady_clock::now();
  std::vector<std::string> paths;
  std::string error;
  for (size_t k = 0; k < shards; ++k) {
    paths.push_back(dir + "/shard" + std::to_string(k) + ".sqlite");
    auto store = RunStore::Open(paths.back(), &error);
    if (!store || !store->SetMeta("sweep_identity", "bench", &error)) {
      std::fprintf(stderr, "bench-merge: %s\n", error.c_str());
      return 1;
    }
    for (size_t i = k; i < total; i += shards) {
      PointResult r;
      r.index = i;
      r.status = PointStatus::kOk;
      r.settle = {"shooting", 2, 8, 1e-4, {{"il0", -4.0}, {"vc0", 11.7}}};
      r.wall_s = 0.1;
      for (const char* edge : {"high_on", "low_on"}) {
        EdgeMeasurement e{"leg", edge, ZvsClass::kFull, "v_turn_on <= 10% of rail", {}};
        for (int m = 0; m < 45; ++m) e.metrics.push_back({"metric_" + std::to_string(m), m * 1.5e-9 + i});
        r.edges.push_back(e);
      }
      if (!store->SavePoint(points[i], hashes[i], r, &error)) {
        std::fprintf(stderr, "bench-merge: %s\n", error.c_str());
        return 1;
      }
    }
  }
  double build_s = Seconds(built);

  auto started = std::chrono::steady_clock::now();
  auto target = RunStore::Open(dir + "/merged.sqlite", &error);
  MergeReport report;
  if (!target || !MergeStores(paths, "bench", points, hashes, target.get(), &report, &error)) {
    std::fprintf(stderr, "bench-merge: %s\n", error.c_str());
    return 1;
  }
  double merge_s = Seconds(started);
  double shard_mb = 0;
  for (const auto& p : paths) shard_mb += MegaBytes(p);
  std::printf("shards %zu x %zu points (2 edges x 45 metrics each)\n", shards, per_shard);
  std::printf("writing the shard stores: %.2f s (%.1f ms per point, one transaction each)\n",
              build_s, 1e3 * build_s / static_cast<double>(total));
  std::printf("shard stores: %.1f MB in all, %.2f MB each\n", shard_mb,
              shard_mb / static_cast<double>(shards));
  std::printf("merge: %zu points in %.2f s (%.2f ms per point); merged store %.1f MB\n",
              report.merged, merge_s, 1e3 * merge_s / static_cast<double>(report.merged),
              MegaBytes(dir + "/merged.sqlite"));
  std::printf("missing %zu, duplicated %zu\n", report.missing.size(), report.duplicated.size());
  return 0;
}
