#include "app/body_flags.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <sstream>

#include "core/io.hpp"

namespace dm::app {

namespace {

// A number as the user sees it in a message (also NaN and infinity).
std::string shown(double v) {
  std::ostringstream o;
  o.precision(10);
  o << v;
  return o.str();
}

// Full precision, so a flag's value reaches the scenario unchanged.
std::string exact(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.17g", v);
  return buf;
}

bool parseNumber(const std::string& s, double& out) {
  if (s.empty()) return false;
  char* end = nullptr;
  out = std::strtod(s.c_str(), &end);
  return end == s.c_str() + s.size();
}

}  // namespace

std::string fieldHelp(const std::string& path, const std::string& lead) {
  const auto* f = findField(path);
  if (!f) return path;
  return (lead.empty() ? f->help : lead) + ", " + f->unit + " (overrides " + path + "; allowed " + shown(f->min) +
         " to " + shown(f->max) + ")";
}

void addBodyFlags(CLI::App* sub, BodyFlags& f, bool withLength) {
  sub->add_option("scenario", f.scenario, "scenario JSON file (default: the built-in default tube)");
  sub->add_option("--set", f.sets, "override a scenario field: key.path=value (repeatable)");
  if (withLength) f.length = sub->add_option("--length-mm", f.lengthMm, fieldHelp("body.length_mm"));
  f.outerDiameter = sub->add_option("--outer-diameter-mm", f.outerDiameterMm, fieldHelp("body.outer_diameter_mm"));
  f.wall = sub->add_option("--wall-mm", f.wallMm, fieldHelp("body.wall_mm"));
}

Scenario loadBodyScenario(const BodyFlags& f, const std::function<void(nlohmann::json&)>& adjust) {
  nlohmann::json doc = f.scenario.empty() ? scenarioToJson(defaultScenario()) : readScenarioJson(f.scenario);
  for (const std::string& s : f.sets) applyOverride(doc, s);
  // The geometry flags go through the field table like any --set.
  std::map<std::string, std::string> flagOf;
  const auto apply = [&](CLI::Option* opt, const char* path, double value) {
    if (!opt || opt->count() == 0) return;
    applyOverride(doc, std::string(path) + "=" + exact(value));
    flagOf[path] = opt->get_name();
  };
  apply(f.length, "body.length_mm", f.lengthMm);
  apply(f.outerDiameter, "body.outer_diameter_mm", f.outerDiameterMm);
  apply(f.wall, "body.wall_mm", f.wallMm);
  if (adjust) adjust(doc);
  try {
    return scenarioFromJson(doc);
  } catch (const ScenarioError& e) {
    const auto it = flagOf.find(e.field());
    if (it == flagOf.end()) throw;
    const std::string message = std::string(e.what()).substr(e.field().size() + 2);
    throw ScenarioError(it->second + " (" + e.field() + ")", message);
  }
}

double checkedFlag(const InputRange& range, double value, const std::string& flag) {
  if (!range.contains(value))
    throw ScenarioError(flag, "value " + shown(value) + " is out of range; " + range.allowedText());
  return value;
}

FlagRange parseFlagRange(const std::string& text, const std::string& flag, const InputRange& range, bool withStep,
                         const InputRange* stepRange) {
  const std::string form = withStep ? "FROM:TO:STEP" : "FROM:TO";
  std::vector<std::string> parts;
  std::stringstream ss(text);
  for (std::string part; std::getline(ss, part, ':');) parts.push_back(part);
  if (!text.empty() && text.back() == ':') parts.push_back("");
  const std::size_t want = withStep ? 3 : 2;
  double v[3] = {0, 0, 0};
  bool ok = parts.size() == want;
  for (std::size_t i = 0; ok && i < want; ++i) ok = parseNumber(parts[i], v[i]);
  if (!ok) throw ScenarioError(flag, "expected " + form + " in " + std::string(range.unit) + ", got \"" + text + "\"");
  const char* names[3] = {"FROM", "TO", "STEP"};
  for (int i = 0; i < 2; ++i)
    if (!range.contains(v[i]))
      throw ScenarioError(flag, std::string(names[i]) + " " + shown(v[i]) + " is out of range; " + range.allowedText());
  if (v[0] > v[1])
    throw ScenarioError(flag,
                        "FROM " + shown(v[0]) + " is above TO " + shown(v[1]) + "; give " + form + " with FROM <= TO");
  if (withStep && stepRange && !stepRange->contains(v[2]))
    throw ScenarioError(flag, "STEP " + shown(v[2]) + " is out of range; " + stepRange->allowedText());
  return {v[0], v[1], v[2]};
}

std::string bodyDescription(const BodySpec& b, bool withLength) {
  std::string s(shapeName(b.shape));
  if (withLength) s += ", length " + fmt(b.length * 1e3, 6) + " mm";
  s += ", outer diameter " + fmt(b.outerDiameter * 1e3, 6) + " mm";
  s += isHollow(b.shape) ? ", wall " + fmt(b.wall * 1e3, 6) + " mm" : std::string(", solid");
  return s;
}

nlohmann::json jsonNumber(double v) {
  if (!std::isfinite(v)) return nullptr;
  return v == 0 ? 0.0 : v;  // no "-0.0"
}

}  // namespace dm::app
