// Checking a sweep's declared requirements against its results.
#pragma once

#include <string>
#include <vector>

#include "report/report_set.h"
#include "sweep/requirement_spec.h"

namespace zvsmap {

/// The outcome of one requirement over the points it covers.
struct RequirementVerdict {
  RequirementSpec spec;
  std::string title;  ///< the file's name="" or "file:line: <Describe()>"
  bool held = false;
  int covered = 0;                   ///< points where the where-expression holds
  int checked = 0;                   ///< of those, points that ran and were checked
  int failing = 0;                   ///< checked points where the requirement does not hold
  int unchecked = 0;                 ///< covered points that failed or did not settle
  std::string message;               ///< one line: why it failed, or what it checked
  std::vector<std::string> details;  ///< one line per failing point (point, values)
};

/// Evaluates every requirement of `input.spec` in file order. A requirement
/// fails when any checked point breaks it, when it checks no point at all, or
/// when its where-expression cannot be evaluated (the message then names the
/// requirement's file:line). Covered points that did not run are counted as
/// unchecked, not as failures (the run's exit status reports them).
std::vector<RequirementVerdict> EvaluateRequirements(const ReportBasis& input);

}  // namespace zvsmap
