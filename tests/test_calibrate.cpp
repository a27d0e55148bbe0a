// Calibration: known surface coefficients come back from times simulated
// with them, measurements out of range are refused by name, and the report
// carries the fitted values and the residuals.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/calibrate.hpp"
#include "core/constants.hpp"
#include "core/ensemble.hpp"
#include "support.hpp"

using namespace dm;

namespace {

// A 25 x 60 mm tube of 2 mm wall on a slippery, soft surface (kinetic
// friction 0.12, rolling resistance 0.01, little pivot friction), flicked
// within a narrow spread. On such a surface the settling time depends on the
// friction and the spin time on the rolling resistance, so both can be
// measured; on a grippy table the settling hardly depends on the friction
// (the calibration then says so).
Scenario slipperyTable() {
  Scenario s = test::demo();
  s.body.length = 0.060;
  s.body.outerDiameter = 0.025;
  s.body.wall = 0.002;
  s.surface.frictionKinetic = 0.12;
  s.surface.frictionStatic = 0.144;
  s.surface.rollingResistance = 0.01;
  s.surface.pivotFriction = 0.05e-3;
  s.launch.pressedEnd = End::A;
  s.launchSpread.pressedEndAShare = 1;
  s.launchSpread.revolution = {SpreadKind::Uniform, 8 * k::twoPi, 10 * k::twoPi, 0, 0};
  s.launchSpread.backspin = {SpreadKind::Uniform, 0.7, 0.9, 0, 0};
  s.launchSpread.tilt = {SpreadKind::Uniform, 8 * k::degree, 12 * k::degree, 0, 0};
  s.launchSpread.drift = {SpreadKind::Fixed, 0, 0, 0, 0};
  validate(s);
  return s;
}

}  // namespace

TEST_CASE("calibration recovers the friction and rolling resistance a run was made with", "[calibrate][slow]") {
  // The "measurement": the mean settle and spin times of 16 launches
  // simulated with the known coefficients; the calibration starts from
  // handbook-like values and averages the same 16 launches.
  const Scenario truth = slipperyTable();
  EnsembleOptions runs;
  runs.launches = 16;
  runs.duration = 8.0;
  const EnsembleResult measured = runEnsemble(truth, runs);
  CalibrationTarget target;
  for (const LaunchOutcome& o : measured.outcomes) {
    REQUIRE(o.settleTime);
    target.settleTime += *o.settleTime / 16;
    target.spinTime += o.spinTime / 16;
  }

  Scenario start = truth;
  start.surface.frictionKinetic = 0.4;
  start.surface.frictionStatic = 0.48;
  start.surface.rollingResistance = 0.002;
  CalibrationOptions options;
  options.launches = 16;
  const CalibrationResult r = calibrate(start, target, options);
  // Within 5 % (the target). The mean of 16 simulated times has small
  // steps where single launches switch between neighbouring outcomes, so a
  // fit is exact only to the width of a step; here it lands well inside.
  CHECK(r.frictionKinetic.value == Approx(0.12).epsilon(0.05));
  CHECK(r.rollingResistance.value == Approx(0.01).epsilon(0.05));
  CHECK(r.frictionKinetic.matched);
  CHECK(r.rollingResistance.determined);
  // The static friction keeps the start's ratio of 1.2.
  CHECK(r.frictionStatic == Approx(1.2 * r.frictionKinetic.value));
  // Residuals well below a phone's timing (0.2 s).
  CHECK(std::abs(r.settleResidual) < 0.05);
  CHECK(std::abs(r.spinResidual) < 0.05);
  CHECK(r.unsettled == 0);
  CHECK(r.calibrated.surface.rollingResistance == r.rollingResistance.value);
}

TEST_CASE("measurements out of range are refused by name", "[calibrate]") {
  CalibrationTarget t;
  t.settleTime = 0.5;
  t.spinTime = 8;
  CHECK_NOTHROW(checkTarget(t));
  auto refused = [](CalibrationTarget bad) -> std::string {
    try {
      checkTarget(bad);
    } catch (const ScenarioError& e) {
      return e.field();
    }
    return "";
  };
  CalibrationTarget bad = t;
  bad.settleTime = 0;
  CHECK(refused(bad) == "settle_time_s");
  bad = t;
  bad.spinTime = 0.4;  // before the settling
  CHECK(refused(bad) == "spin_time_s");
  bad = t;
  bad.spots = 0;
  CHECK(refused(bad) == "spots");
  bad = t;
  bad.timing = -1;
  CHECK(refused(bad) == "timing_s");
}

// [slow]: a whole fit; the sanitizer stage runs the same small calibration from the command line.
TEST_CASE("the calibration report names every fitted value and residual", "[calibrate][slow]") {
  // Two short launches of the demo: only the shape of the report matters here.
  const Scenario s = test::demo();
  CalibrationTarget t;
  t.settleTime = 0.5;
  t.spinTime = 2.0;
  t.spots = 4;
  CalibrationOptions options;
  options.launches = 2;
  int trials = 0;
  options.progress = [&](int n) { trials = n; };
  const CalibrationResult r = calibrate(s, t, options);
  CHECK(r.trials == trials);
  const nlohmann::json j = calibrationJson(r);
  for (const char* key : {"measured", "fitted", "predicted", "residual", "launches", "seed", "trials"})
    CHECK(j.contains(key));
  for (const char* key : {"value", "uncertainty", "matched", "determined"})
    CHECK(j["fitted"]["rolling_resistance"].contains(key));
  CHECK(j["residual"].contains("chi_square"));
  CHECK(j["measured"]["spots"] == 4);
  CHECK_NOTHROW(validate(r.calibrated));
}
