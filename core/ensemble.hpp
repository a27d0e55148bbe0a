// Visitor-launch ensembles: many launches of one design, each drawn from the
// scenario's launch spread, simulated and analysed in parallel, then
// summarised as a designer reads them (which end shows, how many spots, how
// long the wait and the show, how far the piece wanders, whether it leaves
// the table). Launch i is seeded with itemSeed(seed, i) and its outcome is
// stored at index i, so the result is the same at any thread count.
#pragma once
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/scenario.hpp"
#include "core/simulate.hpp"

namespace dm {

struct EnsembleOptions {
  int launches = 100;                   ///< number of launches, >= 1
  int threads = 0;                      ///< worker threads, 0 = one per hardware thread; the result does not depend on it
  std::optional<std::uint64_t> seed;    ///< overrides launch.seed
  std::optional<double> duration;       ///< overrides run.duration, s
  /// Called on the calling thread with (launches done, launches in all)
  /// after each launch finishes.
  std::function<void(int, int)> progress;
};

/// What one launch did.
struct LaunchOutcome {
  std::uint64_t index = 0;
  LaunchSpec launch;                   ///< the drawn launch
  /// The end seen from above: the one raised in most of the pattern windows
  /// that have a raised end (none when none has, or on a tie).
  std::optional<End> visibleEnd;
  std::optional<double> settleTime;    ///< s
  std::optional<double> restTime;      ///< s (none when still moving at the end of the run)
  double spinTime = 0;                 ///< s, end of the last rim rolling: when it falls flat (0: never rolled on a rim)
  double showTime = 0;                 ///< s, time covered by pattern windows showing spots (stationary or creeping)
  std::optional<int> spotsAtSettle;    ///< spots of the first window starting at or after the settle time (0: none or a ring)
  std::vector<int> spotCounts;         ///< spots of each pattern window of the run (0: none or a ring)
  double maxExcursion = 0;             ///< m, largest horizontal distance of the centre from the table centre
  double maxSurfaceSpeed = 0;          ///< m/s, fastest surface point
  std::optional<double> edgeTime;      ///< s, when some part of the body first reaches the table edge
  double edgeCentreHeight = 0;         ///< m, centre height at edgeTime
  double edgeCentreSpeed = 0;          ///< m/s, centre speed at edgeTime
  bool leavesTable = false;            ///< the centre passes the edge of a table without a lip
  double endTime = 0;                  ///< s, last simulated time
  std::string fault;                   ///< why the run stopped early on a numerical fault; empty when it did not
};

/// Median and 10th and 90th percentiles of a sample (linear interpolation
/// between order statistics), with the sample size and the largest value.
/// All zero when the sample is empty.
struct Percentiles {
  std::size_t count = 0;
  double p10 = 0, median = 0, p90 = 0, max = 0;
};
Percentiles percentilesOf(std::vector<double> values);

/// How many launches showed each spot count, at one moment or at settle.
struct SpotHistogram {
  std::vector<std::size_t> launches;  ///< launches[n]: launches showing n spots (n = 0: no spots or a ring)
};

/// The table check of an ensemble for a round table of `radius`.
struct TableCheck {
  double radius = 0;                   ///< m, surface.table_radius_mm
  double reachesEdgeShare = 0;         ///< share of launches in which some part of the body reaches the edge
  double leavesShare = 0;              ///< share in which the centre passes the edge (falls off without a lip)
  double radiusHoldingAll = 0;         ///< m, smallest radius no launch's body reaches
  double radiusHolding90 = 0;          ///< m, radius that 90 % of launches' bodies stay within
  /// Lip height that keeps every launch that reaches the edge on the table,
  /// m: the centre's height when it first reaches the edge plus the rise
  /// v^2 / (2 g) its speed could give, and at least the outer radius (the
  /// centre of a body rolling on its side). None when no launch reaches it.
  std::optional<double> lipHeight;
};

/// The aggregates of an ensemble (ensemble.json).
struct EnsembleSummary {
  std::size_t launches = 0;
  std::size_t faults = 0;              ///< launches stopped by a numerical fault (left out of every figure below)
  double visibleShareA = 0, visibleShareB = 0, visibleShareNone = 0;  ///< which end ends up seen from above
  double pressedVisibleShare = 0;      ///< share in which the pressed end rises and is the one seen
  SpotHistogram spotsAtSettle;
  double windowLength = 0, windowStep = 0;  ///< s, the pattern windows of spotsOverTime
  std::vector<double> windowStarts;         ///< s
  std::vector<SpotHistogram> spotsOverTime;  ///< one per window start (a launch at rest counts 0 spots)
  Percentiles settleTime, showTime, spinTime, restTime;  ///< s (show and spin over every launch; settle and rest over those that do)
  Percentiles maxExcursion;                 ///< m
  Percentiles maxSurfaceSpeed;              ///< m/s
  TableCheck table;
};

struct EnsembleResult {
  std::string scenario;                ///< scenario name
  std::uint64_t seed = 0;              ///< the ensemble seed used
  double duration = 0;                 ///< s, simulated time per launch (a launch stops 0.5 s after it comes to rest)
  LaunchSpreadSpec spread;             ///< the spread the launches were drawn from
  std::vector<LaunchOutcome> outcomes;  ///< in launch order
  EnsembleSummary summary;
};

/// End of the last rim-rolling span of a run's phases, s: when the body
/// falls flat or stands (0 when it never rolled on a rim).
double spinTimeOf(const std::vector<PhaseSpan>& phases);

/// Simulates and analyses one launch of `s` (the launch already drawn into
/// s.launch); `index` is recorded.
LaunchOutcome runLaunch(const Scenario& s, std::uint64_t index, double duration);

/// The aggregates of a set of outcomes of scenario `s`.
EnsembleSummary summariseEnsemble(const Scenario& s, const std::vector<LaunchOutcome>& outcomes, double duration);

/// Runs the ensemble of a validated scenario. Throws std::invalid_argument
/// for fewer than one launch or a negative thread count.
EnsembleResult runEnsemble(const Scenario& s, const EnsembleOptions& options);

/// launches.csv: one row per launch, units in the header; empty cells
/// where a value does not exist (no settle, no rest, never at the edge).
std::string launchesCsv(const EnsembleResult& r);

/// ensemble.json contents (write with jsonFileText, which refuses NaN).
nlohmann::json ensembleJson(const EnsembleResult& r);

}  // namespace dm
