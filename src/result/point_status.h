// The status of one operating point, and its name in the store and reports.
#pragma once

#include <string>

namespace zvsmap {

/// ok: measured in a settled period; failed: no measurement (reason says why);
/// unsettled: did not reach periodic steady state within the limits;
/// not_run: no result for the point (not run yet, interrupted, or its stored
/// result belongs to an older netlist).
enum class PointStatus { kOk, kFailed, kUnsettled, kNotRun };

/// "ok", "failed", "unsettled", "not-run": the one place a status becomes text.
const char* PointStatusName(PointStatus s);

/// The inverse of PointStatusName. Returns false (and leaves `out` alone) for
/// any other text.
bool PointStatusFromName(const std::string& name, PointStatus* out);

/// The reason text a point without a result carries: "not run".
inline constexpr const char kNotRunReason[] = "not run";

}  // namespace zvsmap
