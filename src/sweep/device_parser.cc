#include "sweep/device_parser.h"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <sstream>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

bool IsLabel(const std::string& s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
  });
}

// A SPICE node name: no blanks, no '=' and no brackets.
bool IsNodeName(const std::string& s) {
  return !s.empty() && s.find_first_of("=(){}'\" \t") == std::string::npos;
}

bool ValidTarget(const std::string& to) {
  if (to == "d" || to == "g" || to == "s") return true;
  if (to.size() > 1 && to[0] == '@') return IsNodeName(to.substr(1));
  return ParseSpiceNumber(to).has_value();
}

}  // namespace

bool ParsePinMap(const std::string& text, std::vector<PinTie>* ties, bool* positional,
                 std::string* message) {
  ties->clear();
  std::istringstream in(text);
  std::string item;
  int named = 0, plain = 0;
  while (in >> item) {
    PinTie tie;
    size_t eq = item.find('=');
    if (eq == std::string::npos) {
      tie.to = Lower(item);
      ++plain;
    } else {
      tie.pin = Lower(item.substr(0, eq));
      tie.to = Lower(item.substr(eq + 1));
      ++named;
      if (!IsNodeName(tie.pin)) {
        *message = "bad pin name in '" + item + "'";
        return false;
      }
      for (const auto& t : *ties) {
        if (t.pin == tie.pin) {
          *message = "pin '" + item.substr(0, eq) + "' is mapped twice";
          return false;
        }
      }
    }
    if (!ValidTarget(tie.to)) {
      *message = "pin map entry '" + item +
                 "': tie a pin to d, g, s (the switch's drain, gate, source), a template node "
                 "as @name, or a fixed voltage (a number)";
      return false;
    }
    ties->push_back(tie);
  }
  if (ties->empty()) {
    *message = "empty pin map";
    return false;
  }
  if (named && plain) {
    *message = "pin map mixes plain entries and pin=target entries; use one form";
    return false;
  }
  *positional = plain > 0;
  return true;
}

bool ParseDevice(pugi::xml_node node, const std::string& sweep_path,
                 const std::vector<DeviceSpec>& earlier, const DeviceWhere& where,
                 const DeviceFail& fail, DeviceSpec* out) {
  static const char* kAllowed[] = {"name", "model", "file", "section", "subckt", "pins", "params"};
  for (pugi::xml_attribute a : node.attributes()) {
    std::string name = a.name();
    if (std::none_of(std::begin(kAllowed), std::end(kAllowed),
                     [&](const char* k) { return name == k; })) {
      return fail(a.name(), "unknown attribute '" + name + "' on <device>");
    }
  }
  out->where = where(nullptr);
  out->name = node.attribute("name").value();
  if (!node.attribute("name")) return fail(nullptr, "missing attribute 'name' on <device>");
  if (!IsLabel(out->name)) {
    return fail("name", "bad device name '" + out->name + "' (letters, digits, '_' and '-')");
  }
  for (const auto& d : earlier) {
    if (Lower(d.name) == Lower(out->name)) {
      return fail("name", "device '" + out->name + "' is declared twice (first on line " +
                              std::to_string(d.where.line) + ")");
    }
  }
  out->params = node.attribute("params").value();
  bool has_model = node.attribute("model");
  bool has_file = node.attribute("file") || node.attribute("subckt") || node.attribute("pins") ||
                  node.attribute("section");
  if (has_model == has_file) {
    return fail(nullptr,
                "<device> takes either model=\"zsw_...\" (a generic library model) or "
                "file, subckt and pins (your own subcircuit)");
  }
  if (has_model) {
    out->generic = true;
    out->subckt = node.attribute("model").value();
    out->subckt_where = where("model");
    if (out->subckt.empty()) return fail("model", "empty attribute 'model' on <device>");
    return true;
  }
  for (const char* required : {"file", "subckt", "pins"}) {
    if (!node.attribute(required) || std::string(node.attribute(required).value()).empty()) {
      return fail(node.attribute(required) ? required : nullptr,
                  std::string(node.attribute(required) ? "empty" : "missing") + " attribute '" +
                      required + "' on <device>");
    }
  }
  out->file_as_written = node.attribute("file").value();
  namespace fs = std::filesystem;
  fs::path file(out->file_as_written);
  if (file.is_relative()) file = fs::path(sweep_path).parent_path() / file;
  // Absolute: ngspice reads the .include from its own working directory.
  out->file = std::filesystem::absolute(file).lexically_normal().string();
  out->file_where = where("file");
  out->section = node.attribute("section").value();
  out->subckt = node.attribute("subckt").value();
  out->subckt_where = where("subckt");
  out->pins_where = where("pins");
  std::string message;
  if (!ParsePinMap(node.attribute("pins").value(), &out->pins, &out->positional, &message)) {
    return fail("pins", message);
  }
  return true;
}

}  // namespace zvsmap
