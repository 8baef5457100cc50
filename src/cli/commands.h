// The subcommands of the zvsmap front end, one file each.
#pragma once

#include <CLI/App.hpp>
#include <vector>

#include "cli/run_cli.h"
#include "core/diagnostic.h"

namespace zvsmap::cli {

/// Adds `zvsmap run`; `*exit_code` receives the command's exit status;
/// `seams.workers` (when set) adapts the workers' job and simulator factory.
void AddRunCommand(CLI::App& app, int* exit_code, const CliSeams& seams);
/// Adds `zvsmap merge` (join shard stores and write the reports).
void AddMergeCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap waveforms` (chosen points' settled waveforms as raw files and edge plots).
void AddWaveformsCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap render` (print one point's netlist).
void AddRenderCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap points` (list the expanded points).
void AddPointsCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap explain` (one point's hand calculation beside its simulation).
void AddExplainCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap params` (a template's parameters, cells, edges, metrics, switch models).
void AddParamsCommand(CLI::App& app, int* exit_code);

/// Adds `zvsmap calibrate` (fit Coss forms to datasheet-style numbers).
void AddCalibrateCommand(CLI::App& app, int* exit_code);
/// Adds `zvsmap characterize` (tabulate a switch model's Coss, Qoss, Eoss and reverse curve).
void AddCharacterizeCommand(CLI::App& app, int* exit_code);

/// Prints diagnostics as "zvsmap: error: ..." on stderr.
void PrintErrors(const std::vector<zvsmap::Diagnostic>& errors);
/// Prints diagnostics as "zvsmap: warning: ..." on stderr.
void PrintWarnings(const std::vector<zvsmap::Diagnostic>& warnings);

}  // namespace zvsmap::cli
