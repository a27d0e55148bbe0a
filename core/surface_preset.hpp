// Table-surface presets: small JSON files (assets/surfaces/*.json) holding
// the `surface` block of a scenario, with a note on where the values come from.
#pragma once
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/scenario.hpp"

namespace dm {

/// Version of the surface preset file format.
inline constexpr int surfacePresetFormatVersion = 1;

/// One preset as read from its file (not yet applied).
struct SurfacePreset {
  std::string file;     ///< file name, e.g. "pvc_sheet.json"
  std::string name;     ///< surface.name
  std::string note;     ///< where the values come from
  nlohmann::json surface;  ///< the scenario's `surface` block, file units
};

/// Reads every *.json preset in `dir`, sorted by file name. A malformed
/// file throws ScenarioError naming the file and the key.
std::vector<SurfacePreset> loadSurfacePresets(const std::string& dir);

/// The scenario with its surface block replaced by the preset's keys (keys
/// the preset leaves out keep their current values), validated through the
/// field table: a bad value throws ScenarioError naming the field.
Scenario withSurfacePreset(const Scenario& s, const SurfacePreset& preset);

/// The folder of the bundled presets (assets/surfaces in the source tree).
std::string bundledSurfaceDir();

}  // namespace dm
