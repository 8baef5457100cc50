// The memory bound of a worker process: how big it may be, how it is set,
// and how a point that ran into it is worded.
#pragma once

#include <cstdint>
#include <string>

namespace zvsmap {

/// Parses a size in bytes with an optional binary suffix: "2G" (2 GiB),
/// "512M", "1.5G", "800K", "4096"; "0" means no bound. Returns false with
/// `error` ("worker memory 'x': ...") for anything else or below 64 MiB.
bool ParseMemorySize(const std::string& text, uint64_t* bytes, std::string* error);

/// "2 GiB", "512 MiB", "1.5 GiB", "1000 MiB" (four significant digits).
std::string FormatMemorySize(uint64_t bytes);

/// The default bound per worker: min(4 GiB, physical memory / (jobs + 1)),
/// so `jobs` workers and the parent fit in the machine together.
uint64_t DefaultWorkerMemory(int jobs);

/// Bounds the calling process's address space (RLIMIT_AS) to `bytes`; 0 sets
/// nothing. Returns false when the limit cannot be set or the build runs
/// under AddressSanitizer (its shadow memory needs terabytes of address
/// space), in which case nothing is set.
bool ApplyMemoryBound(uint64_t bytes);

/// False when ApplyMemoryBound cannot bound anything in this build
/// (AddressSanitizer).
bool MemoryBoundAvailable();

/// True when a failure text reads as an allocation failure: C++'s
/// std::bad_alloc or ngspice's "can't allocate" / "Out of memory".
bool LooksLikeAllocationFailure(const std::string& text);

/// "memory bound: the worker reached its 2 GiB limit (--worker-memory); " + detail
/// (just the first part when `detail` is empty).
std::string MemoryBoundReason(uint64_t bytes, const std::string& detail);

}  // namespace zvsmap
