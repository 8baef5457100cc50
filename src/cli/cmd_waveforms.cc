// `zvsmap waveforms SWEEP --out DIR --point N ... [--worst]`: run chosen
// points again and save their settled waveforms (ngspice raw files) and a
// plot of each commutation edge into DIR/waveforms.
#include "cli/cmd_waveforms.h"

#include <signal.h>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <memory>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/dir_lock.h"
#include "run/child_process.h"
#include "run/point_evaluator.h"
#include "run/run_plan.h"
#include "run/waveform_export.h"
#include "run/worker_pool.h"
#include "sim/ngspice_simulator.h"
#include "store/run_store.h"
#include "store/store_owner.h"

namespace zvsmap::cli {

namespace {

int ChildMain(const PreparedSweep& sweep, const std::vector<size_t>& indices,
              const std::string& out_dir, bool quiet) {
  signal(SIGINT, SIG_DFL);
  signal(SIGTERM, SIG_DFL);
  int rc = kExitOk;
  {
    NgspiceSimulator simulator;
    for (const WaveformExport& e : ExportWaveforms(sweep, indices, out_dir, simulator)) {
      if (!e.ok) {
        std::fprintf(stderr, "zvsmap: point %zu: no waveforms: %s\n", e.index, e.reason.c_str());
        rc = kExitPointsFailed;
      }
      if (!quiet) {
        for (const auto& f : e.files) std::fprintf(stderr, "zvsmap: wrote %s\n", f.c_str());
      }
    }
  }
  return rc;  // ChildProcess _exits with it (no atexit handlers in a forked copy)
}

}  // namespace

int ExportWaveformsInChild(const PreparedSweep& sweep, const std::vector<PointResult>& results,
                           const WaveformRequest& request, const std::string& out_dir) {
  std::vector<size_t> indices = request.indices;
  if (request.worst) {
    std::vector<size_t> worst = WorstPoints(results);
    if (worst.empty()) {
      std::fprintf(stderr, "zvsmap: no measured point to choose the worst from\n");
    } else if (!request.quiet) {
      std::string list;
      for (size_t i : worst) list += (list.empty() ? "" : ", ") + std::to_string(i);
      std::fprintf(stderr, "zvsmap: worst points per cell and edge: %s\n", list.c_str());
    }
    indices.insert(indices.end(), worst.begin(), worst.end());
  }
  std::vector<size_t> unique;
  for (size_t i : indices) {
    if (std::find(unique.begin(), unique.end(), i) == unique.end()) unique.push_back(i);
  }
  if (unique.empty()) return kExitPointsFailed;

  // Per point: the given limit, else the sweep's, else the pool's rule
  // (DerivedTimeout, run/child_process.h) over the stored run's time, else 300 s.
  double total_s = 0;
  for (size_t i : unique) {
    double t = request.timeout_s > 0 ? request.timeout_s : sweep.spec.simulation.timeout_s;
    if (t <= 0) {
      std::vector<double> stored;
      if (i < results.size() && results[i].wall_s > 0) stored.push_back(results[i].wall_s);
      t = DerivedTimeout(stored);
    }
    total_s += t;
  }

  ChildProcess child;
  std::string error;
  if (!child.Start([&](int) { return ChildMain(sweep, unique, out_dir, request.quiet); }, {},
                   &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  ChildEnd end = child.WaitFor(total_s);
  if (end.kind == ChildEnd::Kind::kTimedOut) {
    std::fprintf(stderr, "zvsmap: error: waveform export timed out after %.0f s\n", total_s);
    return kExitInternal;
  }
  bool signaled = end.kind == ChildEnd::Kind::kSignaled;
  if (signaled && (end.code == SIGINT || end.code == SIGTERM)) {
    std::fprintf(stderr, "zvsmap: waveform export interrupted\n");
    return kExitInterrupted;
  }
  if (signaled) {
    std::fprintf(stderr, "zvsmap: error: waveform export crashed (signal %d)\n", end.code);
    return kExitInternal;
  }
  return end.code >= 0 ? end.code : kExitInternal;
}
namespace {

struct Options {
  std::string sweep;
  std::string out_dir;
  std::vector<size_t> points;
  bool worst = false;
  size_t max_points = 0;
  double timeout_s = 0;
  bool quiet = false;
};

int Waveforms(const Options& opts) {
  PreparedSweep sweep;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(opts.sweep, opts.max_points, &sweep, &errors)) {
    PrintErrors(errors);
    return kExitBadInput;
  }
  PrintWarnings(sweep.warnings);
  if (opts.points.empty() && !opts.worst) {
    std::fprintf(stderr, "zvsmap: error: choose points with --point N and/or --worst\n");
    return kExitBadInput;
  }
  for (size_t i : opts.points) {
    if (i >= sweep.points.size()) {
      std::fprintf(stderr, "zvsmap: error: --point %zu: the sweep has points 0 to %zu\n", i,
                   sweep.points.size() - 1);
      return kExitBadInput;
    }
  }
  std::error_code ec;
  std::filesystem::create_directories(opts.out_dir, ec);
  if (ec) {
    std::fprintf(stderr, "zvsmap: error: %s: cannot create output directory: %s\n",
                 opts.out_dir.c_str(), ec.message().c_str());
    return kExitBadInput;
  }

  std::string lock_error;
  std::unique_ptr<DirLock> lock = DirLock::Acquire(opts.out_dir, "waveforms", &lock_error);
  if (!lock) {
    std::fprintf(stderr, "zvsmap: error: %s\n", lock_error.c_str());
    return kExitBadInput;
  }

  // The stored run (if any) picks the worst points and sizes the timeout.
  std::vector<PointResult> results;
  std::filesystem::path store_path = std::filesystem::path(opts.out_dir) / "run.sqlite";
  if (std::filesystem::is_regular_file(store_path)) {
    std::string error;
    std::unique_ptr<RunStore> store = RunStore::Open(store_path.string(), &error);
    if (store && !StoreBelongsTo(*store, store_path.string(), sweep.spec.path, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s; choose the run directory of this sweep\n",
                   error.c_str());
      return kExitBadInput;
    }
    PointEvaluator evaluator(sweep);
    if (!store ||
        !CollectStoredResults(*store, PointContentHashes(sweep, evaluator), &results, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitInternal;
    }
  } else if (opts.worst) {
    std::fprintf(stderr, "zvsmap: error: --worst needs a finished run: %s not found\n",
                 store_path.string().c_str());
    return kExitBadInput;
  }
  WaveformRequest request{opts.points, opts.worst, opts.timeout_s, opts.quiet};
  return ExportWaveformsInChild(sweep, results, request, opts.out_dir);
}

}  // namespace

void AddWaveformsCommand(CLI::App& app, int* exit_code) {
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "waveforms",
      "Run chosen points again; save their settled waveforms (ngspice raw) and edge plots "
      "into DIR/waveforms");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
  cmd->add_option("--out,-o", opts->out_dir, "Run directory (DIR/run.sqlite is read for --worst)")
      ->required();
  cmd->add_option("--point,-p", opts->points, "Point index (repeatable; see `zvsmap points`)");
  cmd->add_flag("--worst", opts->worst,
                "Add the worst stored point of each cell and edge (lowest energy margin, else "
                "highest residual voltage above the ZVS limit)");
  cmd->add_option("--max-points", opts->max_points, "Override the sweep's point limit");
  cmd->add_option("--timeout", opts->timeout_s, "Wall-clock limit per point in seconds")
      ->check(CLI::PositiveNumber);
  cmd->add_flag("--quiet,-q", opts->quiet, "Print only errors");
  cmd->callback([opts, exit_code] { *exit_code = Waveforms(*opts); });
}

}  // namespace zvsmap::cli
