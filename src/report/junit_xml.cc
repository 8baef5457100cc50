#include "report/junit_xml.h"

#include <map>
#include <string>
#include <utility>

namespace zvsmap {

namespace {

pugi::xml_node AddSuite(pugi::xml_node root, const char* name) {
  pugi::xml_node suite = root.append_child("testsuite");
  suite.append_attribute("name") = name;
  return suite;
}

void SetCounts(pugi::xml_node node, int tests, int failures) {
  node.append_attribute("tests") = tests;
  node.append_attribute("failures") = failures;
  node.append_attribute("errors") = 0;
  node.append_attribute("skipped") = 0;
}

pugi::xml_node AddCase(pugi::xml_node suite, const char* classname, const std::string& name) {
  pugi::xml_node tc = suite.append_child("testcase");
  tc.append_attribute("classname") = classname;
  tc.append_attribute("name") = name.c_str();
  tc.append_attribute("time") = 0;
  return tc;
}

}  // namespace

void BuildJunitXml(const ReportInput& input, const std::vector<RequirementVerdict>& verdicts,
                   pugi::xml_document* doc) {
  doc->reset();
  pugi::xml_node decl = doc->append_child(pugi::node_declaration);
  decl.append_attribute("version") = "1.0";
  decl.append_attribute("encoding") = "UTF-8";
  pugi::xml_node root = doc->append_child("testsuites");
  root.append_attribute("name") = "zvsmap";

  pugi::xml_node reqs = AddSuite(root, "requirements");
  int req_failures = 0;
  for (const RequirementVerdict& v : verdicts) {
    pugi::xml_node tc = AddCase(reqs, "zvsmap.requirements", v.title);
    if (v.held) {
      tc.append_child("system-out").text() = v.message.c_str();
      continue;
    }
    ++req_failures;
    pugi::xml_node failure = tc.append_child("failure");
    failure.append_attribute("message") = v.message.c_str();
    failure.append_attribute("type") = "requirement";
    std::string text = v.spec.Describe() + "\n";
    for (const std::string& d : v.details) text += d + "\n";
    failure.text() = text.c_str();
  }
  SetCounts(reqs, static_cast<int>(verdicts.size()), req_failures);

  // Points that did not run, grouped by status and reason (in order of first
  // appearance, so the file is stable).
  std::vector<std::pair<std::string, std::string>> order;
  std::map<std::pair<std::string, std::string>, std::vector<size_t>> groups;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    if (r.status == PointStatus::kOk) continue;
    auto key = std::make_pair(std::string(PointStatusName(r.status)), r.reason);
    if (groups.find(key) == groups.end()) order.push_back(key);
    groups[key].push_back(i);
  }
  pugi::xml_node pts = AddSuite(root, "points");
  if (order.empty()) {
    AddCase(pts, "zvsmap.points", "every point ran").append_child("system-out").text() =
        (std::to_string(input.points.size()) + " points ran and settled").c_str();
  }
  for (const auto& key : order) {
    const std::vector<size_t>& members = groups[key];
    std::string name = key.first + ": " + (key.second.empty() ? "no reason given" : key.second);
    pugi::xml_node failure = AddCase(pts, "zvsmap.points", name).append_child("failure");
    failure.append_attribute("message") =
        (std::to_string(members.size()) + " point(s) " + key.first).c_str();
    failure.append_attribute("type") = key.first.c_str();
    std::string text;
    for (size_t i : members) {
      text += "point " + std::to_string(input.points[i].index) + " (" + input.points[i].Describe() +
              ")\n";
    }
    failure.text() = text.c_str();
  }
  int point_cases = order.empty() ? 1 : static_cast<int>(order.size());
  SetCounts(pts, point_cases, static_cast<int>(order.size()));
  SetCounts(root, static_cast<int>(verdicts.size()) + point_cases,
            req_failures + static_cast<int>(order.size()));
}

}  // namespace zvsmap
