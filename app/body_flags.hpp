// Command-line pieces shared by `steady` and `advise`: the optional scenario
// with --set overrides, the geometry flags (mapped onto the scenario's field
// table, so their ranges and messages come from one place), range-checked
// numbers and FROM:TO[:STEP] ranges.
#pragma once
#include <functional>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include "core/constants.hpp"
#include "core/scenario.hpp"
#include "core/steady.hpp"

namespace dm::app {

/// File units at this boundary: metres to millimetres, rad/s to rev/s.
constexpr double mm = 1e3;
inline double revS(double omegaRadS) { return omegaRadS / k::twoPi; }

/// The scenario and geometry flags of a subcommand.
struct BodyFlags {
  std::string scenario;  ///< optional; empty starts from defaultScenario()
  std::vector<std::string> sets;
  double lengthMm = 0, outerDiameterMm = 0, wallMm = 0;
  CLI::Option* length = nullptr;
  CLI::Option* outerDiameter = nullptr;
  CLI::Option* wall = nullptr;
};

/// The help text of a flag that sets scenario field `path`: `lead` (or the
/// field's own help), its unit and allowed range, from the field table.
std::string fieldHelp(const std::string& path, const std::string& lead = "");

/// Adds [SCENARIO.json], --set, --outer-diameter-mm, --wall-mm and (when
/// `withLength`) --length-mm to `sub`.
void addBodyFlags(CLI::App* sub, BodyFlags& f, bool withLength = true);

/// The scenario file (or the defaults) with --set and then the geometry
/// flags applied; `adjust` may edit the document before it is parsed and
/// validated. A refused field that a flag set is reported under the flag's
/// name (ScenarioError, exit 2).
Scenario loadBodyScenario(const BodyFlags& f, const std::function<void(nlohmann::json&)>& adjust = {});

/// `value` if `range` holds it; otherwise ScenarioError naming the flag,
/// the value and the allowed range.
double checkedFlag(const InputRange& range, double value, const std::string& flag);

/// FROM:TO (or FROM:TO:STEP when `withStep`) in `range`'s unit, FROM <= TO,
/// each bound in `range`, the step in `stepRange`.
struct FlagRange {
  double from = 0, to = 0, step = 0;
};
FlagRange parseFlagRange(const std::string& text, const std::string& flag, const InputRange& range, bool withStep,
                         const InputRange* stepRange = nullptr);

/// A describing line for the body: "tube, length 64 mm, outer diameter 16 mm, wall 1 mm".
std::string bodyDescription(const BodySpec& b, bool withLength = true);

/// A JSON number, or null when not finite (NaN never reaches a file); -0 becomes 0.
nlohmann::json jsonNumber(double v);

}  // namespace dm::app
