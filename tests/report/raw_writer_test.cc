#include "report/raw_writer.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace zvsmap {
namespace {

Waveforms Sample() {
  Waveforms w;
  w.SetTime({0.0, 1e-9, 1e-9, 2.5e-9});  // a repeated breakpoint time is allowed
  w.Set("v(sw)", {0.0, 12.5, 24.0, 48.0});
  w.Set("i(vsense)", {-4.0, -3.5, -3.0, 1.25e-3});
  w.Set("i(v.xhs.vch)", {0.0, 0.0, 1e-12, -2.0});
  return w;
}

// A small reader of the ASCII raw-file layout (header "Key: value" lines,
// "Variables:" rows "index name type", "Values:" blocks "point value..."),
// as the Spice3/ngspice raw format describes it. // ngspice User's Manual,
// "write" command and rawfile format; from memory
struct Raw {
  std::map<std::string, std::string> header;
  std::vector<std::pair<std::string, std::string>> variables;  // name, type
  std::vector<std::vector<double>> values;                     // per point
};

Raw Parse(const std::string& text) {
  Raw raw;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line) && line != "Variables:") {
    size_t colon = line.find(": ");
    if (colon != std::string::npos) raw.header[line.substr(0, colon)] = line.substr(colon + 2);
  }
  int nvars = std::stoi(raw.header["No. Variables"]);
  int npoints = std::stoi(raw.header["No. Points"]);
  for (int i = 0; i < nvars; ++i) {
    std::getline(in, line);
    std::istringstream row(line);
    int index = -1;
    std::string name, type;
    row >> index >> name >> type;
    EXPECT_EQ(index, i);
    raw.variables.emplace_back(name, type);
  }
  std::getline(in, line);
  EXPECT_EQ(line, "Values:");
  for (int p = 0; p < npoints; ++p) {
    int index = -1;
    in >> index;
    EXPECT_EQ(index, p);
    std::vector<double> v(nvars);
    for (double& x : v) in >> x;
    raw.values.push_back(v);
  }
  return raw;
}

TEST(RawWriterTest, HeaderFieldsAndValuesRoundTrip) {
  std::ostringstream out;
  ASSERT_TRUE(WriteRawFile(
      out, Sample(),
      {"buck point 3\nsecond line", "Tue Dec  1 23:21:25  2026", "Transient Analysis"}));
  Raw raw = Parse(out.str());
  // Header keys and order of the ASCII raw file as ngspice 39's `write`
  // produces them (checked with `set filetype=ascii` on this machine). // from memory
  EXPECT_EQ(out.str().rfind("Title: buck point 3 second line\nDate: Tue Dec  1 23:21:25  2026\n"
                            "Plotname: Transient Analysis\nFlags: real\nNo. Variables: 4\n"
                            "No. Points: 4\nVariables:\n\t0\ttime\ttime\n",
                            0),
            0u);
  ASSERT_EQ(raw.variables.size(), 4u);
  EXPECT_EQ(raw.variables[0], std::make_pair(std::string("time"), std::string("time")));
  EXPECT_EQ(raw.variables[1], std::make_pair(std::string("i(v.xhs.vch)"), std::string("current")));
  EXPECT_EQ(raw.variables[2], std::make_pair(std::string("i(vsense)"), std::string("current")));
  EXPECT_EQ(raw.variables[3], std::make_pair(std::string("v(sw)"), std::string("voltage")));
  ASSERT_EQ(raw.values.size(), 4u);
  Waveforms w = Sample();
  for (size_t p = 0; p < 4; ++p) {
    // %.15e keeps 16 significant digits: exact for these values. // C standard, printf
    EXPECT_EQ(raw.values[p][0], w.time()[p]);
    EXPECT_EQ(raw.values[p][1], w.Get("i(v.xhs.vch)")[p]);
    EXPECT_EQ(raw.values[p][2], w.Get("i(vsense)")[p]);
    EXPECT_EQ(raw.values[p][3], w.Get("v(sw)")[p]);
  }
}

TEST(RawWriterTest, NgspiceLoadsTheFile) {
  if (access("/usr/bin/ngspice", X_OK) != 0) GTEST_SKIP() << "ngspice CLI not installed";
  auto dir =
      std::filesystem::temp_directory_path() / ("zvsmap-raw-test-" + std::to_string(getpid()));
  std::filesystem::create_directories(dir);
  {
    std::ofstream raw(dir / "w.raw");
    ASSERT_TRUE(WriteRawFile(raw, Sample(), {"t", RawFileDate(), "Transient Analysis"}));
  }
  {
    std::ofstream cir(dir / "load.cir");
    cir << "load check\n.control\nload " << (dir / "w.raw").string()
        << "\nprint length(time) v(sw)[3] i(vsense)[0]\n.endc\n.end\n";
  }
  std::string cmd =
      "cd " + dir.string() + " && HOME=" + dir.string() + " /usr/bin/ngspice -b load.cir 2>&1";
  std::string text;
  if (FILE* p = popen(cmd.c_str(), "r")) {
    char buf[512];
    while (fgets(buf, sizeof buf, p)) text += buf;
    pclose(p);
  }
  std::filesystem::remove_all(dir);
  // ngspice's `print` echoes "expression = value". // ngspice User's Manual, print
  auto printed = [&](const std::string& expr) {
    size_t at = text.find(expr + " = ");
    return at == std::string::npos ? std::nan("")
                                   : std::strtod(text.c_str() + at + expr.size() + 3, nullptr);
  };
  EXPECT_DOUBLE_EQ(printed("length(time)"), 4) << text;
  EXPECT_NEAR(printed("v(sw)[3]"), 48, 1e-5) << text;
  EXPECT_NEAR(printed("i(vsense)[0]"), -4, 1e-5) << text;
}

}  // namespace
}  // namespace zvsmap
