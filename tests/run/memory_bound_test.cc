// Unit tests of the worker memory bound's sizes, default and wording.
#include "run/memory_bound.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <string>

namespace zvsmap {
namespace {

constexpr uint64_t kMiB = 1ull << 20, kGiB = 1ull << 30;

uint64_t Parse(const std::string& text) {
  uint64_t bytes = 12345;
  std::string error;
  EXPECT_TRUE(ParseMemorySize(text, &bytes, &error)) << text << ": " << error;
  return bytes;
}

std::string Refusal(const std::string& text) {
  uint64_t bytes = 0;
  std::string error;
  EXPECT_FALSE(ParseMemorySize(text, &bytes, &error)) << text;
  return error;
}

TEST(MemoryBoundTest, SizesUseBinaryUnits) {
  // K, M, G, T as powers of 1024, the common practice of ulimit and free(1).
  EXPECT_EQ(Parse("2G"), 2 * kGiB);
  EXPECT_EQ(Parse("2g"), 2 * kGiB);
  EXPECT_EQ(Parse("2GiB"), 2 * kGiB);
  EXPECT_EQ(Parse("512M"), 512 * kMiB);
  EXPECT_EQ(Parse("512MB"), 512 * kMiB);
  EXPECT_EQ(Parse("1.5G"), 3 * kGiB / 2);
  EXPECT_EQ(Parse("131072K"), 128 * kMiB);
  EXPECT_EQ(Parse("134217728"), 128 * kMiB);
  EXPECT_EQ(Parse("0"), 0u);
}

TEST(MemoryBoundTest, BadSizesAreRefusedWithTheReason) {
  EXPECT_EQ(Refusal(""), "worker memory '': give a size such as 2G, 512M or 0 (no bound)");
  EXPECT_EQ(Refusal("lots"), "worker memory 'lots': give a size such as 2G, 512M or 0 (no bound)");
  EXPECT_EQ(Refusal("-1G"), "worker memory '-1G': give a size such as 2G, 512M or 0 (no bound)");
  EXPECT_EQ(Refusal("2X"),
            "worker memory '2X': unknown unit 'X' (use K, M, G or T: powers of 1024)");
  EXPECT_EQ(Refusal("2 G"),
            "worker memory '2 G': unknown unit ' G' (use K, M, G or T: powers of 1024)");
  EXPECT_EQ(Refusal("10M"),
            "worker memory '10M': below 64M, where a worker cannot even load ngspice (0 means "
            "no bound)");
}

TEST(MemoryBoundTest, FormatIsFourDigitsInBinaryUnits) {
  EXPECT_EQ(FormatMemorySize(2 * kGiB), "2 GiB");
  EXPECT_EQ(FormatMemorySize(512 * kMiB), "512 MiB");
  EXPECT_EQ(FormatMemorySize(3 * kGiB / 2), "1.5 GiB");
  EXPECT_EQ(FormatMemorySize(1000 * kMiB), "1000 MiB");
  EXPECT_EQ(FormatMemorySize(1000), "1000 bytes");
}

TEST(MemoryBoundTest, DefaultLeavesRoomForEveryWorkerAndTheParent) {
  uint64_t physical =
      static_cast<uint64_t>(sysconf(_SC_PHYS_PAGES)) * static_cast<uint64_t>(sysconf(_SC_PAGESIZE));
  for (int jobs : {1, 2, 8}) {
    uint64_t bound = DefaultWorkerMemory(jobs);
    EXPECT_LE(bound, 4 * kGiB) << jobs;
    if (physical / (jobs + 1) >= 256 * kMiB) {
      EXPECT_LE(bound, physical / (jobs + 1)) << jobs;
    }
    // On the 24 GiB, 2-core machine of the brief: min(4 GiB, 24 GiB / 3) = 4 GiB.
    if (physical >= 12 * kGiB && jobs == 2) {
      EXPECT_EQ(bound, 4 * kGiB);
    }
  }
}

TEST(MemoryBoundTest, AllocationFailuresAreRecognisedAndWorded) {
  EXPECT_TRUE(LooksLikeAllocationFailure("internal error: std::bad_alloc"));
  EXPECT_TRUE(LooksLikeAllocationFailure(
      "engine error: malloc: Internal Error: can't allocate 16000 bytes."));
  EXPECT_FALSE(LooksLikeAllocationFailure("engine error: Timestep too small"));
  EXPECT_EQ(MemoryBoundReason(2 * kGiB, ""),
            "memory bound: the worker reached its 2 GiB limit (--worker-memory)");
  EXPECT_EQ(MemoryBoundReason(256 * kMiB, "crash (signal 11)"),
            "memory bound: the worker reached its 256 MiB limit (--worker-memory); crash "
            "(signal 11)");
}

}  // namespace
}  // namespace zvsmap
