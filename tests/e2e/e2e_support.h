// Small file helpers shared by the end-to-end tests (tests/e2e/*_test.cc).
#pragma once

#include <gtest/gtest.h>

#include <fstream>
#include <sstream>
#include <string>

namespace zvsmap_e2e {

/// A path inside the source tree (ZVSMAP_SOURCE_DIR, set by tests/e2e/CMakeLists.txt).
inline std::string Source(const std::string& relative) {
  return std::string(ZVSMAP_SOURCE_DIR) + "/" + relative;
}

/// The whole file as bytes; empty when it cannot be read.
inline std::string ReadText(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

/// Writes `text` as the whole file.
inline void WriteText(const std::string& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

/// `text` with the first `from` replaced by `to`; a test failure when `from`
/// is not there (an edit that misses its target would test nothing).
inline std::string Replace(std::string text, const std::string& from, const std::string& to) {
  size_t at = text.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return text;
}

}  // namespace zvsmap_e2e
