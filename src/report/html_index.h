// index.html: one page that opens offline from the file system and shows the
// run, the verdict, the requirements, the plots and links to the other files.
#pragma once

#include <string>
#include <vector>

#include "report/plots.h"
#include "report/report_set.h"
#include "report/requirements.h"

namespace zvsmap {

/// Escapes text for HTML element content and quoted attribute values.
std::string HtmlEscape(const std::string& text);

/// The page: run identity (sweep file, template, points), the verdict, the
/// requirements table, each plot as an <img> of its SVG file (relative path),
/// links to `files` (relative names, e.g. "edges.csv"), and the cautions.
/// Self-contained: inline CSS, no scripts, nothing fetched from the network.
std::string BuildHtmlIndex(const ReportBasis& input,
                           const std::vector<RequirementVerdict>& verdicts,
                           const std::vector<Plot>& plots, const std::vector<std::string>& files);

}  // namespace zvsmap
