// The viewing check: three viewing positions from the scenario, eyes below
// the table top see nothing, and visitors above it see the demo's spots in
// its exact steady spin.
#include <catch2/catch.hpp>

#include "core/constants.hpp"
#include "render/viewing_check.hpp"

using namespace dm;

namespace {

// The demo tube in its exact steady spin at 6 rev/s (above its lowest, 4.1 rev/s).
Scenario steadyDemo() {
  Scenario s = loadScenario(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json");
  s.observer.steadyPrecession = 6 * k::twoPi;
  s.observer.start = 0;
  s.observer.exposure = 0.3;
  validate(s);
  return s;
}

}  // namespace

TEST_CASE("viewing positions come from the scenario's viewing section", "[viewing_check]") {
  ViewingSpec v;
  v.standingEyeHeight = 1.6;
  v.childEyeHeight = 1.05;
  v.seatedEyeHeight = 1.2;
  const auto list = viewerPositions(v);
  REQUIRE(list.size() == 3);
  CHECK(list[0].name == "standing adult");
  CHECK(list[1].eyeHeight == 1.05);
  CHECK(list[2].name == "seated visitor");
}

TEST_CASE("visitors above the table see the steady spin's spots and an eye below it sees none", "[viewing_check]") {
  Scenario s = steadyDemo();
  s.viewing.tableHeight = 1.1;  // the child's 1.0 m eye is below the table top
  const Observation seen = observeSteady(s);
  const std::vector<ViewingResult> results = viewingCheck(s, seen, 96, 0);
  REQUIRE(results.size() == 3);
  const ViewingResult& adult = results[0];
  CHECK(adult.eyeAboveTable == Approx(0.47));
  CHECK(adult.elevation == Approx(std::atan2(0.47, 0.6)));
  CHECK(adult.image.width == 96);
  CHECK(adult.seen);
  CHECK(adult.contrast >= adult.threshold);
  const ViewingResult& child = results[1];
  CHECK(child.eyeAboveTable < 0);
  CHECK_FALSE(child.seen);
  CHECK(child.image.width == 0);
  CHECK(child.spots == 0);
}
