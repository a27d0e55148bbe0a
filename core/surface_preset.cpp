#include "core/surface_preset.hpp"

#include <algorithm>
#include <filesystem>

namespace dm {

namespace fs = std::filesystem;

std::vector<SurfacePreset> loadSurfacePresets(const std::string& dir) {
  std::vector<fs::path> files;
  std::error_code ec;
  for (const auto& entry : fs::directory_iterator(dir, ec))
    if (entry.is_regular_file() && entry.path().extension() == ".json") files.push_back(entry.path());
  std::sort(files.begin(), files.end());
  std::vector<SurfacePreset> presets;
  for (const fs::path& f : files) {
    const nlohmann::json doc = readScenarioJson(f.string());
    const std::string where = f.filename().string();
    if (!doc.is_object() || doc.value("dwellmark_surface", 0) != surfacePresetFormatVersion)
      throw ScenarioError(where + ": dwellmark_surface",
                          "a surface preset starts with \"dwellmark_surface\": " + std::to_string(surfacePresetFormatVersion));
    if (!doc.contains("surface") || !doc["surface"].is_object())
      throw ScenarioError(where + ": surface", "missing; a preset holds a \"surface\" object");
    SurfacePreset p;
    p.file = where;
    p.surface = doc["surface"];
    p.name = p.surface.value("name", f.stem().string());
    p.note = doc.value("note", "");
    presets.push_back(std::move(p));
  }
  return presets;
}

Scenario withSurfacePreset(const Scenario& s, const SurfacePreset& preset) {
  // Through the file form, so the field table parses and range-checks every key.
  nlohmann::json doc = scenarioToJson(s);
  for (auto it = preset.surface.begin(); it != preset.surface.end(); ++it) doc["surface"][it.key()] = it.value();
  return scenarioFromJson(doc);
}

std::string bundledSurfaceDir() { return std::string(DWELLMARK_SOURCE_DIR) + "/assets/surfaces"; }

}  // namespace dm
