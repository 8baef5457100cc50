#include "store/run_store.h"

#include <sqlite3.h>

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <limits>

namespace zvsmap {
namespace {

constexpr const char* kSchema =
    "CREATE TABLE IF NOT EXISTS meta(key TEXT PRIMARY KEY, value TEXT NOT NULL);"
    "CREATE TABLE IF NOT EXISTS points(idx INTEGER PRIMARY KEY, params TEXT NOT NULL,"
    " content_hash TEXT NOT NULL, status TEXT NOT NULL, reason TEXT NOT NULL,"
    " settle_method TEXT NOT NULL, settle_iterations INTEGER NOT NULL,"
    " settle_periods REAL NOT NULL, settle_residual, settle_state TEXT NOT NULL, wall_s,"
    " log TEXT NOT NULL, solver_aid TEXT NOT NULL DEFAULT '');"
    "CREATE TABLE IF NOT EXISTS edges(point INTEGER NOT NULL, ord INTEGER NOT NULL,"
    " cell TEXT NOT NULL, edge TEXT NOT NULL, zvs TEXT NOT NULL, criterion TEXT NOT NULL,"
    " PRIMARY KEY(point, ord));"
    "CREATE TABLE IF NOT EXISTS metrics(point INTEGER NOT NULL, edge INTEGER NOT NULL,"
    " ord INTEGER NOT NULL, column_name TEXT NOT NULL, value,"
    " PRIMARY KEY(point, edge, ord));"
    "CREATE TABLE IF NOT EXISTS comparisons(point INTEGER NOT NULL, edge INTEGER NOT NULL,"
    " ord INTEGER NOT NULL, metric TEXT NOT NULL, tag TEXT NOT NULL, predicted, difference,"
    " relative_difference, beyond_tolerance, PRIMARY KEY(point, edge, ord));"
    "CREATE TABLE IF NOT EXISTS settled_states(point INTEGER NOT NULL, ord INTEGER NOT NULL,"
    " init_param TEXT NOT NULL, value, PRIMARY KEY(point, ord));"
    "CREATE TABLE IF NOT EXISTS settled_jacobians(point INTEGER NOT NULL, ord INTEGER NOT NULL,"
    " value NOT NULL, PRIMARY KEY(point, ord));"
    "CREATE TABLE IF NOT EXISTS operating_points(point INTEGER PRIMARY KEY, loop TEXT NOT NULL,"
    " control, set_point, regulated_avg, p_in_w, p_out_w);"
    "CREATE TABLE IF NOT EXISTS operating_averages(point INTEGER NOT NULL, ord INTEGER NOT NULL,"
    " vector TEXT NOT NULL, value, PRIMARY KEY(point, ord));";

// A prepared statement that finalizes itself.
class Statement {
 public:
  Statement(sqlite3* db, const char* sql) { sqlite3_prepare_v2(db, sql, -1, &stmt_, nullptr); }
  ~Statement() { sqlite3_finalize(stmt_); }
  bool ok() const { return stmt_ != nullptr; }
  void Text(int i, const std::string& s) {
    sqlite3_bind_text(stmt_, i, s.data(), static_cast<int>(s.size()), SQLITE_TRANSIENT);
  }
  void Int(int i, long long v) { sqlite3_bind_int64(stmt_, i, v); }
  void Double(int i, double v) {
    if (std::isnan(v)) {
      sqlite3_bind_null(stmt_, i);
    } else {
      sqlite3_bind_double(stmt_, i, v);
    }
  }
  int Step() { return sqlite3_step(stmt_); }
  void Reset() {
    sqlite3_reset(stmt_);
    sqlite3_clear_bindings(stmt_);
  }
  std::string ColText(int i) {
    const unsigned char* p = sqlite3_column_text(stmt_, i);
    return p ? std::string(reinterpret_cast<const char*>(p),
                           static_cast<size_t>(sqlite3_column_bytes(stmt_, i)))
             : std::string();
  }
  long long ColInt(int i) { return sqlite3_column_int64(stmt_, i); }
  double ColDouble(int i) {
    if (sqlite3_column_type(stmt_, i) == SQLITE_NULL) {
      return std::numeric_limits<double>::quiet_NaN();
    }
    return sqlite3_column_double(stmt_, i);
  }

 private:
  sqlite3_stmt* stmt_ = nullptr;
};

// A stored status; text no version wrote reads as failed.
PointStatus StatusFromName(const std::string& name) {
  PointStatus s = PointStatus::kFailed;
  PointStatusFromName(name, &s);
  return s;
}

SettleMethod MethodFromName(const std::string& name) {
  SettleMethod m = SettleMethod::kNotAttempted;
  SettleMethodFromName(name, &m);
  return m;
}

// One row of the comparisons table; beyond_tolerance 1/0, NULL when empty.
bool InsertComparison(Statement& q, long long idx, size_t edge, size_t ord, const Comparison& c) {
  q.Reset();
  q.Int(1, idx);
  q.Int(2, static_cast<long long>(edge));
  q.Int(3, static_cast<long long>(ord));
  q.Text(4, c.metric);
  q.Text(5, c.tag);
  q.Double(6, c.predicted);
  q.Double(7, c.difference);
  q.Double(8, c.relative_difference);
  q.Double(9, c.beyond_tolerance ? (*c.beyond_tolerance ? 1.0 : 0.0) : NAN);
  return q.Step() == SQLITE_DONE;
}

// Columns: metric, tag, predicted, difference, relative_difference, beyond_tolerance from `first`.
Comparison ReadComparison(Statement& q, int first) {
  Comparison c;
  c.metric = q.ColText(first);
  c.tag = q.ColText(first + 1);
  c.predicted = q.ColDouble(first + 2);
  c.difference = q.ColDouble(first + 3);
  c.relative_difference = q.ColDouble(first + 4);
  double beyond = q.ColDouble(first + 5);
  if (!std::isnan(beyond)) c.beyond_tolerance = beyond > 0.5;
  return c;
}

ZvsClass ZvsFromName(const std::string& name) {
  for (ZvsClass c : {ZvsClass::kFull, ZvsClass::kPartial, ZvsClass::kHard}) {
    if (name == ZvsClassName(c)) return c;
  }
  return ZvsClass::kUnknown;
}

// "name=value name=value", values with 17 significant digits (exact for
// binary64: IEEE 754-2008, 5.12.2).
std::string PairsText(const std::vector<SettledState>& pairs) {
  std::string text;
  char buf[48];
  for (const auto& [name, value] : pairs) {
    std::snprintf(buf, sizeof buf, "%.17g", value);
    if (!text.empty()) text += ' ';
    text += name + "=" + buf;
  }
  return text;
}

std::vector<SettledState> ParsePairs(const std::string& text) {
  std::vector<SettledState> pairs;
  size_t pos = 0;
  while (pos < text.size()) {
    size_t end = text.find(' ', pos);
    if (end == std::string::npos) end = text.size();
    std::string item = text.substr(pos, end - pos);
    size_t eq = item.rfind('=');
    if (eq != std::string::npos) {
      pairs.push_back({item.substr(0, eq), std::strtod(item.c_str() + eq + 1, nullptr)});
    }
    pos = end + 1;
  }
  return pairs;
}

std::string ParamsText(const Point& point) {
  std::vector<SettledState> pairs;
  for (const auto& v : point.values) pairs.push_back({v.name, v.value});
  return PairsText(pairs);
}

}  // namespace

RunStore::~RunStore() { sqlite3_close(db_); }

std::unique_ptr<RunStore> RunStore::Open(const std::string& path, std::string* error) {
  sqlite3* db = nullptr;
  if (sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE, nullptr) !=
      SQLITE_OK) {
    int os_error = db ? sqlite3_system_errno(db) : 0;
    *error = path + ": cannot open the run store: " + (db ? sqlite3_errmsg(db) : "out of memory") +
             (os_error != 0 ? std::string(" (") + std::strerror(os_error) + ")" : "");
    sqlite3_close(db);
    return nullptr;
  }
  std::unique_ptr<RunStore> store(new RunStore(db, path));
  sqlite3_busy_timeout(db, 5000);
  std::string why;
  // WAL: a commit is one append to the log; a killed process loses nothing
  // committed. synchronous=NORMAL is durable against process death (not
  // against power loss of the last commits), which is what a rerun needs.
  if (!store->Exec("PRAGMA journal_mode=WAL; PRAGMA synchronous=NORMAL;", &why) ||
      !store->Exec(kSchema, &why) || !store->AddMissingColumns(&why)) {
    *error = store->Where("not a usable run store: " + why);
    return nullptr;
  }
  return store;
}

std::string RunStore::Where(const std::string& message) const {
  // SQLite's text ("database or disk is full") plus the OS's reason when a
  // system call failed (ENOSPC, EIO, EACCES, ...).
  int os_error = sqlite3_system_errno(db_);
  // SQLite clears the system error when a write finds the disk full.
  if (os_error == 0 && (sqlite3_errcode(db_) & 0xff) == SQLITE_FULL) os_error = ENOSPC;
  return path_ + ": " + message +
         (os_error != 0 ? std::string(" (") + std::strerror(os_error) + ")" : "");
}

bool RunStore::DeleteAllPoints(std::string* error) {
  std::string why;
  if (!Exec("BEGIN IMMEDIATE; DELETE FROM comparisons; DELETE FROM metrics; DELETE FROM edges; "
            "DELETE FROM settled_states; DELETE FROM settled_jacobians; "
            "DELETE FROM operating_points; DELETE FROM operating_averages; "
            "DELETE FROM points; COMMIT;",
            &why)) {
    std::string ignored;
    Exec("ROLLBACK", &ignored);
    *error = Where(why);
    return false;
  }
  return true;
}

bool RunStore::AddMissingColumns(std::string* error) {
  // A store written before the solver-aid column existed gets it (empty).
  Statement probe(db_, "SELECT solver_aid FROM points LIMIT 0");
  if (probe.ok()) return true;
  return Exec("ALTER TABLE points ADD COLUMN solver_aid TEXT NOT NULL DEFAULT ''", error);
}

bool RunStore::Exec(const char* sql, std::string* error) {
  char* message = nullptr;
  if (sqlite3_exec(db_, sql, nullptr, nullptr, &message) != SQLITE_OK) {
    *error = message ? message : sqlite3_errmsg(db_);
    sqlite3_free(message);
    return false;
  }
  return true;
}

std::string RunStore::GetMeta(const std::string& key) {
  Statement q(db_, "SELECT value FROM meta WHERE key = ?");
  if (!q.ok()) return "";
  q.Text(1, key);
  return q.Step() == SQLITE_ROW ? q.ColText(0) : "";
}

bool RunStore::SetMeta(const std::string& key, const std::string& value, std::string* error) {
  if (GetMeta(key) == value && !value.empty()) return true;  // a rerun writes nothing it need not
  Statement q(db_, "INSERT OR REPLACE INTO meta(key, value) VALUES(?, ?)");
  q.Text(1, key);
  q.Text(2, value);
  if (!q.ok() || q.Step() != SQLITE_DONE) {
    *error = Where(sqlite3_errmsg(db_));
    return false;
  }
  return true;
}

bool RunStore::ListPoints(std::vector<StoredPointKey>* out, std::string* error) {
  Statement q(db_, "SELECT idx, content_hash, status FROM points ORDER BY idx");
  if (!q.ok()) {
    *error = Where(sqlite3_errmsg(db_));
    return false;
  }
  int rc;
  while ((rc = q.Step()) == SQLITE_ROW) {
    out->push_back({static_cast<size_t>(q.ColInt(0)), q.ColText(1), StatusFromName(q.ColText(2))});
  }
  if (rc != SQLITE_DONE) {
    *error = Where(sqlite3_errmsg(db_));
    return false;
  }
  return true;
}

bool RunStore::SavePoint(const Point& point, const std::string& content_hash, const PointResult& r,
                         std::string* error) {
  auto fail = [&](const char* what) {
    *error = Where(std::string(what) + ": " + sqlite3_errmsg(db_));
    std::string ignored;
    Exec("ROLLBACK", &ignored);
    return false;
  };
  std::string why;
  if (!Exec("BEGIN IMMEDIATE", &why)) {
    *error = Where(why);
    return false;
  }
  long long idx = static_cast<long long>(r.index);
  {
    Statement del_m(db_, "DELETE FROM metrics WHERE point = ?");
    Statement del_e(db_, "DELETE FROM edges WHERE point = ?");
    Statement del_c(db_, "DELETE FROM comparisons WHERE point = ?");
    Statement del_s(db_, "DELETE FROM settled_states WHERE point = ?");
    Statement del_o(db_, "DELETE FROM operating_points WHERE point = ?");
    Statement del_a(db_, "DELETE FROM operating_averages WHERE point = ?");
    Statement del_j(db_, "DELETE FROM settled_jacobians WHERE point = ?");
    del_o.Int(1, idx);
    del_a.Int(1, idx);
    del_j.Int(1, idx);
    if (!del_o.ok() || !del_a.ok() || !del_j.ok() || del_o.Step() != SQLITE_DONE ||
        del_a.Step() != SQLITE_DONE || del_j.Step() != SQLITE_DONE) {
      return fail("delete");
    }
    del_m.Int(1, idx);
    del_e.Int(1, idx);
    del_c.Int(1, idx);
    del_s.Int(1, idx);
    if (!del_m.ok() || !del_e.ok() || !del_c.ok() || !del_s.ok() || del_m.Step() != SQLITE_DONE ||
        del_e.Step() != SQLITE_DONE || del_c.Step() != SQLITE_DONE || del_s.Step() != SQLITE_DONE) {
      return fail("delete");
    }
    Statement ins(
        db_,
        "INSERT OR REPLACE INTO points(idx, params, content_hash, status, reason,"
        " settle_method, settle_iterations, settle_periods, settle_residual, settle_state,"
        " wall_s, log, solver_aid) VALUES(?,?,?,?,?,?,?,?,?,?,?,?,?)");
    if (!ins.ok()) return fail("prepare");
    ins.Int(1, idx);
    ins.Text(2, ParamsText(point));
    ins.Text(3, content_hash);
    ins.Text(4, PointStatusName(r.status));
    ins.Text(5, r.reason);
    ins.Text(6, SettleMethodName(r.settle.method));
    ins.Int(7, r.settle.iterations);
    ins.Double(8, r.settle.periods);
    ins.Double(9, r.settle.residual);
    ins.Text(10, "");  // stores before the settled_states table kept the state here as text
    ins.Double(11, r.wall_s);
    ins.Text(12, r.log);
    ins.Text(13, r.solver_aid);
    if (ins.Step() != SQLITE_DONE) return fail("insert point");
    Statement state(db_,
                    "INSERT INTO settled_states(point, ord, init_param, value) VALUES(?,?,?,?)");
    if (!state.ok()) return fail("prepare");
    for (size_t k = 0; k < r.settle.initial_state.size(); ++k) {
      state.Reset();
      state.Int(1, idx);
      state.Int(2, static_cast<long long>(k));
      state.Text(3, r.settle.initial_state[k].init_param);
      state.Double(4, r.settle.initial_state[k].value);
      if (state.Step() != SQLITE_DONE) return fail("insert settled state");
    }
    Statement jac(db_, "INSERT INTO settled_jacobians(point, ord, value) VALUES(?,?,?)");
    if (!jac.ok()) return fail("prepare");
    for (size_t k = 0; k < r.settle.jacobian.size(); ++k) {
      jac.Reset();
      jac.Int(1, idx);
      jac.Int(2, static_cast<long long>(k));
      jac.Double(3, r.settle.jacobian[k]);
      if (jac.Step() != SQLITE_DONE) return fail("insert settled Jacobian");
    }
    if (!SaveOperatingPoint(idx, r.operating)) return fail("insert operating point");

    Statement edge(db_,
                   "INSERT INTO edges(point, ord, cell, edge, zvs, criterion) VALUES(?,?,?,?,?,?)");
    Statement metric(db_,
                     "INSERT INTO metrics(point, edge, ord, column_name, value) VALUES(?,?,?,?,?)");
    Statement comparison(db_,
                         "INSERT INTO comparisons(point, edge, ord, metric, tag, predicted,"
                         " difference, relative_difference, beyond_tolerance)"
                         " VALUES(?,?,?,?,?,?,?,?,?)");
    if (!edge.ok() || !metric.ok() || !comparison.ok()) return fail("prepare");
    for (size_t e = 0; e < r.edges.size(); ++e) {
      const EdgeMeasurement& m = r.edges[e];
      edge.Reset();
      edge.Int(1, idx);
      edge.Int(2, static_cast<long long>(e));
      edge.Text(3, m.cell);
      edge.Text(4, m.edge);
      edge.Text(5, ZvsClassName(m.zvs));
      edge.Text(6, m.criterion);
      if (edge.Step() != SQLITE_DONE) return fail("insert edge");
      for (size_t k = 0; k < m.metrics.size(); ++k) {
        metric.Reset();
        metric.Int(1, idx);
        metric.Int(2, static_cast<long long>(e));
        metric.Int(3, static_cast<long long>(k));
        metric.Text(4, m.metrics[k].column);
        metric.Double(5, m.metrics[k].value);
        if (metric.Step() != SQLITE_DONE) return fail("insert metric");
      }
      for (size_t k = 0; k < m.comparisons.size(); ++k) {
        if (!InsertComparison(comparison, idx, e, k, m.comparisons[k])) {
          return fail("insert comparison");
        }
      }
    }
  }
  if (!Exec("COMMIT", &why)) {
    *error = Where(why);
    Exec("ROLLBACK", &why);
    return false;
  }
  return true;
}

bool RunStore::SaveOperatingPoint(long long idx, const OperatingPoint& op) {
  Statement point(db_,
                  "INSERT INTO operating_points(point, loop, control, set_point, regulated_avg,"
                  " p_in_w, p_out_w) VALUES(?,?,?,?,?,?,?)");
  Statement average(db_,
                    "INSERT INTO operating_averages(point, ord, vector, value) VALUES(?,?,?,?)");
  if (!point.ok() || !average.ok()) return false;
  point.Int(1, idx);
  point.Text(2, LoopKindName(op.loop));
  int column = 3;
  for (double v : {op.control, op.set_point, op.regulated_avg, op.p_in_w, op.p_out_w}) {
    point.Double(column++, v);
  }
  if (point.Step() != SQLITE_DONE) return false;
  for (size_t k = 0; k < op.averages.size(); ++k) {
    average.Reset();
    average.Int(1, idx);
    average.Int(2, static_cast<long long>(k));
    average.Text(3, op.averages[k].vector);
    average.Double(4, op.averages[k].value);
    if (average.Step() != SQLITE_DONE) return false;
  }
  return true;
}

bool RunStore::LoadOperatingPoints(std::map<size_t, PointResult>* out) {
  Statement points(db_,
                   "SELECT point, loop, control, set_point, regulated_avg, p_in_w, p_out_w"
                   " FROM operating_points");
  Statement averages(db_,
                     "SELECT point, vector, value FROM operating_averages ORDER BY point, ord");
  if (!points.ok() || !averages.ok()) return false;
  int rc;
  while ((rc = points.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(points.ColInt(0)));
    if (it == out->end()) continue;
    OperatingPoint& op = it->second.operating;
    LoopKindFromName(points.ColText(1), &op.loop);
    int column = 2;
    for (double* v : {&op.control, &op.set_point, &op.regulated_avg, &op.p_in_w, &op.p_out_w}) {
      *v = points.ColDouble(column++);
    }
  }
  if (rc != SQLITE_DONE) return false;
  while ((rc = averages.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(averages.ColInt(0)));
    if (it != out->end()) {
      it->second.operating.averages.push_back({averages.ColText(1), averages.ColDouble(2)});
    }
  }
  return rc == SQLITE_DONE;
}

bool RunStore::LoadResults(std::map<size_t, PointResult>* out, std::string* error) {
  auto fail = [&]() {
    *error = Where(sqlite3_errmsg(db_));
    return false;
  };
  Statement points(
      db_,
      "SELECT idx, status, reason, settle_method, settle_iterations, settle_periods,"
      " settle_residual, settle_state, wall_s, log, solver_aid FROM points ORDER BY idx");
  Statement edges(db_, "SELECT point, cell, edge, zvs, criterion FROM edges ORDER BY point, ord");
  Statement metrics(
      db_, "SELECT point, edge, column_name, value FROM metrics ORDER BY point, edge, ord");
  Statement comparisons(db_,
                        "SELECT point, edge, metric, tag, predicted, difference,"
                        " relative_difference, beyond_tolerance FROM comparisons"
                        " ORDER BY point, edge, ord");
  Statement states(db_, "SELECT point, init_param, value FROM settled_states ORDER BY point, ord");
  Statement jacobians(db_, "SELECT point, value FROM settled_jacobians ORDER BY point, ord");
  if (!points.ok() || !edges.ok() || !metrics.ok() || !comparisons.ok() || !states.ok() ||
      !jacobians.ok()) {
    return fail();
  }
  int rc;
  while ((rc = points.Step()) == SQLITE_ROW) {
    PointResult r;
    r.index = static_cast<size_t>(points.ColInt(0));
    r.status = StatusFromName(points.ColText(1));
    r.reason = points.ColText(2);
    r.settle.method = MethodFromName(points.ColText(3));
    r.settle.iterations = static_cast<int>(points.ColInt(4));
    r.settle.periods = points.ColDouble(5);
    r.settle.residual = points.ColDouble(6);
    r.settle.initial_state = ParsePairs(points.ColText(7));
    r.wall_s = points.ColDouble(8);
    r.log = points.ColText(9);
    r.solver_aid = points.ColText(10);
    (*out)[r.index] = std::move(r);
  }
  if (rc != SQLITE_DONE) return fail();
  while ((rc = states.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(states.ColInt(0)));
    if (it != out->end()) {
      it->second.settle.initial_state.push_back({states.ColText(1), states.ColDouble(2)});
    }
  }
  if (rc != SQLITE_DONE) return fail();
  while ((rc = jacobians.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(jacobians.ColInt(0)));
    if (it != out->end()) it->second.settle.jacobian.push_back(jacobians.ColDouble(1));
  }
  if (rc != SQLITE_DONE) return fail();
  while ((rc = edges.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(edges.ColInt(0)));
    if (it == out->end()) continue;
    EdgeMeasurement e;
    e.cell = edges.ColText(1);
    e.edge = edges.ColText(2);
    e.zvs = ZvsFromName(edges.ColText(3));
    e.criterion = edges.ColText(4);
    it->second.edges.push_back(std::move(e));
  }
  if (rc != SQLITE_DONE) return fail();
  while ((rc = metrics.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(metrics.ColInt(0)));
    size_t e = static_cast<size_t>(metrics.ColInt(1));
    if (it == out->end() || e >= it->second.edges.size()) continue;
    it->second.edges[e].metrics.push_back({metrics.ColText(2), metrics.ColDouble(3)});
  }
  if (rc != SQLITE_DONE) return fail();
  while ((rc = comparisons.Step()) == SQLITE_ROW) {
    auto it = out->find(static_cast<size_t>(comparisons.ColInt(0)));
    size_t e = static_cast<size_t>(comparisons.ColInt(1));
    if (it == out->end() || e >= it->second.edges.size()) continue;
    it->second.edges[e].comparisons.push_back(ReadComparison(comparisons, 2));
  }
  if (rc != SQLITE_DONE) return fail();
  if (!LoadOperatingPoints(out)) return fail();
  return true;
}

}  // namespace zvsmap
