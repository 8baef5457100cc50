// junit.xml: the run's verdict in the JUnit XML form that build servers read.
#pragma once

#include <pugixml.hpp>
#include <vector>

#include "report/report_set.h"
#include "report/requirements.h"

namespace zvsmap {

/// Builds <testsuites name="zvsmap"> with two <testsuite>s:
///   "requirements": one <testcase> per requirement; a broken one carries
///     <failure message="..." type="requirement"> whose text lists the failing
///     points with their values;
///   "points": one <testcase> per group of points that did not run (grouped by
///     status and reason, <failure type="failed"|"unsettled"> listing the
///     points), or a single passing "every point ran" when all ran.
/// Counts (tests, failures, errors="0", skipped="0") are set on every level.
void BuildJunitXml(const ReportInput& input, const std::vector<RequirementVerdict>& verdicts,
                   pugi::xml_document* doc);

}  // namespace zvsmap
