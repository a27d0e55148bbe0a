#include "render/view_scene.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>

#include "core/constants.hpp"
#include "core/pattern.hpp"

namespace dm {

namespace {

// Most points a trace keeps: enough for sharp cusps, few enough to draw fast.
constexpr std::size_t maxTracePoints = 2000;

// Reach of the millimetre grid lines around the spin centre, m.
constexpr double fineGridExtent = 0.04;

// A key that changes with the grid's inputs (FNV-1a over their bits); never 0.
std::uint64_t gridKeyOf(double radius, double spacing, const Rgb& colour) {
  std::uint64_t h = 14695981039346656037ull;
  for (double v : {radius, spacing, fineGridExtent, colour.r, colour.g, colour.b}) {
    std::uint64_t bits = 0;
    std::memcpy(&bits, &v, sizeof bits);
    for (int i = 0; i < 8; ++i) h = (h ^ ((bits >> (8 * i)) & 0xffu)) * 1099511628211ull;
  }
  return h | 1u;
}

Eigen::Vector3f toFloat(const Vec3& v) { return v.cast<float>(); }

Rgb scaled(const Rgb& c, double k) { return {c.r * k, c.g * k, c.b * k}; }

// Lifted towards white: keeps a hue but reads on a dark or painted background.
Rgb lifted(const Rgb& c, double amount) {
  return {c.r + (1 - c.r) * amount, c.g + (1 - c.g) * amount, c.b + (1 - c.b) * amount};
}

// Row of the atlas whose centre a region fraction f (0 at its start, 1 at its end) maps to, as v.
float atlasV(const AtlasLayout& l, int start, int rows, double f) {
  return float((start + 0.5 + f * (rows - 1)) / l.size);
}

void addVertex(Mesh& m, const Vec3& p, const Vec3& n, double u, float v) {
  m.vertices.push_back({{float(p.x()), float(p.y()), float(p.z())},
                        {float(n.x()), float(n.y()), float(n.z())},
                        {float(u), v}});
}

// Quads between two rings of `count` + 1 vertices starting at `a` and `b`.
void joinRings(Mesh& m, std::uint32_t a, std::uint32_t b, int count) {
  for (int i = 0; i < count; ++i) {
    const std::uint32_t a0 = a + i, a1 = a + i + 1, b0 = b + i, b1 = b + i + 1;
    m.indices.insert(m.indices.end(), {a0, b0, a1, a1, b0, b1});
  }
}

// A cylindrical wall (outer or bore) from end A to end B.
void addWall(Mesh& m, double radius, double half, int segments, const AtlasLayout& l, int start, int rows,
             double normalSign) {
  const std::uint32_t ringA = std::uint32_t(m.vertices.size());
  for (int end = 0; end < 2; ++end) {
    const double z = end == 0 ? half : -half;
    for (int i = 0; i <= segments; ++i) {
      const double th = k::twoPi * i / segments;
      const Vec3 radial(std::cos(th), std::sin(th), 0);
      addVertex(m, radius * radial + Vec3(0, 0, z), normalSign * radial, double(i) / segments,
                atlasV(l, start, rows, end));
    }
  }
  joinRings(m, ringA, ringA + segments + 1, segments);
}

// An end face: rings from the rim in to the bore (or the axis).
void addFace(Mesh& m, const Cylinder& c, End e, int segments, const AtlasLayout& l) {
  constexpr int rings = 4;
  const double z = endSign(e) * c.length / 2;
  const Vec3 normal(0, 0, endSign(e));
  const std::uint32_t first = std::uint32_t(m.vertices.size());
  for (int k = 0; k < rings; ++k) {
    const double f = double(k) / (rings - 1);
    const double rho = c.outerRadius - f * (c.outerRadius - c.innerRadius);
    for (int i = 0; i <= segments; ++i) {
      const double th = k::twoPi * i / segments;
      addVertex(m, Vec3(rho * std::cos(th), rho * std::sin(th), z), normal, double(i) / segments,
                atlasV(l, l.faceStart(e), l.faceRows, f));
    }
  }
  for (int k = 0; k + 1 < rings; ++k)
    joinRings(m, first + std::uint32_t(k * (segments + 1)), first + std::uint32_t((k + 1) * (segments + 1)), segments);
}

// Index of the first sample at or after time t (samples ascending in time).
std::size_t firstAtOrAfter(const std::vector<Sample>& s, double t) {
  return std::size_t(std::lower_bound(s.begin(), s.end(), t, [](const Sample& a, double v) { return a.t < v; }) -
                     s.begin());
}

SceneLine lineOf(const std::vector<Vec3>& points, const Rgb& colour, float width) {
  SceneLine line;
  line.colour = colour;
  line.width = width;
  line.points.reserve(points.size());
  for (const Vec3& p : points) line.points.push_back(toFloat(p));
  return line;
}

Pose poseOf(const Sample& s) { return {s.position, s.orientation}; }

// Lab positions of one point of each sample from `first` on, every `stride`-th.
template <class PointOf>
std::vector<Vec3> pathOf(const std::vector<Sample>& samples, std::size_t first, std::size_t stride, PointOf point) {
  std::vector<Vec3> out;
  for (std::size_t i = first; i < samples.size(); i += stride) out.push_back(point(samples[i]));
  return out;
}

// The paint colour at a marked point's place on the outer surface.
Rgb colourOfPoint(const Cylinder& c, const Paint& paint, const MarkedPoint& p) {
  SurfacePoint sp;
  sp.part = SurfacePart::Outer;
  sp.z = p.body.z();
  sp.angle = wrapAngle(std::atan2(p.body.y(), p.body.x()));
  sp.radius = c.outerRadius;
  return colourAt(c, paint, sp);
}

// The spin axis: a line through the centre along the angular velocity, an
// arrow head at the end the angular velocity points to.
SceneLine spinAxisLine(const Cylinder& c, const Sample& now) {
  SceneLine line;
  line.strip = false;
  line.colour = {0.85, 0.25, 0.9};
  line.width = 2;
  const double speed = now.spin.norm();
  if (speed < 1e-9) return line;
  const Vec3 dir = now.spin / speed;
  const double reach = 1.4 * (c.length / 2 + c.outerRadius);
  const Vec3 tip = now.position + reach * dir;
  line.points = {toFloat(now.position - reach * dir), toFloat(tip)};
  // Two barbs in a plane holding the axis.
  Vec3 side = dir.cross(up());
  if (side.norm() < 1e-6) side = dir.cross(Vec3::UnitX());
  side.normalize();
  const double barb = 0.15 * reach;
  for (double s : {1.0, -1.0}) {
    line.points.push_back(toFloat(tip));
    line.points.push_back(toFloat(tip - barb * dir + s * 0.5 * barb * side));
  }
  return line;
}

}  // namespace

SurfacePoint atlasTexelPoint(const Cylinder& c, const AtlasLayout& l, int column, int row) {
  SurfacePoint p;
  p.angle = k::twoPi * (column + 0.5) / l.size;
  auto fraction = [](int r, int start, int rows) { return rows > 1 ? double(r - start) / (rows - 1) : 0.0; };
  if (row < l.boreStart()) {
    p.part = SurfacePart::Outer;
    p.radius = c.outerRadius;
    p.z = c.length / 2 - fraction(row, l.outerStart(), l.outerRows) * c.length;
  } else if (row < l.faceStart(End::A)) {
    p.part = SurfacePart::Bore;
    p.radius = c.innerRadius;
    p.z = c.length / 2 - fraction(row, l.boreStart(), l.boreRows) * c.length;
  } else {
    const End e = row < l.faceStart(End::B) ? End::A : End::B;
    p.part = e == End::A ? SurfacePart::FaceA : SurfacePart::FaceB;
    p.z = endSign(e) * c.length / 2;
    p.radius = c.outerRadius - fraction(row, l.faceStart(e), l.faceRows) * (c.outerRadius - c.innerRadius);
  }
  return p;
}

BodyLook makeBodyLook(const Cylinder& c, const Paint& paint, int segments, const AtlasLayout& layout) {
  segments = std::clamp(segments, 8, 1024);
  BodyLook look;
  // Paint atlas: every texel coloured by the core's marking rules.
  look.atlas = Image(layout.size, layout.size);
  for (int row = 0; row < layout.size; ++row)
    for (int col = 0; col < layout.size; ++col) look.atlas.set(col, row, colourAt(c, paint, atlasTexelPoint(c, layout, col, row)));
  // Mesh: outer wall, bore (hollow bodies), both end faces.
  addWall(look.mesh, c.outerRadius, c.length / 2, segments, layout, layout.outerStart(), layout.outerRows, 1.0);
  if (c.innerRadius > 0)
    addWall(look.mesh, c.innerRadius, c.length / 2, segments, layout, layout.boreStart(), layout.boreRows, -1.0);
  addFace(look.mesh, c, End::A, segments, layout);
  addFace(look.mesh, c, End::B, segments, layout);
  return look;
}

std::vector<SceneLine> tableGrid(double radius, double spacing, double fineExtent, const Rgb& table) {
  std::vector<SceneLine> out;
  constexpr float lift = 1e-5f;  // 10 micrometres above the table: drawn over it, never visibly floating
  auto lines = [&](double step, double extent, const Rgb& colour, bool clipToDisk) {
    SceneLine l;
    l.strip = false;
    l.colour = colour;
    const int n = int(std::floor(extent / step));
    for (int i = -n; i <= n; ++i) {
      const double a = i * step;
      const double b = clipToDisk ? std::sqrt(std::max(0.0, radius * radius - a * a)) : extent;
      l.points.insert(l.points.end(), {Eigen::Vector3f(float(a), float(-b), lift), Eigen::Vector3f(float(a), float(b), lift),
                                       Eigen::Vector3f(float(-b), float(a), lift), Eigen::Vector3f(float(b), float(a), lift)});
    }
    out.push_back(std::move(l));
  };
  if (fineExtent > 0) lines(1e-3, std::min(fineExtent, radius / std::sqrt(2.0)), scaled(table, 0.82), false);
  if (spacing > 0) lines(spacing, radius, scaled(table, 0.55), true);
  return out;
}

ViewScene buildViewScene(const SceneSource& src, const SceneOverlays& ov) {
  const Scenario& sc = src.scenario;
  const Cylinder cyl = cylinderOf(sc.body);
  ViewScene v;
  v.tableRadius = sc.surface.tableRadius;
  v.tableColour = sc.surface.colour;
  const LightingSpec& light = sc.lighting;
  v.towardsKeyLight = Vec3(std::cos(light.keyElevation) * std::cos(light.keyAzimuth),
                           std::cos(light.keyElevation) * std::sin(light.keyAzimuth), std::sin(light.keyElevation));
  v.ambient = light.ambient;
  v.keyIntensity = light.keyIntensity;
  if (ov.grid) {
    v.grid = tableGrid(sc.surface.tableRadius, sc.surface.gridSpacing, fineGridExtent, sc.surface.colour);
    v.gridKey = gridKeyOf(sc.surface.tableRadius, sc.surface.gridSpacing, sc.surface.colour);
  }
  if (src.recent.empty()) return v;

  const Sample& now = src.recent.back();
  v.bodyPose = {now.position, now.orientation};
  // Point traces over the trail, thinned to a drawable number of points.
  const std::size_t first = firstAtOrAfter(src.recent, now.t - ov.trailSeconds);
  const std::size_t stride = std::max<std::size_t>(1, (src.recent.size() - first) / maxTracePoints + 1);
  // Floor and ceiling contacts are diametrically opposite through the centre.
  auto ceiling = [&](const Sample& s) { return ceilingContact(cyl, poseOf(s)); };
  auto floor = [&](const Sample& s) { return Vec3(2 * s.position - ceilingContact(cyl, poseOf(s))); };
  if (ov.floorTrace) v.lines.push_back(lineOf(pathOf(src.recent, first, stride, floor), {0.95, 0.3, 0.1}, 2));
  if (ov.ceilingTrace) v.lines.push_back(lineOf(pathOf(src.recent, first, stride, ceiling), {0.1, 0.75, 0.95}, 2));
  if (ov.markPaths)
    for (const MarkedPoint& m : markedPoints(cyl, sc.paint, sc.analysis.tracePoints)) {
      auto at = [&](const Sample& s) { return poseOf(s).toWorld(m.body); };
      v.lines.push_back(lineOf(pathOf(src.recent, first, stride, at), lifted(colourOfPoint(cyl, sc.paint, m), 0.25), 1.5f));
    }
  if (ov.centrePath && !src.record.empty()) {
    const std::size_t every = std::max<std::size_t>(1, src.record.size() / maxTracePoints + 1);
    std::vector<Vec3> path = pathOf(src.record, 0, every, [](const Sample& s) { return s.position; });
    path.push_back(now.position);
    v.lines.push_back(lineOf(path, {0.95, 0.9, 0.55}, 1.5f));
  }
  if (ov.spinAxis) v.lines.push_back(spinAxisLine(cyl, now));
  // The imaginary ceiling: a plane through the body's highest point.
  if (ov.ceiling) {
    v.ceilingVisible = true;
    v.ceilingCentre = Vec3(now.position.x(), now.position.y(), ceilingContact(cyl, v.bodyPose).z());
    v.ceilingHalfSize = 1.6 * (cyl.length / 2 + cyl.outerRadius);
    v.ceilingColour = {0.55, 0.8, 1.0};
    v.ceilingOpacity = 0.18;
  }
  return v;
}

}  // namespace dm
