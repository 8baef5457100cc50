#include "store/content_hash.h"

#include <cstdio>
#include <fstream>
#include <sstream>

namespace zvsmap {

uint64_t Fnv1a64(const std::string& data, uint64_t basis) {
  uint64_t h = basis;
  for (unsigned char c : data) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return h;
}

std::string HexHash(uint64_t hash) {
  char buf[17];
  std::snprintf(buf, sizeof buf, "%016llx", static_cast<unsigned long long>(hash));
  return buf;
}

namespace {

std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return "";
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Field separator that cannot occur in text files' content boundaries by accident.
const std::string kSeparator("\0\x1f", 2);

}  // namespace

std::string SweepIdentity(const std::string& sweep_path, const std::string& template_path) {
  uint64_t h = Fnv1a64(ReadFile(sweep_path));
  h = Fnv1a64(kSeparator, h);
  h = Fnv1a64(ReadFile(template_path), h);
  return HexHash(h);
}

std::string PointContentHash(const std::string& canonical_deck, const SweepSpec& spec,
                             const Template& tmpl) {
  uint64_t h = Fnv1a64(canonical_deck);
  char buf[320];
  const SimulationSettings& s = spec.simulation;
  std::snprintf(
      buf, sizeof buf,
      "settle=%d measure_lead=%.17g max_step=%.17g reltol=%.17g method=%s tol=%.17g newton=%d "
      "max_periods=%d",
      s.settle_periods, MeasureLead(spec, tmpl), s.max_step_s, s.reltol,
      SettleMethodName(s.settle_method), s.settle_tolerance, s.max_newton, s.max_periods);
  h = Fnv1a64(kSeparator + buf, h);
  // The ladder setting, only when not the default (hashes of earlier runs stay valid).
  if (s.solver_aid != "auto") h = Fnv1a64(kSeparator + "solver_aid=" + s.solver_aid, h);
  // Probe runs add the window metrics (on by default; "off" stores none).
  h = Fnv1a64(kSeparator + (s.probe ? "probe=window" : "probe=off"), h);
  // A warm start settles from the chain predecessor's state (the same
  // steady state within the tolerance, not the same digits). "chain3": a
  // warm search stops at a tenth of the tolerance (before "chain2", at the
  // tolerance; before that an extrapolated start was tried as the measured
  // run). "off2": a cold search also checks its predicted step (before, a
  // small residual alone settled it). Results of the older searches are redone.
  h = Fnv1a64(kSeparator + (s.warm_start ? "warm=chain3" : "warm=off2"), h);
  // A regulated loop settles at another operating point.
  if (RunsRegulated(tmpl.regulation, s)) {
    h = Fnv1a64(kSeparator + "loop=regulated", h);
  }
  std::snprintf(buf, sizeof buf, "zvs=%d:%.17g",
                spec.zvs.kind == ZvsCriterion::Kind::kAbsolute ? 0 : 1, spec.zvs.value);
  h = Fnv1a64(kSeparator + buf, h);
  // The annotations (the template's own `*@` comments; the deck drops them).
  for (const DeckLine& card : tmpl.body) {
    if (card.origin.file != tmpl.path) continue;
    std::istringstream words(card.text);
    std::string word, first, annotation;
    words >> first;
    if (first.compare(0, 2, "*@") != 0) continue;
    annotation = first;
    while (words >> word) annotation += " " + word;
    h = Fnv1a64(kSeparator + annotation, h);
  }
  // The sweep's own <predict> formulas: their columns are stored with the point.
  for (const PredictionSpec& p : spec.predictions) {
    std::snprintf(buf, sizeof buf, "|%.17g|%.17g", p.tolerance_rel, p.tolerance_abs);
    h = Fnv1a64(kSeparator + "predict|" + p.name + "|" + p.expression + "|" + p.compare + "|" +
                    p.edge + "|" + p.cell + buf,
                h);
  }
  h = Fnv1a64(kSeparator + ZVSMAP_VERSION, h);
  return HexHash(h);
}

}  // namespace zvsmap
