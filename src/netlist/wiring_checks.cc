#include "netlist/wiring_checks.h"

#include <map>
#include <sstream>
#include <string>

#include "core/text.h"

namespace zvsmap {

namespace {

std::vector<std::string> Tokens(const std::string& line) {
  std::vector<std::string> out;
  std::istringstream in(Lower(line));
  std::string t;
  while (in >> t) out.push_back(t);
  return out;
}

// The template's top-level element lines (outside .subckt ... .ends).
std::vector<std::pair<int, std::vector<std::string>>> TopLevel(const Template& tmpl) {
  std::vector<std::pair<int, std::vector<std::string>>> out;
  int depth = 0;
  for (const auto& [line, text] : tmpl.lines) {
    std::vector<std::string> t = Tokens(text);
    if (t.empty() || t[0][0] == '*') continue;
    if (t[0] == ".subckt") ++depth;
    if (t[0] == ".ends") {
      --depth;
      continue;
    }
    if (depth == 0 && t[0][0] != '.') out.emplace_back(line, t);
  }
  return out;
}

Diagnostic At(const Template& tmpl, int line, const std::string& message) {
  return Diagnostic{{tmpl.path, line, 0}, message};
}

void CheckSense(const Template& tmpl, const CellSpec& cell,
                const std::vector<std::pair<int, std::vector<std::string>>>& elements,
                std::vector<Diagnostic>* out) {
  for (const auto& [line, t] : elements) {
    if (t[0] != Lower(cell.current) || t.size() < 3) continue;
    if (t[2] == Lower(cell.node) && t[1] != Lower(cell.node)) {
      out->push_back(At(tmpl, line,
                        "cell '" + cell.name + "': the sense source '" + t[0] +
                            "' is reversed: " + "it runs " + t[1] + " -> " + t[2] + ", but i(" +
                            t[0] + ") must be the current OUT of the switch node '" + cell.node +
                            "' (write it as '" + t[0] + " " + cell.node + " " + t[1] + " 0')"));
    }
    return;
  }
}

void CheckInstance(const Template& tmpl, const CellSpec& cell, const std::string& instance,
                   const std::vector<std::pair<int, std::vector<std::string>>>& elements,
                   std::vector<Diagnostic>* out) {
  for (const auto& [line, t] : elements) {
    if (t[0] != Lower(instance) || t.size() < 5) continue;
    const std::string &drain = t[1], &gate = t[2];
    for (const std::string* power : {&cell.node, &cell.rail_high, &cell.rail_low}) {
      if (gate == Lower(*power)) {
        out->push_back(At(tmpl, line,
                          "cell '" + cell.name + "': switch '" + instance + "' has its gate pin " +
                              "(its second node) on '" + gate + "', a node of the power loop; " +
                              "expected the pins in the order drain gate source"));
      }
    }
    for (const std::string* drive :
         {&cell.high_gate, &cell.low_gate, &cell.high_cmd, &cell.low_cmd}) {
      if (!drive->empty() && drain == Lower(*drive)) {
        out->push_back(At(tmpl, line,
                          "cell '" + cell.name + "': switch '" + instance + "' has its drain pin " +
                              "(its first node) on the drive node '" + drain +
                              "'; expected the pins in the order drain gate source"));
      }
    }
    return;
  }
}

// "drain role" for "d" (and so on), or the node itself when no pin reaches it.
std::string RoleWord(const std::string& role, const std::string& node) {
  if (role == "d") return "drain role";
  if (role == "g") return "gate role";
  if (role == "s") return "source role";
  return "internal node '" + node + "'";
}

// Logical lines of a subcircuit block ('+' continuations joined).
std::vector<std::string> Logical(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    std::string t = Trim(line);
    if (!t.empty() && t[0] == '+' && !out.empty()) {
      out.back() += " " + t.substr(1);
    } else {
      out.push_back(t);
    }
  }
  return out;
}

void CheckDevice(const ResolvedDevice& device, std::vector<Diagnostic>* out) {
  // Pin name -> where the pin map ties it ("d", "g", "s", ...).
  std::map<std::string, std::string> role;
  for (size_t i = 0; i < device.subckt.pins.size() && i < device.targets.size(); ++i) {
    role[device.subckt.pins[i]] = device.targets[i];
  }
  std::vector<std::vector<std::string>> elements;
  for (const std::string& l : Logical(device.subckt.text)) {
    std::vector<std::string> t = Tokens(l);
    if (!t.empty() && t[0][0] != '.' && t[0][0] != '*') elements.push_back(t);
  }
  // One series resistor away from a pin counts as that pin (internal gate resistance).
  auto role_of = [&](const std::string& node) -> std::string {
    auto it = role.find(node);
    if (it != role.end()) return it->second;
    for (const auto& t : elements) {
      if (t[0][0] != 'r' || t.size() < 3) continue;
      if (t[1] == node && role.count(t[2])) return role[t[2]];
      if (t[2] == node && role.count(t[1])) return role[t[1]];
    }
    return "";
  };
  SourceLocation where =
      device.spec.pins_where.line > 0 ? device.spec.pins_where : device.spec.where;
  std::string name = "device '" + device.spec.name + "' (subcircuit " + device.subckt.name + ")";
  for (const auto& t : elements) {
    if (t[0][0] == 'm' && t.size() >= 4) {
      std::string d = role_of(t[1]), g = role_of(t[2]);
      if (g == "d" || g == "s" || d == "g") {
        out->push_back(Diagnostic{
            where, name + ": the pin map ties transistor '" + t[0] + "' with its gate on the " +
                       RoleWord(g, t[2]) + " and its drain on the " + RoleWord(d, t[1]) +
                       " (nodes " + t[1] + " " + t[2] + " " + t[3] +
                       "): gate and drain swapped? Map its gate pin to g and its drain pin to d"});
        return;
      }
      if (d == "s" && role_of(t[3]) == "d") {
        out->push_back(Diagnostic{
            where, name + ": the pin map ties transistor '" + t[0] +
                       "' with its drain on the source role and its source on the drain role " +
                       "(pins " + t[1] + " " + t[2] + " " + t[3] +
                       "): its body diode would conduct at the rail instead of blocking; " +
                       "drain and source swapped?"});
        return;
      }
    }
    if (t[0][0] == 'd' && t.size() >= 4) {
      std::string anode = role_of(t[1]), cathode = role_of(t[2]);
      if (anode == "d" && cathode == "s") {
        out->push_back(Diagnostic{
            where, name + ": diode '" + t[0] + "' runs from the drain role (" + t[1] +
                       ") to the source role (" + t[2] +
                       "), so the switch would conduct at the rail instead of blocking: " +
                       "drain and source swapped in the pin map?"});
        return;
      }
    }
  }
}

}  // namespace

std::vector<Diagnostic> CheckWiring(const Template& tmpl,
                                    const std::vector<ResolvedDevice>& devices) {
  std::vector<Diagnostic> out;
  auto elements = TopLevel(tmpl);
  for (const CellSpec& cell : tmpl.cells) {
    CheckSense(tmpl, cell, elements, &out);
    CheckInstance(tmpl, cell, cell.high, elements, &out);
    CheckInstance(tmpl, cell, cell.low, elements, &out);
  }
  for (const ResolvedDevice& device : devices) CheckDevice(device, &out);
  return out;
}

}  // namespace zvsmap
