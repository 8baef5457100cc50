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
#include <optional>

#include "cli/cmd_waveforms.h"
#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "cli/run_summary.h"
#include "core/dir_lock.h"
#include "run/memory_bound.h"
#include "run/point_evaluator.h"
#include "run/chain_memory.h"
#include "run/progress.h"
#include "run/run_plan.h"
#include "run/sweep_setup.h"
#include "run/waveform_export.h"
#include "run/worker_pool.h"
#include "sim/ngspice_simulator.h"
#include "store/content_hash.h"
#include "store/run_store.h"
#include "store/store_owner.h"
#include "sweep/chain_layout.h"
#include "sweep/sharding.h"

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
  std::string shard;
  size_t shards = 0;
  std::string waveforms;      ///< "worst" and/or point indices, comma-separated; "" = none
  std::string worker_memory;  ///< per-worker memory bound, e.g. "2G"; "" = the default
};

// Removes DIR/waveforms/point_*.{raw,svg}: the saved waveforms of a replaced
// store's sweep, which index.html would otherwise show beside the new run.
bool RemoveSavedWaveforms(const std::string& out_dir, std::string* error) {
  std::error_code ec;
  std::filesystem::directory_iterator it(std::filesystem::path(WaveformDir(out_dir)), ec);
  if (ec) return true;  // none saved
  for (const auto& entry : it) {
    std::string name = entry.path().filename().string();
    std::string ext = entry.path().extension().string();
    if (name.rfind("point_", 0) != 0 || (ext != ".raw" && ext != ".svg")) continue;
    if (!std::filesystem::remove(entry.path(), ec) && ec) {
      *error = entry.path().string() + ": cannot remove: " + ec.message();
      return false;
    }
  }
  return true;
}

// Runs the points `mine` (one round's, or a shard's share of it) that have no
// stored result for their content, committing each to the store. `hashes`
// grows to cover every point of the sweep so far. False (printed) on a
// store or pool failure; an interruption sets `interrupted`.
bool RunRound(const Options& opts, const CliSeams& seams, const PreparedSweep& sweep,
              const PointEvaluator& evaluator, size_t round_begin, const std::vector<size_t>& mine,
              uint64_t memory_bound, ProgressReporter::Mode mode, RunStore& store,
              std::vector<std::string>* hashes, size_t* kept, bool* interrupted) {
  // Which points must run: those without a stored result for the same content.
  std::string error;
  *hashes = PointContentHashes(sweep, evaluator);
  std::vector<StoredPointKey> stored;
  if (!RekeyStoredResults(store, sweep.points, *hashes, &error) ||
      !store.ListPoints(&stored, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return false;
  }
  std::vector<bool> keep(sweep.points.size(), false);
  std::vector<bool> keep_failed(sweep.points.size(), false);
  for (const auto& s : stored) {
    if (s.index >= sweep.points.size() || s.content_hash != (*hashes)[s.index] || opts.rerun) {
      continue;
    }
    if (s.status == PointStatus::kOk || opts.no_retry_failed) {
      keep[s.index] = true;
      keep_failed[s.index] = s.status != PointStatus::kOk;
    }
  }
  std::vector<size_t> to_run;
  size_t kept_failed = 0;
  *kept = 0;
  for (size_t i : mine) {
    if (!keep[i]) {
      to_run.push_back(i);
    } else {
      ++*kept;
      kept_failed += keep_failed[i] ? 1 : 0;
    }
  }
  if (!opts.quiet && *kept > 0) {
    std::fprintf(stderr, "zvsmap: %zu of %zu points kept from the stored run, %zu to run\n", *kept,
                 mine.size(), to_run.size());
  }
  if (to_run.empty()) return true;

  // Run the rest in worker processes.
  std::string store_error;
  WorkerPoolOptions pool_options;
  pool_options.jobs = opts.jobs;
  pool_options.timeout_s = opts.timeout_s > 0 ? opts.timeout_s : sweep.spec.simulation.timeout_s;
  pool_options.recycle_after = opts.recycle;
  pool_options.memory_bound_bytes = memory_bound;
  ProgressReporter progress(stderr, mode, mine.size(), *kept, kept_failed);
  pool_options.on_tick = [&progress] { progress.Tick(); };
  // Warm starts: each unit of chained points runs in one worker, in chain
  // order; the memory (stored results loaded here, before the workers fork)
  // gives each point its predecessor's settled state.
  std::vector<PointResult> stored_results;
  if (!CollectStoredResults(store, *hashes, &stored_results, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return false;
  }
  ChainMemory memory(ChainLinks(sweep.points, round_begin, InnermostIsDevice(sweep.spec)));
  for (const PointResult& r : stored_results) memory.Remember(r);
  WorkerSetup setup{[&](size_t index, Simulator& simulator) {
                      std::optional<WarmStart> warm = memory.For(index);
                      PointResult r = evaluator.EvaluateWarm(sweep.points[index], simulator,
                                                             warm ? &*warm : nullptr);
                      memory.Remember(r);
                      return r;
                    },
                    [] { return std::make_unique<NgspiceSimulator>(); }};
  if (seams.workers) setup = seams.workers(std::move(setup));
  WorkerPool pool(std::move(setup.job), std::move(setup.factory), pool_options);
  g_stop = 0;
  InstallStopHandlers();
  std::vector<bool> runs(sweep.points.size(), false);
  for (size_t i : to_run) runs[i] = true;
  std::vector<std::vector<size_t>> units;
  for (const auto& unit : ChainUnits(sweep.points, round_begin)) {
    std::vector<size_t> left;
    for (size_t i : unit)
      if (runs[i]) left.push_back(i);
    if (!left.empty()) units.push_back(std::move(left));
  }
  PoolOutcome outcome = pool.RunUnits(
      units,
      [&](PointResult&& result) {
        const Point& point = sweep.points[result.index];
        if (store_error.empty() &&
            !store.SavePoint(point, (*hashes)[result.index], result, &store_error)) {
          g_stop = 1;  // nothing more can be kept: stop
        }
        progress.PointDone(result, point.Describe());
      },
      &g_stop);
  progress.Finish();
  if (!store_error.empty()) {
    std::fprintf(stderr, "zvsmap: error: %s\n", store_error.c_str());
    return false;
  }
  if (!outcome.ok) {
    std::fprintf(stderr, "zvsmap: error: %s\n", outcome.error.c_str());
    return false;
  }
  *interrupted = outcome.interrupted;
  return true;
}

int Run(const Options& opts, const CliSeams& seams) {
  auto started = std::chrono::steady_clock::now();
  WaveformRequest wave_request;
  if (!opts.waveforms.empty()) {
    std::string why;
    if (!ParseWaveformSelection(opts.waveforms, &wave_request.worst, &wave_request.indices, &why)) {
      std::fprintf(stderr, "zvsmap: error: --waveforms: %s\n", why.c_str());
      return kExitBadInput;
    }
    wave_request.timeout_s = opts.timeout_s;
    wave_request.quiet = opts.quiet;
  }
  int jobs = opts.jobs > 0 ? opts.jobs : static_cast<int>(sysconf(_SC_NPROCESSORS_ONLN));
  uint64_t memory_bound = DefaultWorkerMemory(jobs);
  if (!opts.worker_memory.empty()) {
    std::string why;
    if (!ParseMemorySize(opts.worker_memory, &memory_bound, &why)) {
      std::fprintf(stderr, "zvsmap: error: --worker-memory: %s\n", why.c_str());
      return kExitBadInput;
    }
    if (memory_bound > 0 && !MemoryBoundAvailable() && !opts.quiet) {
      std::fprintf(stderr,
                   "zvsmap: warning: --worker-memory has no effect in this build "
                   "(AddressSanitizer needs an unbounded address space)\n");
    }
  }
  PreparedSweep sweep;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(opts.sweep, opts.max_points, &sweep, &errors)) {
    PrintErrors(errors);
    return kExitBadInput;
  }
  PrintWarnings(sweep.warnings);
  for (size_t i : wave_request.indices) {
    if (i >= sweep.points.size()) {
      std::fprintf(stderr, "zvsmap: error: --waveforms: the sweep has points 0 to %zu, not %zu\n",
                   sweep.points.size() - 1, i);
      return kExitBadInput;
    }
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
  // One process at a time per directory; held until this returns.
  std::unique_ptr<DirLock> lock = DirLock::Acquire(opts.out_dir, "run", &error);
  if (!lock) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }
  std::unique_ptr<RunStore> store = RunStore::Open(store_path, &error);
  if (!store) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }
  // Another sweep's store is replaced only when asked to.
  std::string owner_message;
  if (!StoreBelongsTo(*store, store_path, sweep.spec.path, &owner_message)) {
    if (!opts.rerun) {
      std::fprintf(stderr,
                   "zvsmap: error: %s; run with --rerun to replace it, or choose another --out\n",
                   owner_message.c_str());
      return kExitBadInput;
    }
    if (!store->DeleteAllPoints(&error) || !RemoveSavedWaveforms(opts.out_dir, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitInternal;
    }
    if (!opts.quiet) {
      std::fprintf(stderr, "zvsmap: %s: replaced (--rerun)\n", owner_message.c_str());
    }
  }
  if (!ClaimStore(*store, sweep.spec.path, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }

  // Which points this process runs: all, or one shard's (of each round).
  std::optional<ShardSpec> shard;
  std::string shard_text;
  if (!opts.shard.empty()) {
    ShardSpec parsed;
    if (!ParseShard(opts.shard, &parsed, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitBadInput;
    }
    shard = parsed;
  } else if (!ShardFromEnvironment([](const char* name) { return std::getenv(name); }, opts.shards,
                                   &shard, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }
  if (shard) shard_text = shard->Describe();

  PointEvaluator evaluator(sweep);
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

  // One round at a time: the grid (a sweep without <refine> has only this
  // round), then each refinement round from the results of the earlier ones.
  std::vector<size_t> mine;
  std::vector<std::string> hashes;
  std::vector<PointResult> results;
  size_t kept = 0;
  bool interrupted = false;
  bool refinement_complete = !sweep.refinement.active;
  std::string refinement_pending;
  ProgressReporter::Mode mode = opts.quiet              ? ProgressReporter::Mode::kQuiet
                                : isatty(STDERR_FILENO) ? ProgressReporter::Mode::kTerminal
                                                        : ProgressReporter::Mode::kPlain;
  size_t round_begin = 0;
  for (int round = 0;; ++round) {
    std::vector<size_t> round_mine;
    size_t round_size = sweep.points.size() - round_begin;
    if (shard) {
      for (size_t k : ShardPointsOf(sweep.points, round_begin, *shard)) {
        round_mine.push_back(round_begin + k);
      }
      if (!opts.quiet) {
        std::fprintf(stderr, "zvsmap: shard %s (from %s)%s: %zu of %zu points\n",
                     shard_text.c_str(), shard->source.c_str(),
                     sweep.refinement.active ? (", round " + std::to_string(round)).c_str() : "",
                     round_mine.size(), round_size);
      }
    } else {
      for (size_t i = round_begin; i < sweep.points.size(); ++i) round_mine.push_back(i);
    }
    mine.insert(mine.end(), round_mine.begin(), round_mine.end());
    size_t kept_round = 0;
    if (!RunRound(opts, seams, sweep, evaluator, round_begin, round_mine, memory_bound, mode,
                  *store, &hashes,
                  &kept_round, &interrupted)) {
      return kExitInternal;
    }
    kept += kept_round;
    if (!CollectStoredResults(*store, hashes, &results, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitInternal;
    }
    if (!sweep.refinement.active || interrupted) break;
    RoundPlan next;
    Diagnostic round_error;
    if (!PlanRound(sweep.spec, sweep.refinement, round + 1, sweep.points, results, &next,
                   &round_error)) {
      PrintErrors({round_error});
      return kExitBadInput;
    }
    if (next.waiting) {
      refinement_pending =
          next.why_waiting + (shard ? " (other shards' points: merge the shard stores, copy the "
                                      "merged run.sqlite into each shard's directory and run the "
                                      "shards again)"
                                    : "");
      break;
    }
    if (next.added.empty()) {
      refinement_complete = true;
      break;
    }
    round_begin = sweep.points.size();
    for (Point& p : next.added) sweep.points.push_back(std::move(p));
  }

  // Waveforms of chosen points, before the reports so index.html links them;
  // one forked child owns the ngspice. Its failure leaves the verdict alone.
  if (!opts.waveforms.empty() && !interrupted) {
    int rc = ExportWaveformsInChild(sweep, results, wave_request, opts.out_dir);
    if (rc == kExitInterrupted) {
      interrupted = true;
    } else if (rc != kExitOk) {
      std::fprintf(stderr, "zvsmap: warning: some waveforms were not written (see above)\n");
    }
  }
  double wall_s = std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
  RunSummaryInput summary{sweep,      mine, results, opts.out_dir, store_path,
                          shard_text, kept, wall_s,  interrupted};
  summary.refinement = DescribeRefinement(sweep.refinement, sweep.points, results,
                                          refinement_complete, refinement_pending);
  return WriteReportsAndSummarize(summary);
}

}  // namespace

void AddRunCommand(CLI::App& app, int* exit_code, const CliSeams& seams) {
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
  cmd->add_flag("--rerun", opts->rerun,
                "Run every point again, ignoring stored results (and replace a store that "
                "belongs to another sweep)");
  cmd->add_flag("--no-retry-failed", opts->no_retry_failed,
                "Keep stored failed and unsettled points instead of running them again");
  cmd->add_option("--worker-memory", opts->worker_memory,
                  "Memory bound of each worker process, e.g. 2G or 512M (powers of 1024; 0: none); "
                  "a point past it fails with the reason (default: min(4G, RAM / (jobs + 1)))");
  cmd->add_option("--shard", opts->shard,
                  "Run only shard K of N (K/N, 0-based); default: from a Slurm job array "
                  "(SLURM_ARRAY_TASK_*) or JOB_COMPLETION_INDEX with --shards");
  cmd->add_option("--shards", opts->shards,
                  "Number of shards when the index comes from JOB_COMPLETION_INDEX");
  cmd->add_option(
      "--waveforms", opts->waveforms,
      "After the run, save settled waveforms and edge plots into DIR/waveforms for "
      "'worst' (each cell and edge's worst point) and/or point indices, e.g. worst,3,7");
  cmd->callback([opts, exit_code, seams] { *exit_code = Run(*opts, seams); });
}

}  // namespace zvsmap::cli
