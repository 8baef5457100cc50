// The run store: one SQLite database per output directory (DIR/run.sqlite,
// WAL mode) holding every finished point as soon as it finishes.
#pragma once

#include <cstddef>
#include <map>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "result/point_result.h"
#include "sweep/point.h"

struct sqlite3;

namespace zvsmap {

/// What a rerun needs to know about a stored point.
struct StoredPointKey {
  size_t index = 0;
  std::string content_hash;
  PointStatus status = PointStatus::kFailed;
};

/// Tables: meta(key, value); points(idx, params, content_hash, status,
/// reason, settle_method, settle_iterations, settle_periods, settle_residual,
/// settle_state (empty; stores from before settled_states held "name=value ..."
/// text, still read), wall_s, log, solver_aid); settled_states(point, ord, init_param,
/// value); edges(point, ord, cell, edge,
/// zvs, criterion); metrics(point, edge, ord, column_name, value);
/// comparisons(point, edge, ord, metric, tag, predicted, difference,
/// relative_difference, beyond_tolerance 1/0/NULL). A field
/// added to PointResult goes into SavePoint and LoadResults (and the codec). Doubles are stored in
/// untyped columns so they come back bit for bit (-0.0 too); NaN is stored as NULL and read back as
/// NaN. Not safe to share across fork(): workers never touch it.
class RunStore {
 public:
  ~RunStore();
  RunStore(const RunStore&) = delete;
  RunStore& operator=(const RunStore&) = delete;

  /// Opens or creates the store at `path`. Returns null with `error` set when
  /// the file cannot be opened or is not a zvsmap store.
  static std::unique_ptr<RunStore> Open(const std::string& path, std::string* error);

  /// A meta value ("" when absent).
  std::string GetMeta(const std::string& key);
  /// Sets a meta value (writes nothing when it already has that value).
  bool SetMeta(const std::string& key, const std::string& value, std::string* error);

  /// Every stored point's index, content hash and status.
  bool ListPoints(std::vector<StoredPointKey>* out, std::string* error);

  /// Replaces point `result.index` (its row, edges and metrics) in one
  /// transaction, committed before this returns.
  bool SavePoint(const Point& point, const std::string& content_hash, const PointResult& result,
                 std::string* error);

  /// Removes every stored point (their rows, edges and metrics) in one
  /// transaction; the meta values stay.
  bool DeleteAllPoints(std::string* error);

  /// Every stored result by index.
  bool LoadResults(std::map<size_t, PointResult>* out, std::string* error);

 private:
  RunStore(sqlite3* db, std::string path) : db_(db), path_(std::move(path)) {}
  bool Exec(const char* sql, std::string* error);
  /// "PATH: message (OS reason)": every error names the store file.
  std::string Where(const std::string& message) const;
  /// Adds columns newer than the store file (solver_aid); false with the reason on failure.
  bool AddMissingColumns(std::string* error);
  /// The operating_points and operating_averages rows of one point (inside
  /// SaveResult's transaction) and of every loaded point.
  bool SaveOperatingPoint(long long idx, const OperatingPoint& op);
  bool LoadOperatingPoints(std::map<size_t, PointResult>* out);
  sqlite3* db_;
  std::string path_;
};

}  // namespace zvsmap
