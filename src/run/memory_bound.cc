#include "run/memory_bound.h"

#include <sys/resource.h>
#include <unistd.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#if defined(__has_feature)
#if __has_feature(address_sanitizer)
#define ZVSMAP_UNDER_ASAN 1
#endif
#endif
#if defined(__SANITIZE_ADDRESS__)
#define ZVSMAP_UNDER_ASAN 1
#endif

namespace zvsmap {

namespace {
constexpr uint64_t kKiB = 1024, kMiB = kKiB * 1024, kGiB = kMiB * 1024;
}  // namespace

bool ParseMemorySize(const std::string& text, uint64_t* bytes, std::string* error) {
  auto fail = [&](const std::string& why) {
    *error = "worker memory '" + text + "': " + why;
    return false;
  };
  if (text.empty() || !(std::isdigit(static_cast<unsigned char>(text[0])) || text[0] == '.')) {
    return fail("give a size such as 2G, 512M or 0 (no bound)");
  }
  char* end = nullptr;
  double value = std::strtod(text.c_str(), &end);
  std::string suffix(end);
  if (suffix.size() == 2 && (suffix[1] == 'B' || suffix[1] == 'b')) suffix.pop_back();
  if (suffix.size() == 3 && (suffix.substr(1) == "iB" || suffix.substr(1) == "ib")) {
    suffix.resize(1);
  }
  uint64_t unit = 1;
  if (suffix.size() == 1) {
    switch (std::toupper(static_cast<unsigned char>(suffix[0]))) {
      case 'K':
        unit = kKiB;
        break;
      case 'M':
        unit = kMiB;
        break;
      case 'G':
        unit = kGiB;
        break;
      case 'T':
        unit = kGiB * 1024;
        break;
      default:
        return fail("unknown unit '" + suffix + "' (use K, M, G or T: powers of 1024)");
    }
  } else if (!suffix.empty()) {
    return fail("unknown unit '" + suffix + "' (use K, M, G or T: powers of 1024)");
  }
  double total = value * static_cast<double>(unit);
  if (!std::isfinite(total) || total >= 1.8e19) return fail("too large");
  *bytes = static_cast<uint64_t>(total);
  if (*bytes != 0 && *bytes < 64 * kMiB) {
    return fail("below 64M, where a worker cannot even load ngspice (0 means no bound)");
  }
  return true;
}

std::string FormatMemorySize(uint64_t bytes) {
  const char* units[] = {"bytes", "KiB", "MiB", "GiB", "TiB"};
  double v = static_cast<double>(bytes);
  int u = 0;
  while (v >= 1024 && u < 4) {
    v /= 1024;
    ++u;
  }
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.4g %s", v, units[u]);
  return buf;
}

uint64_t DefaultWorkerMemory(int jobs) {
  long pages = sysconf(_SC_PHYS_PAGES);
  long page_size = sysconf(_SC_PAGESIZE);
  uint64_t bound = 4 * kGiB;
  if (pages > 0 && page_size > 0) {
    uint64_t physical = static_cast<uint64_t>(pages) * static_cast<uint64_t>(page_size);
    bound = std::min(bound, physical / static_cast<uint64_t>(std::max(jobs, 1) + 1));
  }
  return std::max(bound, 256 * kMiB);
}

bool ApplyMemoryBound(uint64_t bytes) {
  if (bytes == 0) return true;
#ifdef ZVSMAP_UNDER_ASAN
  return false;
#else
  struct rlimit limit {};
  if (getrlimit(RLIMIT_AS, &limit) != 0) return false;
  rlim_t want = static_cast<rlim_t>(bytes);
  if (limit.rlim_max != RLIM_INFINITY && want > limit.rlim_max) want = limit.rlim_max;
  limit.rlim_cur = want;
  return setrlimit(RLIMIT_AS, &limit) == 0;
#endif
}

bool MemoryBoundAvailable() {
#ifdef ZVSMAP_UNDER_ASAN
  return false;
#else
  return true;
#endif
}

bool LooksLikeAllocationFailure(const std::string& text) {
  for (const char* marker :
       {"bad_alloc", "can't allocate", "cannot allocate", "Out of memory", "out of memory"}) {
    if (text.find(marker) != std::string::npos) return true;
  }
  return false;
}

std::string MemoryBoundReason(uint64_t bytes, const std::string& detail) {
  std::string reason = "memory bound: the worker reached its " + FormatMemorySize(bytes) +
                       " limit (--worker-memory)";
  return detail.empty() ? reason : reason + "; " + detail;
}

}  // namespace zvsmap
