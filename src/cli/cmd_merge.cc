// `zvsmap merge SWEEP --out DIR SHARD...`: join the run stores of a sweep's
// shards into DIR/run.sqlite and write the same reports a single run writes.
#include <chrono>
#include <cstdio>
#include <filesystem>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "cli/run_summary.h"
#include "core/dir_lock.h"
#include "run/point_evaluator.h"
#include "run/run_plan.h"
#include "run/sweep_setup.h"
#include "store/content_hash.h"
#include "store/run_store.h"
#include "store/store_merge.h"
#include "store/store_owner.h"

namespace zvsmap::cli {
namespace {

struct Options {
  std::string sweep;
  std::string out_dir;
  std::vector<std::string> sources;
  size_t max_points = 0;
};

// "3, 7, 12 and 40 more".
std::string IndexList(const std::vector<size_t>& indices) {
  std::string out;
  size_t shown = 0;
  for (size_t i : indices) {
    if (shown == 20) {
      out += " and " + std::to_string(indices.size() - shown) + " more";
      break;
    }
    out += (shown ? ", " : "") + std::to_string(i);
    ++shown;
  }
  return out;
}

int Merge(const Options& opts) {
  auto started = std::chrono::steady_clock::now();
  PreparedSweep sweep;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(opts.sweep, opts.max_points, &sweep, &errors)) {
    PrintErrors(errors);
    return kExitBadInput;
  }
  std::vector<std::string> stores;
  for (const auto& source : opts.sources) {
    std::filesystem::path p(source);
    if (std::filesystem::is_directory(p)) p /= "run.sqlite";
    if (!std::filesystem::is_regular_file(p)) {
      std::fprintf(stderr, "zvsmap: error: %s: no run store there\n", p.string().c_str());
      return kExitBadInput;
    }
    stores.push_back(p.string());
  }
  std::error_code ec;
  std::filesystem::create_directories(opts.out_dir, ec);
  if (ec) {
    std::fprintf(stderr, "zvsmap: error: %s: cannot create output directory: %s\n",
                 opts.out_dir.c_str(), ec.message().c_str());
    return kExitBadInput;
  }
  std::string store_path = (std::filesystem::path(opts.out_dir) / "run.sqlite").string();
  for (const auto& s : stores) {
    if (std::filesystem::equivalent(s, store_path, ec)) {
      std::fprintf(stderr, "zvsmap: error: %s is both a source and the target\n", s.c_str());
      return kExitBadInput;
    }
  }
  std::string error;
  std::unique_ptr<DirLock> lock = DirLock::Acquire(opts.out_dir, "merge", &error);
  if (!lock) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }
  std::unique_ptr<RunStore> target = RunStore::Open(store_path, &error);
  if (!target) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitBadInput;
  }
  if (!StoreBelongsTo(*target, store_path, sweep.spec.path, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s; remove it or choose another --out\n", error.c_str());
    return kExitBadInput;
  }

  PointEvaluator evaluator(sweep);
  std::string identity = SweepIdentity(sweep.spec.path, sweep.spec.template_path);
  MergeReport merged;
  std::vector<std::string> hashes;
  std::vector<PointResult> results;
  bool refinement_complete = !sweep.refinement.active;
  std::string refinement_pending;
  // A refined sweep's points come round by round: merge what the shards hold
  // of the rounds so far, plan the next round from the merged results, and
  // merge again until a round is complete nowhere (it waits for the shards)
  // or the refinement is complete.
  for (int round = 1;; ++round) {
    hashes = PointContentHashes(sweep, evaluator);
    merged = MergeReport();
    if (!MergeStores(stores, identity, sweep.points, hashes, target.get(), &merged, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitBadInput;
    }
    if (!CollectStoredResults(*target, hashes, &results, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      return kExitInternal;
    }
    if (!sweep.refinement.active) break;
    RoundPlan next;
    Diagnostic round_error;
    if (!PlanRound(sweep.spec, sweep.refinement, round, sweep.points, results, &next,
                   &round_error)) {
      PrintErrors({round_error});
      return kExitBadInput;
    }
    if (next.waiting) {
      refinement_pending = next.why_waiting +
                           " (copy the merged run.sqlite into each shard's directory and run "
                           "the shards again)";
      break;
    }
    if (next.added.empty()) {
      refinement_complete = true;
      break;
    }
    for (Point& p : next.added) sweep.points.push_back(std::move(p));
  }
  if (!ClaimStore(*target, sweep.spec.path, &error) ||
      !target->SetMeta("sweep_identity", identity, &error) ||
      !target->SetMeta("sweep_path", sweep.spec.path, &error) ||
      !target->SetMeta("zvsmap_version", ZVSMAP_VERSION, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  std::fprintf(stderr, "zvsmap: merged %zu points from %zu stores\n", merged.merged,
               stores.size());
  if (!merged.duplicated.empty()) {
    std::fprintf(stderr, "zvsmap: %zu points were in more than one store (kept one): %s\n",
                 merged.duplicated.size(), IndexList(merged.duplicated).c_str());
  }
  if (!merged.missing.empty()) {
    std::fprintf(stderr, "zvsmap: %zu points are missing (a shard did not run or did not finish): %s\n",
                 merged.missing.size(), IndexList(merged.missing).c_str());
  }
  if (!merged.stale.empty()) {
    std::fprintf(stderr,
                 "zvsmap: %zu stored points belong to an older version of a template or setting "
                 "and were left out\n",
                 merged.stale.size());
  }

  std::vector<size_t> all;
  for (size_t i = 0; i < sweep.points.size(); ++i) all.push_back(i);
  double wall_s = std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
  RunSummaryInput summary{sweep, all, results, opts.out_dir, store_path, "", merged.merged,
                          wall_s, false};
  summary.refinement = DescribeRefinement(sweep.refinement, sweep.points, results,
                                          refinement_complete, refinement_pending);
  return WriteReportsAndSummarize(summary);
}

}  // namespace

void AddMergeCommand(CLI::App& app, int* exit_code) {
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "merge", "Join the run stores of a sweep's shards and write the reports of the whole sweep");
  cmd->add_option("sweep", opts->sweep, "The sweep file the shards ran")->required();
  cmd->add_option("--out,-o", opts->out_dir, "Output directory for the joined store and reports")
      ->required();
  cmd->add_option("shards", opts->sources, "Shard output directories (or their run.sqlite files)")
      ->required();
  cmd->add_option("--max-points", opts->max_points, "Override the sweep's point limit");
  cmd->callback([opts, exit_code] { *exit_code = Merge(*opts); });
}

}  // namespace zvsmap::cli
