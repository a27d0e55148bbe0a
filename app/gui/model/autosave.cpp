#include "app/gui/model/autosave.hpp"

#include <cstdlib>
#include <filesystem>

#include <nlohmann/json.hpp>

#include "core/io.hpp"

namespace dm::gui {

namespace fs = std::filesystem;

namespace {

constexpr const char* versionKey = "dwellmark_unsaved";
constexpr int version = 1;

}  // namespace

std::string defaultAutosavePath() {
  if (const char* xdg = std::getenv("XDG_STATE_HOME"); xdg && *xdg)
    return std::string(xdg) + "/dwellmark/unsaved-scenario.json";
  if (const char* home = std::getenv("HOME"); home && *home)
    return std::string(home) + "/.local/state/dwellmark/unsaved-scenario.json";
  return {};
}

void writeAutosave(const std::string& file, const Scenario& scenario, const std::string& origin) {
  std::error_code ec;
  fs::create_directories(fs::path(file).parent_path(), ec);
  if (ec) throw OutputError("cannot create " + fs::path(file).parent_path().string() + ": " + ec.message());
  nlohmann::json doc;
  doc[versionKey] = version;
  doc["origin"] = origin;
  doc["scenario"] = scenarioToJson(scenario);
  writeFileAtomic(file, doc.dump(2) + "\n");
}

std::optional<AutosaveRecord> loadAutosave(const std::string& file) {
  std::error_code ec;
  if (file.empty() || !fs::exists(file, ec)) return std::nullopt;
  const nlohmann::json doc = readScenarioJson(file);
  const auto has = [&doc](const char* key) { return doc.is_object() && doc.contains(key); };
  if (!has(versionKey) || doc[versionKey] != version || !has("scenario") || !has("origin") ||
      !doc["origin"].is_string())
    throw ScenarioError(file, std::string("not a dwellmark autosave (expected \"") + versionKey + "\": " +
                                  std::to_string(version) + ", \"origin\" and \"scenario\")");
  AutosaveRecord r;
  r.scenario = scenarioFromJson(doc["scenario"]);  // validates
  r.origin = doc["origin"].get<std::string>();
  return r;
}

void clearAutosave(const std::string& file) {
  std::error_code ec;
  if (!file.empty()) fs::remove(file, ec);
}

bool AutosaveClock::due(double now, std::uint64_t revision, bool dirty) const {
  return dirty && revision != writtenRevision && now - lastWrite >= interval;
}

void AutosaveClock::wrote(double now, std::uint64_t revision) {
  lastWrite = now;
  writtenRevision = revision;
}

}  // namespace dm::gui
