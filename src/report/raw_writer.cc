#include "report/raw_writer.h"

#include <cstdio>
#include <ctime>

namespace zvsmap {

namespace {

std::string OneLine(std::string s) {
  for (char& c : s) {
    if (c == '\n' || c == '\r') c = ' ';
  }
  return s;
}

// ngspice reads the type to choose units and scales in its plots.
const char* TypeOf(const std::string& name) {
  if (name.rfind("v(", 0) == 0) return "voltage";
  if (name.rfind("i(", 0) == 0) return "current";
  return "notype";
}

std::string Number(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.15e", v);
  return buf;
}

}  // namespace

bool WriteRawFile(std::ostream& out, const Waveforms& waves, const RawFileInfo& info) {
  const std::vector<double>& time = waves.time();
  std::vector<std::string> names = waves.Names();
  out << "Title: " << OneLine(info.title) << "\n";
  out << "Date: " << OneLine(info.date) << "\n";
  out << "Plotname: " << OneLine(info.plotname) << "\n";
  out << "Flags: real\n";
  out << "No. Variables: " << names.size() + 1 << "\n";
  out << "No. Points: " << time.size() << "\n";
  out << "Variables:\n";
  out << "\t0\ttime\ttime\n";
  for (size_t i = 0; i < names.size(); ++i) {
    out << "\t" << i + 1 << "\t" << names[i] << "\t" << TypeOf(names[i]) << "\n";
  }
  out << "Values:\n";
  std::vector<const std::vector<double>*> columns;
  for (const auto& n : names) columns.push_back(&waves.Get(n));
  for (size_t k = 0; k < time.size(); ++k) {
    out << " " << k << "\t" << Number(time[k]) << "\n";
    for (const auto* c : columns) out << "\t" << Number((*c)[k]) << "\n";
    out << "\n";
  }
  return static_cast<bool>(out);
}

std::string RawFileDate() {
  std::time_t now = std::time(nullptr);
  std::tm local{};
  localtime_r(&now, &local);
  char buf[64];
  std::strftime(buf, sizeof buf, "%a %b %e %H:%M:%S  %Y", &local);
  return buf;
}

}  // namespace zvsmap
