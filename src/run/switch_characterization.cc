#include "run/switch_characterization.h"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "core/spice_number.h"
#include "sim/waveforms.h"

namespace zvsmap {

namespace {

std::string Header(const ResolvedDevice& device, const char* what, double v_gate_off_v) {
  DeviceLines lines = InstantiateDevice(device, "xdut", "d", "g", "0", {}, {});
  std::ostringstream out;
  out << "zvsmap switch characterisation: " << what << " of " << device.subckt.name << "\n";
  // A user model's cards, read and checked by ResolveDevice (ngspice opens no file).
  for (const DeckLine& card : device.model_cards) out << card.text << "\n";
  for (const auto& d : lines.definitions) out << d;
  out << lines.instance << "\n";
  out << "vgate g 0 dc " << FormatNumber(v_gate_off_v) << "\n";
  return out.str();
}

std::string Footer(double tstop, double max_step, double reltol, const char* saves) {
  std::ostringstream out;
  out << ".options method=gear reltol=" << FormatNumber(reltol) << "\n";
  out << ".save " << saves << "\n";
  out << ".tran " << FormatNumber(max_step) << " " << FormatNumber(tstop) << " 0 "
      << FormatNumber(max_step) << "\n.end\n";
  return out.str();
}

}  // namespace

std::string CossNetlist(const ResolvedDevice& device, const CharacterizeOptions& o) {
  double t = o.ramp_s;
  std::ostringstream out;
  out << Header(device, "output capacitance", o.v_gate_off_v);
  out << "vdrv d 0 pwl(0 0 " << FormatNumber(t) << " " << FormatNumber(o.v_max_v) << " "
      << FormatNumber(2 * t) << " 0)\n";
  out << Footer(2 * t, t / 4000, o.reltol, "v(d) i(vdrv)");
  return out.str();
}

std::string ReverseNetlist(const ResolvedDevice& device, const CharacterizeOptions& o) {
  std::ostringstream out;
  out << Header(device, "reverse conduction", o.v_gate_off_v);
  out << "irev d 0 pwl(0 0 " << FormatNumber(o.reverse_ramp_s) << " "
      << FormatNumber(o.i_reverse_max_a) << ")\n";
  out << Footer(o.reverse_ramp_s, o.reverse_ramp_s / 2000, o.reltol, "v(d)");
  return out.str();
}

bool CharacterizeSwitch(Simulator& simulator, const ResolvedDevice& device,
                        const CharacterizeOptions& o, Characterization* out, std::string* error) {
  out->coss.clear();
  out->reverse.clear();
  out->netlist_coss = CossNetlist(device, o);
  SimulationOutput run = simulator.Run(out->netlist_coss, {"v(d)", "i(vdrv)"}, 2 * o.ramp_s);
  if (!run.ok) {
    *error = "output-capacitance run: " + run.error;
    return false;
  }
  const std::vector<double>& t = run.waves.time();
  const std::vector<double>& v = run.waves.Get("v(d)");
  const std::vector<double>& i_src = run.waves.Get("i(vdrv)");
  // Current into the drain is -i(vdrv). Split the run at the peak.
  size_t peak = 0;
  while (peak + 1 < t.size() && t[peak + 1] <= o.ramp_s) ++peak;
  // Down ramp as a function of voltage (increasing): v and current.
  std::vector<double> v_down, i_down;
  for (size_t k = t.size(); k-- > peak + 1;) {
    if (!v_down.empty() && v[k] <= v_down.back()) continue;
    v_down.push_back(v[k]);
    i_down.push_back(-i_src[k]);
  }
  double slope = o.v_max_v / o.ramp_s;
  std::vector<double> vu, q, e, ic;
  double q_acc = 0, e_acc = 0;
  for (size_t k = 0; k <= peak; ++k) {
    double up = -i_src[k];
    double down = Interpolate(v_down, i_down, v[k]);
    double i_c = 0.5 * (up - down);  // leakage cancels
    if (!vu.empty()) {
      double dt = t[k] - t[k - 1];
      q_acc += 0.5 * (i_c + ic.back()) * dt;
      e_acc += 0.5 * (i_c * v[k] + ic.back() * vu.back()) * dt;
    }
    vu.push_back(v[k]);
    ic.push_back(i_c);
    q.push_back(q_acc);
    e.push_back(e_acc);
  }
  for (int r = 1; r <= o.table_rows; ++r) {
    CossRow row;
    row.v_v = o.v_max_v * r / o.table_rows;
    row.q_c = Interpolate(vu, q, row.v_v);
    row.e_j = Interpolate(vu, e, row.v_v);
    row.c_f = Interpolate(vu, ic, row.v_v) / slope;
    row.co_tr_f = row.q_c / row.v_v;
    row.co_er_f = 2 * row.e_j / (row.v_v * row.v_v);
    out->coss.push_back(row);
  }

  out->netlist_reverse = ReverseNetlist(device, o);
  run = simulator.Run(out->netlist_reverse, {"v(d)"}, o.reverse_ramp_s);
  if (!run.ok) {
    *error = "reverse-conduction run: " + run.error;
    return false;
  }
  for (int r = 1; r <= o.reverse_rows; ++r) {
    ReverseRow row;
    row.i_a = o.i_reverse_max_a * r / o.reverse_rows;
    row.v_v = -run.waves.At("v(d)", o.reverse_ramp_s * r / o.reverse_rows);
    out->reverse.push_back(row);
  }
  return true;
}

}  // namespace zvsmap
