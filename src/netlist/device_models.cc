#include "netlist/device_models.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <optional>
#include <set>
#include <sstream>

#include "core/data_dir.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/cell_vectors.h"
#include "netlist/deck_rules.h"
#include "netlist/include_closure.h"
#include "result/edge_identity.h"

namespace zvsmap {

namespace {

// Splits a SPICE line into tokens; text inside {}, () and quotes stays whole.
std::vector<std::string> Tokens(const std::string& line) {
  std::vector<std::string> out;
  std::string cur;
  int depth = 0;
  char quote = 0;
  for (char c : line) {
    if (quote) {
      cur += c;
      if (c == quote) quote = 0;
      continue;
    }
    if (c == '\'' || c == '"') {
      quote = c;
      cur += c;
      continue;
    }
    if (c == '{' || c == '(') ++depth;
    if (c == '}' || c == ')') --depth;
    if (depth <= 0 && (c == ' ' || c == '\t' || c == '\r')) {
      if (!cur.empty()) out.push_back(cur);
      cur.clear();
      depth = 0;
      continue;
    }
    cur += c;
  }
  if (!cur.empty()) out.push_back(cur);
  // "name = value" written with blanks: glue it back together.
  std::vector<std::string> glued;
  for (size_t i = 0; i < out.size(); ++i) {
    if (out[i] == "=" && !glued.empty() && i + 1 < out.size()) {
      glued.back() += "=" + out[++i];
    } else if (!out[i].empty() && out[i].back() == '=' && i + 1 < out.size()) {
      glued.push_back(out[i] + out[i + 1]);
      ++i;
    } else if (!out[i].empty() && out[i][0] == '=' && !glued.empty()) {
      glued.back() += out[i];
    } else {
      glued.push_back(out[i]);
    }
  }
  return glued;
}

std::string ParamName(const std::string& token) { return Lower(token.substr(0, token.find('='))); }

std::string Join(const std::vector<std::string>& v, const char* sep) {
  std::string out;
  for (const auto& s : v) out += (out.empty() ? "" : sep) + s;
  return out;
}

std::string Where(const SourceLocation& w) { return w.file + ":" + std::to_string(w.line); }

// A template instance line split into name, nodes, model and parameters.
struct InstanceLine {
  std::string name;
  std::vector<std::string> nodes;
  std::string model;
  std::vector<std::string> params;
};

bool SplitInstance(const std::string& line, InstanceLine* out) {
  std::vector<std::string> t = Tokens(line);
  size_t first_param = t.size();
  for (size_t i = 1; i < t.size(); ++i) {
    if (t[i].find('=') != std::string::npos || Lower(t[i]) == "params:") {
      first_param = i;
      break;
    }
  }
  if (first_param < 5) return false;  // name, at least d g s, model
  out->name = t[0];
  out->nodes.assign(t.begin() + 1, t.begin() + static_cast<long>(first_param) - 1);
  out->model = t[first_param - 1];
  out->params.clear();
  for (size_t i = first_param; i < t.size(); ++i) {
    if (Lower(t[i]) != "params:") out->params.push_back(t[i]);
  }
  return true;
}

// The template line (logical) of instance `name`, or nullptr.
const std::string* FindInstance(const Template& tmpl, const std::string& name) {
  for (const auto& [line, text] : tmpl.lines) {
    (void)line;
    std::vector<std::string> t = Tokens(text);
    if (!t.empty() && Lower(t[0]) == Lower(name)) return &text;
  }
  return nullptr;
}

// Subcircuit names the template itself defines (lower-case).
std::vector<std::string> TemplateSubckts(const Template& tmpl) {
  std::vector<std::string> out;
  for (const auto& [line, text] : tmpl.lines) {
    (void)line;
    std::vector<std::string> t = Tokens(text);
    if (t.size() >= 2 && Lower(t[0]) == ".subckt") out.push_back(Lower(t[1]));
  }
  return out;
}

// The template instance that plays `role` in its cell.
const std::string& RoleInstance(const CellSpec& cell, const SwitchRole& role) {
  return role.side == SwitchSide::kHigh ? cell.high : cell.low;
}

}  // namespace

std::string GenericLibraryPath() { return DataFile("netlists/switches.lib"); }

namespace {

// Subcircuits of logical cards ((first line, text) pairs); `physical` gives
// the text of the blocks; when it is empty (assembled cards) the block's text
// is its logical cards, one a line.
void ScanLogical(const std::string& path, const std::vector<std::pair<int, std::string>>& logical,
                 const std::vector<std::string>& physical, std::vector<SubcktInfo>* out) {
  SubcktInfo* open = nullptr;
  int depth = 0;
  for (const auto& [first, text] : logical) {
    std::vector<std::string> t = Tokens(text);
    if (t.empty()) continue;
    std::string head = Lower(t[0]);
    if (head == ".subckt") {
      if (depth++ > 0) continue;  // a nested definition belongs to the outer block
      out->emplace_back();
      open = &out->back();
      open->name = t.size() > 1 ? t[1] : "";
      open->where = {path, first, 0};
      if (physical.empty()) open->text += text + "\n";
      bool in_params = false;
      for (size_t i = 2; i < t.size(); ++i) {
        if (Lower(t[i]) == "params:") {
          in_params = true;
        } else if (t[i].find('=') != std::string::npos) {
          in_params = true;
          open->params.push_back(ParamName(t[i]));
          open->param_defaults.push_back(t[i].substr(t[i].find('=') + 1));
        } else if (!in_params) {
          open->pins.push_back(Lower(t[i]));
        }
      }
      continue;
    }
    if (!open) continue;
    if (physical.empty()) open->text += text + "\n";
    if (head == ".ends") {
      if (--depth == 0) {
        for (int k = open->where.line; k <= first && k <= static_cast<int>(physical.size()); ++k)
          open->text += physical[k - 1] + "\n";
        open = nullptr;
      }
      continue;
    }
    if (depth == 1 && head == "vch") open->has_vch = true;
  }
}

// Subcircuits of assembled cards (each keeps its own file:line).
std::vector<SubcktInfo> ScanCards(const std::vector<DeckLine>& cards) {
  std::vector<SubcktInfo> out;
  std::vector<std::pair<int, std::string>> logical;
  size_t begin = 0;
  auto flush = [&](size_t end) {
    if (begin < end) ScanLogical(cards[begin].origin.file, logical, {}, &out);
    logical.clear();
    begin = end;
  };
  for (size_t i = 0; i < cards.size(); ++i) {
    if (cards[i].origin.file != cards[begin].origin.file) flush(i);
    logical.emplace_back(cards[i].origin.line, cards[i].text);
  }
  flush(cards.size());
  return out;
}

}  // namespace

bool ScanSubckts(const std::string& path, std::vector<SubcktInfo>* out, std::string* error) {
  out->clear();
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    *error = "cannot read '" + path + "'";
    return false;
  }
  // Logical lines (continuations joined) with their first physical line, and
  // the physical text for copying blocks.
  std::vector<std::pair<int, std::string>> logical;
  std::vector<std::string> physical;
  std::string line;
  int number = 0;
  while (std::getline(in, line)) {
    ++number;
    if (!line.empty() && line.back() == '\r') line.pop_back();
    physical.push_back(line);
    size_t b = line.find_first_not_of(" \t");
    if (b != std::string::npos && line[b] == '+' && !logical.empty()) {
      logical.back().second += " " + line.substr(b + 1);
    } else {
      logical.emplace_back(number, line);
    }
  }
  ScanLogical(path, logical, physical, out);
  return true;
}

namespace {

// Every sweep-file value of a device that reaches the deck stays one token
// on its card: no line break or control character can start a new card.
bool CheckDeviceTokens(const DeviceSpec& spec, Diagnostic* error) {
  auto fail = [&](const SourceLocation& where, const std::string& what, const std::string& why) {
    *error = Diagnostic{where, "device '" + spec.name + "': " + what + " " + why, {}};
    return false;
  };
  auto control = [](const std::string& text) {
    for (unsigned char c : text) {
      if (c < 0x20 || c == 0x7f) return DescribeChar(c);
    }
    return std::string();
  };
  std::string why;
  if (!CheckFileName(spec.file_as_written, &why)) return fail(spec.file_where, "model file:", why);
  std::string bad;
  bad = control(spec.name);
  if (!bad.empty()) return fail(spec.where, "the name", "holds " + bad);
  if (!spec.section.empty() && !IsNameToken(spec.section)) {
    return fail(spec.where, "section '" + Printable(spec.section) + "'",
                "is not a library section name (letters, digits and _ . - only)");
  }
  if (!IsNameToken(spec.subckt)) {
    return fail(spec.subckt_where, "subckt '" + Printable(spec.subckt) + "'",
                "is not a subcircuit name");
  }
  if (!CheckParamListToken(spec.params, &why)) return fail(spec.where, "params", why);
  for (const PinTie& tie : spec.pins) {
    const std::string& to = tie.to;
    bool ok = to == "d" || to == "g" || to == "s" ||
              (to.size() > 1 && to[0] == '@' && IsNameToken(to.substr(1))) ||
              (FindForbiddenChar(to, false) == std::string::npos &&
               to.find_first_not_of("0123456789.+-eEafgkmnptuAFGKMNPTU") == std::string::npos &&
               ParseSpiceNumber(to).has_value());
    if (!ok)
      return fail(spec.pins_where, "pin tie '" + to + "'", "is not d, g, s, @node or a number");
  }
  return true;
}

// The device's own params must be declared by its subcircuit.
bool CheckDeclaredParams(const DeviceSpec& spec, const SubcktInfo& sub, Diagnostic* error) {
  for (const std::string& p : Tokens(spec.params)) {
    std::string name = ParamName(p);
    if (std::find(sub.params.begin(), sub.params.end(), name) != sub.params.end()) continue;
    std::string best = ClosestName(name, sub.params);
    *error = Diagnostic{spec.where,
                        "device '" + spec.name + "': params names '" + name + "', which " +
                            "subcircuit '" + sub.name + "' (" + Where(sub.where) +
                            ") does not declare (" +
                            (sub.params.empty() ? std::string("it declares no params")
                                                : "it declares: " + Join(sub.params, ", ")) +
                            (best.empty() ? "" : "; did you mean '" + best + "'?") + ")",
                        {}};
    return false;
  }
  return true;
}

}  // namespace

bool ResolveDevice(const DeviceSpec& spec, ResolvedDevice* out, Diagnostic* error) {
  out->spec = spec;
  out->targets.clear();
  out->model_cards.clear();
  auto fail = [&](const SourceLocation& where, const std::string& message) {
    *error = Diagnostic{where, message, {}};
    return false;
  };
  if (!CheckDeviceTokens(spec, error)) return false;
  std::string file = spec.generic ? GenericLibraryPath() : spec.file;
  std::error_code ec;
  if (!std::filesystem::is_regular_file(file, ec)) {
    if (spec.generic)
      return fail(spec.where, "the generic switch library '" + file + "' is missing");
    return fail(spec.file_where, "device '" + spec.name + "': model file '" + spec.file_as_written +
                                     "' does not exist (looked for '" + file + "')");
  }
  std::vector<SubcktInfo> found;
  std::string message;
  if (spec.generic) {
    if (!ScanSubckts(file, &found, &message)) return fail(spec.file_where, message);
  } else {
    // The model file and all it includes, read and checked now, inlined later.
    bool read = spec.section.empty()
                    ? ExpandNetlistFile(file, spec.file_where, "", &out->model_cards, error)
                    : ExpandLibrarySection(file, spec.section, spec.file_where, "",
                                           &out->model_cards, error);
    if (!read) {
      if (error->where.file == spec.file_where.file && error->where.line == spec.file_where.line) {
        error->message = "device '" + spec.name + "': " + error->message;
      }
      return false;
    }
    found = ScanCards(out->model_cards);
  }
  auto it = std::find_if(found.begin(), found.end(),
                         [&](const SubcktInfo& s) { return Lower(s.name) == Lower(spec.subckt); });
  if (it == found.end()) {
    std::vector<std::string> names;
    for (const auto& s : found) names.push_back(s.name);
    std::string best = ClosestName(spec.subckt, names);
    std::string shown = spec.generic ? "netlists/switches.lib" : spec.file_as_written;
    return fail(spec.subckt_where, "device '" + spec.name + "': subcircuit '" + spec.subckt +
                                       "' not found in '" + shown + "' (" +
                                       (names.empty() ? std::string("it defines no .subckt")
                                                      : "it defines: " + Join(names, ", ")) +
                                       (best.empty() ? "" : "; did you mean '" + best + "'?") +
                                       ")");
  }
  out->subckt = *it;
  const SubcktInfo& sub = out->subckt;
  if (!CheckDeclaredParams(spec, sub, error)) return false;
  std::string which = "subcircuit '" + sub.name + "' (" + Where(sub.where) + ")";
  std::string pins = "pins (" + Join(sub.pins, " ") + ")";
  if (spec.generic) {
    if (sub.pins.size() != 3) {
      return fail(spec.subckt_where, "generic model '" + sub.name + "' must have pins d g s");
    }
    out->targets = {"d", "g", "s"};
    return true;
  }
  if (spec.positional) {
    if (spec.pins.size() != sub.pins.size()) {
      return fail(spec.pins_where, "device '" + spec.name + "': the pin map has " +
                                       std::to_string(spec.pins.size()) + " entries but " + which +
                                       " has " + std::to_string(sub.pins.size()) + " " + pins);
    }
    for (const auto& tie : spec.pins) out->targets.push_back(tie.to);
  } else {
    for (const auto& tie : spec.pins) {
      if (std::find(sub.pins.begin(), sub.pins.end(), tie.pin) == sub.pins.end()) {
        std::string best = ClosestName(tie.pin, sub.pins);
        return fail(spec.pins_where, "device '" + spec.name + "': the pin map names pin '" +
                                         tie.pin + "' but " + which + " has " + pins +
                                         (best.empty() ? "" : " (did you mean '" + best + "'?)"));
      }
    }
    for (const auto& pin : sub.pins) {
      auto tie = std::find_if(spec.pins.begin(), spec.pins.end(),
                              [&](const PinTie& t) { return t.pin == pin; });
      if (tie == spec.pins.end()) {
        return fail(spec.pins_where,
                    "device '" + spec.name + "': pin '" + pin + "' of " + which +
                        " is left floating; tie it to d, g, s, a node (@name) or a voltage");
      }
      out->targets.push_back(tie->to);
    }
  }
  static const char* kRoles[][2] = {{"d", "drain"}, {"g", "gate"}, {"s", "source"}};
  for (const auto& role : kRoles) {
    if (std::find(out->targets.begin(), out->targets.end(), role[0]) == out->targets.end()) {
      return fail(spec.pins_where, "device '" + spec.name + "': no pin of " + which +
                                       " is tied to the switch's " + role[1] + " (" + role[0] +
                                       "), which would leave that node floating");
    }
  }
  return true;
}

bool ResolveSweepDevices(const SweepSpec& spec, const Template& tmpl,
                         std::vector<ResolvedDevice>* out, std::vector<Diagnostic>* errors) {
  out->clear();
  size_t before = errors->size();
  for (const DeviceSpec& d : spec.devices) {
    ResolvedDevice r;
    Diagnostic e;
    if (ResolveDevice(d, &r, &e)) {
      out->push_back(std::move(r));
    } else {
      errors->push_back(e);
    }
  }
  for (const AxisGroup& g : spec.groups) {
    for (const AxisSpec& a : g.axes) {
      for (const std::string& role : a.device_roles) {
        SwitchRole parsed_role;
        ParseSwitchRole(role, &parsed_role);  // the sweep parser checked the spelling
        const std::string& cell_name = parsed_role.cell;
        const std::string side = SwitchSideName(parsed_role.side);
        auto cell = std::find_if(tmpl.cells.begin(), tmpl.cells.end(),
                                 [&](const CellSpec& c) { return c.name == cell_name; });
        std::string instance = cell == tmpl.cells.end() ? "" : RoleInstance(*cell, parsed_role);
        InstanceLine parsed;
        const std::string* line = instance.empty() ? nullptr : FindInstance(tmpl, instance);
        if (cell == tmpl.cells.end()) {
          errors->push_back(
              {a.where,
               "switch role '" + role + "': the template has no cell '" + cell_name + "'",
               {}});
        } else if (instance.empty()) {
          errors->push_back({a.where,
                             "switch role '" + role + "': cell '" + cell_name + "' names no " +
                                 side + " switch (key " + side + "=)",
                             {}});
        } else if (!line || !SplitInstance(*line, &parsed)) {
          errors->push_back({a.where,
                             "switch role '" + role + "': instance '" + instance +
                                 "' is not a subcircuit instance with pins d g s in '" + tmpl.path +
                                 "'",
                             {}});
        }
      }
    }
  }
  return errors->size() == before;
}

DeviceLines InstantiateDevice(const ResolvedDevice& device, const std::string& instance,
                              const std::string& drain, const std::string& gate,
                              const std::string& source, const std::vector<std::string>& inherited,
                              const std::vector<std::string>& defined_subckts) {
  DeviceLines out;
  const SubcktInfo& sub = device.subckt;
  if (device.spec.generic) {
    if (std::find(defined_subckts.begin(), defined_subckts.end(), Lower(sub.name)) ==
        defined_subckts.end()) {
      out.definitions.push_back("* generic switch model from netlists/switches.lib\n" + sub.text);
    }
  }
  // Parameters: of the template instance's only the initial drain-source
  // voltage (a property of the circuit, not of the device), if the subcircuit
  // declares it; then the device's own.
  std::vector<std::string> own = Tokens(device.spec.params);
  std::set<std::string> own_names;
  for (const auto& p : own) own_names.insert(ParamName(p));
  std::vector<std::string> params;
  for (const auto& p : inherited) {
    std::string name = ParamName(p);
    if (name == "vds0_v" && !own_names.count(name) &&
        std::find(sub.params.begin(), sub.params.end(), name) != sub.params.end()) {
      params.push_back(p);
    }
  }
  params.insert(params.end(), own.begin(), own.end());
  std::string param_text = params.empty() ? "" : " " + Join(params, " ");

  // Fixed-voltage pins get a source of their own at the top level.
  std::string inst_lower = Lower(instance);
  auto tie_node = [&](size_t pin) {
    const std::string& to = device.targets[pin];
    if (!to.empty() && to[0] == '@') return to.substr(1);
    std::string node = "zt_" + inst_lower + "_" + sub.pins[pin];
    out.definitions.push_back("vzt_" + inst_lower + "_" + sub.pins[pin] + " " + node + " 0 dc " +
                              to + "\n");
    return node;
  };
  if (sub.has_vch) {
    // The subcircuit follows zvsmap's convention (a vch in its channel): place it directly.
    std::string line = instance;
    for (size_t i = 0; i < sub.pins.size(); ++i) {
      const std::string& to = device.targets[i];
      line += " " + (to == "d" ? drain : to == "g" ? gate : to == "s" ? source : tie_node(i));
    }
    out.instance = line + " " + sub.name + param_text;
    return out;
  }
  // Otherwise a wrapper with vch in series with the drain; tied pins become extra ports.
  std::string wrapper = "zvsmap_w_" + inst_lower;
  std::string ports = "d g s", outer = drain + " " + gate + " " + source, inner;
  for (size_t i = 0; i < sub.pins.size(); ++i) {
    const std::string& to = device.targets[i];
    if (to == "d") {
      inner += " d_dut";
    } else if (to == "g" || to == "s") {
      inner += " " + to;
    } else {
      std::string port = "t_" + sub.pins[i];
      ports += " " + port;
      outer += " " + tie_node(i);
      inner += " " + port;
    }
  }
  out.definitions.push_back("* wrapper: " + ChannelCurrentVector(inst_lower) +
                            " is the drain terminal current of " + sub.name + "\n.subckt " +
                            wrapper + " " + ports + "\nvch d d_dut 0\nx1" + inner + " " + sub.name +
                            param_text + "\n.ends " + wrapper + "\n");
  out.instance = instance + " " + outer + " " + wrapper;
  return out;
}

bool ApplyDevicesToDeck(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                        const std::vector<std::pair<std::string, std::string>>& choice, Deck* deck,
                        std::string* error) {
  if (choice.empty()) return true;
  std::vector<std::string> defined = TemplateSubckts(tmpl);
  std::map<std::string, std::pair<std::string, SourceLocation>> replacement;  // instance -> line
  Deck definitions;
  std::vector<std::string> seen_text;
  std::set<std::string> seen_models;
  for (const auto& [role, name] : choice) {
    auto dev = std::find_if(devices.begin(), devices.end(), [&](const ResolvedDevice& d) {
      return Lower(d.spec.name) == Lower(name);
    });
    SwitchRole parsed_role;
    bool role_ok = ParseSwitchRole(role, &parsed_role);
    auto cell = std::find_if(tmpl.cells.begin(), tmpl.cells.end(),
                             [&](const CellSpec& c) { return c.name == parsed_role.cell; });
    if (dev == devices.end() || !role_ok || cell == tmpl.cells.end()) {
      *error = "unknown device '" + name + "' or role '" + role + "'";
      return false;
    }
    std::string instance = RoleInstance(*cell, parsed_role);
    const std::string* line = FindInstance(tmpl, instance);
    InstanceLine parsed;
    if (!line || !SplitInstance(*line, &parsed)) {
      *error = "instance '" + instance + "' not found in '" + tmpl.path + "'";
      return false;
    }
    // A user model file's cards once per file and section.
    std::string model_key = dev->spec.file + "\n" + Lower(dev->spec.section);
    if (!dev->spec.generic && seen_models.insert(model_key).second) {
      definitions.lines.insert(definitions.lines.end(), dev->model_cards.begin(),
                               dev->model_cards.end());
    }
    DeviceLines lines = InstantiateDevice(*dev, parsed.name, parsed.nodes[0], parsed.nodes[1],
                                          parsed.nodes[2], parsed.params, defined);
    SourceLocation origin = dev->spec.generic ? dev->subckt.where : dev->spec.where;
    for (const auto& d : lines.definitions) {
      if (std::find(seen_text.begin(), seen_text.end(), d) != seen_text.end()) continue;
      seen_text.push_back(d);
      definitions.AddText(d, origin);
    }
    replacement[Lower(parsed.name)] = {lines.instance, dev->spec.where};
  }
  Deck out;
  int depth = 0;
  for (size_t i = 0; i < deck->lines.size(); ++i) {
    const DeckLine& l = deck->lines[i];
    if (i == 0) {
      out.lines.push_back(l);
      out.AddGenerated("* zvsmap switch models");
      out.lines.insert(out.lines.end(), definitions.lines.begin(), definitions.lines.end());
      continue;
    }
    std::vector<std::string> t = Tokens(l.text);
    std::string head = t.empty() ? "" : Lower(t[0]);
    if (head == ".subckt") ++depth;
    if (head == ".ends" && depth > 0) --depth;
    auto it = depth > 0 || t.empty() ? replacement.end() : replacement.find(head);
    if (it == replacement.end()) {
      out.lines.push_back(l);
    } else {
      out.lines.push_back({it->second.first, l.origin});
    }
  }
  *deck = std::move(out);
  return true;
}

bool DeviceParamNominal(const ResolvedDevice& device, const std::string& param, double* value,
                        std::string* why) {
  const SubcktInfo& sub = device.subckt;
  auto declared = std::find(sub.params.begin(), sub.params.end(), param);
  if (declared == sub.params.end()) {
    std::string best = ClosestName(param, sub.params);
    *why = "subcircuit '" + sub.name + "' (" + Where(sub.where) + ") declares no parameter '" +
           param + "' (" +
           (sub.params.empty() ? std::string("it declares none")
                               : "it declares: " + Join(sub.params, ", ")) +
           (best.empty() ? "" : "; did you mean '" + best + "'?") + ")";
    return false;
  }
  if (param == "vds0_v") {
    *why = "vds0_v is the circuit's initial drain-source voltage, not a model parameter";
    return false;
  }
  std::string text;
  std::string from = "the default of subcircuit '" + sub.name + "' (" + Where(sub.where) + ")";
  size_t k = static_cast<size_t>(declared - sub.params.begin());
  if (k < sub.param_defaults.size()) text = sub.param_defaults[k];
  for (const std::string& p : Tokens(device.spec.params)) {
    if (ParamName(p) != param) continue;
    text = p.substr(p.find('=') + 1);
    from = "its params=\"...\"";
  }
  std::optional<double> v = ParseSpiceNumber(text);
  if (!v || !std::isfinite(*v)) {
    *why = "the nominal value of '" + param + "' (" + from + ") is '" + Printable(text) +
           "', not a plain number; set a number with <device params=\"" + param + "=...\">";
    return false;
  }
  *value = *v;
  return true;
}

std::vector<ResolvedDevice> WithDeviceParams(const std::vector<ResolvedDevice>& devices,
                                             const std::vector<DeviceParamValue>& values) {
  std::vector<ResolvedDevice> out = devices;
  for (ResolvedDevice& d : out) {
    std::vector<std::string> tokens = Tokens(d.spec.params);
    bool changed = false;
    for (const DeviceParamValue& v : values) {
      if (Lower(v.device) != Lower(d.spec.name)) continue;
      std::string token = v.param + "=" + FormatNumber(v.value);
      auto same = [&](const std::string& t) { return ParamName(t) == v.param; };
      tokens.erase(std::remove_if(tokens.begin(), tokens.end(), same), tokens.end());
      tokens.push_back(token);
      changed = true;
    }
    if (changed) d.spec.params = Join(tokens, " ");
  }
  return out;
}

bool ApplyDevices(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                  const std::vector<std::pair<std::string, std::string>>& choice,
                  std::string* netlist, std::string* error) {
  Deck deck;
  deck.AddText(*netlist, SourceLocation{});
  if (!ApplyDevicesToDeck(tmpl, devices, choice, &deck, error)) return false;
  *netlist = deck.Text();
  return true;
}

}  // namespace zvsmap
