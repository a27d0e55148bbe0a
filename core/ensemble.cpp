#include "core/ensemble.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/launch_spread.hpp"
#include "core/parallel.hpp"
#include "core/pattern.hpp"
#include "core/simulate.hpp"

namespace dm {

namespace {

// ---- one launch ---------------------------------------------------------------

// Rim points per end when looking for the body's farthest point: the
// farthest sampled point is within R (1 - cos 7.5 deg) < 0.01 R of the true one.
constexpr int reachPointsPerEnd = 24;

// Horizontal distance from the table centre (the lab origin) of the body's
// farthest rim point at one sample, m.
double farthestReach(const Cylinder& c, const Sample& s) {
  const Vec3 axis = s.orientation * Vec3::UnitZ();
  const Vec3 u = s.orientation * Vec3::UnitX(), v = s.orientation * Vec3::UnitY();
  double farthest = 0;
  for (double side : {-1.0, 1.0})
    for (int i = 0; i < reachPointsPerEnd; ++i) {
      const double theta = k::twoPi * i / reachPointsPerEnd;
      const Vec3 p = s.position + side * c.length / 2 * axis + c.outerRadius * (std::cos(theta) * u + std::sin(theta) * v);
      farthest = std::max(farthest, std::hypot(p.x(), p.y()));
    }
  return farthest;
}

// When the body first reaches the edge of a round table of `radius` and
// whether its centre passes it.
void checkTableEdge(const Cylinder& c, const Trajectory& tr, double radius, LaunchOutcome& out) {
  const double halfDiagonal = std::hypot(c.length / 2, c.outerRadius);
  for (const Sample& s : tr.samples) {
    const double centre = std::hypot(s.position.x(), s.position.y());
    out.leavesTable = out.leavesTable || centre >= radius;
    if (out.edgeTime || centre + halfDiagonal < radius) continue;  // no rim point can be that far
    if (farthestReach(c, s) < radius) continue;
    out.edgeTime = s.t;
    out.edgeCentreHeight = s.position.z();
    out.edgeCentreSpeed = s.velocity.norm();
  }
}

bool showsSpots(const PatternWindow& w) {
  return w.kind == PatternKind::Stationary || w.kind == PatternKind::Creeping;
}

int spotsShown(const PatternWindow& w) { return showsSpots(w) ? int(w.spots.size()) : 0; }

// Length of the union of the windows showing spots, s.
double showTimeOf(const std::vector<PatternWindow>& windows) {
  double total = 0, coveredTo = -1;
  for (const PatternWindow& w : windows) {  // in order of start
    if (!showsSpots(w)) continue;
    const double from = std::max(w.start, coveredTo);
    if (w.end > from) total += w.end - from;
    coveredTo = std::max(coveredTo, w.end);
  }
  return total;
}

// The end raised in most windows that have one; none on a tie or when none has.
std::optional<End> mostRaised(const std::vector<PatternWindow>& windows) {
  int a = 0, b = 0;
  for (const PatternWindow& w : windows)
    if (w.visibleEnd) ++(*w.visibleEnd == End::A ? a : b);
  if (a == b) return std::nullopt;
  return a > b ? End::A : End::B;
}

// The spot pattern of a run: spot counts per window, show time, spots at settle.
void analyseSpots(const Scenario& s, const RunResult& run, LaunchOutcome& out) {
  const std::vector<MarkedPoint> points = markedPoints(run.params.body, s.paint, s.analysis.tracePoints);
  const std::vector<StopEvent> stops = stopEvents(run.trajectory, points, s.analysis.dwellSpeed);
  const std::vector<PatternWindow> windows = patternWindows(run.trajectory, points, stops, s.analysis);
  for (const PatternWindow& w : windows) out.spotCounts.push_back(spotsShown(w));
  out.showTime = showTimeOf(windows);
  out.visibleEnd = mostRaised(windows);
  if (!out.settleTime) return;
  for (const PatternWindow& w : windows)
    if (w.start >= *out.settleTime) {
      out.spotsAtSettle = spotsShown(w);
      return;
    }
}

// ---- aggregates ---------------------------------------------------------------

// Value at quantile q (0..1) of sorted values, linear between order statistics.
double quantileOfSorted(const std::vector<double>& sorted, double q) {
  const double pos = q * double(sorted.size() - 1);
  const std::size_t lo = std::size_t(std::floor(pos));
  const std::size_t hi = std::min(lo + 1, sorted.size() - 1);
  return sorted[lo] + (pos - double(lo)) * (sorted[hi] - sorted[lo]);
}

// Adds one launch showing `spots` to a histogram, growing it as needed.
void addToHistogram(SpotHistogram& h, int spots) {
  if (h.launches.size() <= std::size_t(spots)) h.launches.resize(std::size_t(spots) + 1, 0);
  ++h.launches[std::size_t(spots)];
}

// The window starts of a run of `duration` (as patternWindows lays them out).
std::vector<double> windowStartsOf(const AnalysisSpec& a, double duration) {
  std::vector<double> starts;
  if (duration < a.window) return {0.0};
  for (long n = 0;; ++n) {
    const double t0 = double(n) * a.windowStep;
    if (t0 + a.window > duration + 1e-9) break;
    starts.push_back(t0);
  }
  return starts;
}

// The table check over the launches that ran without a fault.
TableCheck tableCheckOf(const Scenario& s, const std::vector<const LaunchOutcome*>& good) {
  TableCheck t;
  t.radius = s.surface.tableRadius;
  if (good.empty()) return t;
  const Cylinder body = cylinderOf(s.body);
  // A body centred at distance d from the table centre reaches at most d + its half diagonal.
  std::vector<double> reach;
  std::size_t atEdge = 0, leave = 0;
  for (const LaunchOutcome* o : good) {
    reach.push_back(o->maxExcursion + std::hypot(body.length / 2, body.outerRadius));
    atEdge += o->edgeTime ? 1 : 0;
    leave += o->leavesTable ? 1 : 0;
    if (!o->edgeTime) continue;
    const double lip = o->edgeCentreHeight + o->edgeCentreSpeed * o->edgeCentreSpeed / (2 * k::gravity);
    t.lipHeight = std::max({t.lipHeight.value_or(0.0), lip, body.outerRadius});
  }
  std::sort(reach.begin(), reach.end());
  t.reachesEdgeShare = double(atEdge) / double(good.size());
  t.leavesShare = double(leave) / double(good.size());
  t.radiusHoldingAll = reach.back();
  t.radiusHolding90 = quantileOfSorted(reach, 0.9);
  return t;
}

// Which end is seen, how often it is the pressed one.
void visibleShares(const std::vector<const LaunchOutcome*>& good, EnsembleSummary& e) {
  if (good.empty()) return;
  std::size_t a = 0, b = 0, pressed = 0;
  for (const LaunchOutcome* o : good) {
    a += o->visibleEnd == End::A ? 1 : 0;
    b += o->visibleEnd == End::B ? 1 : 0;
    pressed += o->visibleEnd == o->launch.pressedEnd ? 1 : 0;
  }
  const double n = double(good.size());
  e.visibleShareA = double(a) / n;
  e.visibleShareB = double(b) / n;
  e.visibleShareNone = double(good.size() - a - b) / n;
  e.pressedVisibleShare = double(pressed) / n;
}

// Spot histograms at settle and per window start.
void spotHistograms(const std::vector<const LaunchOutcome*>& good, EnsembleSummary& e) {
  e.spotsOverTime.assign(e.windowStarts.size(), SpotHistogram{});
  for (const LaunchOutcome* o : good) {
    if (o->spotsAtSettle) addToHistogram(e.spotsAtSettle, *o->spotsAtSettle);
    for (std::size_t i = 0; i < e.windowStarts.size(); ++i)
      addToHistogram(e.spotsOverTime[i], i < o->spotCounts.size() ? o->spotCounts[i] : 0);
  }
}

// Distributions of the times and extremes.
void distributions(const std::vector<const LaunchOutcome*>& good, EnsembleSummary& e) {
  std::vector<double> settle, show, spin, rest, excursion, speed;
  for (const LaunchOutcome* o : good) {
    if (o->settleTime) settle.push_back(*o->settleTime);
    if (o->restTime) rest.push_back(*o->restTime);
    show.push_back(o->showTime);
    spin.push_back(o->spinTime);
    excursion.push_back(o->maxExcursion);
    speed.push_back(o->maxSurfaceSpeed);
  }
  e.settleTime = percentilesOf(settle);
  e.showTime = percentilesOf(show);
  e.spinTime = percentilesOf(spin);
  e.restTime = percentilesOf(rest);
  e.maxExcursion = percentilesOf(excursion);
  e.maxSurfaceSpeed = percentilesOf(speed);
}

// Runs `total` launches; each stores its outcome at its index.
std::vector<LaunchOutcome> runLaunches(const Scenario& s, std::uint64_t seed, double duration, int total, int threads,
                                       const std::function<void(int, int)>& progress) {
  std::vector<LaunchOutcome> outcomes(static_cast<std::size_t>(total));
  parallelFor(
      total, threads,
      [&](int i) {
        Scenario one = s;
        one.launch = drawLaunch(s.launch, s.launchSpread, seed, std::uint64_t(i));
        outcomes[std::size_t(i)] = runLaunch(one, std::uint64_t(i), duration);
      },
      progress);
  return outcomes;
}

}  // namespace

double spinTimeOf(const std::vector<PhaseSpan>& phases) {
  double end = 0;
  for (const PhaseSpan& p : phases)
    if (p.phase == Phase::RollingA || p.phase == Phase::RollingB) end = p.end;
  return end;
}

Percentiles percentilesOf(std::vector<double> values) {
  Percentiles p;
  p.count = values.size();
  if (values.empty()) return p;
  std::sort(values.begin(), values.end());
  p.p10 = quantileOfSorted(values, 0.1);
  p.median = quantileOfSorted(values, 0.5);
  p.p90 = quantileOfSorted(values, 0.9);
  p.max = values.back();
  return p;
}

LaunchOutcome runLaunch(const Scenario& s, std::uint64_t index, double duration) {
  SimulateOptions options;
  options.duration = duration;
  options.stopAtRest = true;
  const RunResult run = simulate(s, options);
  LaunchOutcome out;
  out.index = index;
  out.launch = s.launch;
  out.endTime = run.summary.endTime;
  if (run.fault) {
    out.fault = run.fault->reason + " at t = " + std::to_string(run.fault->time) + " s";
    return out;
  }
  out.settleTime = run.summary.settleTime;
  out.restTime = run.summary.restTime;
  out.spinTime = spinTimeOf(run.summary.phases);
  out.maxExcursion = run.summary.maxExcursion;
  out.maxSurfaceSpeed = run.summary.maxSurfaceSpeed;
  checkTableEdge(run.params.body, run.trajectory, s.surface.tableRadius, out);
  analyseSpots(s, run, out);
  return out;
}

EnsembleSummary summariseEnsemble(const Scenario& s, const std::vector<LaunchOutcome>& outcomes, double duration) {
  EnsembleSummary e;
  e.launches = outcomes.size();
  std::vector<const LaunchOutcome*> good;
  for (const LaunchOutcome& o : outcomes)
    if (o.fault.empty()) good.push_back(&o);
  e.faults = outcomes.size() - good.size();
  e.windowLength = s.analysis.window;
  e.windowStep = s.analysis.windowStep;
  e.windowStarts = windowStartsOf(s.analysis, duration);
  visibleShares(good, e);
  spotHistograms(good, e);
  distributions(good, e);
  e.table = tableCheckOf(s, good);
  return e;
}

EnsembleResult runEnsemble(const Scenario& s, const EnsembleOptions& options) {
  if (options.launches < 1)
    throw std::invalid_argument("launches: value " + std::to_string(options.launches) + " is out of range; allowed at least 1");
  if (options.threads < 0)
    throw std::invalid_argument("threads: value " + std::to_string(options.threads) +
                                " is out of range; allowed 0 (one per hardware thread) or more");
  EnsembleResult r;
  r.scenario = s.name;
  r.seed = options.seed.value_or(s.launch.seed);
  r.duration = options.duration.value_or(s.run.duration);
  r.spread = s.launchSpread;
  r.outcomes = runLaunches(s, r.seed, r.duration, options.launches, workerCount(options.threads, options.launches),
                           options.progress);
  r.summary = summariseEnsemble(s, r.outcomes, r.duration);
  return r;
}

}  // namespace dm
