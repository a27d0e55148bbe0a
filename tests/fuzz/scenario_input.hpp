// One fuzz input through the scenario parser and validator, exactly as the
// command line takes a file and its --set overrides, with the properties
// that must hold for any bytes at all. Shared by the libFuzzer target
// (fuzz_scenario.cpp) and the regression test that replays the inputs
// under tests/fuzz/regressions/.
#pragma once
#include <stdexcept>
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/dynamics.hpp"
#include "core/launch.hpp"
#include "core/scenario.hpp"

namespace dm::fuzz {

/// How an input ended: refused with a ScenarioError, or accepted.
enum class Outcome { Refused, Accepted };

/// An input is the document text, optionally followed by a line holding
/// only "%%" and then one --set assignment per line.
struct Input {
  std::string document;
  std::vector<std::string> assignments;
};

inline Input splitInput(const std::string& bytes) {
  Input in;
  const std::string marker = "\n%%\n";
  const auto at = bytes.find(marker);
  in.document = bytes.substr(0, at);
  if (at == std::string::npos) return in;
  std::string rest = bytes.substr(at + marker.size());
  std::size_t start = 0;
  while (start <= rest.size()) {
    const auto end = rest.find('\n', start);
    in.assignments.push_back(rest.substr(start, end == std::string::npos ? std::string::npos : end - start));
    if (end == std::string::npos) break;
    start = end + 1;
  }
  return in;
}

/// Integrator steps run on every accepted scenario: a few milliseconds of
/// the launch, enough to meet the first contact forces.
inline constexpr int stepsAfterAcceptance = 48;

/// Parses, overrides and validates `bytes`. Returns Refused when a
/// ScenarioError says no, Accepted for a valid scenario. Throws
/// std::logic_error when a property fails: an accepted scenario that
/// validate refuses, that is refused once written back to JSON, or whose
/// first steps leave the healthy range. Any other exception is a failure too.
inline Outcome checkScenarioInput(const std::string& bytes) {
  const Input in = splitInput(bytes);
  Scenario s;
  try {
    nlohmann::json doc = parseScenarioText(in.document, "fuzz input");
    for (const std::string& a : in.assignments) applyOverride(doc, a);
    s = scenarioFromJson(doc);
  } catch (const ScenarioError&) {
    return Outcome::Refused;
  }
  // Accepted: it must be valid, and stay valid written back and read again.
  try {
    validate(s);
  } catch (const ScenarioError& e) {
    throw std::logic_error(std::string("accepted a scenario that validate refuses: ") + e.what());
  }
  const std::string written = scenarioToJson(s).dump(2);
  try {
    validate(scenarioFromJson(parseScenarioText(written, "written back")));
  } catch (const ScenarioError& e) {
    throw std::logic_error(std::string("an accepted scenario is refused once written back: ") + e.what());
  }
  // Its launch and first steps stay finite and below the runaway limits.
  const Params p = makeParams(s);
  State state = launchState(p, s.launch);
  for (int i = 0; i < stepsAfterAcceptance; ++i) {
    if (!healthy(state)) throw std::logic_error("an accepted scenario is not healthy after " + std::to_string(i) + " steps");
    step(p, state);
  }
  return Outcome::Accepted;
}

}  // namespace dm::fuzz
