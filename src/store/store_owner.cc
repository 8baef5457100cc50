#include "store/store_owner.h"

#include <filesystem>
#include <system_error>

namespace zvsmap {

std::string SweepOwnerKey(const std::string& sweep_path) {
  std::error_code ec;
  std::filesystem::path absolute = std::filesystem::absolute(sweep_path, ec);
  if (ec) return sweep_path;
  std::filesystem::path canonical = std::filesystem::weakly_canonical(absolute, ec);
  return (ec ? absolute.lexically_normal() : canonical).string();
}

bool StoreBelongsTo(RunStore& store, const std::string& store_path, const std::string& sweep_path,
                    std::string* message) {
  std::string owner = store.GetMeta(kStoreOwnerKey);
  std::string mine = SweepOwnerKey(sweep_path);
  if (owner.empty() || owner == mine) return true;
  *message = store_path + " holds the results of another sweep (" + owner + "), not of " + mine;
  return false;
}

bool ClaimStore(RunStore& store, const std::string& sweep_path, std::string* error) {
  std::string mine = SweepOwnerKey(sweep_path);
  if (store.GetMeta(kStoreOwnerKey) == mine) return true;
  return store.SetMeta(kStoreOwnerKey, mine, error);
}

}  // namespace zvsmap
