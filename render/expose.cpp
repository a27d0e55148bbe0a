#include "render/expose.hpp"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <thread>
#include <vector>

#include "core/constants.hpp"

namespace dm {

PoseSource poseSourceOf(const Trajectory& trajectory) {
  return [&trajectory](double t) { return trajectory.poseAt(t); };
}

namespace {

// ---- body frames ----------------------------------------------------------

// The body-from-lab map at one instant, x_body = rotation x_lab - shift, and
// the key light's direction in body axes.
struct BodyFrame {
  double rotation[9];  // row-major
  double shift[3];
  double light[3];
};

BodyFrame bodyFrameOf(const Pose& pose, const Vec3& keyDirection) {
  const Mat3 m = pose.worldFromBody.toRotationMatrix().transpose();
  const Vec3 q = m * pose.position, l = m * keyDirection;
  BodyFrame f;
  for (int r = 0; r < 3; ++r) {
    for (int c = 0; c < 3; ++c) f.rotation[3 * r + c] = m(r, c);
    f.shift[r] = q[r];
    f.light[r] = l[r];
  }
  return f;
}

// The frame a fraction u of the way from a to b, entry by entry. Between two
// knots a body point then moves on a straight line; the map stays a rotation
// to within (rotation angle)^2 / 8, under 1e-5 at the strata used here.
BodyFrame lerpFrame(const BodyFrame& a, const BodyFrame& b, double u) {
  BodyFrame f;
  for (int i = 0; i < 9; ++i) f.rotation[i] = a.rotation[i] + u * (b.rotation[i] - a.rotation[i]);
  for (int i = 0; i < 3; ++i) {
    f.shift[i] = a.shift[i] + u * (b.shift[i] - a.shift[i]);
    f.light[i] = a.light[i] + u * (b.light[i] - a.light[i]);
  }
  return f;
}

// Where an interpolated frame places body points in the lab (the inverse
// of its map, inverted once for all the points asked).
struct LabPlacement {
  Mat3 labFromBody;
  Vec3 shift;
  explicit LabPlacement(const BodyFrame& f) : shift(f.shift[0], f.shift[1], f.shift[2]) {
    Mat3 m;
    for (int r = 0; r < 3; ++r)
      for (int c = 0; c < 3; ++c) m(r, c) = f.rotation[3 * r + c];
    labFromBody = m.inverse();
  }
  Vec3 operator()(const Vec3& bodyPoint) const { return labFromBody * (bodyPoint + shift); }
};

// ---- one sample -----------------------------------------------------------

// Ray parameter where a lab ray meets the table plane z = 0 (infinity if never).
double tableDistance(const Ray& ray) {
  if (!(ray.direction.z() < 0)) return std::numeric_limits<double>::infinity();
  return -ray.origin.z() / ray.direction.z();
}

// The rays of all pixels in body coordinates at one instant, affine in the
// pixel's image coordinates (x, y): origin o0 + x ox + y oy, direction
// d0 + x dx + y dy; and the key light's direction in body axes. Linear in
// the body frame, so interpolating maps interpolates frames.
struct RayMap {
  double v[21];  // o0, ox, oy, d0, dx, dy, light: three each
};

RayMap rayMapOf(const Camera& camera, const BodyFrame& f) {
  const Ray base = camera.rayAt(0, 0), alongX = camera.rayAt(1, 0), alongY = camera.rayAt(0, 1);
  const Vec3 lab[6] = {base.origin, alongX.origin - base.origin, alongY.origin - base.origin,
                       base.direction, alongX.direction - base.direction, alongY.direction - base.direction};
  RayMap map;
  for (int k = 0; k < 6; ++k) {
    const bool point = k == 0;  // only the base origin is a point; the rest are vectors
    for (int r = 0; r < 3; ++r) {
      const double* m = f.rotation + 3 * r;
      map.v[3 * k + r] = m[0] * lab[k].x() + m[1] * lab[k].y() + m[2] * lab[k].z() - (point ? f.shift[r] : 0.0);
    }
  }
  for (int r = 0; r < 3; ++r) map.v[18 + r] = f.light[r];
  return map;
}

RayMap lerpMap(const RayMap& a, const RayMap& b, double u) {
  RayMap m;
  for (int i = 0; i < 21; ++i) m.v[i] = a.v[i] + u * (b.v[i] - a.v[i]);
  return m;
}

// A ray map ready for sampling along one row at a time: with an
// orthographic camera every ray has the same direction, so its terms are
// worked out once; the row's terms y oy and y dy once per row.
struct SamplingMap {
  RayMap map;
  bool sharedDirection = false;
  Vec3 direction = -Vec3::UnitZ();  // the shared direction (orthographic)
  DirectionTerms terms{Vec3::UnitZ()};
  double rowOrigin[3] = {0, 0, 0}, rowDirection[3] = {0, 0, 0};
  SamplingMap(const RayMap& m, bool orthographic)
      : map(m), sharedDirection(orthographic), direction(m.v[9], m.v[10], m.v[11]), terms(direction) {}
  // Sets the row terms for image row y.
  void setRow(double y) {
    for (int r = 0; r < 3; ++r) {
      rowOrigin[r] = y * map.v[6 + r];
      rowDirection[r] = y * map.v[15 + r];
    }
  }
  // The origin of the ray of image point x on the current row.
  Vec3 originAt(double x) const {
    const double* v = map.v;
    return {v[0] + x * v[3] + rowOrigin[0], v[1] + x * v[4] + rowOrigin[1], v[2] + x * v[5] + rowOrigin[2]};
  }
};

// The ray of image point x on the map's current row in body coordinates
// as the map places the body: origin o and direction d.
inline void pixelRay(const SamplingMap& sm, double x, Vec3& o, Vec3& d) {
  const double* v = sm.map.v;
  o = sm.originAt(x);
  d = sm.sharedDirection ? sm.direction
                         : Vec3(v[9] + x * v[12] + sm.rowDirection[0], v[10] + x * v[13] + sm.rowDirection[1],
                                v[11] + x * v[14] + sm.rowDirection[2]);
}

// What one sample sees of the body (unflickered): its radiance, and the
// part of it the markings make, the radiance less that of the unpainted
// body at the same point (Lambert shading is linear in the albedo).
struct BodySample {
  Rgb radiance;
  Rgb markDelta;
  bool marked = false;  // a marking covers the point (else markDelta is zero)
};

// The sample of a hit whose albedo is `albedo`, lit at cosKey.
inline BodySample bodySample(const SceneLights& lights, const Rgb& albedo, const Rgb& unpainted, double cosKey) {
  const Rgb delta{albedo.r - unpainted.r, albedo.g - unpainted.g, albedo.b - unpainted.b};
  return {shade(lights, albedo, cosKey), shade(lights, delta, cosKey), delta.r != 0 || delta.g != 0 || delta.b != 0};
}

// The sample where the ray of image point x on the map's current row meets
// the body placed by the map; false when it misses the body or meets the
// table first (at ray parameter `tableT`).
bool bodyRadiance(const SceneLook& scene, const BodyShape& shape, const PaintLookup& paint, const SamplingMap& sm,
                  double x, double tableT, BodySample& sample) {
  Vec3 o, d;
  pixelRay(sm, x, o, d);
  BodyHit hit;
  const bool met = sm.sharedDirection ? intersectBody(shape, o, d, sm.terms, hit)
                                      : intersectBody(shape, o, d, DirectionTerms(d), hit);
  if (!met || hit.t >= tableT) return false;
  const double* light = sm.map.v + 18;
  const double cosKey = hit.normal.x() * light[0] + hit.normal.y() * light[1] + hit.normal.z() * light[2];
  sample = bodySample(scene.lights, paint.albedoAt(hit), paint.unpaintedAt(hit), cosKey);
  return true;
}

// ---- the half-pixel criterion ---------------------------------------------

// Points sampled on the two rim circles, body coordinates.
constexpr int rimSamplesPerEnd = 32;

std::vector<Vec3> rimPoints(const Cylinder& c) {
  std::vector<Vec3> points;
  for (double z : {c.length / 2, -c.length / 2})
    for (int i = 0; i < rimSamplesPerEnd; ++i) {
      const double a = k::twoPi * i / rimSamplesPerEnd;
      points.emplace_back(c.outerRadius * std::cos(a), c.outerRadius * std::sin(a), z);
    }
  return points;
}

// Largest image distance (px) between where two placements put the same
// rim sample; infinity when a point is not in front of the camera.
template <class PlaceA, class PlaceB>
double largestImageGap(const Camera& camera, const std::vector<Vec3>& rim, const PlaceA& placeA, const PlaceB& placeB) {
  double gap = 0;
  for (const Vec3& b : rim) {
    double xa, ya, xb, yb;
    if (!camera.project(placeA(b), xa, ya) || !camera.project(placeB(b), xb, yb))
      return std::numeric_limits<double>::infinity();
    gap = std::max(gap, std::hypot(xb - xa, yb - ya));
  }
  return gap;
}

// Bound on the image motion (px) of every surface point, bore and faces
// included, from pose a to pose b. Proof: with an orthographic camera the
// image displacement of a body point is an affine function of its body
// coordinates, so its length is convex and peaks at an extreme point of the
// solid cylinder, i.e. on one of the two rim circles. On each circle the
// displacement traces an ellipse; the n rim samples span a polygon whose
// scaling by 1/cos(pi/n) about the ellipse's centre c contains it, so
// |displacement| <= |c| (1/cos - 1) + max_k |d_k| / cos <= max_k |d_k| (2/cos(pi/n) - 1),
// as |c| <= max_k |d_k|. A perspective camera is affine to first order in
// the body's size over its distance, which the same bound then carries.
double motionBound(const Camera& camera, const std::vector<Vec3>& rim, const Pose& a, const Pose& b) {
  const double factor = 2.0 / std::cos(k::pi / rimSamplesPerEnd) - 1.0;
  return factor * largestImageGap(
                      camera, rim, [&](const Vec3& p) { return a.toWorld(p); }, [&](const Vec3& p) { return b.toWorld(p); });
}

// Largest turn of the body within one stratum, rad: keeps the interpolated
// frame a rotation to within 1e-3 even for a body a few pixels across, and
// stops a whole turn between knots from looking like no motion.
constexpr double maxStratumTurn = 0.09;
// Most strata one exposure may use (memory: about 400 bytes each).
constexpr std::size_t maxStrata = 2'000'000;

// The body's outline in the image at one instant: the images of the axis
// ends, the unit vector and length (px) from end A's to end B's, and each
// end's outline, an ellipse with semi-axes `acrossPx` across the projected
// axis and `alongPx` along it. With an orthographic camera the ellipse is
// the rim circle's exact image (R across, R |axis . forward| along); in
// perspective a disc holding the image of a ball of radius R about the end.
// The body's image is then the two end ellipses and the rectangle of the
// axis widened by acrossPx between them (the hull of the two rims).
struct Outline {
  double ax = 0, ay = 0, bx = 0, by = 0;
  double ux = 1, uy = 0, length = 0;
  double acrossPx = 0, alongPx = 0;
  bool bounded = false;  // false: the outline is unknown, sample the whole image
};

Outline outlineOf(const Cylinder& c, const Camera& camera, const Pose& pose) {
  Outline k;
  const Vec3 endA = pose.toWorld(Vec3(0, 0, c.length / 2)), endB = pose.toWorld(Vec3(0, 0, -c.length / 2));
  if (!camera.project(endA, k.ax, k.ay) || !camera.project(endB, k.bx, k.by)) return k;
  k.length = std::hypot(k.bx - k.ax, k.by - k.ay);
  if (k.length > 1e-9) {
    k.ux = (k.bx - k.ax) / k.length;
    k.uy = (k.by - k.ay) / k.length;
  }
  if (camera.orthographic) {
    k.acrossPx = c.outerRadius / camera.pixelScale;
    k.alongPx = k.acrossPx * std::abs((pose.worldFromBody * Vec3::UnitZ()).dot(camera.forward));
  } else {
    // A ball of radius R at depth z projects within R / ((z - R) s) pixels of
    // its centre on the axis, and within 1/cos^2 of that off the axis.
    const double nearest = std::min(camera.depthOf(endA), camera.depthOf(endB)) - c.outerRadius;
    if (nearest <= 1e-6) return k;
    const double offAxis = std::cos(camera.halfDiagonalAngle());
    k.acrossPx = k.alongPx = c.outerRadius / (nearest * camera.pixelScale) / (offAxis * offAxis);
  }
  k.bounded = true;
  return k;
}

// A knot: the pose at a stratum boundary, its body frame, ray map and outline.
struct Knot {
  double t = 0;
  Pose pose;
  BodyFrame frame;
  RayMap map;
  Outline outline;
};

Knot makeKnot(const SceneLook& scene, const Camera& camera, double t, const Pose& pose) {
  Knot k;
  k.t = t;
  k.pose = pose;
  k.frame = bodyFrameOf(pose, scene.lights.keyDirection);
  k.map = rayMapOf(camera, k.frame);
  k.outline = outlineOf(scene.body, camera, pose);
  return k;
}

// One stratum: the time between two knots, with its weights.
struct Stratum {
  double weight = 0;  // integral of the time weight
  double light = 0;   // integral of the time weight times the flicker factor
  double stepPx = 0;  // image motion bound within it
  bool counts = true;
};

struct TimeGrid {
  std::vector<Knot> knots;
  std::vector<Stratum> strata;
};

// Places knots from the window's start to its end so that each stratum
// moves every surface point at most options.maxStepPx in the image (steps
// grow or shrink with the measured motion; a rejected step is retried
// shorter), then weighs each stratum.
TimeGrid buildTimeGrid(const SceneLook& scene, const Camera& camera, const PoseSource& poses,
                       const ExposureOptions& options, ExposureStats& stats) {
  const TimeWeighting& timing = options.timing;
  const std::vector<Vec3> rim = rimPoints(scene.body);
  const double target = 0.95 * options.maxStepPx;
  TimeGrid grid;
  grid.knots.push_back(makeKnot(scene, camera, timing.start, poses(timing.start)));
  double dt = timing.duration / 1024;
  std::vector<double> steps;
  while (grid.knots.back().t < timing.end()) {
    const Knot& last = grid.knots.back();
    double next = std::min(timing.end(), last.t + dt);
    if (timing.end() - next < 1e-9 * timing.duration) next = timing.end();
    const Pose pose = poses(next);
    const double step = motionBound(camera, rim, last.pose, pose);
    const double turn = last.pose.worldFromBody.angularDistance(pose.worldFromBody);
    if (step > options.maxStepPx || turn > maxStratumTurn) {
      if (next - last.t < 1e-12 * std::max(1.0, timing.duration))
        throw std::runtime_error("the body moves too fast to resolve in time (image motion " + std::to_string(step) +
                                 " px in " + std::to_string(next - last.t) + " s)");
      dt = (next - last.t) * std::max(0.1, 0.9 * std::min(target / step, maxStratumTurn / std::max(turn, 1e-300)));
      continue;
    }
    const double used = next - last.t;
    steps.push_back(step);
    grid.knots.push_back(makeKnot(scene, camera, next, pose));
    if (grid.knots.size() > maxStrata)
      throw std::runtime_error("the motion needs more than " + std::to_string(maxStrata) +
                               " time strata; shorten the exposure or make the image smaller");
    const double grow = std::min(step > 0 ? target / step : 2.0, turn > 0 ? 0.95 * maxStratumTurn / turn : 2.0);
    dt = used * std::clamp(grow, 0.25, 2.0);
  }
  // Weigh the strata; in the eye's mode the response's far tail weighs
  // nothing a float image can hold, and those strata are not sampled.
  double total = 0;
  for (std::size_t s = 0; s + 1 < grid.knots.size(); ++s) {
    const TimeWeighting::Integral w = timing.integrate(grid.knots[s].t, grid.knots[s + 1].t);
    grid.strata.push_back({w.weight, w.light, steps[s], true});
    total += std::abs(w.weight) + std::abs(w.light);
  }
  for (Stratum& s : grid.strata) s.counts = std::abs(s.weight) + std::abs(s.light) > 1e-12 * total;
  // Report: strata, largest step, fastest image speed, interpolation error.
  stats.strata = int(grid.strata.size());
  for (std::size_t s = 0; s < grid.strata.size(); ++s) {
    const Knot& a = grid.knots[s];
    const Knot& b = grid.knots[s + 1];
    stats.weightedStrata += grid.strata[s].counts ? 1 : 0;
    stats.largestStepPx = std::max(stats.largestStepPx, grid.strata[s].stepPx);
    stats.fastestImageSpeed = std::max(stats.fastestImageSpeed, grid.strata[s].stepPx / (b.t - a.t));
    const double mid = 0.5 * (a.t + b.t);
    const Pose truePose = poses(mid);
    const LabPlacement drawn(lerpFrame(a.frame, b.frame, 0.5));
    stats.interpolationErrorPx = std::max(
        stats.interpolationErrorPx,
        largestImageGap(camera, rim, [&](const Vec3& p) { return truePose.toWorld(p); }, drawn));
  }
  return grid;
}

// ---- accumulation ---------------------------------------------------------

// A counter-based hash (splitmix64 finaliser): the same input, the same
// output, whatever thread asks.
std::uint64_t mix(std::uint64_t x) {
  x += 0x9e3779b97f4a7c15ULL;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ULL;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebULL;
  return x ^ (x >> 31);
}

// Where in each stratum pixel `index` samples: phase p of `phases` (at
// (p + 1/2) / phases of the stratum). One phase per pixel, so a pixel's
// successive samples lie exactly one stratum apart and no surface point
// moves more than maxStepPx between them; neighbouring pixels differ, so the
// leftover error is noise rather than a pattern. Sixteen phases place a
// sample to 1/32 of a stratum, 1/64 px of motion.
constexpr int phases = 16;

int samplePhase(std::uint64_t seed, std::uint64_t index) { return int(mix(mix(seed) ^ index) >> 60); }

double phaseOffset(int phase) { return (phase + 0.5) / phases; }

// An interval of image x, empty when lo > hi.
struct Span {
  double lo = std::numeric_limits<double>::infinity(), hi = -std::numeric_limits<double>::infinity();
  void unite(const Span& o) {
    lo = std::min(lo, o.lo);
    hi = std::max(hi, o.hi);
  }
};

// Where the line y = yc has lo <= (x - x0) gain + offset <= hi.
Span slabSpan(double gain, double offset, double lo, double hi, double x0) {
  if (std::abs(gain) < 1e-12) {
    if (offset < lo || offset > hi) return {};
    return {-std::numeric_limits<double>::infinity(), std::numeric_limits<double>::infinity()};
  }
  double a = (lo - offset) / gain, b = (hi - offset) / gain;
  if (a > b) std::swap(a, b);
  return {x0 + a, x0 + b};
}

// Margin (px) added to the outline on top of the stratum's motion: covers
// the perspective ball bound's first-order terms.
constexpr double outlineMarginPx = 1.0;

// An outline widened by w px in every direction, for one stratum: every
// point within w of the outline lies inside. An end ellipse E (semi-axes a
// across, b along, b <= a) widened by w lies in the ellipse of semi-axes
// a + w and sqrt(b^2 + w^2 + w (a + b^2 / a)): the support function of E
// plus w, squared, is a^2 c^2 + b^2 s^2 + 2 w h + w^2 with h the support,
// and 2 h <= a + h^2 / a gives at most (a + w)^2 c^2 + (b^2 + w^2 + w (a + b^2/a)) s^2.
// Sliding that ellipse along the axis sweeps the two end ellipses and the
// rectangle of half-width a + w between them.
struct OutlineBound {
  Outline outline;
  double across = 0, along = 0;  // widened end ellipse's semi-axes, px
  // The end ellipse's rows: x - cx = (-q dy +- sqrt(p - dy^2 / (across along)^2)) / p.
  double p = 0, q = 0, invAxes2 = 0;
  OutlineBound(const Outline& o, double w);
  // The span of row y = yc within the end ellipse about (cx, cy).
  Span endSpan(double cx, double cy, double yc) const;
};

OutlineBound::OutlineBound(const Outline& o, double w) : outline(o) {
  const double a = o.acrossPx, b = o.alongPx;
  across = a + w;
  along = std::sqrt(b * b + w * w + w * (a + b * b / a));
  const double invAcross2 = 1.0 / (across * across), invAlong2 = 1.0 / (along * along);
  p = o.ux * o.ux * invAlong2 + o.uy * o.uy * invAcross2;
  q = o.ux * o.uy * (invAlong2 - invAcross2);
  invAxes2 = invAcross2 * invAlong2;
}

Span OutlineBound::endSpan(double cx, double cy, double yc) const {
  const double dy = yc - cy, disc = p - dy * dy * invAxes2;
  if (disc < 0) return {};
  const double mid = cx - q * dy / p, half = std::sqrt(disc) / p;
  return {mid - half, mid + half};
}

// Columns [first, last] of the row whose centre is at image y = `yc` that
// the widened outline covers; false when none: the union of the spans of
// the two end ellipses and of the rectangle between them.
bool outlineColumns(const OutlineBound& bound, double yc, int width, int& first, int& last) {
  const Outline& k = bound.outline;
  Span span = bound.endSpan(k.ax, k.ay, yc);
  span.unite(bound.endSpan(k.bx, k.by, yc));
  if (k.length > 1e-9) {
    const Span along = slabSpan(k.ux, (yc - k.ay) * k.uy, 0, k.length, k.ax);
    const Span across = slabSpan(-k.uy, (yc - k.ay) * k.ux, -bound.across, bound.across, k.ax);
    const Span rect{std::max(along.lo, across.lo), std::min(along.hi, across.hi)};
    if (rect.lo <= rect.hi) span.unite(rect);
  }
  if (!(span.lo <= span.hi)) return false;
  first = std::max(0, int(std::ceil(span.lo - 0.5)));
  last = std::min(width - 1, int(std::floor(span.hi - 0.5)));
  return first <= last;
}

struct ExposeJob {
  const SceneLook& scene;
  const Camera& camera;
  const BodyShape& shape;
  const PaintLookup& paint;
  const TimeGrid& grid;
  const ExposureOptions& options;
  double lightTotal = 0, weightTotal = 0;
};

// The film of a block of rows: per pixel the sums of weight x radiance and
// of weight x the markings' part of it (three each per pixel) and of the
// weight the body covered, the ray parameter of the table, and the sample
// phase.
struct BlockFilm {
  int row0 = 0, width = 0;
  std::vector<double> sum, markSum, cover, table;
  std::vector<int> phase;
  BlockFilm(const ExposeJob& job, int firstRow, int rowEnd);
};

BlockFilm::BlockFilm(const ExposeJob& job, int firstRow, int rowEnd) : row0(firstRow), width(job.camera.width) {
  const std::size_t n = std::size_t(rowEnd - row0) * std::size_t(width);
  sum.assign(3 * n, 0.0);
  markSum.assign(3 * n, 0.0);
  cover.assign(n, 0.0);
  table.resize(n);
  phase.resize(n);
  for (int y = row0; y < rowEnd; ++y)
    for (int x = 0; x < width; ++x) {
      const std::size_t i = std::size_t(y - row0) * std::size_t(width) + std::size_t(x);
      table[i] = tableDistance(job.camera.rayAt(x + 0.5, y + 0.5));
      phase[i] = samplePhase(job.options.seed, std::size_t(y) * std::size_t(width) + std::size_t(x));
    }
}

// What the common case of a sample needs: a hit on the outer surface where
// no marking reaches. A local copy, so that the film's stores cannot alias
// it and the compiler keeps it in registers.
struct PlainOuterLook {
  BodyShape shape;
  PaintLookup::Stretch plain;
  SceneLights lights;
  Rgb body;
};

// The sample of image point x on the map's current row, as bodyRadiance()
// gives it, with the outer surface worked out in place and the commonest
// case, where no marking reaches, in plain numbers.
[[gnu::always_inline]] inline bool sampleRadiance(const ExposeJob& job, const PlainOuterLook& look,
                                                  const SamplingMap& sm, double x, double tableT, BodySample& sample) {
  if (!sm.sharedDirection) return bodyRadiance(job.scene, job.shape, job.paint, sm, x, tableT, sample);
  const Vec3 o = sm.originAt(x);
  const Vec3& d = sm.direction;
  const double* light = sm.map.v + 18;
  BoundsCrossing c;
  if (!crossCylinder(look.shape, o, d, sm.terms, c)) return false;
  const double t = c.cylIn, z = o.z() + t * d.z();
  // The outer normal (x, y, 0) / R at cylIn, as scene_detail::wallHit() gives it.
  const double nx = (o.x() + t * d.x()) * look.shape.invOuter, ny = (o.y() + t * d.y()) * look.shape.invOuter;
  const double cosKey = nx * light[0] + ny * light[1] + 0.0 * light[2];
  // Entering the outer surface in the plain stretch, which lies a margin
  // many orders above rounding inside the ends: the slab test would pass,
  // with enter = cylIn and leave = min(cylOut, slabOut) = cylOut, and is skipped.
  if (look.plain.contains(z) && t > 0 && t < c.cylOut && t < tableT) {
    sample = {shade(look.lights, look.body, cosKey), Rgb{0, 0, 0}, false};
    return true;
  }
  if (!crossSlab(look.shape, o, d, sm.terms, c)) return false;
  if (c.throughOuter()) {
    if (t >= tableT) return false;
    BodyHit hit;
    scene_detail::wallHit(o, d, t, SurfacePart::Outer, look.shape.outer, look.shape.invOuter, 1.0, hit);
    sample = bodySample(look.lights, job.paint.albedoAt(hit), look.body, cosKey);
    return true;
  }
  // Through an end plane: in full (recomputing keeps this path's values out of memory).
  return bodyRadiance(job.scene, job.shape, job.paint, sm, x, tableT, sample);
}

// Samples columns [first, last] of row y in one stratum of weight `light`
// into the film, with the stratum's maps, one per phase.
void sampleRow(const ExposeJob& job, std::vector<SamplingMap>& maps, int y, int first, int last, double light,
               BlockFilm& film) {
  for (SamplingMap& m : maps) m.setRow(y + 0.5);
  const PlainOuterLook look{job.shape, job.paint.plainStretch(), job.scene.lights, job.paint.bodyColour()};
  const std::size_t rowStart = std::size_t(y - film.row0) * std::size_t(film.width);
  const SamplingMap* phaseMaps = maps.data();
  const int* phase = film.phase.data() + rowStart;
  const double* table = film.table.data() + rowStart;
  double* sum = film.sum.data() + 3 * rowStart;
  double* markSum = film.markSum.data() + 3 * rowStart;
  double* cover = film.cover.data() + rowStart;
  for (int x = first; x <= last; ++x) {
    BodySample c;
    if (!sampleRadiance(job, look, phaseMaps[phase[x]], x + 0.5, table[x], c)) continue;
    sum[3 * x] += light * c.radiance.r;
    sum[3 * x + 1] += light * c.radiance.g;
    sum[3 * x + 2] += light * c.radiance.b;
    cover[x] += light;
    if (!c.marked) continue;
    markSum[3 * x] += light * c.markDelta.r;
    markSum[3 * x + 1] += light * c.markDelta.g;
    markSum[3 * x + 2] += light * c.markDelta.b;
  }
}

// Exposes rows [row0, row1) into the output images; returns the body samples cast.
std::uint64_t exposeRows(const ExposeJob& job, int row0, int row1, Exposure& out) {
  const int width = job.camera.width;
  BlockFilm film(job, row0, row1);
  // Stratum by stratum: every pixel the body's outline can reach takes its sample.
  std::uint64_t cast = 0;
  std::vector<SamplingMap> maps;
  for (std::size_t s = 0; s < job.grid.strata.size(); ++s) {
    const Stratum& stratum = job.grid.strata[s];
    if (!stratum.counts) continue;
    const Knot& a = job.grid.knots[s];
    const Knot& b = job.grid.knots[s + 1];
    const OutlineBound bound(a.outline, stratum.stepPx + outlineMarginPx);
    maps.clear();
    for (int y = row0; y < row1; ++y) {
      int first = 0, last = width - 1;
      if (a.outline.bounded && !outlineColumns(bound, y + 0.5, width, first, last)) continue;
      // The phases' maps, made when the body first reaches these rows.
      if (maps.empty())
        for (int p = 0; p < phases; ++p) maps.emplace_back(lerpMap(a.map, b.map, phaseOffset(p)), job.camera.orthographic);
      cast += std::uint64_t(last - first + 1);
      sampleRow(job, maps, y, first, last, stratum.light, film);
    }
  }
  // Strata where the body was absent show the background: film = A + bg (M - B).
  // The unpainted exposure is the plain one less the markings' part.
  for (int y = row0; y < row1; ++y)
    for (int x = 0; x < width; ++x) {
      const std::size_t i = std::size_t(y - row0) * std::size_t(width) + std::size_t(x);
      const double absent = job.lightTotal - film.cover[i];
      const double* sum = film.sum.data() + 3 * i;
      const double* mark = film.markSum.data() + 3 * i;
      const auto pixel = [&](const Rgb& bg, double keepMarks) {
        return Rgb{(sum[0] - (1 - keepMarks) * mark[0] + bg.r * absent) / job.weightTotal,
                   (sum[1] - (1 - keepMarks) * mark[1] + bg.g * absent) / job.weightTotal,
                   (sum[2] - (1 - keepMarks) * mark[2] + bg.b * absent) / job.weightTotal};
      };
      const Rgb plainTable = backgroundAt(job.scene, job.camera, x, y, false);
      out.image.set(x, y, pixel(backgroundAt(job.scene, job.camera, x, y, true), 1));
      out.plain.set(x, y, pixel(plainTable, 1));
      out.unpainted.set(x, y, pixel(plainTable, 0));
    }
  return cast;
}

// Runs `work(row0, row1)` over blocks of rows on `threads` workers; each
// block's result depends only on its rows, never on which worker ran it.
void forRowBlocks(int height, int threads, const std::function<void(int, int)>& work) {
  constexpr int rowsPerBlock = 8;
  const int blocks = (height + rowsPerBlock - 1) / rowsPerBlock;
  std::atomic<int> nextBlock{0};
  auto worker = [&] {
    for (int b = nextBlock++; b < blocks; b = nextBlock++) work(b * rowsPerBlock, std::min(height, (b + 1) * rowsPerBlock));
  };
  const int count = std::max(1, std::min(threads, blocks));
  std::vector<std::thread> pool;
  for (int t = 1; t < count; ++t) pool.emplace_back(worker);
  worker();
  for (std::thread& t : pool) t.join();
}

int threadCount(int requested) {
  if (requested > 0) return requested;
  return std::max(1, int(std::thread::hardware_concurrency()));
}

}  // namespace

Exposure expose(const SceneLook& scene, const Camera& camera, const PoseSource& poses, const ExposureOptions& options) {
  if (!(options.timing.duration > 0)) throw std::invalid_argument("exposure duration must be positive");
  Exposure out;
  out.image = Image(camera.width, camera.height);
  out.plain = Image(camera.width, camera.height);
  out.unpainted = Image(camera.width, camera.height);
  const TimeGrid grid = buildTimeGrid(scene, camera, poses, options, out.stats);
  const PaintLookup paint(scene.body, scene.paint);
  const BodyShape shape(scene.body);
  ExposeJob job{scene, camera, shape, paint, grid, options};
  for (const Stratum& s : grid.strata) {
    job.lightTotal += s.light;
    job.weightTotal += s.weight;
  }
  out.stats.weightTotal = job.weightTotal;
  out.stats.pixelSamples = std::uint64_t(out.stats.weightedStrata) * std::uint64_t(camera.width) * std::uint64_t(camera.height);
  std::atomic<std::uint64_t> cast{0};
  forRowBlocks(camera.height, threadCount(options.threads),
               [&](int row0, int row1) { cast += exposeRows(job, row0, row1, out); });
  out.stats.bodySamples = cast;
  return out;
}

Image renderInstant(const SceneLook& scene, const Camera& camera, const Pose& pose) {
  Image img(camera.width, camera.height);
  const PaintLookup paint(scene.body, scene.paint);
  const BodyShape shape(scene.body);
  SamplingMap map(rayMapOf(camera, bodyFrameOf(pose, scene.lights.keyDirection)), camera.orthographic);
  for (int y = 0; y < camera.height; ++y) {
    map.setRow(y + 0.5);
    for (int x = 0; x < camera.width; ++x) {
      BodySample c;
      if (!bodyRadiance(scene, shape, paint, map, x + 0.5, tableDistance(camera.rayAt(x + 0.5, y + 0.5)), c))
        c.radiance = backgroundAt(scene, camera, x, y);
      img.set(x, y, c.radiance);
    }
  }
  return img;
}

}  // namespace dm
