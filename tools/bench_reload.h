// Reload per run versus alter-and-rerun of a loaded circuit (bench only).
#pragma once

#include "run/sweep_setup.h"

/// For every point of `sweep`, times one-period runs from three start states
/// `repeats` times, reloading per run (NgspiceSimulator) versus loading once
/// and changing the initial conditions with `alter`; prints one line per point
/// and "RESULT" lines. Returns the process exit status.
int RunReloadComparison(const zvsmap::PreparedSweep& sweep, int repeats);
