// `zvsmap run SWEEP --out DIR`: simulate every point in worker processes,
// commit each to DIR/run.sqlite as it finishes, and write the reports from
// the store. Rerunning into the same DIR resumes.
#include <signal.h>
#include <unistd.h>

#include <chrono>
#include <csignal>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <map>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "report/report_set.h"
#include "run/point_evaluator.h"
#include "run/progress.h"
#include "run/sweep_setup.h"
#include "run/worker_pool.h"
#include "sim/ngspice_simulator.h"
#include "store/content_hash.h"
#include "store/run_store.h"

namespace zvsmap::cli {
namespace {

volatile std::sig_atomic_t g_stop = 0;

void OnStopSignal(int) { g_stop = 1; }

// No SA_RESTART: poll() returns at once with EINTR and the pool sees the flag.
void InstallStopHandlers() {
  struct sigaction action {};
  action.sa_handler = OnStopSignal;
  sigemptyset(&action.sa_mask);
  sigaction(SIGINT, &action, nullptr);
  sigaction(SIGTERM, &action, nullptr);
}

struct Options {
  std::string sweep;
  std::string out_dir;
  size_t max_points = 0;
  bool quiet = false;
  int jobs = 0;
  double timeout_s = 0;
  size_t recycle = 200;
  bool rerun = false;
  bool no_retry_failed = false;
};

int Run(const Options& opts) {
  auto started = std::chrono::steady_clock::now();
  PreparedSweep sweep;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(opts.sweep, opts.max_points, &sweep, &errors)) {
    PrintErrors(errors);
    return kExitBadInput;
  }
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    if (sweep.points[i].index != i) {
      std::fprintf(stderr, "zvsmap: internal error: point %zu has index %zu\n", i,
                   sweep.points[i].index);
      return kExitInternal;
    }
  }
  std::error_code ec;
  std::filesystem::create_directories(opts.out_dir, ec);
  if (ec) {
    std::fprintf(stderr, "zvsmap: error: %s: cannot create output directory: %s\n",
                 opts.out_dir.c_str(), ec.message().c_str());
    return kExitBadInput;
  }
  std::string store_path = (std::filesystem::path(opts.out_dir) / "run.sqlite").string();
  std::string error;
  std::unique_ptr<RunStore> store = RunStore::Open(store_path, &error);
  if (!store) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }

  // Which points must run: those without a stored result for the same content.
  PointEvaluator evaluator(sweep.spec, sweep.tmpl);
  std::vector<std::string> hashes(sweep.points.size());
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    std::string netlist;
    Diagnostic render_error;
    if (!evaluator.Render(sweep.points[i], &netlist, &render_error)) {
      netlist = "render error: " + render_error.Format();
    }
    hashes[i] = PointContentHash(netlist, sweep.spec, sweep.tmpl);
  }
  std::vector<StoredPointKey> stored;
  if (!store->ListPoints(&stored, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  std::vector<bool> keep(sweep.points.size(), false);
  size_t kept = 0, kept_failed = 0;
  for (const auto& s : stored) {
    if (s.index >= sweep.points.size() || s.content_hash != hashes[s.index] || opts.rerun) continue;
    if (s.status == PointStatus::kOk || opts.no_retry_failed) {
      keep[s.index] = true;
      ++kept;
      kept_failed += s.status == PointStatus::kOk ? 0 : 1;
    }
  }
  std::vector<size_t> to_run;
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    if (!keep[i]) to_run.push_back(i);
  }
  std::string identity = SweepIdentity(sweep.spec.path, sweep.spec.template_path);
  std::string old_identity = store->GetMeta("sweep_identity");
  if (!opts.quiet && !old_identity.empty() && old_identity != identity) {
    std::fprintf(stderr,
                 "zvsmap: the sweep or its template changed since the stored run; "
                 "points whose netlist changed run again\n");
  }
  if (!store->SetMeta("sweep_identity", identity, &error) ||
      !store->SetMeta("sweep_path", sweep.spec.path, &error) ||
      !store->SetMeta("zvsmap_version", ZVSMAP_VERSION, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  if (!opts.quiet && kept > 0) {
    std::fprintf(stderr, "zvsmap: %zu of %zu points kept from the stored run, %zu to run\n", kept,
                 sweep.points.size(), to_run.size());
  }

  // Run the rest in worker processes.
  bool interrupted = false;
  std::string store_error;
  ProgressReporter::Mode mode = opts.quiet              ? ProgressReporter::Mode::kQuiet
                                : isatty(STDERR_FILENO) ? ProgressReporter::Mode::kTerminal
                                                        : ProgressReporter::Mode::kPlain;
  if (!to_run.empty()) {
    WorkerPoolOptions pool_options;
    pool_options.jobs = opts.jobs;
    pool_options.timeout_s = opts.timeout_s > 0 ? opts.timeout_s : sweep.spec.simulation.timeout_s;
    pool_options.recycle_after = opts.recycle;
    // Test-only fault switch (see WorkerPoolOptions::fault_spec).
    if (const char* fault = std::getenv("ZVSMAP_TEST_FAULT")) pool_options.fault_spec = fault;
    WorkerPool pool(
        [&](size_t index, Simulator& simulator) {
          return evaluator.Evaluate(sweep.points[index], simulator);
        },
        [] { return std::make_unique<NgspiceSimulator>(); }, pool_options);
    ProgressReporter progress(stderr, mode, sweep.points.size(), kept, kept_failed);
    g_stop = 0;
    InstallStopHandlers();
    PoolOutcome outcome = pool.Run(
        to_run,
        [&](PointResult&& result) {
          const Point& point = sweep.points[result.index];
          if (store_error.empty() &&
              !store->SavePoint(point, hashes[result.index], result, &store_error)) {
            g_stop = 1;  // nothing more can be kept: stop
          }
          progress.PointDone(result, point.Describe());
        },
        &g_stop);
    progress.Finish();
    if (!store_error.empty()) {
      std::fprintf(stderr, "zvsmap: error: %s\n", store_error.c_str());
      return kExitInternal;
    }
    if (!outcome.ok) {
      std::fprintf(stderr, "zvsmap: error: %s\n", outcome.error.c_str());
      return kExitInternal;
    }
    interrupted = outcome.interrupted;
  }

  // Reports come from the store, ordered by point index.
  std::map<size_t, PointResult> loaded;
  if (!store->LoadResults(&loaded, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  std::vector<StoredPointKey> now_stored;
  store->ListPoints(&now_stored, &error);
  std::vector<PointResult> results(sweep.points.size());
  size_t ok = 0, failed = 0, unsettled = 0, not_run = 0;
  for (size_t i = 0; i < results.size(); ++i) {
    results[i].index = i;
    results[i].reason = "not run";
  }
  for (const auto& s : now_stored) {
    if (s.index >= results.size() || s.content_hash != hashes[s.index]) continue;
    auto it = loaded.find(s.index);
    if (it != loaded.end()) results[s.index] = std::move(it->second);
  }
  for (const auto& r : results) {
    if (r.status == PointStatus::kOk) {
      ++ok;
    } else if (r.status == PointStatus::kUnsettled) {
      ++unsettled;
    } else if (r.reason == "not run") {
      ++not_run;
    } else {
      ++failed;
    }
  }

  ReportOutcome report;
  if (!WriteReports({sweep.spec, sweep.tmpl, sweep.points, results}, opts.out_dir, &report,
                    &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
  std::fprintf(stderr, "zvsmap: %zu points: %zu ok, %zu failed, %zu unsettled", results.size(), ok,
               failed, unsettled);
  if (not_run > 0) std::fprintf(stderr, ", %zu not run", not_run);
  std::fprintf(stderr, " (%zu kept from the stored run); wall time %s\n", kept,
               FormatDuration(wall).c_str());
  for (const auto& f : report.files) std::fprintf(stderr, "zvsmap: wrote %s\n", f.c_str());
  std::fprintf(stderr, "zvsmap: run store %s\n", store_path.c_str());
  if (interrupted) {
    std::fprintf(stderr, "zvsmap: interrupted; run the same command again to resume\n");
    return kExitInterrupted;
  }
  if (failed + unsettled + not_run > 0) return kExitPointsFailed;
  if (report.requirements_failed > 0) return kExitRequirementFailed;
  return kExitOk;
}

}  // namespace

void AddRunCommand(CLI::App& app, int* exit_code) {
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "run", "Simulate every point of a sweep and write the reports (resumes into DIR)");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
  cmd->add_option("--out,-o", opts->out_dir, "Output directory (created if missing)")->required();
  cmd->add_option("--max-points", opts->max_points, "Override the sweep's point limit");
  cmd->add_flag("--quiet,-q", opts->quiet, "Print only errors and the final summary");
  cmd->add_option("--jobs,-j", opts->jobs, "Worker processes (default: number of cores)")
      ->check(CLI::NonNegativeNumber);
  cmd->add_option("--timeout", opts->timeout_s,
                  "Per-point wall-clock limit in seconds (default: the sweep's, else derived)")
      ->check(CLI::PositiveNumber);
  cmd->add_option("--recycle", opts->recycle,
                  "Replace each worker after this many points (0: never)")
      ->capture_default_str();
  cmd->add_flag("--rerun", opts->rerun, "Run every point again, ignoring stored results");
  cmd->add_flag("--no-retry-failed", opts->no_retry_failed,
                "Keep stored failed and unsettled points instead of running them again");
  cmd->callback([opts, exit_code] { *exit_code = Run(*opts); });
}

}  // namespace zvsmap::cli
