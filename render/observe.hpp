// A scenario's exposure from end to end, shared by the command line and the
// GUI: which motion is shown (the simulated run or the exact steady spin),
// the ring its spots lie on, the camera, the exposure and the spot report.
#pragma once
#include <memory>
#include <optional>

#include <nlohmann/json.hpp>

#include "core/scenario.hpp"
#include "core/simulate.hpp"
#include "core/steady.hpp"
#include "render/camera.hpp"
#include "render/expose.hpp"
#include "render/spots.hpp"

namespace dm {

/// What an exposure looks at: the body's poses over time, the ring the
/// raised end's top point traces and which end that is.
struct Observation {
  PoseSource poses;
  Ring ring;
  std::optional<End> visibleEnd;       ///< none when no end is raised (the body lies, stands or rests)
  std::optional<SteadySpin> steady;    ///< the prescribed steady spin, when that is what is shown
  std::shared_ptr<const RunResult> run;  ///< the simulated run, when that is what is shown
};

/// The exact steady spin at observer.steady_precession_rev_s with the
/// scenario's pressed end raised, centred over the origin. Throws
/// ScenarioError (naming that field) when the body has no rolling steady
/// state at that precession.
Observation observeSteady(const Scenario& s);

/// A simulated run seen over the window [start, end] (s): the ring is
/// fitted to the raised end's top points there.
Observation observeRun(const Scenario& s, std::shared_ptr<const RunResult> run, double start, double end);

/// Simulated time an exposure of the scenario needs, s: up to the end of
/// its last frame.
double observedUntil(const ObserverSpec& o);

/// One exposure and what spot detection found in it.
struct ExposureResult {
  Camera camera;
  Exposure exposure;
  SpotReport spots;
  double start = 0;  ///< s
};

/// Exposes the scenario's observer view of `seen` starting at `start` (s)
/// for observer.exposure_s, and finds the spots.
ExposureResult exposeObservation(const Scenario& s, const Observation& seen, double start, int threads);

/// The spot report as written to spots.json (units in the keys); throws
/// std::domain_error if a number is not finite.
nlohmann::json spotsJson(const Scenario& s, const Observation& seen, const ExposureResult& r);

}  // namespace dm
