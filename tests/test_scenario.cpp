// The scenario file: one field table, validation with named fields, round trips.
#include <algorithm>
#include <filesystem>
#include <fstream>
#include <optional>
#include <sstream>

#include <catch2/catch.hpp>

#include "core/colour.hpp"
#include "core/constants.hpp"
#include "core/dynamics.hpp"
#include "core/scenario.hpp"
#include "tests/fuzz/scenario_input.hpp"
#include "support.hpp"

using namespace dm;
using nlohmann::json;

namespace {


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
  const Scenario s = scenarioFromJson(test::demoDoc());
  CHECK(s.body.shape == Shape::Tube);
  CHECK(s.body.length == Approx(0.131));
  CHECK(s.paint.markings.size() == 2);
  const Scenario again = scenarioFromJson(scenarioToJson(s));
  CHECK(scenarioToJson(again) == scenarioToJson(s));
}

TEST_CASE("the default scenario is valid", "[scenario]") { CHECK_NOTHROW(validate(defaultScenario())); }

TEST_CASE("broken scenarios are refused naming the field", "[scenario]") {
  json d = test::demoDoc();
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
    json e = test::demoDoc();
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
    json e = test::demoDoc();
    e["dwellmark_scenario"] = scenarioFormatVersion + 1;
    CHECK(refusedField(e) == "dwellmark_scenario");
  }
  SECTION("neither density nor mass") {
    d["body"].erase("density_kg_m3");
    CHECK(refusedField(d) == "body.density_kg_m3");
  }
}

TEST_CASE("messages name the value and the allowed range", "[scenario]") {
  json d = test::demoDoc();
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

TEST_CASE("a missing field is refused with what it allows, an unknown key with the keys allowed there", "[scenario]") {
  // The issue: validation names the field, the value and the allowed range.
  // A missing field has no value: the message gives the range; an unknown
  // key's "range" is the set of keys its group holds.
  json d = test::demoDoc();
  d["body"].erase("length_mm");
  CHECK(refusal(d) == "body.length_mm: missing required field; allowed 0.2 to 1000 mm");
  d = test::demoDoc();
  d["body"].erase("shape");
  CHECK(refusal(d) == "body.shape: missing required field; allowed one of: tube, rod, ring, disk");
  d = test::demoDoc();
  d["launch"]["speedy"] = 1;
  CHECK(refusal(d) == "launch.speedy: unknown key; allowed in launch: pressed_end, revolution_rev_s, backspin, "
                      "tilt_deg, drift_mm_s, seed");
  d = test::demoDoc();
  d["bdy"] = json::object({{"length_mm", 3}});
  const std::string top = refusal(d);
  CHECK(top.rfind("bdy: unknown key; allowed at the top level: dwellmark_scenario, name, description, body, ", 0) == 0);
  CHECK(top.find("markings") != std::string::npos);
  d = test::demoDoc();
  d["markings"][1]["glow"] = true;
  CHECK(refusal(d).rfind("markings.1.glow: unknown key; allowed here: kind, colour, end, ", 0) == 0);
  json o = test::demoDoc();
  CHECK_THROWS_WITH(applyOverride(o, "launch_spread.tilt.kindd=fixed"),
                    Catch::StartsWith("launch_spread.tilt.kindd: unknown key; allowed in launch_spread.tilt: kind, min_deg, "));
}

TEST_CASE("set overrides apply by dotted path before validation", "[scenario]") {
  json d = test::demoDoc();
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
  json doc = test::demoDoc();
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
  json doc = test::demoDoc();
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
  CHECK(refusal(bad) == "analysis.trace_points.0.end: missing required field; allowed one of: A, B");
  bad = doc;
  bad["analysis"]["trace_points"][0]["colour"] = "#ffffff";
  CHECK(refusal(bad) == "analysis.trace_points.0.colour: unknown key; allowed here: end, angle_deg, size_mm");
  bad = doc;
  bad["analysis"]["window_s"] = 0.01;
  CHECK(refusal(bad) == "analysis.window_s: value 0.01 is out of range; allowed 0.05 to 60 s");
}

TEST_CASE("overrides (--set) reach analysis fields and trace point items", "[scenario]") {
  json doc = test::demoDoc();
  doc["analysis"]["trace_points"] = {{{"end", "A"}, {"angle_deg", 0.0}}};
  applyOverride(doc, "analysis.trace_points.0.angle_deg=45");
  applyOverride(doc, "analysis.eye_time_ms=80");
  const Scenario s = scenarioFromJson(doc);
  CHECK(s.analysis.tracePoints[0].angle == Approx(k::pi / 4));
  CHECK(s.analysis.eyeTime == Approx(0.08));
  CHECK_THROWS_WITH(applyOverride(doc, "analysis.trace_points.0.hue=1"),
                    "analysis.trace_points.0.hue: unknown key; allowed here: end, angle_deg, size_mm");
  CHECK_THROWS_WITH(applyOverride(doc, "analysis.trace_points.3.angle_deg=1"),
                    "analysis.trace_points.3.angle_deg: no element 3 here");
}

TEST_CASE("hand edits: a repeated key, deep nesting and a group given as a value are refused with their path",
          "[scenario][parse]") {
  auto refusedText = [](const std::string& text) {
    try {
      scenarioFromJson(parseScenarioText(text, "edited.json"));
    } catch (const ScenarioError& e) {
      return e.field();
    }
    return std::string();
  };
  CHECK(refusedText(R"({"dwellmark_scenario": 1, "body": {"length_mm": 60, "length_mm": 61}})") == "body.length_mm");
  CHECK(refusedText(R"({"dwellmark_scenario": 1, "markings": [{"kind": "dot"}, {"end": "A", "end": "B"}]})") ==
        "markings.1.end");
  // The same key in two different objects is no repetition.
  const std::string fine = test::demoDoc().dump();
  CHECK_NOTHROW(scenarioFromJson(parseScenarioText(fine, "demo")));
  // Ten thousand nested arrays: refused at the nesting limit, not walked.
  const std::string deep =
      R"({"dwellmark_scenario": 1, "body": )" + std::string(10000, '[') + std::string(10000, ']') + "}";
  CHECK(refusedText(deep).rfind("body.0.0.0", 0) == 0);
  // Unknown groups are refused before being entered; known groups must be objects.
  json d = test::demoDoc();
  d["lamp"] = {{"colour", {{"hue", 1}}}};
  CHECK(refusedField(d) == "lamp");
  json e = test::demoDoc();
  e["surface"] = 0.4;
  CHECK(refusedField(e) == "surface");
}

TEST_CASE("the format version is read exactly, whatever JSON number type holds it", "[scenario][parse]") {
  // 4294967297 is 2^32 + 1: read as a 32-bit int it used to pass as version 1.
  for (const json& v : {json(4294967297ULL), json(0), json(-1), json(1.0), json("1"), json(nullptr)}) {
    json d = test::demoDoc();
    d["dwellmark_scenario"] = v;
    INFO(v.dump());
    CHECK(refusedField(d) == "dwellmark_scenario");
  }
}

TEST_CASE("override values that used to crash or mislead are refused with the field", "[scenario][parse]") {
  json d = test::demoDoc();
  auto refusedOverride = [&](const std::string& assignment) {
    json doc = d;
    try {
      applyOverride(doc, assignment);
      scenarioFromJson(doc);
    } catch (const ScenarioError& e) {
      return e.field();
    }
    return std::string();
  };
  // A float-to-integer conversion out of range (undefined behaviour before).
  CHECK(refusedOverride("run.substeps=1e300") == "run.substeps");
  CHECK(refusedOverride("run.substeps=2.5") == "run.substeps");
  // An index beyond any integer (std::out_of_range escaped before).
  CHECK(refusedOverride("markings.99999999999999999999999.colour=#000000") ==
        "markings.99999999999999999999999.colour");
  // Text that is not UTF-8 was accepted and then made writing summary.json fail.
  CHECK(refusedOverride("name=\xff\xfe") == "name");
  CHECK(refusedOverride("name=caf\xc3\xa9") == "");
}

namespace {

// Every file in a folder of the source tree, in name order.
std::vector<std::filesystem::path> filesIn(const std::string& folder) {
  std::vector<std::filesystem::path> files;
  const std::filesystem::path dir = std::filesystem::path(DWELLMARK_SOURCE_DIR) / folder;
  if (std::filesystem::is_directory(dir))
    for (const auto& e : std::filesystem::directory_iterator(dir))
      if (e.is_regular_file()) files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

std::string bytesOf(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

}  // namespace

TEST_CASE("the fuzz seeds: broken inputs are refused, good ones accepted, and every property holds",
          "[scenario][fuzz]") {
  // The same check the fuzzer applies (tests/fuzz/scenario_input.hpp) on
  // the hand-made seeds: bad-* must be refused, ok-* and the demo accepted.
  const auto seeds = filesIn("tests/fuzz/seeds");
  REQUIRE(seeds.size() >= 20);
  for (const auto& f : seeds) {
    INFO(f.filename().string());
    const bool bad = f.filename().string().rfind("bad-", 0) == 0;
    CHECK(fuzz::checkScenarioInput(bytesOf(f)) == (bad ? fuzz::Outcome::Refused : fuzz::Outcome::Accepted));
  }
  for (const auto& f : filesIn("assets/scenarios")) {
    INFO(f.filename().string());
    CHECK(fuzz::checkScenarioInput(bytesOf(f)) == fuzz::Outcome::Accepted);
  }
}

TEST_CASE("every input the fuzzer found a fault with is now refused or accepted cleanly", "[scenario][fuzz]") {
  // Regression inputs: tests/fuzz/regressions/, one file per finding,
  // named after what it broke. Each must pass the fuzzer's own check.
  for (const auto& f : filesIn("tests/fuzz/regressions")) {
    INFO(f.filename().string());
    CHECK_NOTHROW(fuzz::checkScenarioInput(bytesOf(f)));
  }
}

TEST_CASE("numerics refusals name the setting and a value that is then accepted", "[scenario][numerics]") {
  json coin = test::demoDoc();
  applyOverride(coin, "body.shape=disk");
  applyOverride(coin, "body.length_mm=0.4");
  applyOverride(coin, "body.outer_diameter_mm=2");
  // A 2 mm coin on the default 100 Hz contact sinks 25 um, 2.5 % of its radius.
  CHECK(refusedField(coin) == "contact.frequency_hz");
  // sqrt(g / (0.01 R)) / 2 pi with R = 1 mm: 157.6 Hz, so 158 Hz; its
  // contact period then needs 4 steps per 1 ms row (a twentieth each).
  CHECK(refusal(coin).find("allowed at least 158 Hz") != std::string::npos);
  CHECK(refusal(coin).find("run.substeps at least 4") != std::string::npos);
  applyOverride(coin, "contact.frequency_hz=158");
  CHECK(refusedField(coin) == "run.substeps");
  applyOverride(coin, "run.substeps=4");
  CHECK(refusedField(coin) == "");

  json rod = test::demoDoc();
  applyOverride(rod, "body.shape=rod");
  applyOverride(rod, "body.length_mm=400");
  applyOverride(rod, "body.outer_diameter_mm=10");
  applyOverride(rod, "launch.revolution_rev_s=50");
  applyOverride(rod, "launch.backspin=2");
  // Axial spin 2 x 314 rad/s x (L / D) = 25 000 rad/s: over half the runaway limit.
  CHECK(refusedField(rod) == "launch.backspin");
  const std::string said = refusal(rod);
  const auto at = said.find("allowed at most ");
  REQUIRE(at != std::string::npos);
  const double largest = std::stod(said.substr(at + 16));
  applyOverride(rod, "launch.backspin=" + std::to_string(largest));
  applyOverride(rod, "run.substeps=1000");
  CHECK(refusedField(rod) == "");
  // Then the step must resolve that spin: the default 3 substeps do not.
  applyOverride(rod, "run.substeps=3");
  CHECK(refusedField(rod) == "run.substeps");
  const Scenario fine = scenarioFromJson(test::demoDoc());
  CHECK(numericsNeeds(fine).minSubsteps <= fine.run.substeps);

  // Rows too far apart for the 1000 substeps allowed: the cure is shorter rows.
  json sparse = test::demoDoc();
  applyOverride(sparse, "run.sample_ms=100");
  applyOverride(sparse, "contact.frequency_hz=2000");
  CHECK(refusedField(sparse) == "run.substeps");
  // A twentieth of 0.5 ms is 25 us; 1000 of them make 25 ms.
  CHECK(refusal(sparse).find("lower run.sample_ms to at most 25") != std::string::npos);
  applyOverride(sparse, "run.sample_ms=25");
  applyOverride(sparse, "run.substeps=1000");
  CHECK(refusedField(sparse) == "");
}

TEST_CASE("at the largest turn per step the integrator's rotation errs less than plain RK4", "[scenario][numerics]") {
  // Our derivation (core/constants.hpp, maxTurnPerStep): plain RK4 on a
  // uniform rotation of h w = 0.5 rad per step falls 3.18e-5 of the angle
  // short (phase of 1 + z + z^2/2 + z^3/6 + z^4/24, z = i h w / 2). Our step
  // renormalises the quaternion at each stage; on a free rod spinning about
  // its own axis it must do no worse than plain RK4 (measured: 1.2e-5), so
  // the limit keeps the error it was chosen for.
  Scenario sc = defaultScenario();
  Params p = makeParams(sc);
  p.gravity = 0;
  p.dragLinear = p.dragTransverse = 0;
  const double spin = 1000;
  p.timeStep = k::maxTurnPerStep / spin;
  State s;
  s.position = Vec3(0, 0, 1.0);  // far above the table: no contact
  s.spinBody = Vec3(0, 0, spin);
  const int steps = 6;  // 3 rad in all: below pi, so the angle reads back unambiguously
  for (int i = 0; i < steps; ++i) step(p, s);
  const double turned = 2 * std::atan2(s.orientation.z(), s.orientation.w());
  const double exact = spin * p.timeStep * steps;
  CHECK((exact - turned) / exact > 0);
  CHECK((exact - turned) / exact < 3.18e-5);
}

// The launch spread of the ensembles: per parameter a kind, bounds, mean and
// sd in file units, checked by name like every other field.
TEST_CASE("launch spread fields read in file units and check their bounds", "[scenario]") {
  json d = test::demoDoc();
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
