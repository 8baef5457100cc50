// Where one point's time goes in zvsmap's pipeline (bench only).
#pragma once

#include "run/sweep_setup.h"

/// Evaluates every point of `sweep` as `zvsmap run` does, through a bench-only
/// simulator that drives libngspice itself and times each stage; prints one
/// line per point and "RESULT stage_<name> <fraction>" lines. Returns the
/// process exit status.
int RunStageBreakdown(const zvsmap::PreparedSweep& sweep);
