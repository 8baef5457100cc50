// `zvsmap calibrate`: fit the generic output-capacitance forms to
// datasheet-style numbers and say how well each number is reproduced.
#include <cmath>
#include <cstdio>
#include <memory>
#include <optional>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/spice_number.h"
#include "handcalc/coss_calibration.h"

namespace zvsmap::cli {

namespace {

bool Number(const std::string& option, const std::string& text, double* value) {
  if (text.empty()) return true;
  NumberSpelling spelling = JudgeSpiceSpelling(text);
  if (spelling.kind == NumberSpelling::Kind::kRefused) {
    std::fprintf(stderr, "zvsmap: error: %s: %s\n", option.c_str(), spelling.message.c_str());
    return false;
  }
  std::optional<double> v = ParseSpiceNumber(text);
  if (!v) {
    std::fprintf(stderr, "zvsmap: error: %s: bad number '%s'\n", option.c_str(), text.c_str());
    return false;
  }
  *value = *v;
  return true;
}

void PrintReproduction(const std::vector<Reproduction>& rows) {
  for (const auto& r : rows) {
    std::printf("  %-16s given %-10s model %-10s error %+.3f %%\n", r.what.c_str(),
                (FormatEngineering(r.given) + "F").c_str(),
                (FormatEngineering(r.model) + "F").c_str(), 100 * r.RelativeError());
  }
}

}  // namespace

void AddCalibrateCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string voltage, co_tr, co_er, qoss, eoss, c_small, c_small_v, m = "0.5";
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "calibrate",
      "Fit the junction form C0/(1+V/Vj)^m and the power law K*V^-g to datasheet-style "
      "output-capacitance numbers");
  cmd->add_option("--voltage,-V", opts->voltage, "Voltage of Co(tr)/Co(er) or Qoss/Eoss")
      ->required();
  cmd->add_option("--co-tr", opts->co_tr, "Charge-equivalent capacitance Co(tr) at the voltage");
  cmd->add_option("--co-er", opts->co_er, "Energy-equivalent capacitance Co(er) at the voltage");
  cmd->add_option("--qoss", opts->qoss, "Output charge at the voltage (instead of --co-tr)");
  cmd->add_option("--eoss", opts->eoss, "Output energy at the voltage (instead of --co-er)");
  cmd->add_option("--c-small", opts->c_small,
                  "Small-signal Coss at --c-small-voltage (lets the junction fit solve m)");
  cmd->add_option("--c-small-voltage", opts->c_small_v, "Voltage of --c-small");
  cmd->add_option("--m", opts->m, "Junction grading m held fixed without --c-small")
      ->capture_default_str();
  cmd->callback([opts, exit_code] {
    *exit_code = kExitBadInput;
    double v = 0, co_tr = 0, co_er = 0, q = 0, e = 0, cs = 0, csv = 0, m = 0.5;
    if (!Number("--voltage", opts->voltage, &v) || !Number("--co-tr", opts->co_tr, &co_tr) ||
        !Number("--co-er", opts->co_er, &co_er) || !Number("--qoss", opts->qoss, &q) ||
        !Number("--eoss", opts->eoss, &e) || !Number("--c-small", opts->c_small, &cs) ||
        !Number("--c-small-voltage", opts->c_small_v, &csv) || !Number("--m", opts->m, &m)) {
      return;
    }
    if ((opts->co_tr.empty() == opts->qoss.empty()) ||
        (opts->co_er.empty() == opts->eoss.empty())) {
      std::fprintf(stderr, "zvsmap: error: give one of --co-tr/--qoss and one of --co-er/--eoss\n");
      return;
    }
    if (opts->c_small.empty() != opts->c_small_v.empty()) {
      std::fprintf(stderr, "zvsmap: error: --c-small and --c-small-voltage go together\n");
      return;
    }
    CossDatasheet data;
    data.v_rated_v = v;
    data.co_tr_f = opts->qoss.empty() ? co_tr : q / v;
    data.co_er_f = opts->eoss.empty() ? co_er : 2 * e / (v * v);
    data.c_at_v_f = cs;
    data.c_v_v = csv;
    std::printf("datasheet: Co(tr) = %sF, Co(er) = %sF at %s V (r = Co(tr)/Co(er) = %.4g)\n",
                FormatEngineering(data.co_tr_f).c_str(), FormatEngineering(data.co_er_f).c_str(),
                FormatEngineering(v).c_str(), data.co_tr_f / data.co_er_f);
    bool any = false;
    std::string error;
    PowerLawFit power;
    if (FitPowerLaw(data, &power, &error)) {
      any = true;
      std::printf("\npower law  C(V) = K*V^-g   (g = (2r-2)/(2r-1))\n  K = %sF*V^g  g = %.6g\n",
                  FormatEngineering(power.k).c_str(), power.g);
      PrintReproduction(power.reproduced);
    } else {
      std::printf("\npower law: %s\n", error.c_str());
    }
    JunctionFit junction;
    if (FitJunction(data, m, &junction, &error)) {
      any = true;
      std::printf("\njunction  C(V) = C0/(1 + V/Vj)^m%s\n  C0 = %sF  Vj = %s V  m = %.6g\n",
                  cs > 0 ? "   (m solved from the small-signal C)" : "   (m held fixed)",
                  FormatEngineering(junction.c0_f).c_str(),
                  FormatEngineering(junction.vj_v).c_str(), junction.m);
      PrintReproduction(junction.reproduced);
      std::printf("  zsw_junction parameters: c0_f=%.6g vj_v=%.6g m_j=%.6g\n", junction.c0_f,
                  junction.vj_v, junction.m);
    } else {
      std::printf("\njunction: %s\n", error.c_str());
    }
    *exit_code = any ? kExitOk : kExitBadInput;
  });
}

}  // namespace zvsmap::cli
