#include "netlist/cell_vectors.h"

namespace zvsmap {

bool IsGroundNode(const std::string& node) { return node == "0" || node == "gnd"; }

std::string NodeVoltageVector(const std::string& node) {
  if (node.empty() || IsGroundNode(node)) return "";
  return "v(" + node + ")";
}

std::string SourceCurrentVector(const std::string& source) {
  return source.empty() ? "" : "i(" + source + ")";
}

std::string ChannelCurrentVector(const std::string& instance) {
  return instance.empty() ? "" : "i(v." + instance + ".vch)";
}

std::vector<std::string> CellVectors::All() const {
  std::vector<std::string> out;
  for (const std::string* v :
       {&node, &rail_high, &rail_low, &current, &high_cmd, &low_cmd, &high_gate, &high_source,
        &low_gate, &low_source, &high_channel, &low_channel}) {
    if (!v->empty()) out.push_back(*v);
  }
  return out;
}

CellVectors CellVectorsFor(const CellSpec& cell) {
  CellVectors v;
  v.node = NodeVoltageVector(cell.node);
  v.rail_high = NodeVoltageVector(cell.rail_high);
  v.rail_low = NodeVoltageVector(cell.rail_low);
  v.current = SourceCurrentVector(cell.current);
  v.high_cmd = NodeVoltageVector(cell.high_cmd);
  v.low_cmd = NodeVoltageVector(cell.low_cmd);
  v.high_gate = NodeVoltageVector(cell.high_gate);
  v.high_source = NodeVoltageVector(cell.high_source);
  v.low_gate = NodeVoltageVector(cell.low_gate);
  v.low_source = NodeVoltageVector(cell.low_source);
  v.high_channel = ChannelCurrentVector(cell.high);
  v.low_channel = ChannelCurrentVector(cell.low);
  return v;
}

}  // namespace zvsmap
