// The scenario file: one field table, validation with named fields, round trips.
#include <optional>

#include <catch2/catch.hpp>

#include "core/colour.hpp"
#include "core/constants.hpp"
#include "core/scenario.hpp"

using namespace dm;
using nlohmann::json;

namespace {

json demoDoc() { return readScenarioJson(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json"); }

// The error a broken document raises, if any.
std::optional<ScenarioError> refusalOf(const json& doc) {
  try {
    scenarioFromJson(doc);
  } catch (const ScenarioError& e) {
    return e;
  }
  return std::nullopt;
}

// The field named by the error a broken document raises ("" if none).
std::string refusedField(const json& doc) {
  const auto e = refusalOf(doc);
  return e ? e->field() : "";
}

// The whole message of the error a broken document raises ("" if none).
std::string refusal(const json& doc) {
  const auto e = refusalOf(doc);
  return e ? e->what() : "";
}

}  // namespace

TEST_CASE("the demo scenario is valid and round-trips through JSON", "[scenario]") {
  const Scenario s = scenarioFromJson(demoDoc());
  CHECK(s.body.shape == Shape::Tube);
  CHECK(s.body.length == Approx(0.131));
  CHECK(s.paint.markings.size() == 2);
  const Scenario again = scenarioFromJson(scenarioToJson(s));
  CHECK(scenarioToJson(again) == scenarioToJson(s));
}

TEST_CASE("the default scenario is valid", "[scenario]") { CHECK_NOTHROW(validate(defaultScenario())); }

TEST_CASE("broken scenarios are refused naming the field", "[scenario]") {
  json d = demoDoc();
  SECTION("missing field") {
    d["body"].erase("length_mm");
    CHECK(refusedField(d) == "body.length_mm");
  }
  SECTION("negative length") {
    d["body"]["length_mm"] = -5;
    CHECK(refusedField(d) == "body.length_mm");
  }
  SECTION("wall thicker than the radius") {
    d["body"]["wall_mm"] = 20;
    CHECK(refusedField(d) == "body.wall_mm");
  }
  SECTION("friction below zero") {
    d["surface"]["friction_kinetic"] = -0.1;
    CHECK(refusedField(d) == "surface.friction_kinetic");
  }
  SECTION("kinetic friction above static") {
    d["surface"]["friction_kinetic"] = 0.9;
    CHECK(refusedField(d) == "surface.friction_kinetic");
  }
  SECTION("unknown key, with its path") {
    d["surface"]["stickiness"] = 1;
    CHECK(refusedField(d) == "surface.stickiness");
    json e = demoDoc();
    e["markings"][1]["glow"] = true;
    CHECK(refusedField(e) == "markings.1.glow");
  }
  SECTION("wrong type") {
    d["launch"]["revolution_rev_s"] = "fast";
    CHECK(refusedField(d) == "launch.revolution_rev_s");
  }
  SECTION("choice outside its list") {
    d["launch"]["pressed_end"] = "C";
    CHECK(refusedField(d) == "launch.pressed_end");
  }
  SECTION("bad colour") {
    d["body"]["colour"] = "red";
    CHECK(refusedField(d) == "body.colour");
  }
  SECTION("a ring longer than wide") {
    d["body"]["shape"] = "ring";
    CHECK(refusedField(d) == "body.length_mm");
  }
  SECTION("no version, or a newer one") {
    d.erase("dwellmark_scenario");
    CHECK(refusedField(d) == "dwellmark_scenario");
    json e = demoDoc();
    e["dwellmark_scenario"] = scenarioFormatVersion + 1;
    CHECK(refusedField(e) == "dwellmark_scenario");
  }
  SECTION("neither density nor mass") {
    d["body"].erase("density_kg_m3");
    CHECK(refusedField(d) == "body.density_kg_m3");
  }
}

TEST_CASE("messages name the value and the allowed range", "[scenario]") {
  json d = demoDoc();
  d["launch"]["tilt_deg"] = 120;
  try {
    scenarioFromJson(d);
    FAIL("accepted a tilt of 120 deg");
  } catch (const ScenarioError& e) {
    const std::string m = e.what();
    CHECK(m.find("launch.tilt_deg") != std::string::npos);
    CHECK(m.find("120") != std::string::npos);
    CHECK(m.find("0 to 90 deg") != std::string::npos);
  }
}

TEST_CASE("set overrides apply by dotted path before validation", "[scenario]") {
  json d = demoDoc();
  applyOverride(d, "body.length_mm=140");
  applyOverride(d, "launch.pressed_end=B");
  applyOverride(d, "markings.0.colour=#102030");
  const Scenario s = scenarioFromJson(d);
  CHECK(s.body.length == Approx(0.140));
  CHECK(s.launch.pressedEnd == End::B);
  CHECK(hexFromRgb(s.paint.markings[0].colour) == "#102030");
  CHECK_THROWS_AS(applyOverride(d, "body.lenght_mm=3"), ScenarioError);
  CHECK_THROWS_AS(applyOverride(d, "body.length_mm=long"), ScenarioError);
  CHECK_THROWS_AS(applyOverride(d, "markings.7.colour=#000000"), ScenarioError);
}

TEST_CASE("every field of the table states a unit, a range and a meaning", "[scenario]") {
  for (const auto& f : scenarioFields()) {
    INFO(f.path);
    CHECK(!f.unit.empty());
    CHECK(!f.help.empty());
    if (f.type == FieldType::Number || f.type == FieldType::Integer) CHECK(f.min <= f.max);
    if (f.type == FieldType::Choice) CHECK(!f.choices.empty());
  }
}

TEST_CASE("sRGB transfer matches IEC 61966-2-1", "[scenario][colour]") {
  // IEC 61966-2-1:1999: linear 0.0031308 <-> encoded 0.04045 at the knee;
  // encoded 0.5 is linear 0.214041 (from the piecewise formula).
  CHECK(srgbToLinear(0.04045) == Approx(0.0031308).epsilon(1e-4));
  CHECK(linearToSrgb(0.0031308) == Approx(0.04045).epsilon(1e-4));
  CHECK(srgbToLinear(0.5) == Approx(0.214041).epsilon(1e-5));
  CHECK(srgbToLinear(1.0) == Approx(1.0));
  for (double v : {0.0, 0.01, 0.2, 0.7, 1.0}) CHECK(linearToSrgb(srgbToLinear(v)) == Approx(v).margin(1e-12));
}

TEST_CASE("analysis fields default to a 1 s window every 0.5 s and read in file units", "[scenario]") {
  json doc = demoDoc();
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
  json doc = demoDoc();
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

  json bad = doc;
  bad["analysis"]["trace_points"][1]["angle_deg"] = 400.0;
  CHECK(refusal(bad) == "analysis.trace_points.1.angle_deg: value 400 is out of range; allowed -360 to 360 deg");
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
  json doc = demoDoc();
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

// The launch spread of the ensembles: per parameter a kind, bounds, mean and
// sd in file units, checked by name like every other field.
TEST_CASE("launch spread fields read in file units and check their bounds", "[scenario]") {
  json d = demoDoc();
  d["launch_spread"] = {{"revolution", {{"kind", "uniform"}, {"min_rev_s", 5.0}, {"max_rev_s", 11.0}}},
                        {"tilt", {{"kind", "normal"}, {"min_deg", 0.0}, {"max_deg", 10.0}, {"mean_deg", 4.0}, {"sd_deg", 2.0}}},
                        {"pressed_end_a_share", 0.8}};
  const Scenario s = scenarioFromJson(d);
  CHECK(s.launchSpread.revolution.kind == SpreadKind::Uniform);
  CHECK(s.launchSpread.revolution.min == Approx(5 * k::twoPi));
  CHECK(s.launchSpread.tilt.kind == SpreadKind::Normal);
  CHECK(s.launchSpread.tilt.mean == Approx(4 * k::degree));
  CHECK(s.launchSpread.pressedEndAShare == 0.8);
  CHECK(scenarioToJson(scenarioFromJson(scenarioToJson(s))) == scenarioToJson(s));

  json bad = d;
  bad["launch_spread"]["revolution"]["max_rev_s"] = 4.0;
  CHECK(refusal(bad) == "launch_spread.revolution.max_rev_s: value 4 is below launch_spread.revolution.min_rev_s (5); "
                        "allowed 5 to 50 rev/s");
  bad = d;
  bad["launch_spread"]["tilt"]["mean_deg"] = 12.0;
  CHECK(refusedField(bad) == "launch_spread.tilt.mean_deg");
  bad = d;
  bad["launch_spread"]["tilt"]["kind"] = "lognormal";
  CHECK(refusedField(bad) == "launch_spread.tilt.kind");
  bad = d;
  bad["launch_spread"]["pressed_end_a_share"] = 1.5;
  CHECK(refusedField(bad) == "launch_spread.pressed_end_a_share");
}
