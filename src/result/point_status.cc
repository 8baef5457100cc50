#include "result/point_status.h"

namespace zvsmap {

namespace {
constexpr PointStatus kAll[] = {PointStatus::kOk, PointStatus::kFailed, PointStatus::kUnsettled,
                                PointStatus::kNotRun};
}  // namespace

const char* PointStatusName(PointStatus s) {
  switch (s) {
    case PointStatus::kOk: return "ok";
    case PointStatus::kFailed: return "failed";
    case PointStatus::kUnsettled: return "unsettled";
    case PointStatus::kNotRun: return "not-run";
  }
  return "failed";
}

bool PointStatusFromName(const std::string& name, PointStatus* out) {
  for (PointStatus s : kAll) {
    if (name == PointStatusName(s)) {
      *out = s;
      return true;
    }
  }
  return false;
}

}  // namespace zvsmap
