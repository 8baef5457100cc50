#include "report/report_set.h"

#include <filesystem>
#include <fstream>

#include "report/csv_writer.h"

namespace zvsmap {

bool WriteReports(const ReportInput& input, const std::string& dir, ReportOutcome* outcome,
                  std::string* error) {
  std::string csv_path = (std::filesystem::path(dir) / "edges.csv").string();
  std::ofstream csv(csv_path, std::ios::binary);
  WriteEdgesCsv(csv, input.points, input.results);
  csv.close();
  if (!csv) {
    *error = csv_path + ": cannot write";
    return false;
  }
  outcome->files.push_back(csv_path);
  return true;
}

}  // namespace zvsmap
