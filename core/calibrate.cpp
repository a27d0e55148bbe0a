#include "core/calibrate.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>
#include <string>
#include <vector>

#include "core/ensemble.hpp"
#include "core/io.hpp"
#include "core/launch_spread.hpp"
#include "core/parallel.hpp"
#include "core/simulate.hpp"

namespace dm {

using json = nlohmann::json;

namespace {

// Search ranges of the fitted coefficients (within their field ranges; the
// lower ends are above zero so the search can run on a log scale).
constexpr double frictionLow = 0.02, frictionHigh = 2.0;
constexpr double rollingLow = 1e-5, rollingHigh = 0.1;
// Uncertainty of a counted spot number in the chi-square.
constexpr double spotUncertainty = 0.5;
// Root finding stops when the bracket is this narrow in log value (0.5 %)
// or after this many trials.
constexpr double logTolerance = 5e-3;
constexpr int maxRootTrials = 16;
// The slope behind each uncertainty is taken over +-10 % of the value.
const double slopeStep = std::log(1.1);

void checkRange(const std::string& name, double v, double lo, double hi, const std::string& unit) {
  if (!(v >= lo && v <= hi))
    throw ScenarioError(name, "value " + fmt(v, 10) + " is out of range; allowed " + fmt(lo, 10) + " to " + fmt(hi, 10) +
                                  (unit.empty() ? "" : " " + unit));
}

// Mean settle and spin times of a set of launches.
struct Trial {
  double settle = 0, spin = 0;  ///< s
  int unsettled = 0;
};

// Runs the trials of one calibration: the launches, their seed and the
// surface coefficients under test.
struct Trials {
  const Scenario& scenario;
  std::uint64_t seed;
  int launches, threads;
  double staticRatio;  ///< static / kinetic friction of the scenario
  double settleCap;    ///< s, a launch settling later (or never) counts this long
  const std::function<void(int)>& progress;
  int count = 0;

  // The scenario with the coefficients under test and launch i drawn.
  Scenario with(double friction, double rolling, int i) const {
    Scenario s = scenario;
    s.surface.frictionKinetic = friction;
    s.surface.frictionStatic = std::min(2.0, staticRatio * friction);
    s.surface.rollingResistance = rolling;
    s.launch = drawLaunch(scenario.launch, scenario.launchSpread, seed, std::uint64_t(i));
    return s;
  }

  // Means over the launches, each run for `duration` (stopping at rest).
  Trial run(double friction, double rolling, double duration) {
    std::vector<RunSummary> summaries(static_cast<std::size_t>(launches));
    parallelFor(launches, threads, [&](int i) {
      SimulateOptions o;
      o.duration = duration;
      o.stopAtRest = true;
      summaries[std::size_t(i)] = simulate(with(friction, rolling, i), o).summary;
    });
    Trial t;
    for (const RunSummary& r : summaries) {
      t.settle += std::min(r.settleTime.value_or(settleCap), settleCap);
      t.unsettled += r.settleTime ? 0 : 1;
      t.spin += spinTimeOf(r.phases);
    }
    t.settle /= launches;
    t.spin /= launches;
    ++count;
    if (progress) progress(count);
    return t;
  }
};

// A root of a function of x (a log value) between lo and hi.
struct Root {
  double x = 0;
  bool matched = false;
};

// Illinois regula falsi on a bracket [a, b] where f changes sign (every
// third step a bisection, for the steps that launch-to-launch jumps put in a
// mean of simulated times). Returns the evaluated point nearest a zero.
Root refine(const std::function<double(double)>& f, double a, double fa, double b, double fb) {
  Root best{std::abs(fa) <= std::abs(fb) ? a : b, true};
  double bestF = std::min(std::abs(fa), std::abs(fb));
  int side = 0;
  for (int n = 0; n < maxRootTrials && b - a > logTolerance && bestF > 0; ++n) {
    double c = (a * fb - b * fa) / (fb - fa);
    if (n % 3 == 2 || !(c > a && c < b)) c = 0.5 * (a + b);
    const double fc = f(c);
    if (std::abs(fc) < bestF) bestF = std::abs(fc), best.x = c;
    if ((fc > 0) == (fb > 0)) {
      b = c, fb = fc;
      if (side == -1) fa /= 2;
      side = -1;
    } else {
      a = c, fa = fc;
      if (side == +1) fb /= 2;
      side = +1;
    }
  }
  return best;
}

// Points of the coarse scan of a search range.
constexpr int scanPoints = 7;

// A zero of f (a function of the log value) in [lo, hi] (log values): a
// coarse scan finds where f changes sign (a mean time need not be monotone:
// on a very grippy table pieces chatter and settle later again), the change
// nearest `prior` is refined. Unmatched, at the scanned point nearest a
// zero, when f keeps its sign.
Root solve(const std::function<double(double)>& f, double lo, double hi, double prior) {
  std::vector<double> x(scanPoints), v(scanPoints);
  for (int i = 0; i < scanPoints; ++i) {
    x[std::size_t(i)] = lo + (hi - lo) * i / (scanPoints - 1);
    v[std::size_t(i)] = f(x[std::size_t(i)]);
  }
  std::optional<std::size_t> chosen;
  for (std::size_t i = 0; i + 1 < x.size(); ++i) {
    if ((v[i] > 0) == (v[i + 1] > 0) && v[i] != 0) continue;
    const auto distance = [&](std::size_t j) { return std::abs(0.5 * (x[j] + x[j + 1]) - prior); };
    if (!chosen || distance(i) < distance(*chosen)) chosen = i;
  }
  if (!chosen) {
    std::size_t nearest = 0;
    for (std::size_t i = 1; i < x.size(); ++i)
      if (std::abs(v[i]) < std::abs(v[nearest])) nearest = i;
    return Root{x[nearest], false};
  }
  return refine(f, x[*chosen], v[*chosen], x[*chosen + 1], v[*chosen + 1]);
}

// Solves in the range [lo, hi] (values) near `guess`: first within 25 % of
// it (the second round, starting from the first round's value), then over
// the whole range.
Root solveNear(const std::function<double(double)>& f, double lo, double hi, double guess, bool narrow) {
  const double g = std::log(std::clamp(guess, lo, hi));
  if (narrow) {
    const double a = std::max(std::log(lo), g - std::log(1.25)), b = std::min(std::log(hi), g + std::log(1.25));
    const double fa = f(a), fb = f(b);
    if ((fa > 0) != (fb > 0) || fa == 0 || fb == 0) return refine(f, a, fa, b, fb);
  }
  return solve(f, std::log(lo), std::log(hi), g);
}

// The fitted coefficient at log value x, with its uncertainty from the
// slope of `time` (s as a function of the log value).
FittedCoefficient fitted(const Root& root, double lo, double hi, double timing,
                         const std::function<double(double)>& time) {
  FittedCoefficient c;
  c.value = std::exp(root.x);
  c.matched = root.matched;
  c.low = lo;
  c.high = hi;
  const double slope = (time(root.x + slopeStep) - time(root.x - slopeStep)) / (2 * slopeStep);
  if (slope != 0) c.uncertainty = c.value * timing / std::abs(slope);
  c.determined = c.matched && c.uncertainty && *c.uncertainty < 0.5 * c.value;
  return c;
}

// The spot count a launch's show displays most often (none without a show).
std::optional<int> showSpots(const LaunchOutcome& o) {
  std::map<int, int> tally;
  for (int n : o.spotCounts)
    if (n > 0) ++tally[n];
  if (tally.empty()) return std::nullopt;
  return std::max_element(tally.begin(), tally.end(), [](auto& x, auto& y) { return x.second < y.second; })->first;
}

// The most common show spot count over the launches of the calibrated scenario.
std::optional<int> predictedSpots(Trials& trials, double friction, double rolling, double duration) {
  std::vector<LaunchOutcome> outcomes(static_cast<std::size_t>(trials.launches));
  parallelFor(trials.launches, trials.threads, [&](int i) {
    outcomes[std::size_t(i)] = runLaunch(trials.with(friction, rolling, i), std::uint64_t(i), duration);
  });
  std::map<int, int> tally;
  for (const LaunchOutcome& o : outcomes)
    if (const auto n = showSpots(o)) ++tally[*n];
  if (tally.empty()) return std::nullopt;
  return std::max_element(tally.begin(), tally.end(), [](auto& x, auto& y) { return x.second < y.second; })->first;
}

// Residuals and chi-square of the prediction against the measurements.
void compare(CalibrationResult& r) {
  r.settleResidual = r.predictedSettle - r.target.settleTime;
  r.spinResidual = r.predictedSpin - r.target.spinTime;
  r.chiSquare = std::pow(r.settleResidual / r.target.timing, 2) + std::pow(r.spinResidual / r.target.timing, 2);
  if (r.target.spots && r.predictedSpots) {
    r.spotsResidual = *r.predictedSpots - *r.target.spots;
    r.chiSquare += std::pow(*r.spotsResidual / spotUncertainty, 2);
  }
}

json fittedJson(const FittedCoefficient& c) {
  return {{"value", c.value},
          {"uncertainty", c.uncertainty ? json(*c.uncertainty) : json(nullptr)},
          {"matched", c.matched},
          {"determined", c.determined},
          {"search_min", c.low},
          {"search_max", c.high}};
}

}  // namespace

void checkTarget(const CalibrationTarget& t) {
  checkRange("settle_time_s", t.settleTime, 0.01, 600, "s");
  checkRange("spin_time_s", t.spinTime, 0.01, 600, "s");
  if (!(t.spinTime > t.settleTime))
    throw ScenarioError("spin_time_s", "value " + fmt(t.spinTime, 10) + " s is not after the settle time " +
                                           fmt(t.settleTime, 10) + " s; allowed above it, up to 600 s");
  if (t.spots) checkRange("spots", *t.spots, 1, 50, "");
  checkRange("timing_s", t.timing, 0.001, 10, "s");
}

CalibrationResult calibrate(const Scenario& s, const CalibrationTarget& target, const CalibrationOptions& options) {
  checkTarget(target);
  if (options.launches < 1 || options.launches > 1000 || options.threads < 0)
    throw std::invalid_argument("calibration needs 1 to 1000 launches and a thread count of 0 or more");
  const double ratio = s.surface.frictionKinetic > 0 ? std::max(1.0, s.surface.frictionStatic / s.surface.frictionKinetic) : 1.0;
  // Runs long enough to see each measured event with room to spare.
  const double settleRun = std::min(600.0, 1.5 * target.settleTime + 1);
  const double spinRun = std::min(600.0, 1.5 * target.spinTime + 1);
  Trials trials{s, options.seed.value_or(s.launch.seed), options.launches,
                workerCount(options.threads, options.launches), ratio, settleRun, options.progress};

  // Friction to the settling time, rolling resistance to the spin time, twice
  // round so each sees the other's fitted value (the second rolling fit is
  // skipped when the friction did not move).
  double friction = s.surface.frictionKinetic > frictionLow ? s.surface.frictionKinetic : 0.3;
  double rolling = s.surface.rollingResistance > rollingLow ? s.surface.rollingResistance : 0.002;
  auto settleAt = [&](double x) { return trials.run(std::exp(x), rolling, settleRun).settle; };
  auto spinAt = [&](double x) { return trials.run(friction, std::exp(x), spinRun).spin; };
  Root frictionRoot, rollingRoot;
  for (int round = 0; round < 2; ++round) {
    frictionRoot = solveNear([&](double x) { return settleAt(x) - target.settleTime; }, frictionLow, frictionHigh,
                             friction, round > 0);
    const bool frictionKept = round > 0 && std::abs(frictionRoot.x - std::log(friction)) < logTolerance;
    friction = std::exp(frictionRoot.x);
    if (frictionKept) break;  // the rolling resistance was fitted with this friction already
    rollingRoot = solveNear([&](double x) { return spinAt(x) - target.spinTime; }, rollingLow, rollingHigh, rolling,
                            round > 0);
    rolling = std::exp(rollingRoot.x);
  }

  CalibrationResult r;
  r.target = target;
  r.frictionKinetic = fitted(frictionRoot, frictionLow, frictionHigh, target.timing, settleAt);
  r.rollingResistance = fitted(rollingRoot, rollingLow, rollingHigh, target.timing, spinAt);
  r.frictionStatic = std::min(2.0, ratio * friction);
  const Trial final = trials.run(friction, rolling, spinRun);
  r.predictedSettle = final.settle;
  r.predictedSpin = final.spin;
  r.unsettled = final.unsettled;
  if (target.spots) r.predictedSpots = predictedSpots(trials, friction, rolling, spinRun);
  compare(r);
  r.launches = options.launches;
  r.seed = trials.seed;
  r.trials = trials.count;
  r.calibrated = s;
  r.calibrated.surface.frictionKinetic = friction;
  r.calibrated.surface.frictionStatic = r.frictionStatic;
  r.calibrated.surface.rollingResistance = rolling;
  validate(r.calibrated);
  return r;
}

json calibrationJson(const CalibrationResult& r) {
  json measured = {{"settle_time_s", r.target.settleTime}, {"spin_time_s", r.target.spinTime},
                   {"spots", r.target.spots ? json(*r.target.spots) : json(nullptr)}, {"timing_s", r.target.timing}};
  json predicted = {{"settle_time_s", r.predictedSettle}, {"spin_time_s", r.predictedSpin},
                    {"spots", r.predictedSpots ? json(*r.predictedSpots) : json(nullptr)},
                    {"unsettled_launches", r.unsettled}};
  json residual = {{"settle_time_s", r.settleResidual}, {"spin_time_s", r.spinResidual},
                   {"spots", r.spotsResidual ? json(*r.spotsResidual) : json(nullptr)},
                   {"chi_square", r.chiSquare}};
  json fit = {{"friction_kinetic", fittedJson(r.frictionKinetic)},
              {"rolling_resistance", fittedJson(r.rollingResistance)},
              {"friction_static", r.frictionStatic}};
  return {{"scenario", r.calibrated.name}, {"measured", measured}, {"fitted", fit}, {"predicted", predicted},
          {"residual", residual}, {"launches", r.launches}, {"seed", r.seed}, {"trials", r.trials}};
}

}  // namespace dm
