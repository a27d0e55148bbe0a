// The CPU observer camera over time: an exposure accumulates, per pixel,
// weight x linear radiance and weight over time samples in double precision
// and divides them. Time is sampled finely enough that no surface point
// moves more than half a pixel between a pixel's successive samples; the
// sample times are seeded per pixel, so the image is the same at any thread
// count. Poses come from any PoseSource: a run's trajectory or an exact
// prescribed motion.
#pragma once
#include <cstdint>
#include <functional>

#include "core/trajectory.hpp"
#include "core/vec.hpp"
#include "render/camera.hpp"
#include "render/image.hpp"
#include "render/scene.hpp"
#include "render/temporal.hpp"

namespace dm {

/// Where the body is at time t (s).
using PoseSource = std::function<Pose(double)>;

/// The poses of a run (its cubic Hermite interpolation). The trajectory
/// must outlive the source.
PoseSource poseSourceOf(const Trajectory& trajectory);

struct ExposureOptions {
  TimeWeighting timing;      ///< mode, window, flicker
  int threads = 0;           ///< worker threads, 0 = one per hardware thread; the result does not depend on it
  std::uint64_t seed = 1;    ///< seeds each pixel's sample times
  double maxStepPx = 0.5;    ///< largest image motion of any surface point between a pixel's successive samples, px
};

/// How the exposure sampled time, for reports and benchmarks.
struct ExposureStats {
  int strata = 0;                   ///< time strata (one sample per pixel each)
  int weightedStrata = 0;           ///< strata with a weight that counts (eye mode skips the filter's empty tail)
  double largestStepPx = 0;         ///< largest measured image motion of any surface point within one stratum, px
  double fastestImageSpeed = 0;     ///< px/s, the fastest surface point's image speed
  double interpolationErrorPx = 0;  ///< largest gap between interpolated and true poses at mid-stratum, px
  std::uint64_t pixelSamples = 0;   ///< pixels x weighted strata: the samples the exposure stands for
  std::uint64_t bodySamples = 0;    ///< samples within the body's widened outline, ray cast
  double weightTotal = 0;           ///< sum of the time weights (1 s^-1 x s for the eye, the exposure time for a camera)
};

struct Exposure {
  Image image;  ///< what the observer sees, linear radiance
  Image plain;  ///< the same exposure over a plain table (no grid): what spot detection reads
  /// The plain exposure with the markings left off the body (the same
  /// samples, each with the unpainted albedo): spot detection's reference
  /// for what the markings change, apart from the body's own outline.
  Image unpainted;
  ExposureStats stats;
};

/// Exposes the scene through `camera` over the options' window.
/// Throws std::runtime_error when the motion cannot be resolved (more than
/// two million strata).
Exposure expose(const SceneLook& scene, const Camera& camera, const PoseSource& poses, const ExposureOptions& options);

/// A single instant (no flicker, no time): the radiance every pixel sees.
Image renderInstant(const SceneLook& scene, const Camera& camera, const Pose& pose);

}  // namespace dm
