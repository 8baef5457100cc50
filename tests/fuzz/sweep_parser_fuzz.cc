// libFuzzer target: the sweep-file parser and grid expansion must never
// crash, leak or hang on any input. Built only with ZVSMAP_FUZZ=ON and clang;
// run it with tools/fuzz-sweep.
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/point.h"
#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string text(reinterpret_cast<const char*>(data), size);
  zvsmap::SweepSpec spec;
  zvsmap::Diagnostic error;
  if (!zvsmap::ParseSweepText(text, "fuzz/sweep.xml", &spec, &error)) {
    (void)error.Format();  // the message path must be safe too
    return 0;
  }
  // Keep each input fast: expansion is linear in the grid size.
  if (spec.max_points > 2000) spec.max_points = 2000;
  std::vector<zvsmap::Point> points;
  if (zvsmap::ExpandSweep(spec, &points, &error)) {
    for (const auto& p : points) (void)p.Describe();
  } else {
    (void)error.Format();
  }
  return 0;
}
