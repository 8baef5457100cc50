// The tolerance variants of each nominal point (README "Tolerances and
// yield"): corners and Monte Carlo samples, as ordinary points of the sweep.
#pragma once

#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/point.h"
#include "sweep/tolerance_spec.h"

namespace zvsmap {

/// Up to this many varied parameters, corners="auto" runs every corner (2^k).
constexpr int kFullCornersUpTo = 6;

/// The corners run per nominal point for `k` varied parameters, as masks (bit j
/// set: parameter j at nominal + within, else nominal - within), ascending.
/// kAll, or kAuto with k <= 6: all 2^k. kAuto with k > 6: a two-level
/// fractional factorial of 64 runs — the first six parameters take every
/// combination; parameter 6 + m is the product (in ±1 signs) of the m-th
/// three-element subset of the first six in lexicographic order ({0,1,2},
/// {0,1,3}, ...), so every column is balanced and any two are orthogonal
/// (Box, Hunter & Hunter, "Statistics for Experimenters", 2nd ed. 2005, ch. 6:
/// fractional factorials from generators) — plus the all-low and all-high
/// corners when the design lacks them. kNone: none.
std::vector<uint32_t> CornerMasks(int k, ToleranceSpec::Corners mode);

/// The seed of the stream of sample `sample` of nominal point `nominal`:
/// SplitMix64 (Steele, Lea & Flood, "Fast splittable pseudorandom number
/// generators", OOPSLA 2014) applied to seed, nominal and sample in turn, so
/// each sample's values depend on nothing else (not on -j, shards or order).
uint64_t SampleStreamSeed(uint64_t seed, uint64_t nominal, uint64_t sample);

/// A uniform number in (0, 1): the top 53 bits of one draw of `gen`, offset by
/// half a unit so that neither 0 nor 1 occurs. (std:: distributions are not
/// used: their output differs between standard libraries.)
double UnitUniform(std::mt19937_64& gen);

/// A standard normal number by the Box-Muller transform (Box & Muller, "A note
/// on the generation of random normal deviates", Ann. Math. Stat. 29, 1958):
/// sqrt(-2 ln u1) cos(2 pi u2) from two UnitUniform draws.
double StandardNormal(std::mt19937_64& gen);

/// The offsets of Monte Carlo sample `sample` of nominal point `nominal`, one
/// per <vary> in file order (relative: a fraction of the nominal value;
/// absolute: an amount): uniform within ±within, normal with its sigma,
/// corners ±within with equal odds. Drawn from one mt19937_64 seeded with
/// SampleStreamSeed, in file order.
std::vector<double> SampleOffsets(const ToleranceSpec& spec, size_t nominal, unsigned sample);

/// The offsets of corner `mask` (±within per <vary>).
std::vector<double> CornerOffsets(const ToleranceSpec& spec, uint32_t mask);

/// "L+ Coss-": which end of its band each parameter takes at corner `mask`.
std::string DescribeCorner(const ToleranceSpec& spec, uint32_t mask);

/// Appends the variants of every nominal point to `points` (which holds the
/// nominal points, index i at position i): for nominal point i, its corners
/// (CornerMasks) and then its samples, at indices N + i·V + v (N nominal
/// points, V variants each), each a copy of the nominal point with the varied
/// parameters set to nominal_values[i][j] moved by the offsets (derived
/// values keep their nominal values) and its VariantTag; a device's
/// parameter (<vary device=...>) goes to Point::device_params instead. Fails when the total
/// exceeds `max_points` (error at the block).
bool ExpandTolerances(const ToleranceSpec& spec,
                      const std::vector<std::vector<double>>& nominal_values, size_t max_points,
                      std::vector<Point>* points, Diagnostic* error);

/// Variants per nominal point: corners plus samples.
size_t VariantsPerPoint(const ToleranceSpec& spec);

}  // namespace zvsmap
