// Calibration of a table surface from what a designer can time on a
// prototype with a phone: the time from release to settling and the total
// spin time (release until the piece stops rolling on a rim and falls
// flat), optionally the number of spots seen. The kinetic friction is fitted
// to the settling time and the rolling resistance to the spin time, each by
// bracketed root finding on the mean over a set of launches drawn from the
// scenario's launch spread (the same launches at every trial, so the
// comparison is not blurred by a new draw). The static friction keeps the
// scenario's static-to-kinetic ratio.
//
// A measured time pins a coefficient only where the time depends on it: on
// a grippy table the settling hardly depends on the friction (the piece
// lands from its launch hop already rolling), so each fitted value comes
// with the change that moves its time by the timing uncertainty, and a flag
// saying whether the measurement determines it.
#pragma once
#include <cstdint>
#include <functional>
#include <optional>

#include <nlohmann/json.hpp>

#include "core/scenario.hpp"

namespace dm {

/// What was measured (means over a few flicks, as visitors launch).
struct CalibrationTarget {
  double settleTime = 0;     ///< s, release to settling (the first rim rolling lasting 0.5 s), 0.01 to 600
  double spinTime = 0;       ///< s, release until it stops rolling on a rim, above settleTime, up to 600
  std::optional<int> spots;  ///< spots seen during the show, 1 to 50
  /// s, uncertainty of each measured time, 0.001 to 10: 0.2 s by default for
  /// timing from a phone video by hand (common practice, no source).
  double timing = 0.2;
};

/// Throws ScenarioError naming the measurement (settle_time_s, spin_time_s,
/// spots, timing_s), its value and the allowed range.
void checkTarget(const CalibrationTarget& t);

struct CalibrationOptions {
  int launches = 16;                  ///< launches averaged per trial, 1 to 1000
  int threads = 0;                    ///< worker threads, 0 = one per hardware thread; the result does not depend on it
  std::optional<std::uint64_t> seed;  ///< overrides launch.seed for the launch draws
  std::function<void(int)> progress;  ///< called with the number of trials done after each trial
};

/// One fitted coefficient.
struct FittedCoefficient {
  double value = 0;         ///< fitted value, -
  bool matched = false;     ///< the predicted time crosses the measured one within the search range
  /// Change of the value that moves its predicted time by the timing
  /// uncertainty (from the slope over +-10 % of the value); none when the
  /// time does not change there at all.
  std::optional<double> uncertainty;
  bool determined = false;  ///< matched, and the uncertainty is below half the value
  double low = 0, high = 0;  ///< the search range, -
};

struct CalibrationResult {
  CalibrationTarget target;
  FittedCoefficient frictionKinetic;    ///< fitted to the settling time
  FittedCoefficient rollingResistance;  ///< fitted to the spin time
  double frictionStatic = 0;            ///< the scenario's static/kinetic ratio times the fitted kinetic friction
  /// s, mean over the launches with the fitted values; a launch that settles
  /// later than 1.5 times the measured time plus 1 s, or never, counts that long.
  double predictedSettle = 0;
  double predictedSpin = 0;             ///< s, the same for the spin time
  int unsettled = 0;                    ///< launches that never settled with the fitted values
  std::optional<int> predictedSpots;    ///< most common spot count of the launches' shows (when spots were measured)
  double settleResidual = 0;            ///< s, predicted - measured
  double spinResidual = 0;              ///< s, predicted - measured
  std::optional<int> spotsResidual;     ///< predicted - measured
  double chiSquare = 0;                 ///< sum of (residual / uncertainty)^2; a spot counts with an uncertainty of 0.5
  int launches = 0;
  std::uint64_t seed = 0;
  int trials = 0;                       ///< simulated trials (each of `launches` runs)
  Scenario calibrated;                  ///< the scenario with the fitted surface coefficients
};

/// Fits the kinetic friction (0.02 to 2) and the rolling resistance (1e-5
/// to 0.1) of a validated scenario's surface to the measurements. Throws
/// ScenarioError for a bad target and std::invalid_argument for bad options.
CalibrationResult calibrate(const Scenario& s, const CalibrationTarget& target, const CalibrationOptions& options);

/// calibration.json contents (write with jsonFileText, which refuses NaN).
nlohmann::json calibrationJson(const CalibrationResult& r);

}  // namespace dm
