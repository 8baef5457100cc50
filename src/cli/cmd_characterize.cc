// `zvsmap characterize`: tabulate a switch model's output capacitance, charge,
// energy and reverse-conduction curve in ngspice.
#include <cstdio>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/atomic_file.h"
#include "core/spice_number.h"
#include "run/switch_characterization.h"
#include "sim/ngspice_simulator.h"
#include "sweep/device_parser.h"

namespace zvsmap::cli {

namespace {

bool Number(const std::string& option, const std::string& text, double* value) {
  NumberSpelling spelling = JudgeSpiceSpelling(text);
  if (spelling.kind == NumberSpelling::Kind::kRefused) {
    std::fprintf(stderr, "zvsmap: error: %s: %s\n", option.c_str(), spelling.message.c_str());
    return false;
  }
  std::optional<double> v = ParseSpiceNumber(text);
  if (!v || !(*v > 0)) {
    std::fprintf(stderr, "zvsmap: error: %s: bad or non-positive number '%s'\n", option.c_str(),
                 text.c_str());
    return false;
  }
  *value = *v;
  return true;
}

}  // namespace

void AddCharacterizeCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string model, file, subckt, pins, section, params, out;
    std::string v_max = "48", i_rev = "10", ramp = "10u";
    double v_gate_off = 0;
    int rows = 24, reverse_rows = 20;
    bool netlists = false;
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "characterize",
      "Tabulate a switch model in ngspice: Coss, Qoss, Eoss, Co(tr), Co(er) against V_ds and "
      "the reverse-conduction curve with the gate off");
  cmd->add_option("--model", opts->model, "A generic model of netlists/switches.lib (zsw_...)");
  cmd->add_option("--file", opts->file, "Your model file (.include/.lib)");
  cmd->add_option("--subckt", opts->subckt, "Subcircuit name in --file");
  cmd->add_option("--pins", opts->pins,
                  "Pin map: subcircuit pins in order (\"s d g\") or PIN=d|g|s|@node|volts");
  cmd->add_option("--section", opts->section, "Library section (.lib FILE SECTION)");
  cmd->add_option("--params", opts->params, "Instance parameters, \"name=value ...\"");
  cmd->add_option("--vmax", opts->v_max, "Highest drain-source voltage")->capture_default_str();
  cmd->add_option("--rows", opts->rows, "Rows of the Coss table")->capture_default_str();
  cmd->add_option("--ramp", opts->ramp, "Voltage ramp duration")->capture_default_str();
  cmd->add_option("--vgs-off", opts->v_gate_off, "Gate-source voltage holding it off")
      ->capture_default_str();
  cmd->add_option("--irev", opts->i_rev, "Highest reverse current")->capture_default_str();
  cmd->add_option("--reverse-rows", opts->reverse_rows, "Rows of the reverse curve")
      ->capture_default_str();
  cmd->add_option("--out", opts->out, "Folder for coss.csv and reverse.csv");
  cmd->add_flag("--netlists", opts->netlists, "Also write the simulated netlists to --out");
  cmd->callback([opts, exit_code] {
    *exit_code = kExitBadInput;
    DeviceSpec spec;
    spec.name = "dut";
    SourceLocation cli{"(command line)", 0, 0};
    spec.where = spec.file_where = spec.subckt_where = spec.pins_where = cli;
    spec.params = opts->params;
    if (!opts->model.empty() == !(opts->file.empty() && opts->subckt.empty())) {
      std::fprintf(stderr, "zvsmap: error: give --model, or --file, --subckt and --pins\n");
      return;
    }
    if (!opts->model.empty()) {
      spec.generic = true;
      spec.subckt = opts->model;
    } else {
      if (opts->file.empty() || opts->subckt.empty() || opts->pins.empty()) {
        std::fprintf(stderr, "zvsmap: error: --file, --subckt and --pins go together\n");
        return;
      }
      spec.file = std::filesystem::absolute(opts->file).lexically_normal().string();
      spec.file_as_written = opts->file;
      spec.subckt = opts->subckt;
      spec.section = opts->section;
      std::string message;
      if (!ParsePinMap(opts->pins, &spec.pins, &spec.positional, &message)) {
        std::fprintf(stderr, "zvsmap: error: --pins: %s\n", message.c_str());
        return;
      }
    }
    CharacterizeOptions co;
    if (!Number("--vmax", opts->v_max, &co.v_max_v) ||
        !Number("--irev", opts->i_rev, &co.i_reverse_max_a) ||
        !Number("--ramp", opts->ramp, &co.ramp_s)) {
      return;
    }
    if (opts->rows < 1 || opts->reverse_rows < 1) {
      std::fprintf(stderr, "zvsmap: error: --rows and --reverse-rows must be at least 1\n");
      return;
    }
    co.table_rows = opts->rows;
    co.reverse_rows = opts->reverse_rows;
    co.v_gate_off_v = opts->v_gate_off;
    ResolvedDevice device;
    Diagnostic error;
    if (!ResolveDevice(spec, &device, &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.message.c_str());
      return;
    }
    NgspiceSimulator simulator;
    Characterization result;
    std::string why;
    if (!CharacterizeSwitch(simulator, device, co, &result, &why)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", why.c_str());
      *exit_code = kExitPointsFailed;
      return;
    }
    std::printf("%s: output capacitance, gate held at %g V\n", device.subckt.name.c_str(),
                co.v_gate_off_v);
    std::printf("%10s %12s %12s %12s %12s %12s\n", "v_ds_v", "coss_f", "qoss_c", "eoss_j",
                "co_tr_f", "co_er_f");
    for (const auto& r : result.coss) {
      std::printf("%10.4g %12.5g %12.5g %12.5g %12.5g %12.5g\n", r.v_v, r.c_f, r.q_c, r.e_j,
                  r.co_tr_f, r.co_er_f);
    }
    std::printf("\nreverse conduction (gate off): current source->drain, voltage source-drain\n");
    std::printf("%10s %12s\n", "i_rev_a", "v_rev_v");
    for (const auto& r : result.reverse) std::printf("%10.4g %12.5g\n", r.i_a, r.v_v);
    if (!opts->out.empty()) {
      std::error_code ec;
      std::filesystem::create_directories(opts->out, ec);
      if (ec) {
        std::fprintf(stderr, "zvsmap: error: %s: cannot create output directory: %s\n",
                     opts->out.c_str(), ec.message().c_str());
        *exit_code = kExitInternal;
        return;
      }
      char buf[200];
      std::string coss = "v_ds_v,coss_f,qoss_c,eoss_j,co_tr_f,co_er_f\r\n";
      for (const auto& r : result.coss) {
        std::snprintf(buf, sizeof buf, "%.9g,%.9g,%.9g,%.9g,%.9g,%.9g\r\n", r.v_v, r.c_f, r.q_c,
                      r.e_j, r.co_tr_f, r.co_er_f);
        coss += buf;
      }
      std::string rev = "i_rev_a,v_rev_v\r\n";
      for (const auto& r : result.reverse) {
        std::snprintf(buf, sizeof buf, "%.9g,%.9g\r\n", r.i_a, r.v_v);
        rev += buf;
      }
      std::vector<std::pair<std::string, const std::string*>> files = {{"coss.csv", &coss},
                                                                       {"reverse.csv", &rev}};
      if (opts->netlists) {
        files.push_back({"coss.cir", &result.netlist_coss});
        files.push_back({"reverse.cir", &result.netlist_reverse});
      }
      for (const auto& [name, text] : files) {
        std::string error;
        if (!WriteFileAtomically(opts->out + "/" + name, *text, &error)) {
          std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
          *exit_code = kExitInternal;
          return;
        }
      }
    }
    *exit_code = kExitOk;
  });
}

}  // namespace zvsmap::cli
