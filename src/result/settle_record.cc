#include "result/settle_record.h"

namespace zvsmap {

namespace {
constexpr SettleMethod kAll[] = {SettleMethod::kNotAttempted, SettleMethod::kNone,
                                 SettleMethod::kShooting, SettleMethod::kPeriods};
}  // namespace

const char* SettleMethodName(SettleMethod m) {
  switch (m) {
    case SettleMethod::kNotAttempted: return "";
    case SettleMethod::kNone: return "none";
    case SettleMethod::kShooting: return "shooting";
    case SettleMethod::kPeriods: return "periods";
  }
  return "";
}

bool SettleMethodFromName(const std::string& name, SettleMethod* out) {
  for (SettleMethod m : kAll) {
    if (name == SettleMethodName(m)) {
      *out = m;
      return true;
    }
  }
  return false;
}

}  // namespace zvsmap
