// Commutation waveforms of chosen points, exported by one forked child
// process that owns the only ngspice (the caller's process never creates one).
#pragma once

#include <string>
#include <vector>

#include "result/point_result.h"
#include "run/sweep_setup.h"

namespace zvsmap::cli {

/// What to export and how long the child may take.
struct WaveformRequest {
  std::vector<size_t> indices;  ///< points chosen by the user
  bool worst = false;           ///< add WorstPoints(results)
  double timeout_s = 0;         ///< per point; 0 = the sweep's, else derived from results
  bool quiet = false;
};

/// Resolves the selection against `results` (index for index with the
/// sweep's points; used for --worst and the derived timeout), forks one
/// child that creates an NgspiceSimulator, writes DIR/waveforms/... (see
/// ExportWaveforms) and prints what it wrote; waits for it, killing it after
/// the timeout. Returns an exit status: kExitOk when every chosen point gave
/// its files, kExitPointsFailed when some did not (or nothing was chosen),
/// kExitInterrupted when SIGINT/SIGTERM ended it, kExitInternal when the
/// child crashed, timed out or could not start.
int ExportWaveformsInChild(const PreparedSweep& sweep, const std::vector<PointResult>& results,
                           const WaveformRequest& request, const std::string& out_dir);

}  // namespace zvsmap::cli
