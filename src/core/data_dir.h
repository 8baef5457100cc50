// Where zvsmap's own data lives (the bundled templates, the switch library,
// the summary schema, the demo sweeps), installed or in the source tree.
#pragma once

#include <string>
#include <vector>

namespace zvsmap {

/// The environment variable that names the data directory outright.
inline constexpr const char kDataDirEnv[] = "ZVSMAP_DATA_DIR";
/// Set to 1 to skip the compiled-in source directory (tests of an install).
inline constexpr const char kNoSourceDirEnv[] = "ZVSMAP_NO_SOURCE_DIR";

/// The data directory, searched in this order: $ZVSMAP_DATA_DIR when set and
/// not empty (taken as it is); DIR/../share/zvsmap where DIR holds the running
/// executable (an install made by `cmake --install`), when it has
/// netlists/switches.lib; the source directory compiled in, unless
/// $ZVSMAP_NO_SOURCE_DIR is 1. Returns "" when none applies. When `searched`
/// is not null it receives every directory tried, in order.
std::string DataDir(std::vector<std::string>* searched = nullptr);

/// DataDir() + "/" + `relative` ("netlists/switches.lib"); `relative` alone
/// when there is no data directory (so that the error names the file).
std::string DataFile(const std::string& relative);

}  // namespace zvsmap
