#include "render/observe.hpp"

#include <cmath>
#include <stdexcept>

#include "core/colour.hpp"
#include "core/constants.hpp"
#include "core/io.hpp"
#include "core/kinematics.hpp"

namespace dm {

Observation observeSteady(const Scenario& s) {
  const Cylinder body = cylinderOf(s.body);
  const double precession = s.observer.steadyPrecession;
  const CentreOrbit orbit{s.observer.steadyOrbit};
  const PatternResult pattern = patternAtPrecession(body, precession, orbit);
  if (!pattern.found)
    throw ScenarioError("observer.steady_precession_rev_s",
                        "value " + fmt(precession / k::twoPi, 6) + " rev/s has no steady rolling state for this body" +
                            (orbit.rho == 0 ? std::string() : " with the centre orbiting " + fmt(orbit.rho * 1e3, 6) + " mm") +
                            "; the lowest with the centre still is " + fmt(minSteadyPrecession(body) / k::twoPi, 6) +
                            " rev/s");
  SteadyMotion motion;
  motion.body = body;
  motion.spin = pattern.spin;
  motion.raised = s.launch.pressedEnd;
  Observation seen;
  seen.poses = [motion](double t) { return motion.poseAt(t); };
  // The raised end's top circles the spin axis at the ceiling height, at
  // |b + rho| (with the centre still, as far out as the floor contact).
  seen.ring.centre = Vec3(motion.centre.x(), motion.centre.y(), pattern.spin.ceilingHeight);
  seen.ring.radius = pattern.spin.ringRadius;
  seen.visibleEnd = motion.raised;
  seen.steady = pattern.spin;
  return seen;
}

Observation observeRun(const Scenario& s, std::shared_ptr<const RunResult> run, double start, double end) {
  Observation seen;
  const Trajectory& trajectory = run->trajectory;
  seen.poses = [run](double t) { return run->trajectory.poseAt(t); };
  // The raised end at mid-window, if the body is rolling on a rim then.
  const double mid = 0.5 * (start + end);
  const std::size_t i = trajectory.indexAt(mid);
  const Phase phase = trajectory.empty() ? Phase::AtRest : trajectory.samples[i].phase;
  const Cylinder body = cylinderOf(s.body);
  if (phase == Phase::RollingA || phase == Phase::RollingB || phase == Phase::Sliding) {
    const AxisMotion axis = axisMotion(trajectory.poseAt(mid).worldFromBody, trajectory.spinAt(mid));
    seen.visibleEnd = axis.raisedEnd;
    seen.ring = ringOfRun(trajectory, body, axis.raisedEnd, start, end);
  } else {
    const Pose pose = trajectory.poseAt(mid);
    seen.ring.centre = pose.position;
    seen.ring.radius = 0;
  }
  seen.run = std::move(run);
  return seen;
}

double observedUntil(const ObserverSpec& o) {
  const double frames = o.frameCount > 1 ? double(o.frameCount - 1) / o.frameRate : 0.0;
  return o.start + frames + o.exposure;
}

ExposureResult exposeObservation(const Scenario& s, const Observation& seen, double start, int threads) {
  ExposureResult r;
  r.start = start;
  r.camera = cameraOf(s.observer, seen.ring.centre);
  ExposureOptions options;
  options.timing.mode = s.observer.mode;
  options.timing.start = start;
  options.timing.duration = s.observer.exposure;
  options.timing.flicker = flickerOf(s.lighting);
  options.threads = threads;
  options.seed = s.launch.seed;
  r.exposure = expose(sceneOf(s), r.camera, seen.poses, options);
  r.spots.ring = seen.ring;
  r.spots.threshold = s.observer.spotThreshold;
  if (seen.visibleEnd && seen.ring.radius > 0) r.spots = findSpots(r.exposure.plain, r.exposure.unpainted, r.camera, seen.ring, s.observer.spotThreshold, s.surface.tableRadius);
  return r;
}

namespace {

double finite(double v) {
  if (!std::isfinite(v)) throw std::domain_error("a non-finite number reached spots.json");
  return v;
}

}  // namespace

nlohmann::json spotsJson(const Scenario& s, const Observation& seen, const ExposureResult& r) {
  using json = nlohmann::json;
  json spots = json::array();
  for (const ImageSpot& spot : r.spots.spots)
    spots.push_back({{"azimuth_deg", finite(spot.azimuth / k::degree)},
                     {"radius_mm", finite(spot.radius * 1e3)},
                     {"contrast", finite(spot.contrast)},
                     {"width_deg", finite(spot.width / k::degree)},
                     {"colour", hexFromRgb(spot.colour)}});
  const ExposureStats& st = r.exposure.stats;
  json doc = {{"spot_count", r.spots.spots.size()},
              {"spots", spots},
              {"visible_end", seen.visibleEnd ? json(std::string(endName(*seen.visibleEnd))) : json(nullptr)},
              {"ring_radius_mm", finite(seen.ring.radius * 1e3)},
              {"ring_centre_mm", {finite(seen.ring.centre.x() * 1e3), finite(seen.ring.centre.y() * 1e3), finite(seen.ring.centre.z() * 1e3)}},
              {"ring_median_luminance", finite(r.spots.medianLuminance)},
              {"ring_mark_tint", finite(r.spots.markTint)},
              {"strongest_contrast", finite(r.spots.strongestContrast)},
              {"ring_share_against_table", finite(r.spots.seenShare)},
              {"threshold", finite(r.spots.threshold)},
              {"start_s", finite(r.start)},
              {"exposure_s", finite(s.observer.exposure)},
              {"mode", s.observer.mode == ExposureMode::Eye ? "eye" : "camera"},
              {"view", s.observer.view == ViewKind::Top ? "top" : "visitor"},
              {"image_size_px", s.observer.imageSize},
              {"sampling",
               {{"strata", st.strata},
                {"weighted_strata", st.weightedStrata},
                {"largest_step_px", finite(st.largestStepPx)},
                {"fastest_image_speed_px_s", finite(st.fastestImageSpeed)},
                {"interpolation_error_px", finite(st.interpolationErrorPx)},
                {"pixel_samples", st.pixelSamples},
                {"body_samples", st.bodySamples}}}};
  if (s.observer.view == ViewKind::Visitor) {
    doc["eye_height_mm"] = finite(s.observer.eyeHeight * 1e3);
    doc["eye_distance_mm"] = finite(s.observer.eyeDistance * 1e3);
    doc["eye_azimuth_deg"] = finite(s.observer.eyeAzimuth / k::degree);
  }
  if (seen.steady) {
    doc["steady_precession_rev_s"] = finite(seen.steady->precession / k::twoPi);
    doc["steady_tilt_deg"] = finite(seen.steady->tilt / k::degree);
    doc["spots_per_rev"] = finite(seen.steady->spotsPerRev);
    doc["steady_orbit_mm"] = finite(seen.steady->orbit * 1e3);
    doc["top_speed_mm_s"] = finite(seen.steady->topSpeed * 1e3);
  }
  return doc;
}

}  // namespace dm
