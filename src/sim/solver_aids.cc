#include "sim/solver_aids.h"

#include <algorithm>
#include <cstddef>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

// The ladder, least intrusive first. Values are ngspice 39 option names
// (ngspice manual, ch. 15.1 "Simulator Variables"); the defaults they replace
// are gmin 1e-12 S, abstol 1e-12 A, vntol 1e-6 V, no node shunt, method gear
// (as zvsmap renders it). `automatic` follows the measurement on the
// reference cases (tools/bench-aids, figures in README "Solver aids"): an aid
// that moved a reference metric by more than 0.5 % is only used when a sweep
// fixes it.
const std::vector<SolverAid> kAids = {
    // 10 pA per volt from every node to ground: 4 nA at 400 V. Gives a
    // floating node (a gate driven only through capacitances and a floating
    // source) a DC path, the usual cause of "trouble with node ...".
    {"rshunt", "a 100 GOhm shunt from every node to ground (.options rshunt=1e11)", "rshunt=1e11",
     1, true},
    // 100 times the default minimum conductance across every pn junction.
    {"gmin", "minimum junction conductance raised to 1e-10 S (.options gmin=1e-10)", "gmin=1e-10",
     1, true},
    // Absolute current and voltage tolerances relaxed (1 nA, 10 uV): the
    // truncation-error test no longer chases near-zero currents.
    {"abstol", "absolute tolerances relaxed to abstol=1e-9 A, vntol=1e-5 V",
     "abstol=1e-9 vntol=1e-5", 1, true},
    // The three above at once. Not automatic: it moved the 400 V
    // superjunction buck's t_transition_s by 3.7 %.
    {"combined", "rshunt, gmin and abstol together",
     "rshunt=1e11 gmin=1e-10 abstol=1e-9 vntol=1e-5", 1, false},
    // Settling runs at ten times the requested reltol (at most 1e-3); the
    // measuring run keeps the requested one, so only the starting state moves.
    // Not automatic: it moved the boost case's v_turn_on_v by 1.2 %.
    {"settle-reltol", "settling runs at 10x reltol (at most 1e-3); the measuring run as requested",
     "", 10, false},
    // Trapezoidal integration instead of gear. Not automatic: it moved the
    // boost case's t_ringback_s by 0.8 %.
    {"trap", "trapezoidal integration instead of gear (.options method=trap)", "method=trap", 1,
     false},
};

bool IsEndLine(const std::string& line) { return Lower(Trim(line)) == ".end"; }

}  // namespace

const std::vector<SolverAid>& SolverAids() { return kAids; }

const SolverAid* FindSolverAid(const std::string& name) {
  for (const SolverAid& aid : kAids) {
    if (Lower(name) == aid.name) return &aid;
  }
  return nullptr;
}

std::string SolverAidChoices() {
  std::string out = "auto, off";
  for (const SolverAid& aid : kAids) out += std::string(", ") + aid.name;
  return out;
}

std::vector<const SolverAid*> SolverAidRungs(const std::string& setting) {
  std::string s = Lower(Trim(setting));
  if (s == "off") return {nullptr};
  if (s == "auto" || s.empty()) {
    std::vector<const SolverAid*> rungs = {nullptr};
    for (const SolverAid& aid : kAids) {
      if (aid.automatic) rungs.push_back(&aid);
    }
    return rungs;
  }
  if (const SolverAid* aid = FindSolverAid(s)) return {aid};
  return {};
}

std::string SolverAidName(const SolverAid* aid) { return aid == nullptr ? "none" : aid->name; }

bool IsStiffFailure(const std::string& reason) {
  // ngspice 39's messages (seen in the point logs of failing runs):
  // "doAnalyses: TRAN:  Timestep too small; ...", "Transient op failed" /
  // "... no convergence", "Iteration limit reached", "gmin stepping failed",
  // "source stepping failed"; "simulation ended at t=... before tstop" is
  // zvsmap's own for a run that stopped early without an error line.
  static const char* const kSigns[] = {
      "timestep too small",     "no convergence",      "iteration limit", "gmin stepping failed",
      "source stepping failed", "transient op failed", "before tstop"};
  std::string lower = Lower(reason);
  return std::any_of(std::begin(kSigns), std::end(kSigns),
                     [&](const char* s) { return lower.find(s) != std::string::npos; });
}

std::string ApplySolverAid(const std::string& netlist, const SolverAid* aid, double reltol,
                           bool measuring) {
  if (aid == nullptr) return netlist;
  std::string options = aid->options;
  if (!measuring && aid->settle_reltol_factor > 1) {
    double relaxed = std::min(reltol * aid->settle_reltol_factor, kMaxSettleReltol);
    if (relaxed > reltol) {
      options += (options.empty() ? "" : " ") + std::string("reltol=") + FormatNumber(relaxed);
    }
  }
  if (options.empty()) return netlist;
  std::string line = ".options " + options + "\n";
  // Before the last `.end` line; appended when there is none (a renderer
  // always writes one).
  size_t end = netlist.size();
  while (end > 0) {
    size_t start = netlist.rfind('\n', end - 1);
    start = start == std::string::npos ? 0 : start + 1;
    if (IsEndLine(netlist.substr(start, end - start))) {
      return netlist.substr(0, start) + line + netlist.substr(start);
    }
    if (start == 0) break;
    end = start - 1;
  }
  std::string out = netlist;
  if (!out.empty() && out.back() != '\n') out += '\n';
  return out + line;
}

SimulationOutput AidedSimulator::Run(const std::string& netlist,
                                     const std::vector<std::string>& vectors, double tstop_s) {
  SimulationOutput out =
      inner_.Run(ApplySolverAid(netlist, aid_, reltol_, measuring_), vectors, tstop_s);
  poisoned_ = poisoned_ || out.poisoned;
  return out;
}

}  // namespace zvsmap
