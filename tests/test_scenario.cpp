// Scenario fields of the pattern analysis: the analysis section and the
// extra trace points go through the one field table like every other input.
#include <catch2/catch.hpp>

#include "core/constants.hpp"
#include "core/scenario.hpp"

using namespace dm;

namespace {

// The bundled demo scenario as a JSON document.
nlohmann::json demoDocument() { return readScenarioJson(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json"); }

// The ScenarioError message of parsing `doc`, or "" if it parses.
std::string refusal(const nlohmann::json& doc) {
  try {
    scenarioFromJson(doc);
  } catch (const ScenarioError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_CASE("analysis fields default to a 1 s window every 0.5 s and read in file units", "[scenario]") {
  nlohmann::json doc = demoDocument();
  CHECK(scenarioFromJson(doc).analysis.window == 1.0);
  CHECK(scenarioFromJson(doc).analysis.windowStep == 0.5);
  doc["analysis"] = {{"window_s", 2.0}, {"window_step_s", 0.25}, {"dwell_speed_mm_s", 20.0}, {"eye_time_ms", 50.0}};
  const Scenario s = scenarioFromJson(doc);
  CHECK(s.analysis.window == 2.0);
  CHECK(s.analysis.windowStep == 0.25);
  CHECK(s.analysis.dwellSpeed == Approx(0.02));
  CHECK(s.analysis.eyeTime == Approx(0.05));
}

TEST_CASE("trace points parse, round-trip and are range-checked by name", "[scenario]") {
  nlohmann::json doc = demoDocument();
  doc["analysis"]["trace_points"] = {{{"end", "B"}, {"angle_deg", 90.0}, {"size_mm", 1.5}}, {{"end", "A"}, {"angle_deg", -30.0}}};
  const Scenario s = scenarioFromJson(doc);
  REQUIRE(s.analysis.tracePoints.size() == 2);
  CHECK(s.analysis.tracePoints[0].end == End::B);
  CHECK(s.analysis.tracePoints[0].angle == Approx(k::pi / 2));
  CHECK(s.analysis.tracePoints[0].size == Approx(0.0015));
  CHECK(s.analysis.tracePoints[1].size == Approx(0.002));  // the default

  const Scenario again = scenarioFromJson(scenarioToJson(s));
  REQUIRE(again.analysis.tracePoints.size() == 2);
  CHECK(again.analysis.tracePoints[1].angle == Approx(-30 * k::degree));

  nlohmann::json bad = doc;
  bad["analysis"]["trace_points"][1]["angle_deg"] = 400.0;
  CHECK(refusal(bad) == "analysis.trace_points.1.angle_deg: value 400.0 is out of range; allowed -360 to 360 deg");
  bad = doc;
  bad["analysis"]["trace_points"][0].erase("end");
  CHECK(refusal(bad) == "analysis.trace_points.0.end: missing required field");
  bad = doc;
  bad["analysis"]["trace_points"][0]["colour"] = "#ffffff";
  CHECK(refusal(bad) == "analysis.trace_points.0.colour: unknown key");
  bad = doc;
  bad["analysis"]["window_s"] = 0.01;
  CHECK(refusal(bad) == "analysis.window_s: value 0.01 is out of range; allowed 0.05 to 60 s");
}

TEST_CASE("overrides (--set) reach analysis fields and trace point items", "[scenario]") {
  nlohmann::json doc = demoDocument();
  doc["analysis"]["trace_points"] = {{{"end", "A"}, {"angle_deg", 0.0}}};
  applyOverride(doc, "analysis.trace_points.0.angle_deg=45");
  applyOverride(doc, "analysis.eye_time_ms=80");
  const Scenario s = scenarioFromJson(doc);
  CHECK(s.analysis.tracePoints[0].angle == Approx(k::pi / 4));
  CHECK(s.analysis.eyeTime == Approx(0.08));
  CHECK_THROWS_WITH(applyOverride(doc, "analysis.trace_points.0.hue=1"), "analysis.trace_points.0.hue: unknown key");
  CHECK_THROWS_WITH(applyOverride(doc, "analysis.trace_points.3.angle_deg=1"),
                    "analysis.trace_points.3.angle_deg: no element 3 here");
}
