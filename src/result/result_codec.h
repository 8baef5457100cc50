// One place that turns a PointResult into bytes and back (worker -> parent).
#pragma once

#include <string>

#include "result/point_result.h"

namespace zvsmap {

/// Encodes every field of `result` (edges, metrics, comparisons, settle record, log) into a
/// compact binary string. Doubles are stored as their raw IEEE-754 bits, so
/// they round-trip exactly (NaN and infinities included). When a field is
/// added to PointResult or EdgeMeasurement, extend EncodeResult and
/// DecodeResult together and bump the format byte.
std::string EncodeResult(const PointResult& result);

/// Decodes what EncodeResult wrote. Returns false (and leaves `out` in an
/// unspecified state) on truncated or malformed input; never reads past `data`.
bool DecodeResult(const std::string& data, PointResult* out);

}  // namespace zvsmap
