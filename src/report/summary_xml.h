// summary.xml: where ZVS holds, per cell and edge, in zvsmap's own XML
// vocabulary (schema: sweeps/schema/zvsmap-summary.xsd).
#pragma once

#include <pugixml.hpp>
#include <string>
#include <vector>

#include "report/report_set.h"
#include "report/requirements.h"

namespace zvsmap {

/// Builds the summary document: the run (<run>), the grid (<grid>), the
/// margin used (<margin>), per edge (<edge>) the counts by class, the ZVS
/// region as <boundary> elements, the worst margin and the measured ranges of
/// t_ZVS and the dead-time window (when the results have those columns), the
/// dead-time envelope (<dead-time-envelope>, when the results carry the
/// probe's window), then the points that did not run and the requirement
/// verdicts.
void BuildSummaryXml(const ReportBasis& input, const std::vector<RequirementVerdict>& verdicts,
                     pugi::xml_document* doc);

/// Formats a number for the XML files: %.9g; NaN, INF, -INF as xs:double spells them.
std::string XmlNumber(double value);

}  // namespace zvsmap
