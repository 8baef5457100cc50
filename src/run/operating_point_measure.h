// Reads a point's operating point (result/operating_point.h) off its
// measured run: the slow states' and the regulated quantity's averages and
// the power balance of the template's `*@ power` ports over one period.
#pragma once

#include "netlist/template.h"
#include "result/operating_point.h"
#include "sim/waveforms.h"

namespace zvsmap {

/// How the point's control was set: the loop and the value (NaN when the
/// template declares no control), and the set point (NaN without `*@ regulate`).
struct LoopSetting {
  LoopKind loop = LoopKind::kOpen;
  double control = OperatingPoint::kNaN;
  double set_point = OperatingPoint::kNaN;
};

/// The operating point over [t0, t1] of `w` (a settled run that saved
/// VectorsToSave(tmpl)).
OperatingPoint MeasureOperatingPoint(const Template& tmpl, const Waveforms& w, double t0,
                                     double t1, const LoopSetting& setting);

}  // namespace zvsmap
