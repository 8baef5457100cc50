// Tolerances of a sweep (<tolerances> with <vary> children, README
// "Tolerances and yield"): which parameters spread around each nominal point,
// by how much, and which variants (corners, Monte Carlo samples) to run.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// How one parameter spreads around its nominal value.
struct VarySpec {
  enum class Spread { kUniform, kNormal, kCorners };
  /// A template parameter (`device` empty), or a parameter of the named
  /// <device>'s switch subcircuit (`<vary device="fast" param="coss_f">`): one
  /// draw per variant, taken by every switch that uses the device.
  std::string param;
  std::string device;
  /// The half-width of the band: a fraction of the nominal value (`within="10%"`)
  /// or an absolute amount (`within="50n"`). Corners sit at nominal ± within.
  bool relative = true;
  double within = 0;  ///< > 0; a fraction when `relative`
  Spread spread = Spread::kUniform;
  /// kNormal: the standard deviation, in the same form as `within` (default within / 3).
  double sigma = 0;
  SourceLocation where;

  /// "L", or "fast.coss_f" for a device's parameter (corner names, messages).
  std::string Label() const { return device.empty() ? param : device + "." + param; }
  bool OnDevice() const { return !device.empty(); }

  /// The value at `deviate` bands (or sigmas, for kNormal samples) from `nominal`.
  double At(double nominal, double offset) const {
    return relative ? nominal * (1 + offset) : nominal + offset;
  }
};

/// "uniform", "normal", "corners".
const char* SpreadName(VarySpec::Spread s);

/// The whole <tolerances> block.
struct ToleranceSpec {
  enum class Corners { kAuto, kAll, kNone };
  /// What a passing sample is, for the yield: the edge's class is full at the
  /// set dead time (kClass), or its energy margin zvs_energy_margin >= 0 (kEnergy,
  /// which does not depend on the dead time).
  enum class Pass { kClass, kEnergy };
  bool used = false;  ///< the sweep has a <tolerances> block
  uint64_t seed = 1;
  int samples = 0;  ///< Monte Carlo samples per nominal point
  Corners corners = Corners::kAuto;
  double confidence = 0.95;  ///< of the yield's Wilson score interval
  Pass pass = Pass::kClass;
  std::vector<VarySpec> vary;  ///< in file order
  SourceLocation where;

  /// Everything that decides the variants' values (seed, samples' spreads and
  /// widths, corner choice), as text for the content hash of variant points.
  std::string Canonical() const;
};

/// "class", "energy".
const char* PassName(ToleranceSpec::Pass p);

}  // namespace zvsmap
