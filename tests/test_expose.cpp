// The observer camera over time: rest, conservation of radiance under
// motion, the half-pixel criterion, flicker, and thread independence.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "core/steady.hpp"
#include "render/expose.hpp"

using namespace dm;

namespace {

const Cylinder tube{0.064, 0.008, 0.007, 0.01};

// A scene with a plain table and the body under flat light (ambient only),
// so every surface point shows its albedo.
SceneLook flatScene(const Paint& paint) {
  SceneLook look;
  look.body = tube;
  look.paint = paint;
  look.tableColour = {0.3, 0.3, 0.3};
  look.gridSpacing = 0;
  look.lights = {1.0, 0.0, Vec3::UnitZ()};
  return look;
}

// A marked scene under the default lights, with a grid.
SceneLook markedScene() {
  Paint paint;
  Marking m;
  m.kind = MarkingKind::RimPatch;
  m.colour = {0.8, 0.05, 0.05};
  m.fromAngle = 0;
  m.toAngle = 0.4;
  paint.markings = {m};
  SceneLook look = flatScene(paint);
  look.gridSpacing = 0.01;
  look.lights = {0.35, 0.75, Vec3(0.3, 0.2, 0.93).normalized()};
  return look;
}

// The exact steady spin of the tube at `revPerS` (end A raised).
SteadyMotion steadyTube(double revPerS) {
  const PatternResult p = patternAtPrecession(tube, revPerS * k::twoPi);
  REQUIRE(p.found);
  SteadyMotion m;
  m.body = tube;
  m.spin = p.spin;
  return m;
}

ExposureOptions options(ExposureMode mode, double start, double duration) {
  ExposureOptions o;
  o.timing.mode = mode;
  o.timing.start = start;
  o.timing.duration = duration;
  o.threads = 2;
  return o;
}

double largestDifference(const Image& a, const Image& b) {
  double d = 0;
  for (std::size_t i = 0; i < a.rgb.size(); ++i) d = std::max(d, double(std::abs(a.rgb[i] - b.rgb[i])));
  return d;
}

}  // namespace

TEST_CASE("a body at rest exposes to its single-frame render", "[expose]") {
  const SceneLook look = markedScene();
  const SteadyMotion m = steadyTube(8);
  const Pose still = m.poseAt(0.013);
  const PoseSource rest = [still](double) { return still; };
  const Camera top = topCamera(Vec3::Zero(), 0.1, 96);
  const Camera eye = visitorCamera(Vec3(0, 0, 0.02), 0.5, 0.3, 1.0, 0.25, 96);
  for (const Camera& cam : {top, eye})
    for (ExposureMode mode : {ExposureMode::Camera, ExposureMode::Eye}) {
      const Exposure e = expose(look, cam, rest, options(mode, 1.0, 0.3));
      // Every sample of a still body is the instant's radiance; the ratio of
      // the sums differs from it by rounding only (the issue asks 1e-6).
      CHECK(largestDifference(e.image, renderInstant(look, cam, still)) < 1e-6);
      CHECK(e.stats.largestStepPx == 0.0);
    }
}

TEST_CASE("the outline an exposure samples within holds the whole body, at any shape and tilt", "[expose]") {
  // renderInstant() casts every pixel; a still exposure casts only within
  // the body's outline (end ellipses and the rectangle between, widened by
  // a pixel). Equal images mean no pixel the body covers was left out.
  const Cylinder shapes[] = {tube, {0.08, 0.005, 0, 0.01}, {0.004, 0.02, 0, 0.01}, {0.01, 0.02, 0.015, 0.01}};
  const double tilts[] = {0.0, 0.03, 0.5, 1.2, k::pi / 2};
  const Camera top = topCamera(Vec3(0.003, -0.002, 0), 0.1, 80);
  const Camera eye = visitorCamera(Vec3::Zero(), 0.25, 0.3, 2.0, 0.4, 80);
  SceneLook look = markedScene();
  for (const Cylinder& c : shapes)
    for (double tilt : tilts) {
      look.body = c;
      Pose still;
      still.worldFromBody = Quat(Eigen::AngleAxisd(0.7, Vec3::UnitZ()) * Eigen::AngleAxisd(k::pi / 2 - tilt, Vec3::UnitY()));
      still.position = Vec3(0.004, 0.001, c.outerRadius + c.length / 2);
      const PoseSource rest = [still](double) { return still; };
      for (const Camera& cam : {top, eye}) {
        const Exposure e = expose(look, cam, rest, options(ExposureMode::Camera, 0.0, 0.1));
        // Every sample is the instant's radiance; the ratio of the sums
        // differs from it by rounding only.
        CHECK(largestDifference(e.image, renderInstant(look, cam, still)) < 1e-6);
      }
    }
}

TEST_CASE("a uniform body spinning steadily conserves the swept annulus' mean radiance", "[expose]") {
  Paint uniform;
  uniform.body = uniform.bore = {0.9, 0.9, 0.9};
  const SceneLook look = flatScene(uniform);
  const SteadyMotion m = steadyTube(8);
  const double span = 0.1;
  const int size = 160;
  const Camera cam = topCamera(Vec3::Zero(), span, size);
  // Two whole precession revolutions: every azimuth is swept equally often.
  const double duration = 2 * k::twoPi / m.spin.precession;
  const Exposure e = expose(look, cam, [m](double t) { return m.poseAt(t); }, options(ExposureMode::Camera, 0.0, duration));
  // Mean over the pixels within 45 mm of the centre (the sweep reaches
  // L/2 cos a + R sin a < 33 mm).
  double sum = 0;
  int count = 0;
  for (int y = 0; y < size; ++y)
    for (int x = 0; x < size; ++x) {
      const double px = (x + 0.5 - size / 2.0) * span / size, py = (y + 0.5 - size / 2.0) * span / size;
      if (std::hypot(px, py) > 0.045) continue;
      sum += e.image.at(x, y).r;
      ++count;
    }
  // Analytic: the body's silhouette from above is the rectangle 2R x L cos a
  // plus two half-ellipses of semi-axes R and R sin a (our derivation); over
  // whole turns each pixel's coverage averages to silhouette area / disc area.
  const double a = m.spin.tilt, R = tube.outerRadius, L = tube.length;
  const double silhouette = 2 * R * L * std::cos(a) + k::pi * R * R * std::sin(a);
  const double pixelArea = (span / size) * (span / size);
  const double expected = 0.3 + (0.9 - 0.3) * silhouette / (count * pixelArea);
  // Tolerance: pixel centres count the turning silhouette's area to about
  // its perimeter in pixels over the area in pixels, ~1e-2 per instant,
  // averaging down over the ~8000 orientations; 2e-3 of the mean holds it.
  CHECK(sum / count == Approx(expected).epsilon(2e-3));
}

TEST_CASE("time strata resolve the motion to half a pixel, and no finer than needed", "[expose]") {
  const SceneLook look = markedScene();
  const SteadyMotion m = steadyTube(8);
  const double span = 0.1;
  const int size = 128;
  const Camera cam = topCamera(Vec3::Zero(), span, size);
  const double duration = 0.05;
  const Exposure e = expose(look, cam, [m](double t) { return m.poseAt(t); }, options(ExposureMode::Camera, 0.0, duration));
  CHECK(e.stats.largestStepPx <= 0.5);
  // Independent image speed: the horizontal speed of the surface, w x (x - c)
  // with the exact angular velocity, over 720 points on each rim (the
  // fastest points lie on the rims: the speed is convex in body position).
  double fastest = 0;
  const Pose pose = m.poseAt(0.0);
  const Vec3 w = m.spinAt(0.0);
  for (double z : {tube.length / 2, -tube.length / 2})
    for (int i = 0; i < 720; ++i) {
      const double t = k::twoPi * i / 720;
      const Vec3 r = pose.worldFromBody * Vec3(tube.outerRadius * std::cos(t), tube.outerRadius * std::sin(t), z);
      const Vec3 v = w.cross(r);
      fastest = std::max(fastest, std::hypot(v.x(), v.y()));
    }
  const double pxPerS = fastest / (span / size);
  const double needed = duration * pxPerS / 0.5;
  CHECK(e.stats.strata >= int(std::floor(needed * (1 - 1e-3))));
  // The steps aim at 95 % of the limit; allow 15 % over the bare minimum.
  CHECK(e.stats.strata <= int(std::ceil(needed * 1.15)));
  CHECK(e.stats.fastestImageSpeed == Approx(pxPerS).epsilon(0.02));
  // Interpolating between knots moves no point by more than 1e-3 px.
  CHECK(e.stats.interpolationErrorPx < 1e-3);
}

TEST_CASE("exposures are bit-identical at any thread count", "[expose]") {
  const SceneLook look = markedScene();
  const SteadyMotion m = steadyTube(7);
  const Camera cam = visitorCamera(Vec3(0, 0, 0.02), 0.8, 0.5, 0.3, 0.12, 96);
  ExposureOptions o = options(ExposureMode::Eye, 0.0, 0.25);
  const PoseSource poses = [m](double t) { return m.poseAt(t); };
  o.threads = 1;
  const Exposure one = expose(look, cam, poses, o);
  o.threads = 2;
  const Exposure two = expose(look, cam, poses, o);
  o.threads = 3;
  const Exposure three = expose(look, cam, poses, o);
  CHECK(one.image.rgb == two.image.rgb);
  CHECK(one.image.rgb == three.image.rgb);
  CHECK(one.plain.rgb == two.plain.rgb);
  // A different seed moves the sample times: the image changes, a little.
  o.seed = 99;
  const Exposure other = expose(look, cam, poses, o);
  CHECK(other.image.rgb != one.image.rgb);
}

TEST_CASE("flicker scales a still scene by its mean over the window; the eye fuses 100 Hz", "[expose]") {
  const SceneLook look = markedScene();
  const SteadyMotion m = steadyTube(8);
  const Pose still = m.poseAt(0.0);
  const PoseSource rest = [still](double) { return still; };
  const Camera cam = topCamera(Vec3::Zero(), 0.1, 64);
  const Image instant = renderInstant(look, cam, still);
  // Camera: 12.5 ms of a 100 Hz sine, 1.25 periods: mean factor
  // 1 + d (1 - cos(2 pi 1.25)) / (2 pi 1.25) in closed form.
  ExposureOptions camera = options(ExposureMode::Camera, 0.0, 0.0125);
  camera.timing.flicker = {Waveform::Sine, 100, 0.5};
  const double mean = 1 + 0.5 * (1 - std::cos(k::twoPi * 1.25)) / (k::twoPi * 1.25);
  const Exposure lit = expose(look, cam, rest, camera);
  for (std::size_t i = 0; i < lit.image.rgb.size(); i += 97) CHECK(lit.image.rgb[i] == Approx(instant.rgb[i] * mean).epsilon(1e-6));
  // Eye: 100 Hz at full depth is above fusion; Talbot-Plateau law (the
  // steady level is seen) to within |H(100 Hz)| < 1e-3 of Watson's filter.
  ExposureOptions eye = options(ExposureMode::Eye, 0.0, 0.5);
  eye.timing.flicker = {Waveform::RectifiedMains, 100, 1.0};
  const Exposure fused = expose(look, cam, rest, eye);
  for (std::size_t i = 0; i < fused.image.rgb.size(); i += 97)
    CHECK(fused.image.rgb[i] == Approx(instant.rgb[i]).epsilon(1e-3));
}
