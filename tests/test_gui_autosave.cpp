// The GUI's autosave: the edited scenario round-trips through the file with
// the file it belongs to, a damaged file is refused by name rather than
// loaded, clearing removes it, and the clock writes only changed, unsaved
// edits and at most once per interval.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include <unistd.h>

#include "app/gui/model/autosave.hpp"
#include "core/io.hpp"

using namespace dm;
using namespace dm::gui;

namespace {

// A fresh folder under the system's temporary folder, removed at the end.
struct TempFolder {
  std::filesystem::path dir;
  TempFolder() {
    dir = std::filesystem::temp_directory_path() / ("dwellmark-autosave-" + std::to_string(::getpid()));
    std::filesystem::remove_all(dir);
  }
  ~TempFolder() { std::filesystem::remove_all(dir); }
};

}  // namespace

TEST_CASE("an autosave gives back the edited scenario and the file it belongs to", "[gui][autosave]") {
  TempFolder tmp;
  const std::string file = (tmp.dir / "state" / "unsaved-scenario.json").string();
  Scenario s = defaultScenario();
  s.body.length = 0.0875;
  s.launch.revolution = 7.25 * 6.283185307179586;
  CHECK_FALSE(loadAutosave(file));  // none yet
  writeAutosave(file, s, "/exhibits/tube.json");  // creates the folder
  const std::optional<AutosaveRecord> back = loadAutosave(file);
  REQUIRE(back);
  CHECK(back->origin == "/exhibits/tube.json");
  CHECK(scenarioToJson(back->scenario) == scenarioToJson(s));
  clearAutosave(file);
  CHECK_FALSE(std::filesystem::exists(file));
  clearAutosave(file);  // twice is harmless
}

TEST_CASE("a damaged autosave is refused by name, not loaded", "[gui][autosave]") {
  TempFolder tmp;
  std::filesystem::create_directories(tmp.dir);
  const std::string file = (tmp.dir / "unsaved-scenario.json").string();
  const auto holding = [&file](const std::string& text) {
    std::ofstream(file) << text;
    return file;
  };
  CHECK_THROWS_WITH(loadAutosave(holding("{\"dwellmark_unsaved\": 1, \"origin\": ")),
                    Catch::Contains("unsaved-scenario.json"));
  CHECK_THROWS_WITH(loadAutosave(holding("{\"scenario\": {}}")), Catch::Contains("not a dwellmark autosave"));
  CHECK_THROWS_WITH(loadAutosave(holding("[1, 2]")), Catch::Contains("not a dwellmark autosave"));
  // A scenario out of range inside a well-formed autosave: the field is named.
  nlohmann::json doc = {{"dwellmark_unsaved", 1}, {"origin", ""}, {"scenario", scenarioToJson(defaultScenario())}};
  doc["scenario"]["body"]["length_mm"] = -4;
  CHECK_THROWS_WITH(loadAutosave(holding(doc.dump())), Catch::Contains("body.length_mm"));
}

TEST_CASE("the autosave clock writes changed unsaved edits at most once per interval", "[gui][autosave]") {
  AutosaveClock clock;
  clock.interval = 5;
  CHECK_FALSE(clock.due(0, 3, false));  // nothing unsaved
  CHECK(clock.due(0, 3, true));
  clock.wrote(0, 3);
  CHECK_FALSE(clock.due(1, 4, true));   // changed, but too soon
  CHECK_FALSE(clock.due(9, 3, true));   // late enough, but already written
  CHECK(clock.due(5, 4, true));
}
