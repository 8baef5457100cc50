#include "sim/ngspice_simulator.h"

#include <fmt/format.h>
#include <ngspice/sharedspice.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <cmath>
#include <cstddef>
#include <sstream>

#include "core/diagnostic.h"
#include "core/text.h"

namespace zvsmap {

namespace {

// What the callbacks collect during one run.
struct RunCapture {
  std::string log;                        // every line of this run, with its channel prefix
  std::vector<std::string> stderr_lines;  // the "stderr " lines of this run, prefix removed
  bool exit_fired = false;                // the exit callback fired during this run
};

// ngspice is one global instance per process, so its C callbacks reach the
// live simulator through these file-level variables, not the user pointer.
RunCapture* g_active = nullptr;  // the live simulator's capture, or null
bool g_initialised = false;      // ngSpice_Init is called once per process
bool g_poisoned = false;         // the exit callback fired once: ngspice is unusable until exit

constexpr const char* kStderrPrefix = "stderr ";
constexpr const char* kPoisonedError = "engine unusable after an earlier fatal error";

bool StartsWith(const std::string& s, const char* prefix) {
  return s.compare(0, std::char_traits<char>::length(prefix), prefix) == 0;
}

int OnPrintf(char* text, int /*id*/, void* /*user*/) {
  if (g_active == nullptr || text == nullptr) return 0;
  std::string line(text);
  g_active->log += line;
  g_active->log += '\n';
  if (StartsWith(line, kStderrPrefix)) {
    g_active->stderr_lines.push_back(line.substr(std::char_traits<char>::length(kStderrPrefix)));
  }
  return 0;
}

int OnStatus(char* /*text*/, int /*id*/, void* /*user*/) { return 0; }

int OnExit(int /*status*/, NG_BOOL /*immediate*/, NG_BOOL /*quit*/, int /*id*/, void* /*user*/) {
  // ngspice asks to be unloaded; it is unusable from here on (measured: every
  // later load fails, even after a new ngSpice_Init). Never exit the process.
  g_poisoned = true;
  if (g_active != nullptr) g_active->exit_fired = true;
  return 0;
}

// Which stderr lines mean failure. ngspice 39 writes its routine chatter to
// the stderr channel too; the rule below was settled by running good and bad
// netlists through ngspice 39.3 (the integration tests cover the cases):
//  - benign: empty lines, and lines starting (case-insensitively) with
//    "Warning" (e.g. "Warning: singular matrix: check node ...", "Warning:
//    Dynamic gmin stepping failed" on runs that then converge), "Note:"
//    ("Note: Starting dynamic gmin stepping", "Note: Transient op finished
//    successfully"), "Trying gmin", "Supplies reduced" (source stepping
//    progress), "Numparam warning", "Using SPARSE";
//  - everything else on stderr is an error, e.g. "Error: circuit not
//    parsed.", "Error on line 6 or its substitute:", "doAnalyses: TRAN:
//    Timestep too small; ...", "run simulation(s) aborted", "run simulation
//    not started", "Netlist line no. 3:".
// A run is good only if no line is an error, the exit callback did not fire,
// a `time` vector exists and it reaches tstop; the last two catch anything the
// text rule misses.
bool IsBenignStderr(const std::string& line) {
  static const char* const kBenign[] = {
      "warning", "note:", "trying gmin", "supplies reduced", "numparam warning", "using sparse"};
  std::string lower = Lower(line);
  size_t first = lower.find_first_not_of(" \t");
  if (first == std::string::npos) return true;
  lower.erase(0, first);
  for (const char* prefix : kBenign) {
    if (StartsWith(lower, prefix)) return true;
  }
  return false;
}

// The first error line of this run. ngspice often splits one message over
// lines ("Netlist line no. 3:" / "Undefined parameter [b]"); a line ending in
// ':' is joined with up to two following lines, stopping at a line that
// starts a new message ("Error..." or another line ending in ':').
std::string FirstError(const std::vector<std::string>& lines) {
  for (size_t i = 0; i < lines.size(); ++i) {
    if (IsBenignStderr(lines[i])) continue;
    std::string message = Trim(lines[i]);
    if (!message.empty() && message.back() == ':') {
      for (size_t j = i + 1; j < lines.size() && j <= i + 2; ++j) {
        std::string next = Trim(lines[j]);
        if (next.empty() || StartsWith(Lower(next), "error") || next.back() == ':') break;
        message += " " + next;
      }
    }
    return message;
  }
  return "";
}

std::vector<std::string> SplitLines(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back(line);
  }
  return lines;
}

void Command(const char* command) { ngSpice_Command(const_cast<char*>(command)); }

// ngspice's vector names in the user's spelling: node "out" -> "v(out)",
// "l1#branch" -> "i(l1)", "time" and "@dev[param]" as they are.
std::string UserName(const std::string& raw) {
  const std::string kBranch = "#branch";
  if (raw == "time" || raw.empty() || raw[0] == '@') return raw;
  if (raw.size() > kBranch.size() &&
      raw.compare(raw.size() - kBranch.size(), kBranch.size(), kBranch) == 0) {
    return "i(" + raw.substr(0, raw.size() - kBranch.size()) + ")";
  }
  return "v(" + raw + ")";
}

std::string AvailableVectors() {
  std::vector<std::string> names;
  char** all = ngSpice_AllVecs(ngSpice_CurPlot());
  for (size_t i = 0; all != nullptr && all[i] != nullptr; ++i) names.push_back(UserName(all[i]));
  std::sort(names.begin(), names.end());
  constexpr size_t kMaxShown = 30;
  std::string out;
  for (size_t i = 0; i < names.size() && i < kMaxShown; ++i) {
    if (i > 0) out += ", ";
    out += names[i];
  }
  if (names.size() > kMaxShown) out += fmt::format(", ... ({} in all)", names.size());
  return out.empty() ? "none" : out;
}

pvector_info FindVector(const std::string& name) {
  return ngGet_Vec_Info(const_cast<char*>(name.c_str()));
}

// Looks a requested vector up. ngspice names the branch current of a source
// or inductor inside a subcircuit "v.x1.vs#branch", so "i(x1.vs)" is not
// found; it is reached as "i(v.x1.vs)" (device letter, dot, full path).
pvector_info LookUp(const std::string& requested) {
  std::string name = Lower(requested);
  if (pvector_info info = FindVector(name)) return info;
  if (name.size() > 3 && StartsWith(name, "i(") && name.back() == ')') {
    std::string inner = name.substr(2, name.size() - 3);
    size_t dot = inner.rfind('.');
    if (dot != std::string::npos && dot + 1 < inner.size()) {
      std::string alias = "i(" + std::string(1, inner[dot + 1]) + "." + inner + ")";
      if (pvector_info info = FindVector(alias)) return info;
    }
  }
  return nullptr;
}

// Copies `time` and every asked-for vector out of the current plot (the
// pointers die with it); returns why it could not, or "".
std::string CopyVectors(pvector_info time, const std::vector<std::string>& vectors,
                        Waveforms* waves) {
  size_t n = static_cast<size_t>(time->v_length);
  waves->SetTime(std::vector<double>(time->v_realdata, time->v_realdata + n));
  for (const std::string& name : vectors) {
    if (Lower(name) == "time") continue;
    pvector_info info = LookUp(name);
    if (info == nullptr) {
      return fmt::format("vector '{}' not found (available: {})", name, AvailableVectors());
    }
    if (info->v_realdata == nullptr) {
      return fmt::format("vector '{}' is complex; only real vectors are supported", name);
    }
    if (info->v_length != time->v_length) {
      return fmt::format("vector '{}' has {} samples but time has {}", name, info->v_length,
                         time->v_length);
    }
    waves->Set(name, std::vector<double>(info->v_realdata, info->v_realdata + n));
  }
  return "";
}

// Adds the wall time since construction to `*sum` when it ends.
class StageClock {
 public:
  explicit StageClock(double* sum) : sum_(sum), start_(std::chrono::steady_clock::now()) {}
  ~StageClock() {
    *sum_ += std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  }
  StageClock(const StageClock&) = delete;
  StageClock& operator=(const StageClock&) = delete;

 private:
  double* sum_;
  std::chrono::steady_clock::time_point start_;
};

}  // namespace

struct NgspiceSimulator::State : RunCapture {
  EngineTimings timings;
};

NgspiceSimulator::NgspiceSimulator() : state_(std::make_unique<State>()) {
  if (g_active != nullptr) {
    throw Error("only one NgspiceSimulator may exist per process (ngspice is not re-entrant)");
  }
  g_active = state_.get();
  if (!g_initialised) {
    g_initialised = true;
    // No data callbacks: they fire once per accepted time point. No
    // background thread callback: runs are in the foreground.
    ngSpice_Init(OnPrintf, OnStatus, OnExit, nullptr, nullptr, nullptr, nullptr);
    // No "Reference value" progress line: ngspice otherwise reads the process
    // clock at every stored time point to decide whether to print it
    // (OUTpData in its src/frontend/outitf.c), about a third of a one-period
    // run here (DEVELOPERS.md "The engine's progress line").
    Command("set norefvalue");
  }
}

NgspiceSimulator::~NgspiceSimulator() {
  if (g_active == state_.get()) g_active = nullptr;
}

const EngineTimings& NgspiceSimulator::timings() const { return state_->timings; }

void NgspiceSimulator::ResetTimings() { state_->timings = EngineTimings(); }

SimulationOutput NgspiceSimulator::Run(const std::string& netlist,
                                       const std::vector<std::string>& vectors, double tstop_s) {
  SimulationOutput out;
  if (g_poisoned) {
    out.poisoned = true;
    out.error = kPoisonedError;
    return out;
  }
  State& state = *state_;
  state.log.clear();
  state.stderr_lines.clear();
  state.exit_fired = false;

  std::vector<std::string> lines = SplitLines(netlist);
  if (lines.empty()) {
    out.error = "empty netlist";
    return out;
  }
  std::vector<char*> pointers;
  pointers.reserve(lines.size() + 1);
  for (std::string& line : lines) pointers.push_back(&line[0]);
  pointers.push_back(nullptr);

  // Return codes say little (0 on most errors); the printf and exit callbacks
  // tell what happened. After an exit callback nothing more may be sent.
  EngineTimings& timings = state.timings;
  ++timings.runs;
  {
    StageClock clock(&timings.load_s);
    ngSpice_Circ(pointers.data());
  }
  if (!state.exit_fired) {
    StageClock clock(&timings.run_s);
    Command("run");
  }
  size_t run_stderr_lines = state.stderr_lines.size();

  auto finish = [&](SimulationOutput& result) {
    if (!state.exit_fired) {
      // Both, or plots and circuits pile up (~1.3 MB per run measured).
      StageClock clock(&timings.unload_s);
      Command("remcirc");
      Command("destroy all");
    }
    result.poisoned = state.exit_fired;
    result.log = state.log;
  };

  std::vector<std::string> run_errors(
      state.stderr_lines.begin(),
      state.stderr_lines.begin() + static_cast<std::ptrdiff_t>(run_stderr_lines));
  std::string first_error = FirstError(run_errors);
  if (state.exit_fired) {
    out.error =
        "engine error: " +
        (first_error.empty() ? std::string("ngspice stopped (exit callback)") : first_error);
    finish(out);
    return out;
  }
  if (!first_error.empty()) {
    out.error = "engine error: " + first_error;
    finish(out);
    return out;
  }

  pvector_info time = FindVector("time");
  if (time == nullptr || time->v_realdata == nullptr || time->v_length <= 0) {
    out.error = "engine error: no time points (did the netlist run a transient analysis?)";
    finish(out);
    return out;
  }
  size_t n = static_cast<size_t>(time->v_length);
  timings.samples += time->v_length;
  double t_end = time->v_realdata[n - 1];
  // ngspice ends exactly at tstop; allow for rounding only.
  if (t_end < tstop_s * (1.0 - 1e-9)) {
    out.error = fmt::format("simulation ended at t={:g} before tstop={:g}", t_end, tstop_s);
    finish(out);
    return out;
  }
  {
    StageClock copy_clock(&timings.copy_s);
    out.error = CopyVectors(time, vectors, &out.waves);
  }
  out.ok = out.error.empty();
  if (!out.ok) out.waves = Waveforms();
  finish(out);
  return out;
}

}  // namespace zvsmap
