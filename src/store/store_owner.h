// Which sweep a run store belongs to, so that a run never mixes its results
// into (or silently overwrites) the store of another sweep.
#pragma once

#include <string>

#include "store/run_store.h"

namespace zvsmap {

/// The meta key of the sweep file a store belongs to.
inline constexpr const char kStoreOwnerKey[] = "sweep_file";

/// The sweep file's owner key: its absolute path with symbolic links, "." and
/// ".." resolved, so every spelling of one file gives one key. Editing the
/// file keeps the key (the content hashes decide what reruns); another file
/// is another sweep.
std::string SweepOwnerKey(const std::string& sweep_path);

/// Whether `store` may take results of the sweep `sweep_path`: true when it
/// records the same owner key, or none (a new store, or one written before
/// stores recorded their owner). Otherwise false with `message` =
/// "STORE holds the results of another sweep (OWNER), not of SWEEP_KEY".
bool StoreBelongsTo(RunStore& store, const std::string& store_path, const std::string& sweep_path,
                    std::string* message);

/// Records `sweep_path`'s owner key in `store` (when it differs).
bool ClaimStore(RunStore& store, const std::string& sweep_path, std::string* error);

}  // namespace zvsmap
