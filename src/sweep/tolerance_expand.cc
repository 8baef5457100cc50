#include "sweep/tolerance_expand.h"

#include <algorithm>
#include <cmath>

#include "core/text.h"

namespace zvsmap {

namespace {

constexpr int kBaseFactors = 6;  // 64 runs in the reduced design

uint64_t SplitMix64(uint64_t x) {
  x += 0x9e3779b97f4a7c15ull;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ull;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebull;
  return x ^ (x >> 31);
}

// The three-element subsets of {0..5} in lexicographic order, as bit masks.
std::vector<uint32_t> Generators() {
  std::vector<uint32_t> out;
  for (int a = 0; a < kBaseFactors; ++a) {
    for (int b = a + 1; b < kBaseFactors; ++b) {
      for (int c = b + 1; c < kBaseFactors; ++c) out.push_back((1u << a) | (1u << b) | (1u << c));
    }
  }
  return out;
}

// Run `run` of the reduced design for k > 6 parameters: base factors from the
// run's bits; an added factor is high when an even number of its generator's
// base factors are low (the product of the ±1 signs is +1).
uint32_t FractionalRun(uint32_t run, int k, const std::vector<uint32_t>& generators) {
  uint32_t mask = run;
  for (int j = kBaseFactors; j < k; ++j) {
    uint32_t low = generators[j - kBaseFactors] & ~run;
    int lows = 0;
    for (uint32_t b = low; b; b &= b - 1) ++lows;
    if (lows % 2 == 0) mask |= 1u << j;
  }
  return mask;
}

}  // namespace

std::vector<uint32_t> CornerMasks(int k, ToleranceSpec::Corners mode) {
  std::vector<uint32_t> out;
  if (mode == ToleranceSpec::Corners::kNone || k <= 0) return out;
  if (mode == ToleranceSpec::Corners::kAll || k <= kFullCornersUpTo) {
    for (uint32_t m = 0; m < (1u << k); ++m) out.push_back(m);
    return out;
  }
  std::vector<uint32_t> generators = Generators();
  for (uint32_t run = 0; run < (1u << kBaseFactors); ++run) {
    out.push_back(FractionalRun(run, k, generators));
  }
  out.push_back(0);              // all low
  out.push_back((1u << k) - 1);  // all high
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

uint64_t SampleStreamSeed(uint64_t seed, uint64_t nominal, uint64_t sample) {
  return SplitMix64(SplitMix64(SplitMix64(seed) ^ nominal) ^ sample);
}

double UnitUniform(std::mt19937_64& gen) {
  return (static_cast<double>(gen() >> 11) + 0.5) * 0x1.0p-53;
}

double StandardNormal(std::mt19937_64& gen) {
  double u1 = UnitUniform(gen);
  double u2 = UnitUniform(gen);
  return std::sqrt(-2 * std::log(u1)) * std::cos(2 * 3.14159265358979323846 * u2);
}

std::vector<double> SampleOffsets(const ToleranceSpec& spec, size_t nominal, unsigned sample) {
  std::mt19937_64 gen(SampleStreamSeed(spec.seed, nominal, sample));
  std::vector<double> out;
  for (const VarySpec& v : spec.vary) {
    switch (v.spread) {
      case VarySpec::Spread::kUniform:
        out.push_back(v.within * (2 * UnitUniform(gen) - 1));
        break;
      case VarySpec::Spread::kNormal:
        out.push_back(v.sigma * StandardNormal(gen));
        break;
      case VarySpec::Spread::kCorners:
        out.push_back(UnitUniform(gen) < 0.5 ? -v.within : v.within);
        break;
    }
  }
  return out;
}

std::vector<double> CornerOffsets(const ToleranceSpec& spec, uint32_t mask) {
  std::vector<double> out;
  for (size_t j = 0; j < spec.vary.size(); ++j) {
    out.push_back((mask >> j) & 1u ? spec.vary[j].within : -spec.vary[j].within);
  }
  return out;
}

std::string DescribeCorner(const ToleranceSpec& spec, uint32_t mask) {
  std::string out;
  for (size_t j = 0; j < spec.vary.size(); ++j) {
    out += (j ? " " : "") + spec.vary[j].Label() + ((mask >> j) & 1u ? "+" : "-");
  }
  return out;
}

size_t VariantsPerPoint(const ToleranceSpec& spec) {
  if (!spec.used) return 0;
  return CornerMasks(static_cast<int>(spec.vary.size()), spec.corners).size() +
         static_cast<size_t>(spec.samples);
}

namespace {

Point MakeVariant(const ToleranceSpec& spec, const Point& nominal,
                  const std::vector<double>& nominal_values, const std::vector<double>& offsets,
                  VariantTag tag, size_t index) {
  Point p = nominal;
  p.index = index;
  p.variant = tag;
  for (size_t j = 0; j < spec.vary.size(); ++j) {
    const VarySpec& v = spec.vary[j];
    double value = v.At(nominal_values[j], offsets[j]);
    if (v.OnDevice()) {
      p.device_params.push_back({v.device, v.param, value});
      continue;
    }
    auto it = std::find_if(p.values.begin(), p.values.end(),
                           [&](const ParamValue& pv) { return SameName(pv.name, v.param); });
    if (it != p.values.end()) {
      it->value = value;
    } else {
      p.values.push_back({v.param, value});
    }
  }
  return p;
}

}  // namespace

bool ExpandTolerances(const ToleranceSpec& spec,
                      const std::vector<std::vector<double>>& nominal_values, size_t max_points,
                      std::vector<Point>* points, Diagnostic* error) {
  if (!spec.used) return true;
  size_t n = points->size();
  std::vector<uint32_t> corners = CornerMasks(static_cast<int>(spec.vary.size()), spec.corners);
  size_t per = corners.size() + static_cast<size_t>(spec.samples);
  if (n > 0 && (per + 1) > max_points / n) {
    *error = Diagnostic(spec.where,
                        "the sweep's " + std::to_string(n) + " points with " + std::to_string(per) +
                            " tolerance variants each are " + std::to_string(n * (per + 1)) +
                            " points, more than the limit of " + std::to_string(max_points) +
                            " (raise <limits max-points> or use --max-points)");
    return false;
  }
  points->reserve(n * (per + 1));
  for (size_t i = 0; i < n; ++i) {
    const Point nominal = (*points)[i];
    size_t base = n + i * per;
    for (size_t c = 0; c < corners.size(); ++c) {
      VariantTag tag{i, VariantTag::Kind::kCorner, corners[c]};
      points->push_back(MakeVariant(spec, nominal, nominal_values[i],
                                    CornerOffsets(spec, corners[c]), tag, base + c));
    }
    for (int s = 0; s < spec.samples; ++s) {
      unsigned number = static_cast<unsigned>(s);
      VariantTag tag{i, VariantTag::Kind::kSample, number};
      points->push_back(MakeVariant(spec, nominal, nominal_values[i],
                                    SampleOffsets(spec, i, number), tag,
                                    base + corners.size() + number));
    }
  }
  return true;
}

}  // namespace zvsmap
