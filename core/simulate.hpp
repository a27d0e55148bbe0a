// A whole run: launch, step until the duration (or a fault), record the
// dense trajectory and the events a designer asks about.
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/dynamics.hpp"
#include "core/scenario.hpp"
#include "core/trajectory.hpp"

namespace dm {

struct PhaseSpan {
  Phase phase = Phase::Airborne;
  double start = 0, end = 0;  ///< s
};

/// A run stopped by a non-finite or runaway state.
struct Fault {
  double time = 0;            ///< s, time of the first bad state
  Phase phase = Phase::Airborne;  ///< phase of the last good state
  State lastGood;             ///< the last good state
  std::string reason;
};

/// Events and extremes of a run (what summary.json reports).
struct RunSummary {
  End pressedEnd = End::A;
  std::optional<End> raisedEnd;        ///< raised end during the first sustained rim rolling
  std::optional<double> settleTime;    ///< s, start of the first rim rolling lasting >= 0.5 s
  std::optional<double> restTime;      ///< s, start of the final stretch at rest (or flat, not spinning)
  std::vector<PhaseSpan> phases;       ///< debounced phase history
  double maxExcursion = 0;             ///< m, largest horizontal distance of the centre from its start
  double maxSurfaceSpeed = 0;          ///< m/s, fastest surface point
  double energyInitial = 0, energyFinal = 0;  ///< J
  double endTime = 0;                  ///< s, last recorded time
};

struct RunResult {
  Params params;
  Trajectory trajectory;
  RunSummary summary;
  std::optional<Fault> fault;
  std::vector<double> energyAt;  ///< J, at each output row (every run.sample_ms)
};

struct SimulateOptions {
  std::optional<double> duration;          ///< overrides run.duration
  bool stopAtRest = false;                 ///< end 0.5 s after the body comes to rest
  std::function<void(double)> progress;    ///< called now and then with the fraction done
};

/// The trajectory record of state `s`, given the contact report of that
/// same state (what step() returns for the state it started from).
Sample sampleOf(const Params& p, const State& s, const ContactReport& c);

/// Simulates a validated scenario from its launch.
RunResult simulate(const Scenario& s, const SimulateOptions& options = {});
/// Simulates from a given initial state.
RunResult simulateFrom(const Params& p, const State& initial, double duration, double sampleInterval,
                       End pressedEnd, const SimulateOptions& options = {});

/// The phase spans of a trajectory, with spans shorter than `minSpan`
/// seconds merged into the span before them.
std::vector<PhaseSpan> phaseSpans(const Trajectory& t, double minSpan = 0.003);

}  // namespace dm
