// Reads <device> elements of a sweep file (see README "Switch models").
#pragma once

#include <functional>
#include <pugixml.hpp>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/device_spec.h"

namespace zvsmap {

/// Reports a problem in the element being parsed: `attribute` is the attribute
/// at fault (nullptr for the element); returns false.
using DeviceFail = std::function<bool(const char* attribute, const std::string& message)>;
/// The location of an attribute's name in the sweep file (the element's if absent).
using DeviceWhere = std::function<SourceLocation(const char* attribute)>;

/// Parses one <device name=... (model=GENERIC | file=... subckt=... pins=...
/// [section=...]) [params=...]/>. Checks the shape, the name (unique among
/// `earlier`) and the pin map's syntax; whether the file, the subcircuit and
/// its pins exist is checked later (netlist/device_models.h). `sweep_path`
/// resolves a relative file.
bool ParseDevice(pugi::xml_node node, const std::string& sweep_path,
                 const std::vector<DeviceSpec>& earlier, const DeviceWhere& where,
                 const DeviceFail& fail, DeviceSpec* out);

/// Splits a pin map ("s d g" or "D=d G=g S=s KS=s TJ=25") into ties; false
/// with `message` on a malformed entry.
bool ParsePinMap(const std::string& text, std::vector<PinTie>* ties, bool* positional,
                 std::string* message);

}  // namespace zvsmap
