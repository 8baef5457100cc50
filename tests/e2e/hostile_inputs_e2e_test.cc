// A corpus of hostile inputs through the built binary, across every channel
// that reaches a deck: the template, files it includes, device model files,
// sweep-file attributes and file names. Each tries to make ngspice run
// `shell touch MARKER` (ngspice 39 runs control sections in any spelling
// ciprefix(".control") accepts, "*#" lines, "pre_" commands, and scripts
// marked "*ng_script"); each must exit 2 naming the file, before anything is
// simulated, and the marker never appears. The circuit is an invented scenario.
#include <fcntl.h>
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "e2e_support.h"

namespace {

namespace fs = std::filesystem;
using zvsmap_e2e::ReadText;

int RunZvsmapArgs(const std::vector<std::string>& args, std::string* log) {
  std::string log_path =
      fs::temp_directory_path() / ("zvsmap_hostile_log_" + std::to_string(getpid()));
  pid_t pid = fork();
  if (pid == 0) {
    int out = open(log_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    int null = open("/dev/null", O_WRONLY);
    dup2(out, 2);
    dup2(null, 1);
    std::vector<std::string> copy = args;
    std::string binary = ZVSMAP_BINARY;
    std::vector<char*> argv{&binary[0]};
    for (auto& a : copy) argv.push_back(&a[0]);
    argv.push_back(nullptr);
    execv(binary.c_str(), argv.data());
    _exit(127);
  }
  int status = 0;
  waitpid(pid, &status, 0);
  *log = ReadText(log_path);
  fs::remove(log_path);
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

// {{M}} in a case's text becomes the command that would create the marker.
const char* kTemplate = R"(hostile input test: a small buck half-bridge (invented scenario)
.param Vin=48 fsw=500k Dd=50n il0=0 vout0=12 Iout=2
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense high=xhs low=xls
*@+ high_cmd=ch low_cmd=cl
*@ state i(l1) init=il0
*@ state v(out) init=vout0
.include inc.cir
{{T}}
vin in 0 {Vin}
vch ch 0 pulse(0 1 {Dd} 1n 1n {0.25/fsw-Dd} {1/fsw})
vcl cl 0 pulse(1 0 0 1n 1n {0.75/fsw} {1/fsw})
xhs in ch sw sw1
xls sw cl 0 sw1
vsense sw sx 0
l1 sx out 1u ic={il0}
cout out 0 22u ic={vout0}
iload out 0 {Iout}
.subckt sw1 d g s
vch d dch 0
sch dch s g 0 swm
cds d s 1n
.model swm sw(vt=0.5 vh=0.1 ron=10m roff=1Meg)
.ends
.end
)";
const char* kModel =
    "* invented switch model\n.subckt usw D G S params: r=10m\nvch D x 0\nr1 x S {r}\n"
    "c1 D S 1n\n.ends\n{{L}}";

struct Case {
  std::string name;
  std::map<std::string, std::string> files;  // extra or replaced files (name -> text)
  std::string tmpl_insert;                   // text put into the template at {{T}}
  std::string model_insert;                  // text put at the end of m.lib
  std::string device_attrs;                  // extra attributes of the <device>
  std::string template_name = "buck.cir";
  std::string named;  // the file the message must name
};

std::string Fill(std::string text, const std::string& key, const std::string& value) {
  for (size_t at; (at = text.find(key)) != std::string::npos;) text.replace(at, key.size(), value);
  return text;
}

class HostileInputsTest : public ::testing::Test {
 protected:
  void SetUp() override {
    root_ = fs::temp_directory_path() / ("zvsmap_hostile_" + std::to_string(getpid()));
    fs::remove_all(root_);
    fs::create_directories(root_);
  }
  void TearDown() override { fs::remove_all(root_); }

  // Writes a case into its own folder; returns the sweep file.
  std::string Write(const Case& c, const fs::path& dir) {
    fs::create_directories(dir);
    std::string marker = (dir / "marker").string();
    std::string cmd = "shell touch " + marker;
    auto write = [&](const std::string& name, const std::string& text) {
      fs::create_directories((dir / name).parent_path());
      std::ofstream(dir / name, std::ios::binary) << Fill(text, "{{M}}", cmd);
    };
    write(c.template_name, Fill(kTemplate, "{{T}}", c.tmpl_insert));
    write("inc.cir", "* included by the template\nrbleed out 0 1Meg\n");
    write("m.lib", Fill(kModel, "{{L}}", c.model_insert));
    for (const auto& [name, text] : c.files) write(name, text);
    std::string sweep = "<sweep>\n  <template file=\"" + Fill(c.template_name, "\n", "&#10;") +
                        "\"/>\n  <device name=\"m\" file=\"m.lib\" subckt=\"usw\" pins=\"D=d G=g "
                        "S=s\"" +
                        c.device_attrs + "/>\n  <simulation settle-periods=\"4\"/>\n</sweep>\n";
    std::ofstream(dir / "s.xml") << sweep;
    return (dir / "s.xml").string();
  }

  fs::path root_;
};

std::vector<Case> Corpus() {
  const std::string M = "{{M}}";
  std::vector<Case> c;
  auto tmpl = [&](const std::string& name, const std::string& text) {
    Case k;
    k.name = name;
    k.tmpl_insert = text;
    k.named = "buck.cir:";
    c.push_back(k);
  };
  auto inc = [&](const std::string& name, const std::string& text) {
    Case k;
    k.name = name;
    k.files["inc.cir"] = text;
    k.named = "inc.cir:";
    c.push_back(k);
  };
  auto model = [&](const std::string& name, const std::string& text) {
    Case k;
    k.name = name;
    k.model_insert = text;
    k.named = "m.lib";
    c.push_back(k);
  };
  auto attr = [&](const std::string& name, const std::string& attrs) {
    Case k;
    k.name = name;
    k.device_attrs = attrs;
    k.named = "s.xml:";
    c.push_back(k);
  };
  // The template.
  tmpl("control section", ".control\n" + M + "\n.endc");
  tmpl("upper-case control", ".CONTROL\n" + M + "\n.ENDC");
  tmpl("control with a suffix", ".controls\n" + M + "\n.endc");
  tmpl("indented control", "   .control\n" + M + "\n.endc");
  tmpl("pre_ command", ".Control\npre_" + M + "\n.endc");
  tmpl("star-hash command", "*#" + M);
  tmpl("indented star-hash", "  *# " + M);
  tmpl("stray endc", ".endc\n" + M);
  tmpl("unknown dot card", ".exec " + M);
  tmpl("options interp", ".options interp");
  tmpl("options on a continuation", ".options reltol=1e-3\n+ interp");
  tmpl("carriage return inside a card", "rx out 0 1Meg\r.control\r" + M + "\r.endc");
  {
    Case k;
    k.name = "script first line";
    k.files["buck.cir"] = "*ng_script\n" + M + "\n";
    k.named = "buck.cir:1";
    c.push_back(k);
  }
  {
    Case k;
    k.name = "title read as a card";
    k.files["buck.cir"] = ".include evil.cir\n" + std::string(kTemplate).substr(65);
    k.named = "buck.cir:1";
    c.push_back(k);
  }
  // Files the template includes.
  inc("control in an include", "rbleed out 0 1Meg\n.control\n" + M + "\n.endc\n");
  inc("star-hash in an include", "*#" + M + "\n");
  inc("orphan continuation in an include", "+ .control\n" + M + "\n.endc\n");
  {
    Case k;
    k.name = "nested include";
    k.files["inc.cir"] = ".include deeper/inc2.cir\n";
    k.files["deeper/inc2.cir"] = ".CoNtRoL\n" + M + "\n.endc\n";
    k.named = "inc2.cir:1";
    c.push_back(k);
  }
  {
    Case k;
    k.name = "library section";
    k.files["inc.cir"] = ".lib parts.lib typ\n";
    k.files["parts.lib"] = ".lib typ\nrbleed out 0 1Meg\n.endl\n.lib evil\n*#" + M + "\n.endl\n";
    k.named = "parts.lib:5";
    c.push_back(k);
  }
  inc("include cycle", ".include buck.cir\n");
  {
    Case k;
    k.name = "binary include";
    k.files["inc.cir"] = std::string(
                             "\x7f"
                             "ELF\0\0",
                             6) +
                         "\n.control\n" + M + "\n.endc\n";
    k.named = "buck.cir:8";
    c.push_back(k);
  }
  // Device model files.
  model("control in a model file", ".control\n" + M + "\n.endc\n");
  model("star-hash in a model file", "*#" + M + "\n");
  model("script line in a model file", "*ng_script\n" + M + "\n");
  {
    Case k;
    k.name = "model file includes a control section";
    k.model_insert = ".inc m2.inc\n";
    k.files["m2.inc"] = "* more\n.control\n" + M + "\n.endc\n";
    k.named = "m2.inc:2";
    c.push_back(k);
  }
  {
    Case k;
    k.name = "binary model file";
    k.files["m.lib"] = std::string("\0\0\0", 3) + "\n.control\n" + M + "\n.endc\n";
    k.named = "s.xml:3";
    c.push_back(k);
  }
  // Sweep attributes (&#10; is a line feed inside an XML attribute).
  attr("params with a line feed", " params=\"r=1m&#10;.control&#10;" + M + "&#10;.endc\"");
  attr("params with a carriage return", " params=\"r=1m&#13;.control&#13;" + M + "&#13;.endc\"");
  attr("params with a semicolon", " params=\"r=1m;" + M + "\"");
  attr("params with an undeclared name", " params=\"rr=1m\"");
  {
    Case k;
    k.name = "section with a line feed";
    k.device_attrs = " section=\"typ&#10;.control&#10;" + M + "&#10;.endc\"";
    k.named = "s.xml:";
    c.push_back(k);
  }
  // File names with line breaks.
  {
    Case k;
    k.name = "template file name with a line feed";
    k.template_name = "t\n.control\nshell touch marker\n.endc\n.cir";
    k.named = "s.xml:2";
    c.push_back(k);
  }
  return c;
}

TEST_F(HostileInputsTest, NoHostileInputRunsACommandAndEachIsBadInput) {
  // The base case is good input (checked without simulating).
  std::string log;
  Case base;
  ASSERT_EQ(RunZvsmapArgs({"points", Write(base, root_ / "base")}, &log), 0) << log;

  std::vector<Case> corpus = Corpus();
  ASSERT_GE(corpus.size(), 25u);
  int n = 0;
  for (const Case& c : corpus) {
    fs::path dir = root_ / ("case" + std::to_string(n++));
    std::string sweep = Write(c, dir);
    int rc = RunZvsmapArgs({"run", sweep, "-o", (dir / "out").string(), "-j", "1"}, &log);
    EXPECT_EQ(rc, 2) << c.name << "\n" << log;
    EXPECT_NE(log.find(c.named), std::string::npos) << c.name << ": names no " << c.named << "\n"
                                                    << log;
    EXPECT_FALSE(fs::exists(dir / "marker")) << c.name << ": a command ran";
    EXPECT_FALSE(fs::exists(dir / "out" / "run.sqlite")) << c.name << ": a run started";
  }
}

}  // namespace
