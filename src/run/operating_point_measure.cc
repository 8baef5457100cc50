#include "run/operating_point_measure.h"

namespace zvsmap {

namespace {

// The average over [t0, t1] of sign * v * i.
double PortPower(const PowerProduct& p, const Waveforms& w, double t0, double t1) {
  const std::vector<double>& v = w.Get(p.voltage);
  const std::vector<double>& i = w.Get(p.current);
  std::vector<double> product(v.size());
  for (size_t k = 0; k < v.size(); ++k) product[k] = p.sign * v[k] * i[k];
  return Average(w.time(), product, t0, t1);
}

}  // namespace

OperatingPoint MeasureOperatingPoint(const Template& tmpl, const Waveforms& w, double t0,
                                     double t1, const LoopSetting& setting) {
  OperatingPoint op;
  op.loop = setting.loop;
  op.control = setting.control;
  op.set_point = setting.set_point;
  for (const StateSpec& s : tmpl.states) {
    op.averages.push_back({s.vector, Average(w.time(), w.Get(s.vector), t0, t1)});
  }
  if (tmpl.regulation.declared()) {
    op.regulated_avg = Average(w.time(), w.Get(tmpl.regulation.vector), t0, t1);
  }
  if (tmpl.power.declared()) {
    op.p_in_w = PortPower(tmpl.power.input, w, t0, t1);
    op.p_out_w = PortPower(tmpl.power.output, w, t0, t1);
  }
  return op;
}

}  // namespace zvsmap
