// The include closure: zvsmap reads every file a template names, relative
// to the file naming it, checks every card and inlines it with its origin.
// `.lib FILE SECTION` / `.lib SECTION` ... `.endl` follow the ngspice 39
// manual (ngspice User's Manual, section 2.7 ".LIB"); the messages are our
// own wording.
#include "netlist/include_closure.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>

namespace zvsmap {
namespace {

namespace fs = std::filesystem;

class IncludeClosureTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("zvsmap_closure_" + std::to_string(::getpid()));
    fs::create_directories(dir_ / "sub");
  }
  void TearDown() override { fs::remove_all(dir_); }
  std::string Write(const std::string& name, const std::string& text) {
    std::ofstream(dir_ / name, std::ios::binary) << text;
    return (dir_ / name).string();
  }
  // Expands `text` as a template at dir_/t.cir; the error with paths relative to dir_.
  bool Expand(const std::string& text) {
    lines_.clear();
    bool ok = ExpandNetlistText(text, P("t.cir"), true, &lines_, &error_);
    std::string d = dir_.string() + "/";
    for (size_t at; (at = error_.message.find(d)) != std::string::npos;)
      error_.message.erase(at, d.size());
    if (error_.where.file.rfind(d, 0) == 0) error_.where.file.erase(0, d.size());
    return ok;
  }
  std::string P(const std::string& name) const { return (dir_ / name).string(); }
  std::string Text() const {
    std::string out;
    for (const auto& l : lines_)
      out += fs::path(l.origin.file).filename().string() + ":" + std::to_string(l.origin.line) +
             " " + l.text + "\n";
    return out;
  }
  std::string Error() const {
    Diagnostic d = error_;
    return d.Format();
  }

  fs::path dir_;
  std::vector<DeckLine> lines_;
  Diagnostic error_;
};

TEST_F(IncludeClosureTest, InlinesNestedIncludesRelativeToTheNamingFile) {
  Write("sub/a.inc", "ra x 0 1\n.include 'b.inc'\n");
  Write("sub/b.inc", "* b\nrb y 0\n+ 2\n.end\nrc z 0 3\n");
  ASSERT_TRUE(Expand("title\n.param a=1\n\n.inc sub/a.inc\n.tran 1n 1u\nv1 x 0 1\n.end\n"))
      << Error();
  EXPECT_EQ(Text(),
            "t.cir:2 .param a=1\n"
            "a.inc:1 ra x 0 1\n"
            "b.inc:1 * b\n"
            "b.inc:2 rb y 0 2\n"
            "t.cir:6 v1 x 0 1\n");
}

TEST_F(IncludeClosureTest, LibrarySectionsNestedAndSkipped) {
  Write("m.lib",
        "* library\n.lib typ\nrt a 0 1\n.lib m.lib slow\n.endl typ\n"
        ".lib slow\nrs a 0 9\n.endl\n.lib bad\n.control\n.endl\n");
  EXPECT_FALSE(Expand("title\n.lib m.lib typ\n"));
  // Every card of a file is checked, also in sections nobody asks for.
  EXPECT_EQ(Error(),
            "m.lib:10: '.control' starts a control section (ngspice runs its lines as commands); "
            "a zvsmap deck holds no commands\n  .control\n  ^");
  Write("m.lib",
        "* library\n.lib typ\nrt a 0 1\n.lib m.lib slow\n.endl typ\n"
        ".lib slow\nrs a 0 9\n.endl\n");
  ASSERT_TRUE(Expand("title\n.LIB m.lib TYP\n.include m.lib\n")) << Error();
  EXPECT_EQ(Text(), "m.lib:3 rt a 0 1\nm.lib:7 rs a 0 9\nm.lib:1 * library\n");
  EXPECT_FALSE(Expand("title\n.lib m.lib tpy\n"));
  EXPECT_EQ(Error(),
            "t.cir:2: 'm.lib' has no library section 'tpy' (it has: typ, slow; did you mean "
            "'typ'?)\n  .lib m.lib tpy\n       ^");
}

TEST_F(IncludeClosureTest, CyclesMissingBinaryAndNonFiles) {
  Write("a.inc", ".include b.inc\n");
  Write("b.inc", "r1 a 0 1\n.include a.inc\n");
  EXPECT_FALSE(Expand("title\n.include a.inc\n"));
  EXPECT_EQ(Error(),
            "b.inc:2: include cycle: 'a.inc' is already being read\n  .include a.inc\n"
            "           ^");
  EXPECT_FALSE(Expand("title\n.include t.cir\n"));  // the template itself
  EXPECT_NE(Error().find("include cycle"), std::string::npos) << Error();
  EXPECT_FALSE(Expand("title\n.include nowhere.inc\n"));
  EXPECT_EQ(Error(),
            "t.cir:2: cannot read 'nowhere.inc': no such file\n  .include nowhere.inc\n"
            "           ^");
  Write("bin.lib", std::string("\x7f"
                               "ELF\0\0\x01",
                               7));
  EXPECT_FALSE(Expand("title\n.include \"bin.lib\"\n"));
  EXPECT_EQ(Error(),
            "t.cir:2: 'bin.lib' is a binary file (it holds NUL bytes), not a SPICE netlist\n"
            "  .include \"bin.lib\"\n           ^");
  EXPECT_FALSE(Expand("title\n.include sub\n"));
  EXPECT_EQ(Error().substr(0, 46), "t.cir:2: cannot read 'sub': not a regular file");
}

TEST_F(IncludeClosureTest, RefusedCardsNameTheirOwnFileAndLine) {
  Write("evil.inc", "r1 a 0 1\n*#shell touch x\n");
  EXPECT_FALSE(Expand("title\n.include evil.inc\n"));
  EXPECT_EQ(error_.where.file, "evil.inc");
  EXPECT_EQ(error_.where.line, 2);
  EXPECT_FALSE(Expand("title\n.options reltol=1e-3\n+ interp\n"));
  EXPECT_EQ(Error(),
            "t.cir:3: option 'interp' is refused: it interpolates the saved data onto the print "
            "step, so the waveforms zvsmap measures are no longer the simulated ones (measured "
            "in ngspice 39: a turn-on voltage halved) (in the card continued here from line 2)\n"
            "  + interp\n  ^");
  Write("plus.inc", "+ .control\n");
  EXPECT_FALSE(Expand("title\nr1 a 0 1\n.include plus.inc\n"));
  EXPECT_EQ(Error(),
            "plus.inc:1: a continuation line ('+') with no card before it in this file\n"
            "  + .control\n  ^");
  EXPECT_FALSE(Expand("*ng_script\nshell touch x\n"));
  EXPECT_EQ(error_.where.line, 1);
  EXPECT_FALSE(Expand(".include /etc/passwd\n"));  // a title ngspice could read as a card
  EXPECT_EQ(error_.message.substr(0, 38), "the title line starts with '.', which ");
}

}  // namespace
}  // namespace zvsmap
