// The GUI's session: edits go through the field table's override path, an
// accepted motion edit restarts the run with the new value, refused edits
// change nothing, and the GUI's own stepping reproduces simulate().
#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "app/gui/model/session.hpp"
#include "core/io.hpp"
#include "support.hpp"

using namespace dm;
using namespace dm::gui;

namespace {


std::string tempPath(const std::string& name) {
  const auto dir = std::filesystem::temp_directory_path() / "dwellmark-test-gui-session";
  std::filesystem::create_directories(dir);
  return (dir / name).string();
}

std::string readTextFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

}  // namespace

TEST_CASE("a slider edit restarts the run with the new value", "[gui][session]") {
  Session session(test::demo());
  session.pause();
  for (int i = 0; i < 200; ++i) session.stepOnce();
  REQUIRE(session.live().steps == 200);
  const auto revision = session.motionRevision();

  // The slider and the typed entry both call setNumber with the file-unit value.
  const EditOutcome out = session.setNumber("body.length_mm", 70.0);
  REQUIRE(out.accepted);
  CHECK(out.restarted);
  CHECK(session.motionRevision() == revision + 1);
  CHECK(session.scenario().body.length == Approx(0.070).epsilon(1e-12));
  CHECK(session.live().params.body.length == Approx(0.070).epsilon(1e-12));
  CHECK(session.live().steps == 0);
  CHECK(session.live().now().t == 0.0);

  // The restarted run is the core's run of the edited scenario, step for step.
  for (int i = 0; i < 300; ++i) session.stepOnce();
  SimulateOptions options;
  options.duration = 300 * session.scenario().run.timeStep();
  const RunResult reference = simulate(session.scenario(), options);
  const auto& live = session.live().recent;
  REQUIRE(live.size() == 300);
  for (std::size_t i = 0; i < live.size(); ++i) {
    INFO("sample " << i);
    // Same code, same inputs: bit-for-bit equal.
    CHECK(live[i].t == reference.trajectory.samples[i].t);
    CHECK(live[i].position == reference.trajectory.samples[i].position);
    CHECK(live[i].orientation.coeffs() == reference.trajectory.samples[i].orientation.coeffs());
    CHECK(live[i].phase == reference.trajectory.samples[i].phase);
  }
}

TEST_CASE("a value outside the field table's range is refused with its range", "[gui][session]") {
  Session session(test::demo());
  session.pause();
  for (int i = 0; i < 50; ++i) session.stepOnce();
  const double before = session.scenario().launch.tilt;
  const EditOutcome out = session.setNumber("launch.tilt_deg", 95.0);
  CHECK_FALSE(out.accepted);
  CHECK_FALSE(out.restarted);
  CHECK_THAT(out.error, Catch::Contains("launch.tilt_deg") && Catch::Contains("allowed 0 to 90 deg"));
  CHECK(session.scenario().launch.tilt == before);
  CHECK(session.live().steps == 50);  // the run went on untouched
  // Cross-field rules come from the same validation.
  const EditOutcome kinetic = session.setNumber("surface.friction_kinetic", 0.9);
  CHECK_FALSE(kinetic.accepted);
  CHECK_THAT(kinetic.error, Catch::Contains("surface.friction_kinetic"));
  CHECK_FALSE(session.setNumber("no.such_field", 1).accepted);
}

TEST_CASE("view-only edits keep the run going", "[gui][session]") {
  Session session(test::demo());
  session.pause();
  for (int i = 0; i < 100; ++i) session.stepOnce();
  const auto look = session.lookRevision();
  const EditOutcome eye = session.setNumber("observer.eye_height_mm", 1200);
  REQUIRE(eye.accepted);
  CHECK_FALSE(eye.restarted);
  CHECK(session.scenario().observer.eyeHeight == Approx(1.2));
  CHECK(session.live().steps == 100);
  const EditOutcome colour = session.setMarkingText(0, "colour", "#ff0000");
  REQUIRE(colour.accepted);
  CHECK_FALSE(colour.restarted);
  CHECK(session.lookRevision() == look + 1);
  CHECK(session.setText("observer.view", "visitor").accepted);
  CHECK(session.scenario().observer.view == ViewKind::Visitor);
  CHECK_FALSE(session.setText("observer.view", "sideways").accepted);
}

TEST_CASE("shape and mass switches keep the other values", "[gui][session]") {
  Session session(test::demo());
  const double wall = session.scenario().body.wall;
  REQUIRE(session.setText("body.shape", "rod").accepted);
  CHECK(session.live().params.body.innerRadius == 0.0);
  REQUIRE(session.setText("body.shape", "tube").accepted);
  CHECK(session.scenario().body.wall == wall);
  REQUIRE(session.setNumber("body.mass_g", 5.0).accepted);
  CHECK(session.live().params.inertia.mass == Approx(0.005));
  REQUIRE(session.setNumber("body.mass_g", 0.0).accepted);
  CHECK(session.scenario().body.density == Approx(1180));
  CHECK(session.live().params.inertia.mass == Approx(1180 * materialVolume(cylinderOf(session.scenario().body))));
}

TEST_CASE("markings are added, edited and removed", "[gui][session]") {
  Session session(test::demo());
  const std::size_t n = session.scenario().paint.markings.size();
  REQUIRE(session.addMarking().accepted);
  REQUIRE(session.scenario().paint.markings.size() == n + 1);
  REQUIRE(session.setMarkingNumber(n, "width_mm", 2.5).accepted);
  CHECK(session.scenario().paint.markings[n].width == Approx(0.0025));
  CHECK_FALSE(session.setMarkingNumber(n, "width_mm", 0.0).accepted);  // below 0.05 mm
  REQUIRE(session.removeMarking(0).accepted);
  CHECK(session.scenario().paint.markings.size() == n);
  CHECK_FALSE(session.removeMarking(99).accepted);
}

TEST_CASE("the speed factor scales simulated time per wall second", "[gui][session]") {
  Session session(test::demo());
  session.setSpeed(0.5);
  const AdvanceReport r = session.advance(0.1, 10.0);
  // 0.1 s of wall time at half speed is 0.05 s simulated.
  const double h = session.scenario().run.timeStep();
  CHECK(r.steps == long(std::llround(0.05 / h)));
  CHECK_FALSE(r.behind);
  session.setSpeed(1000);
  CHECK(session.speed() == maxSpeed);
  session.setSpeed(0);
  CHECK(session.speed() == minSpeed);
  // A zero budget stops at the first clock check and drops the lag.
  session.setSpeed(1);
  const AdvanceReport lagging = session.advance(1.0, 0.0);
  CHECK(lagging.behind);
  CHECK(lagging.steps == 64);
  session.pause();
  CHECK(session.advance(1.0, 10.0).steps == 0);
}

TEST_CASE("the forecast is the core's run of the current scenario", "[gui][session]") {
  Session session(test::demo());
  REQUIRE(session.setNumber("run.duration_s", 2.0).accepted);
  session.waitForForecast();
  const Forecast* f = session.forecast();
  REQUIRE(f != nullptr);
  CHECK(f->motionRevision == session.motionRevision());
  CHECK_FALSE(f->truncated);
  const RunResult reference = simulate(session.scenario());
  CHECK(f->run.trajectory.samples.size() == reference.trajectory.samples.size());
  CHECK(f->run.summary.settleTime == reference.summary.settleTime);
  CHECK(f->run.summary.restTime == reference.summary.restTime);
}

TEST_CASE("files: save clears the unsaved mark, open refuses bad files untouched", "[gui][session]") {
  Session session(test::demo(), "demo.json");
  CHECK_FALSE(session.dirty());
  REQUIRE(session.setNumber("launch.revolution_rev_s", 9.5).accepted);
  CHECK(session.dirty());
  const std::string path = tempPath("saved.json");
  session.saveAs(path);
  CHECK_FALSE(session.dirty());
  CHECK(session.path() == path);
  CHECK(loadScenario(path).launch.revolution == Approx(9.5 * 2 * 3.14159265358979));

  const std::string bad = tempPath("bad.json");
  writeFileAtomic(bad, "{\"dwellmark_scenario\": 1, \"body\": {\"length_mm\": -3}}");
  CHECK_THROWS_AS(session.open(bad), ScenarioError);
  CHECK(session.path() == path);
  CHECK(session.scenario().launch.revolution == Approx(9.5 * 2 * 3.14159265358979));
}

TEST_CASE("the visitor flick draws reproducible launches within the spread", "[gui][session]") {
  Session a(test::demo()), b(test::demo());
  REQUIRE(a.flick().accepted);
  REQUIRE(b.flick().accepted);
  CHECK(a.scenario().launch.revolution == b.scenario().launch.revolution);
  CHECK(a.flickCount() == 1);
  REQUIRE(a.flick().accepted);
  CHECK(a.scenario().launch.revolution != b.scenario().launch.revolution);
  const Spread& spread = a.scenario().launchSpread.revolution;  // the scenario's own visitor spread
  CHECK(a.scenario().launch.revolution >= spread.min);
  CHECK(a.scenario().launch.revolution <= spread.max);
  CHECK(a.live().steps == 0);
}

TEST_CASE("the design review job writes the report and refuses a folder in use", "[gui][session][review]") {
  namespace fs = std::filesystem;
  Session session(test::demo());
  session.pause();
  const fs::path dir = fs::path(tempPath("review"));
  fs::remove_all(dir);
  // The job the GUI's review button starts, with options small enough for
  // a unit test (two launches, one second runs, tiny images); the report's
  // figures are tested with the review itself.
  app::ReviewOptions fast;
  fast.launches = 2;
  fast.duration = 1.0;
  fast.imageSize = 32;
  fast.viewerImageSize = 16;
  fast.threads = 1;
  session.requestReview(dir.string(), fast);
  CHECK(session.reviewBusy());
  session.waitForReview();
  CHECK_FALSE(session.reviewBusy());
  CHECK(session.reviewStage().empty());
  REQUIRE(session.reviewOutcome() != nullptr);
  const ReviewOutcome first = *session.reviewOutcome();
  INFO(first.message);
  REQUIRE(first.written);
  CHECK(first.folder == dir.string());
  CHECK(first.files.size() == 2);
  REQUIRE(fs::is_regular_file(dir / "review.html"));
  REQUIRE(fs::is_regular_file(dir / "review.json"));
  const nlohmann::json report = nlohmann::json::parse(readTextFile((dir / "review.json").string()));
  REQUIRE(report["variants"].size() == 1);
  CHECK(report["variants"][0]["name"] == session.scenario().name);  // the current scenario, as edited

  // The folder now holds the report: refused with the reason, the files untouched.
  const std::string html = readTextFile((dir / "review.html").string());
  session.requestReview(dir.string(), fast);
  session.waitForReview();
  REQUIRE(session.reviewsFinished() == 2);
  CHECK_FALSE(session.reviewOutcome()->written);
  CHECK_THAT(session.reviewOutcome()->message, Catch::Contains(dir.string()) && Catch::Contains("already holds files"));
  CHECK(readTextFile((dir / "review.html").string()) == html);

  // A refused option comes back the same way, naming the option and its range.
  fast.force = true;
  fast.launches = 0;
  session.requestReview(dir.string(), fast);
  session.waitForReview();
  CHECK_FALSE(session.reviewOutcome()->written);
  CHECK_THAT(session.reviewOutcome()->message, Catch::Contains("launches") && Catch::Contains("allowed 1 to 100000"));
  CHECK(readTextFile((dir / "review.html").string()) == html);
}

TEST_CASE("the live visitor's view finds its spots with expose's own chain", "[gui][session][observer]") {
  Session session(test::demo());
  session.pause();
  // 3 s in: the demo rolls on rim B with end A raised (settled near 0.5 s).
  const long steps = long(std::llround(3.0 / session.scenario().run.timeStep()));
  for (long i = 0; i < steps; ++i) session.stepOnce();
  constexpr int side = 96;  // px: small enough to be quick, large enough to resolve a spot
  REQUIRE(session.requestObserverShot(side));
  session.waitForObserver();
  const ObserverShot* shot = session.observerShot();
  REQUIRE(shot != nullptr);
  REQUIRE(shot->visibleEnd == End::A);
  CHECK(shot->spots.ring.radius > 0);
  CHECK(shot->end - shot->start == Approx(session.scenario().observer.exposure).epsilon(1e-9));

  // The same window of the core's own run through observeRun,
  // exposeObservation and findSpots, as `dwellmark expose` does it: the
  // live samples equal the run's bit for bit, so the picture and the spots
  // are the same numbers.
  Scenario s = session.scenario();
  s.observer.imageSize = side;
  s.observer.exposure = shot->end - shot->start;
  SimulateOptions options;
  options.duration = double(steps) * s.run.timeStep();
  const auto run = std::make_shared<const RunResult>(simulate(s, options));
  const Observation seen = observeRun(s, run, shot->start, shot->end);
  const ExposureResult expected = exposeObservation(s, seen, shot->start, 1);
  CHECK(seen.visibleEnd == shot->visibleEnd);
  CHECK(shot->spots.ring.radius == seen.ring.radius);
  REQUIRE_FALSE(expected.spots.spots.empty());  // something to compare
  REQUIRE(shot->spots.spots.size() == expected.spots.spots.size());
  for (std::size_t i = 0; i < expected.spots.spots.size(); ++i) {
    CHECK(shot->spots.spots[i].azimuth == expected.spots.spots[i].azimuth);
    CHECK(shot->spots.spots[i].contrast == expected.spots.spots[i].contrast);
  }
  CHECK(shot->image.rgb == expected.exposure.image.rgb);
}
