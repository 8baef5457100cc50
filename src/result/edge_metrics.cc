#include "result/edge_metrics.h"

#include <limits>

namespace zvsmap {

const std::vector<std::string>& EdgeMetricNames() {
  static const std::vector<std::string> kNames = {"rail_v",
                                                  "i_commutated_a",
                                                  "t_dead_s",
                                                  "v_turn_on_v",
                                                  "v_at_vth_v",
                                                  "v_residual_limit_v",
                                                  "t_transition_s",
                                                  "t_clamp_s",
                                                  "t_zvs_s",
                                                  "dvdt_peak_v_per_s",
                                                  "t_reverse_s",
                                                  "v_ds_min_v",
                                                  "ringback",
                                                  "t_ringback_s",
                                                  "v_ringback_v",
                                                  "e_on_j",
                                                  "e_off_j",
                                                  "e_cap_est_j",
                                                  "e_available_j",
                                                  "e_needed_j",
                                                  "zvs_energy_margin",
                                                  "zvs_timing_margin_early_s",
                                                  "zvs_timing_margin_late_s",
                                                  "probe_t_min_s",
                                                  "probe_t_rail_s",
                                                  "probe_t_max_s",
                                                  "probe_bound_s",
                                                  "probe_max_at_bound",
                                                  "probe_t_diode_s",
                                                  "probe_e_diode_j",
                                                  "probe_t_valley_s",
                                                  "probe_v_valley_v",
                                                  "t_dead_optimal_s",
                                                  "e_dead_optimal_j"};
  return kNames;
}

double EdgeMeasurement::Get(const std::string& column) const {
  for (const auto& m : metrics)
    if (m.column == column) return m.value;
  for (const auto& c : comparisons) {
    for (const FlatColumn& f : FlatColumns(c)) {
      if (f.name == column) return f.value;
    }
  }
  return std::numeric_limits<double>::quiet_NaN();
}

const Comparison* EdgeMeasurement::FindComparison(const std::string& metric,
                                                  const std::string& tag) const {
  for (const auto& c : comparisons) {
    if (c.metric == metric && c.tag == tag) return &c;
  }
  return nullptr;
}

}  // namespace zvsmap
