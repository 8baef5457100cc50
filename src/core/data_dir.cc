#include "core/data_dir.h"

#include <cstdlib>
#include <filesystem>
#include <system_error>

namespace zvsmap {

namespace {

// The directory of the running executable (Linux: /proc/self/exe), or "".
std::filesystem::path ExecutableDir() {
  std::error_code ec;
  std::filesystem::path exe = std::filesystem::read_symlink("/proc/self/exe", ec);
  return ec ? std::filesystem::path() : exe.parent_path();
}

bool HasLibrary(const std::filesystem::path& dir) {
  std::error_code ec;
  return std::filesystem::is_regular_file(dir / "netlists" / "switches.lib", ec);
}

}  // namespace

std::string DataDir(std::vector<std::string>* searched) {
  auto tried = [&](const std::string& dir) {
    if (searched) searched->push_back(dir);
  };
  const char* env = std::getenv(kDataDirEnv);
  if (env && *env) {
    tried(env);
    return env;
  }
  std::filesystem::path exe_dir = ExecutableDir();
  if (!exe_dir.empty()) {
    std::filesystem::path installed = (exe_dir / ".." / "share" / "zvsmap").lexically_normal();
    tried(installed.string());
    if (HasLibrary(installed)) return installed.string();
  }
  const char* no_source = std::getenv(kNoSourceDirEnv);
  if (no_source && std::string(no_source) == "1") return "";
  tried(ZVSMAP_SOURCE_DIR);
  return ZVSMAP_SOURCE_DIR;
}

std::string DataFile(const std::string& relative) {
  std::string dir = DataDir();
  return dir.empty() ? relative : dir + "/" + relative;
}

}  // namespace zvsmap
