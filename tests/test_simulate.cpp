// Whole runs at the edges: numerical faults stop cleanly and say when, in
// which phase and from what state; a sweep of extreme designs ends every run
// with a result or a named refusal, finite outputs, and a bounded cost.
#include <algorithm>
#include <filesystem>
#include <optional>
#include <limits>
#include <sstream>

#include <unistd.h>

#include <catch2/catch.hpp>

#include "app/cli.hpp"
#include "core/constants.hpp"
#include "core/export.hpp"
#include "core/simulate.hpp"
#include "core/kinematics.hpp"
#include "support.hpp"

using namespace dm;
using nlohmann::json;
namespace fs = std::filesystem;

namespace {


// A fresh, not yet existing folder under the system's temporary folder.
fs::path freshFolder(const std::string& name) {
  const fs::path p = fs::temp_directory_path() / ("dwellmark-test-" + name + "-" + std::to_string(::getpid()));
  fs::remove_all(p);
  return p;
}

// A rod lying on its side whose "rolling resistance" is -10: a couple that
// drives the roll instead of resisting it, outside the range validation
// allows, so the spin grows until it is runaway.
struct DrivenRoll {
  Params params;
  State start;
};

DrivenRoll drivenRoll() {
  const Scenario sc = test::bodyScenario(Shape::Rod, 0.05, 0.01, 0);
  DrivenRoll d;
  d.params = makeParams(sc);
  d.params.rollingResistance = -10;
  d.start.orientation = test::frameAlong(Vec3(0, 1, 0));
  d.start.position =
      Vec3(0, 0, d.params.body.outerRadius - 0.5 * d.params.inertia.mass * d.params.gravity / d.params.normalStiffness);
  d.start.spinBody = Vec3(0, 0, 1.0);
  return d;
}

}  // namespace

TEST_CASE("settle time is the start of the first rim rolling that lasts 0.5 s", "[simulate][events]") {
  // The definition: settle time = the first moment of sustained
  // rolling on one rim, sustained = at least 0.5 s; the raised end is the one
  // raised then. A 4:1 tube started in its steady spin (physics.md section 3)
  // rolls on end B's rim from the first instant, end A raised.
  const Scenario sc = test::bodyScenario(Shape::Tube, 0.064, 0.016, 0.001, 2700);
  const Params p = makeParams(sc);
  const State start = test::steadyStart(p, 12 * k::degree).state;
  const RunResult held = simulateFrom(p, start, 0.6, 1e-3, End::A);
  REQUIRE(held.summary.phases.size() == 1);
  CHECK(held.summary.phases[0].phase == Phase::RollingB);
  REQUIRE(held.summary.settleTime);
  CHECK(*held.summary.settleTime == 0);
  REQUIRE(held.summary.raisedEnd);
  CHECK(*held.summary.raisedEnd == End::A);
  // The same rolling cut short of 0.5 s is not sustained: no settle time, no raised end.
  const RunResult brief = simulateFrom(p, start, 0.45, 1e-3, End::A);
  CHECK(brief.summary.phases.size() == 1);
  CHECK_FALSE(brief.summary.settleTime);
  CHECK_FALSE(brief.summary.raisedEnd);
}

TEST_CASE("rest time is when the body stops, or lies flat without spin", "[simulate][events]") {
  // A solid cylinder rolling on its side at v0 is slowed by the rolling
  // resistance couple c N R at c g / (1 + k), k = 1/2 (our derivation from
  // m a = F, I a / R = -F R - c m g R). It counts as at rest once it lies
  // flat turning slower than 0.1 rad/s (the definition in simulate.cpp), at
  // speed 0.1 R: t = (v0 - 0.1 R)(1 + k) / (c g). Tolerance 2 %: the couple
  // fades below 0.05 rad/s (k::torqueSmoothing) and the contact settles in
  // the first milliseconds.
  Scenario sc = test::bodyScenario(Shape::Rod, 0.08, 0.03, 0);
  sc.surface.rollingResistance = 0.05;
  const Params p = makeParams(sc);
  const double R = p.body.outerRadius, v0 = 0.05;
  State s;
  s.orientation = test::frameAlong(Vec3::UnitY());
  s.position = Vec3(0, 0, R - p.inertia.mass * p.gravity / (2 * p.normalStiffness));
  s.velocity = Vec3(v0, 0, 0);
  s.spinBody = Vec3(0, 0, v0 / R);  // rolling: the frame's z is lab +y
  const RunResult r = simulateFrom(p, s, 0.5, 1e-3, End::A);
  REQUIRE(r.summary.restTime);
  CHECK(*r.summary.restTime == Approx((v0 - 0.1 * R) * 1.5 / (0.05 * k::gravity)).epsilon(0.02));
  CHECK(r.summary.phases.back().phase != Phase::Sliding);
  // Still rolling at the end of a shorter run: no rest time.
  const RunResult early = simulateFrom(p, s, 0.1, 1e-3, End::A);
  CHECK_FALSE(early.summary.restTime);
}

TEST_CASE("a non-finite state stops the run at once with the time, phase and last good state", "[simulate][fault]") {
  const Scenario sc = test::bodyScenario(Shape::Rod, 0.05, 0.01, 0);
  const Params p = makeParams(sc);
  State s;
  s.orientation = test::frameAlong(Vec3(1, 0, 0));
  s.position = Vec3(0, 0, 0.1);
  s.spinBody = Vec3(0, 0, std::numeric_limits<double>::quiet_NaN());
  const RunResult r = simulateFrom(p, s, 1.0, 1e-3, End::A);
  REQUIRE(r.fault);
  // The first step already produces NaN: the run stops there, after one step.
  CHECK(r.fault->time == Approx(p.timeStep));
  CHECK(r.fault->reason.find("non-finite") != std::string::npos);
  CHECK(r.trajectory.samples.size() == 1);
  CHECK(r.fault->phase == Phase::Airborne);
}

TEST_CASE("a runaway state mid-run is caught at the first bad step", "[simulate][fault]") {
  const DrivenRoll d = drivenRoll();
  const RunResult r = simulateFrom(d.params, d.start, 5.0, 1e-3, End::A);
  REQUIRE(r.fault);
  // It spins up for about a quarter of a second, sliding on the table.
  CHECK(r.fault->time > 0.1);
  CHECK(r.fault->time < 1.0);
  CHECK(r.fault->phase == Phase::Sliding);
  CHECK(r.fault->reason.find("runaway") != std::string::npos);
  // The last good state is the one just before, finite and within the limits.
  CHECK(r.fault->lastGood.t == Approx(r.fault->time - d.params.timeStep));
  CHECK(healthy(r.fault->lastGood));
  CHECK(r.trajectory.samples.back().t == r.fault->lastGood.t);
  const std::string report = faultReport(*r.fault);
  CHECK(report.find("t = ") != std::string::npos);
  CHECK(report.find(std::string(phaseName(r.fault->phase))) != std::string::npos);
  CHECK(report.find("last good state") != std::string::npos);
}

TEST_CASE("simulate reports a fault with exit code 3 and writes nothing", "[simulate][fault][cli]") {
  const DrivenRoll d = drivenRoll();
  const RunResult r = simulateFrom(d.params, d.start, 5.0, 1e-3, End::A);
  REQUIRE(r.fault);
  const fs::path out = freshFolder("fault");
  std::ostringstream said, complaint;
  CHECK(app::finishSimulation(test::bodyScenario(Shape::Rod, 0.05, 0.01, 0), r, out.string(), said, complaint) ==
        app::exitFault);
  CHECK(complaint.str().find("numerical fault at t = ") != std::string::npos);
  CHECK(complaint.str().find("in phase ") != std::string::npos);
  CHECK(complaint.str().find("last good state: t = ") != std::string::npos);
  CHECK(complaint.str().find("nothing was written") != std::string::npos);
  CHECK(said.str().empty());
  CHECK_FALSE(fs::exists(out));
}

TEST_CASE("the fastest surface speed is the largest over every output sample", "[simulate][events]") {
  // The demo's first 2 s: release, the sliding transient and rolling.
  const Scenario s = test::demo();
  SimulateOptions o;
  o.duration = 2.0;
  const RunResult r = simulate(s, o);
  REQUIRE(r.trajectory.samples.size() > 1000);
  double fastest = 0;
  for (const Sample& x : r.trajectory.samples)
    fastest = std::max(fastest, fastestSurfaceSpeed(r.params.body, x.orientation, x.velocity, x.spin));
  CHECK(r.summary.maxSurfaceSpeed == fastest);
  const Sample& first = r.trajectory.samples.front();
  CHECK(fastest >= fastestSurfaceSpeed(r.params.body, first.orientation, first.velocity, first.spin));
}

TEST_CASE("a finished run writes its four files, and the folder is then refused without force", "[simulate][cli]") {
  Scenario s = scenarioFromJson(test::demoDoc());
  SimulateOptions o;
  o.duration = 0.05;
  const RunResult r = simulate(s, o);
  const fs::path out = freshFolder("finish");
  std::ostringstream said, complaint;
  REQUIRE(app::finishSimulation(s, r, out.string(), said, complaint) == app::exitOk);
  CHECK(fs::file_size(out / "trajectory.csv") > 0);
  CHECK(fs::file_size(out / "summary.json") > 0);
  CHECK(fs::file_size(out / "traces.csv") > 0);
  CHECK(fs::exists(out / "stops.csv"));
  // Nothing else, in particular no temporary file.
  CHECK(std::distance(fs::directory_iterator(out), fs::directory_iterator()) == 4);
  CHECK_THROWS_AS(checkOutputDir(out.string(), false), OutputError);
  fs::remove_all(out);
}

namespace {

// One design of the sweep: body, surface and launch as file values.
struct Design {
  std::string shape;
  double lengthMm, diameterMm, wallMm;
  double friction, revolutionRevS, tiltDeg, backspin;
  std::string label() const {
    std::ostringstream o;
    o << shape << " " << lengthMm << " x " << diameterMm << " mm, mu " << friction << ", " << revolutionRevS
      << " rev/s, tilt " << tiltDeg << " deg, backspin " << backspin;
    return o.str();
  }
};

// The demo document changed to a design through the --set path (so the
// sweep goes through the command line's parsing and validation).
json designDoc(const Design& d) {
  json doc = test::demoDoc();
  auto set = [&](const std::string& key, double v) {
    std::ostringstream o;
    o.precision(17);
    o << key << "=" << v;
    applyOverride(doc, o.str());
  };
  applyOverride(doc, "body.shape=" + d.shape);
  set("body.length_mm", d.lengthMm);
  set("body.outer_diameter_mm", d.diameterMm);
  if (d.wallMm > 0) set("body.wall_mm", d.wallMm);  // solid shapes keep the demo's, which they ignore
  set("surface.friction_static", d.friction);
  set("surface.friction_kinetic", 0.8 * d.friction);
  set("launch.revolution_rev_s", d.revolutionRevS);
  set("launch.tilt_deg", d.tiltDeg);
  set("launch.backspin", d.backspin);
  return doc;
}

// The bodies: a 2 mm coin to a 1 m rod, both ends of every size range.
struct Body {
  std::string shape;
  double lengthMm, diameterMm, wallMm;
};
const std::vector<Body> sweepBodies = {
    {"disk", 0.4, 2, 0},  {"disk", 0.2, 1, 0},    {"disk", 2, 25, 0},  {"disk", 0.2, 500, 0}, {"ring", 5, 30, 1},
    {"tube", 64, 8, 0.5}, {"tube", 131, 32, 1.6}, {"rod", 400, 10, 0}, {"rod", 400, 4, 0},    {"rod", 1000, 1, 0}};

// Under AddressSanitizer a run costs about twenty times more: the sanitizer
// stage of tests/run-all.sh takes every ninth design (each body still nine
// times), the plain build all of them.
#if defined(__SANITIZE_ADDRESS__)
constexpr std::size_t sweepStride = 9;
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
constexpr std::size_t sweepStride = 9;
#else
constexpr std::size_t sweepStride = 1;
#endif
#else
constexpr std::size_t sweepStride = 1;
#endif

std::vector<Design> sweepDesigns() {
  std::vector<Design> all;
  for (const Body& b : sweepBodies)
    for (double mu : {0.0, 0.4, 2.0})
      for (double rev : {0.0, 20.0, 50.0})
        for (double tilt : {0.0, 45.0, 90.0})
          for (double back : {0.0, 0.7, 2.0})
            all.push_back({b.shape, b.lengthMm, b.diameterMm, b.wallMm, mu, rev, tilt, back});
  std::vector<Design> taken;
  for (std::size_t i = 0; i < all.size(); i += sweepStride) taken.push_back(all[i]);
  return taken;
}

// Fields whose refusal names a numerical setting the designer can raise.
bool numericsField(const std::string& field) { return field == "contact.frequency_hz" || field == "run.substeps"; }

// The outcome of parsing a design: the scenario to run, or the refusal.
struct Parsed {
  std::optional<Scenario> scenario;
  bool cured = false;  ///< refused for its numerics, runs with the settings numericsNeeds gives
  std::string refusalField, refusal;
};

// Parses a design; a design refused only for its numerics is parsed again
// with the stiffest contact and finest step, then given exactly the
// contact and step numericsNeeds asks for (as a designer following the
// message would).
Parsed parseDesign(const Design& d, const Scenario& demo) {
  Parsed p;
  try {
    p.scenario = scenarioFromJson(designDoc(d));
    return p;
  } catch (const ScenarioError& e) {
    p.refusalField = e.field();
    p.refusal = e.what();
  }
  if (!numericsField(p.refusalField)) return p;
  json generous = designDoc(d);
  applyOverride(generous, "contact.frequency_hz=2000");
  applyOverride(generous, "run.substeps=1000");
  try {
    Scenario s = scenarioFromJson(generous);
    s.contact = demo.contact;
    s.run.substeps = demo.run.substeps;
    s.contact.frequency =
        std::max(s.contact.frequency, std::ceil(numericsNeeds(s).minContactFrequency / k::twoPi) * k::twoPi);
    s.run.substeps = std::max(s.run.substeps, numericsNeeds(s).minSubsteps);
    validate(s);
    p.scenario = s;
    p.cured = true;
  } catch (const ScenarioError& e) {
    // Refused for something else too: that refusal is the one that counts.
    p.refusalField = e.field();
    p.refusal = e.what();
  }
  return p;
}

}  // namespace

TEST_CASE("extreme designs end with a result or a named refusal, finite outputs and bounded cost",
          "[simulate][extremes]") {
  // The sweep: coin to long rod, friction 0 to 2, spins 0 to 50
  // rev/s, tilts 0 to 90 deg, back-spin 0 to 2, 0.5 s each. A refusal must
  // name a field of the table; one that names a numerical setting must be
  // cured by the setting numericsNeeds gives. Cost: at most 10 times the
  // demo's per simulated second (the bound), counted in integrator
  // steps, which every design pays alike (one model evaluation per RK4
  // stage); wall time belongs to the benchmarks, not to a test.
  const double duration = 0.5;
  const Scenario demo = scenarioFromJson(test::demoDoc());
  const double demoStepsPerSecond = 1 / demo.run.timeStep();
  int results = 0, refusals = 0, cured = 0;
  double worstStepRatio = 0;
  for (const Design& d : sweepDesigns()) {
    INFO(d.label());
    const Parsed parsed = parseDesign(d, demo);
    INFO(parsed.refusal);
    if (!parsed.scenario) {
      ++refusals;
      CHECK((findField(parsed.refusalField) != nullptr || parsed.refusalField.rfind("markings.", 0) == 0));
      CHECK(parsed.refusal.find("allowed") != std::string::npos);
      continue;
    }
    const Scenario& s = *parsed.scenario;
    if (parsed.cured) ++cured;
    SimulateOptions o;
    o.duration = duration;
    const RunResult r = simulate(s, o);
    REQUIRE_FALSE(r.fault);
    CHECK(r.summary.endTime == Approx(duration));
    // Every number that reaches a file is finite (fmt and jsonFileText throw otherwise).
    CHECK_NOTHROW(simulationFiles(s, r, analysePattern(s, r)));
    const double stepRatio = (1 / s.run.timeStep()) / demoStepsPerSecond;
    CHECK(stepRatio <= 10);
    worstStepRatio = std::max(worstStepRatio, stepRatio);

    ++results;
  }
  WARN("measured, extreme sweep: " << sweepDesigns().size() << " designs, " << results << " results (" << cured
                                   << " after raising the named numerical setting), " << refusals
                                   << " refusals; worst cost per simulated second vs the demo: " << worstStepRatio
                                   << " x in steps");
  CHECK(results + refusals == int(sweepDesigns().size()));
}
