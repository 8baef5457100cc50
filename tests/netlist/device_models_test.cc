// The user's own switch models: checks before any simulation (file, subcircuit,
// pin map, roles) and the rewritten instance lines. Inputs inline; the model
// files are written to a temporary folder. The expected messages are our own
// wording (common practice: name the file and line, no source).
#include "netlist/device_models.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

#include "netlist/render.h"
#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

const char* kTemplate = R"(half bridge under test
.param Vin=48
.param fsw=500k
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense
*@+ high=xhs low=xls high_cmd=ch low_cmd=cl
xhs in gh sw zsw_linear ron_ohm=10m vds0_v={Vin}
xls sw gl 0 zsw_linear ron_ohm=10m vds0_v=0
.subckt zsw_linear d g s params: ron_ohm=10m vds0_v=0
vch d dch 0
rch dch s {ron_ohm}
.ends
.end
)";

const char* kModels = R"(* invented models for the test
.subckt fet_sdg S D G params: rg=1
vch D x 0
r1 x S 1
.ends
.SUBCKT Fet5 D G S KS
+ TJ
r1 D S 1
.ENDS
)";

class DeviceModelsTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ =
        std::filesystem::temp_directory_path() / ("zvsmap_devices_" + std::to_string(::getpid()));
    std::filesystem::create_directories(dir_);
    std::ofstream(dir_ / "models.lib") << kModels;
    ASSERT_TRUE(ParseTemplateText(kTemplate, "t.cir", &tmpl_, &error_)) << error_.Format();
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  // Parses a sweep with `body` (after <template>) and resolves its devices.
  bool Resolve(const std::string& body) {
    std::string text = "<sweep>\n<template file=\"t.cir\"/>\n" + body + "</sweep>\n";
    path_ = (dir_ / "s.xml").string();
    if (!ParseSweepText(text, path_, &spec_, &error_)) {
      errors_ = {error_};
      return false;
    }
    errors_.clear();
    return ResolveSweepDevices(spec_, tmpl_, &devices_, &errors_);
  }
  std::string FirstError() const {
    if (errors_.empty()) return "";
    Diagnostic d = errors_[0];
    d.source_line.clear();
    d.where.file = std::filesystem::path(d.where.file).filename().string();
    return d.Format();
  }

  std::filesystem::path dir_;
  std::string path_;
  Template tmpl_;
  SweepSpec spec_;
  Diagnostic error_;
  std::vector<Diagnostic> errors_;
  std::vector<ResolvedDevice> devices_;
};

TEST_F(DeviceModelsTest, ScansSubcircuitsWithContinuationsCaseInsensitively) {
  std::vector<SubcktInfo> found;
  std::string error;
  ASSERT_TRUE(ScanSubckts((dir_ / "models.lib").string(), &found, &error)) << error;
  ASSERT_EQ(found.size(), 2u);
  EXPECT_EQ(found[0].name, "fet_sdg");
  EXPECT_EQ(found[0].pins, (std::vector<std::string>{"s", "d", "g"}));
  EXPECT_EQ(found[0].params, (std::vector<std::string>{"rg"}));
  EXPECT_TRUE(found[0].has_vch);
  EXPECT_EQ(found[1].pins, (std::vector<std::string>{"d", "g", "s", "ks", "tj"}));
  EXPECT_EQ(found[1].where.line, 6);
  EXPECT_FALSE(found[1].has_vch);
}

TEST_F(DeviceModelsTest, MissingModelFile) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"nowhere.lib\" subckt=\"x\" pins=\"d g s\"/>\n"
              "<axis device=\"leg.high\" values=\"a\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: device 'a': model file 'nowhere.lib' does not exist "
            "(looked for '" +
                (dir_ / "nowhere.lib").string() + "')");
}

TEST_F(DeviceModelsTest, SubcircuitNotInTheFile) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet_sgd\" pins=\"s d g\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: device 'a': subcircuit 'fet_sgd' not found in 'models.lib' (it defines: "
            "fet_sdg, Fet5; did you mean 'fet_sdg'?)");
}

TEST_F(DeviceModelsTest, PinCountDoesNotMatch) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"FET5\" pins=\"d g s\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:3: device 'a': the pin map has 3 entries but subcircuit 'Fet5' (" +
                              (dir_ / "models.lib").string() + ":6) has 5 pins (d g s ks tj)");
}

TEST_F(DeviceModelsTest, PinNameNotInTheSubcircuit) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet5\" pins=\"D=d G=g S=s KS=s "
              "TK=25\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: device 'a': the pin map names pin 'tk' but subcircuit 'Fet5' (" +
                (dir_ / "models.lib").string() + ":6) has pins (d g s ks tj) (did you mean 'tj'?)");
}

TEST_F(DeviceModelsTest, PinLeftFloating) {
  EXPECT_FALSE(Resolve(
      "<device name=\"a\" file=\"models.lib\" subckt=\"fet5\" pins=\"D=d G=g S=s KS=s\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:3: device 'a': pin 'tj' of subcircuit 'Fet5' (" +
                              (dir_ / "models.lib").string() +
                              ":6) is left floating; tie it to d, g, s, a node (@name) or a "
                              "voltage");
}

TEST_F(DeviceModelsTest, SwitchNodeLeftFloating) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet_sdg\" pins=\"s d s\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:3: device 'a': no pin of subcircuit 'fet_sdg' (" +
                              (dir_ / "models.lib").string() +
                              ":2) is tied to the switch's gate (g), which would leave that node "
                              "floating");
}

TEST_F(DeviceModelsTest, BadPinMapSyntaxAndUnknownNamesAreParseErrors) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet5\" pins=\"D=d G=x\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: pin map entry 'G=x': tie a pin to d, g, s (the switch's "
            "drain, gate, source), a template node as @name, or a fixed voltage "
            "(a number)");
  EXPECT_FALSE(
      Resolve("<device name=\"a\" model=\"zsw_linear\"/>\n"
              "<axis device=\"leg.high\" values=\"b\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:4: unknown device 'b' (declare it with <device name=\"b\" .../>; did you "
            "mean 'a'?)");
  EXPECT_FALSE(
      Resolve("<device name=\"a\" model=\"zsw_linear\"/>\n"
              "<axis device=\"leg.middle\" values=\"a\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:4: bad switch role 'leg.middle' (use CELL.high or CELL.low, e.g. leg.high)");
  EXPECT_FALSE(Resolve("<device name=\"a\" model=\"zsw_junktion\"/>\n"));
  EXPECT_EQ(FirstError().substr(0, 70),
            "s.xml:3: device 'a': subcircuit 'zsw_junktion' not found in 'netlists/");
}

TEST_F(DeviceModelsTest, SweepValuesThatReachTheDeckStayOneToken) {
  // &#10; is a line feed inside an XML attribute (XML 1.0, sec. 3.3.3).
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet_sdg\" pins=\"s d g\" "
              "params=\"rg=2&#10;.control&#10;shell touch x&#10;.endc\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: device 'a': params holds a line break (LF) at character 5; a parameter "
            "list stays on one card");
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" section=\"typ&#10;.endc\" subckt=\"fet_sdg\" "
              "pins=\"s d g\"/>\n"));
  EXPECT_EQ(FirstError(),
            "s.xml:3: device 'a': section 'typ\\n.endc' is not a library section name (letters, "
            "digits and _ . - only)");
  EXPECT_FALSE(
      Resolve("<device name=\"a\" file=\"models.lib\" subckt=\"fet_sdg\" pins=\"s d g\" "
              "params=\"rgg=2\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:3: device 'a': params names 'rgg', which subcircuit 'fet_sdg' (" +
                              (dir_ / "models.lib").string() +
                              ":2) does not declare (it declares: rg; did you mean 'rg'?)");
}

TEST_F(DeviceModelsTest, ModelFilesPassTheDeckRules) {
  std::ofstream(dir_ / "evil.lib") << ".subckt q d g s\nr1 d s 1\n.ends\n*#shell touch x\n";
  EXPECT_FALSE(Resolve("<device name=\"a\" file=\"evil.lib\" subckt=\"q\" pins=\"d g s\"/>\n"));
  EXPECT_EQ(FirstError(),
            "evil.lib:4: '*#' lines are commands to ngspice (run like a control section); a "
            "zvsmap deck holds no commands");
  std::ofstream(dir_ / "bin.lib", std::ios::binary) << std::string("\0\x01\x02", 3);
  EXPECT_FALSE(Resolve("<device name=\"a\" file=\"bin.lib\" subckt=\"q\" pins=\"d g s\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:3: device 'a': '" + (dir_ / "bin.lib").string() +
                              "' is a binary file (it holds NUL bytes), not a SPICE netlist");
}

TEST_F(DeviceModelsTest, RoleMustNameACellOfTheTemplate) {
  EXPECT_FALSE(
      Resolve("<device name=\"a\" model=\"zsw_linear\"/>\n"
              "<axis device=\"arm.high\" values=\"a\"/>\n"));
  EXPECT_EQ(FirstError(), "s.xml:4: switch role 'arm.high': the template has no cell 'arm'");
}

TEST_F(DeviceModelsTest, RewritesInstancesWithThePinMapAndTies) {
  ASSERT_TRUE(
      Resolve("<device name=\"mine\" file=\"models.lib\" subckt=\"fet_sdg\" pins=\"s d g\" "
              "params=\"rg=2\"/>\n"
              "<device name=\"five\" file=\"models.lib\" subckt=\"fet5\" pins=\"D=d G=g S=s KS=s "
              "TJ=25\"/>\n"
              "<device name=\"jn\" model=\"zsw_junction\" params=\"c0_f=2n\"/>\n"
              "<axis device=\"leg.high\" values=\"mine jn\"/>\n"
              "<axis device=\"leg.low\" values=\"five\"/>\n"))
      << FirstError();
  std::string netlist =
      "title\nxhs in gh sw zsw_linear ron_ohm=10m vds0_v={Vin}\n"
      "xls sw gl 0 zsw_linear ron_ohm=10m vds0_v=0\n.end\n";
  std::string error;
  std::string a = netlist;
  ASSERT_TRUE(
      ApplyDevices(tmpl_, devices_, {{"leg.high", "mine"}, {"leg.low", "five"}}, &a, &error))
      << error;
  // The model file's cards are inlined (continuations joined): ngspice opens no file.
  EXPECT_EQ(a,
            "title\n* zvsmap switch models\n* invented models for the test\n"
            ".subckt fet_sdg S D G params: rg=1\nvch D x 0\nr1 x S 1\n.ends\n"
            ".SUBCKT Fet5 D G S KS TJ\nr1 D S 1\n.ENDS\n"
            "vzt_xls_tj zt_xls_tj 0 dc 25\n"
            "* wrapper: i(v.xls.vch) is the drain terminal current of Fet5\n"
            ".subckt zvsmap_w_xls d g s t_tj\nvch d d_dut 0\n"
            "x1 d_dut g s s t_tj Fet5\n.ends zvsmap_w_xls\n"
            "xhs sw in gh fet_sdg rg=2\n"
            "xls sw gl 0 zt_xls_tj zvsmap_w_xls\n.end\n");
  // A generic model keeps the template's initial voltage, takes its own params,
  // and the template's own definition of a generic name is not duplicated.
  std::string b = netlist;
  ASSERT_TRUE(ApplyDevices(tmpl_, devices_, {{"leg.high", "jn"}}, &b, &error)) << error;
  EXPECT_NE(b.find("\n.subckt zsw_junction d g s"), std::string::npos);
  EXPECT_NE(b.find("\nxhs in gh sw zsw_junction vds0_v={Vin} c0_f=2n\n"), std::string::npos);
  EXPECT_NE(b.find("\nxls sw gl 0 zsw_linear ron_ohm=10m vds0_v=0\n"), std::string::npos);
}

}  // namespace
}  // namespace zvsmap
