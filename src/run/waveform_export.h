// Commutation waveforms of chosen points for the user: each point is run
// again with a simulator the caller owns, and its settled periods are saved
// as an ngspice raw file plus one SVG plot per cell and edge.
#pragma once

#include <string>
#include <vector>

#include "result/point_result.h"
#include "run/sweep_setup.h"
#include "sim/simulator.h"

namespace zvsmap {

/// What exporting one point produced.
struct WaveformExport {
  size_t index = 0;
  bool ok = false;
  std::string reason;              ///< why the point gave no waveforms (empty when ok)
  std::vector<std::string> files;  ///< paths written, raw file first
};

/// The worst point of each cell and edge among the ok results: the lowest
/// zvs_energy_margin where any point measured one, otherwise the highest
/// v_turn_on_v - v_residual_limit_v (the residual voltage's excess over the
/// ZVS limit). Ties go to the lower index. Ascending, without duplicates.
std::vector<size_t> WorstPoints(const std::vector<PointResult>& results);

/// Parses a selection: a comma list of point indices and/or the word
/// "worst" (e.g. "worst", "3,5", "worst,7"). Fails, with a message, on
/// anything else or an empty list.
bool ParseWaveformSelection(const std::string& text, bool* worst, std::vector<size_t>* indices,
                            std::string* error);

/// The folder the files go to: `out_dir`/waveforms.
std::string WaveformDir(const std::string& out_dir);

/// For each index (< sweep.points.size(), else that entry fails): evaluates
/// the point with `simulator` and writes into WaveformDir(out_dir) (created)
/// point_<N>.raw (the measured settled periods, every saved vector; see
/// WriteRawFile) and point_<N>_<cell>_<edge>.svg for each edge of each cell
/// (see EdgeWaveformPlot). A point that fails or does not settle writes
/// nothing and says why. Never prints; `simulator` must be fit for the
/// process (a worker's or a child's ngspice, or a fake in tests).
std::vector<WaveformExport> ExportWaveforms(const PreparedSweep& sweep,
                                            const std::vector<size_t>& indices,
                                            const std::string& out_dir, Simulator& simulator);

}  // namespace zvsmap
