#include "render/scene.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/constants.hpp"

namespace dm {

SceneLook sceneOf(const Scenario& s) {
  SceneLook look;
  look.body = cylinderOf(s.body);
  look.paint = s.paint;
  look.tableColour = s.surface.colour;
  look.gridSpacing = s.surface.gridSpacing;
  look.tableRadius = s.surface.tableRadius;
  const LightingSpec& l = s.lighting;
  look.lights.ambient = l.ambient;
  look.lights.key = l.keyIntensity;
  look.lights.keyDirection = Vec3(std::cos(l.keyElevation) * std::cos(l.keyAzimuth),
                                  std::cos(l.keyElevation) * std::sin(l.keyAzimuth), std::sin(l.keyElevation));
  return look;
}

BodyShape::BodyShape(const Cylinder& c)
    : half(c.length / 2), outer(c.outerRadius), inner(c.innerRadius), outer2(outer * outer), inner2(inner * inner),
      invOuter(1.0 / outer), invInner(inner > 0 ? 1.0 / inner : 0.0) {}

DirectionTerms::DirectionTerms(const Vec3& d)
    : across(d.x() * d.x() + d.y() * d.y()), invAcross(across > 0 ? 1.0 / across : 0.0),
      invZ(d.z() != 0.0 ? 1.0 / d.z() : 0.0) {}

namespace {

// A hit at ray parameter t on a cylindrical wall of `radius` (1/radius
// given), its normal pointing away from the axis (`outward` +1) or towards it (-1).
bool wallHit(const Vec3& o, const Vec3& d, double t, SurfacePart part, double radius, double invRadius, double outward,
             BodyHit& hit) {
  hit.t = t;
  hit.part = part;
  hit.point = o + t * d;
  hit.radius = radius;
  hit.dirX = hit.point.x() * invRadius;
  hit.dirY = hit.point.y() * invRadius;
  hit.normal = Vec3(outward * hit.dirX, outward * hit.dirY, 0);
  return true;
}

}  // namespace

bool intersectBody(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms, BodyHit& hit) {
  constexpr double inf = std::numeric_limits<double>::infinity();
  // The infinite outer cylinder along the ray (tested first: most misses end here).
  const double a = terms.across, invA = terms.invAcross;
  const double b = o.x() * d.x() + o.y() * d.y();
  const double rho2 = o.x() * o.x() + o.y() * o.y();
  double cylIn = -inf, cylOut = inf;
  if (a > 0.0) {
    const double disc = b * b - a * (rho2 - s.outer2);
    if (disc < 0) return false;
    const double root = std::sqrt(disc);
    cylIn = (-b - root) * invA;
    cylOut = (-b + root) * invA;
  } else if (rho2 > s.outer2) {
    return false;
  }
  // The slab |z| <= L/2 along the ray.
  double slabIn = -inf, slabOut = inf;
  if (d.z() != 0.0) {
    const double ta = (s.half - o.z()) * terms.invZ, tb = (-s.half - o.z()) * terms.invZ;
    slabIn = std::min(ta, tb);
    slabOut = std::max(ta, tb);
  } else if (std::abs(o.z()) > s.half) {
    return false;
  }
  const double enter = std::max(cylIn, slabIn), leave = std::min(cylOut, slabOut);
  if (!(enter < leave) || enter <= 0) return false;
  // Entering through the outer surface.
  if (cylIn >= slabIn) return wallHit(o, d, cylIn, SurfacePart::Outer, s.outer, s.invOuter, 1.0, hit);
  // Entering through an end plane: the face annulus, or the bore's opening.
  const bool throughA = d.z() < 0;
  Vec3 p = o + slabIn * d;
  p.z() = throughA ? s.half : -s.half;
  const double faceRho2 = p.x() * p.x() + p.y() * p.y();
  if (faceRho2 >= s.inner2) {
    hit.t = slabIn;
    hit.part = throughA ? SurfacePart::FaceA : SurfacePart::FaceB;
    hit.point = p;
    hit.radius = std::sqrt(faceRho2);
    hit.dirX = hit.radius > 0 ? p.x() / hit.radius : 1.0;
    hit.dirY = hit.radius > 0 ? p.y() / hit.radius : 0.0;
    hit.normal = Vec3(0, 0, throughA ? 1.0 : -1.0);
    return true;
  }
  // Inside the bore: the wall is where the ray leaves the inner cylinder,
  // unless it leaves the slab (the far opening) first.
  if (!(a > 0.0)) return false;
  const double discInner = std::max(0.0, b * b - a * (rho2 - s.inner2));
  const double wall = (-b + std::sqrt(discInner)) * invA;
  if (!(wall < slabOut)) return false;
  return wallHit(o, d, wall, SurfacePart::Bore, s.inner, s.invInner, -1.0, hit);
}

bool intersectBody(const Cylinder& c, const Vec3& o, const Vec3& d, BodyHit& hit) {
  return intersectBody(BodyShape(c), o, d, DirectionTerms(d), hit);
}

// ---- paint look-up --------------------------------------------------------

PaintLookup::PaintLookup(const Cylinder& body, const Paint& paint) : body_(body), paint_(paint) {
  for (const Marking& m : paint.markings) {
    Compiled c;
    c.marking = m;
    c.fromX = std::cos(m.fromAngle);
    c.fromY = std::sin(m.fromAngle);
    c.toX = std::cos(m.toAngle);
    c.toY = std::sin(m.toAngle);
    c.span = wrapAngle(m.toAngle - m.fromAngle);
    if (c.span == 0.0 && m.toAngle != m.fromAngle) c.span = k::twoPi;  // a whole turn, as colourAt() reads it
    c.centreX = std::cos(m.angle);
    c.centreY = std::sin(m.angle);
    c.minCos = m.arcWidth / 2 >= k::pi ? -2.0 : std::cos(m.arcWidth / 2);
    marks_.push_back(c);
  }
}

namespace {

// True when direction (x, y) lies in the counter-clockwise arc of `span`
// radians starting at direction (fx, fy) and ending at (tx, ty), by signs of
// cross products instead of angles.
bool inArc(double x, double y, double fx, double fy, double tx, double ty, double span) {
  if (span >= k::twoPi) return true;
  if (span <= 0.0) return x == fx && y == fy;
  if (span < k::pi) return fx * y - fy * x >= 0 && x * ty - y * tx >= 0;
  // Outside the open complementary arc from `to` to `from` (no longer than pi).
  return !(tx * y - ty * x > 0 && x * fy - y * fx > 0);
}

bool onFace(SurfacePart part, End e) {
  return (part == SurfacePart::FaceA && e == End::A) || (part == SurfacePart::FaceB && e == End::B);
}

}  // namespace

bool PaintLookup::covers(const Compiled& c, const BodyHit& hit) const {
  const Marking& m = c.marking;
  const double fromEdge = body_.length / 2 - endSign(m.end) * hit.point.z();
  const double cx = hit.dirX, cy = hit.dirY;
  switch (m.kind) {
    case MarkingKind::Band:
      if (onFace(hit.part, m.end)) return true;
      return hit.part == SurfacePart::Outer && fromEdge <= m.width;
    case MarkingKind::RimPatch:
      // The cheap test of the extent first, then the arc.
      if (onFace(hit.part, m.end)) {
        if (!(body_.outerRadius - hit.radius <= m.width)) return false;
      } else if (!(hit.part == SurfacePart::Outer && fromEdge <= m.width)) {
        return false;
      }
      return inArc(cx, cy, c.fromX, c.fromY, c.toX, c.toY, c.span);
    case MarkingKind::Stripe:
      return hit.part == SurfacePart::Outer && cx * c.centreX + cy * c.centreY >= c.minCos;
    case MarkingKind::Dot: {
      if (hit.part != SurfacePart::Outer) return false;
      const double dz = hit.point.z() - m.axial;
      if (std::abs(dz) > m.radius) return false;
      const double arc = std::atan2(c.centreX * cy - c.centreY * cx, c.centreX * cx + c.centreY * cy) * body_.outerRadius;
      return arc * arc + dz * dz <= m.radius * m.radius;
    }
  }
  return false;
}

Rgb PaintLookup::albedoAt(const BodyHit& hit) const {
  Rgb colour = hit.part == SurfacePart::Bore ? paint_.bore : paint_.body;
  for (const Compiled& c : marks_)
    if (covers(c, hit)) colour = c.marking.colour;
  return colour;
}

// ---- shading and background ----------------------------------------------

Rgb shade(const SceneLights& lights, const Rgb& albedo, double cosKey) {
  const double light = lights.ambient + lights.key * std::max(0.0, cosKey);
  return {albedo.r * light, albedo.g * light, albedo.b * light};
}

namespace {

// Fraction of [x - w/2, x + w/2] covered by lines of width `line` centred
// on the multiples of `spacing` (a box filter over the pixel's footprint).
double lineCoverage(double x, double w, double spacing, double line) {
  // Covered length of the lines up to v, counted from a fixed origin (differences are what matter).
  auto cumulative = [&](double v) {
    const double shifted = v + line / 2;
    const double periods = std::floor(shifted / spacing);
    return periods * line + std::min(shifted - periods * spacing, line);
  };
  if (w <= 1e-12) {
    const double phase = std::remainder(x, spacing);
    return std::abs(phase) <= line / 2 ? 1.0 : 0.0;
  }
  return std::clamp((cumulative(x + w / 2) - cumulative(x - w / 2)) / w, 0.0, 1.0);
}

// Table point seen through image point (x, y), or false past the horizon.
bool tablePoint(const Camera& camera, double x, double y, Vec3& point) {
  const Ray ray = camera.rayAt(x, y);
  if (!(ray.direction.z() < 0)) return false;
  point = ray.origin - ray.origin.z() / ray.direction.z() * ray.direction;
  return true;
}

}  // namespace

Rgb backgroundAt(const SceneLook& scene, const Camera& camera, int px, int py, bool withGrid) {
  const double cosKey = scene.lights.keyDirection.z();
  const Rgb room{roomAlbedo, roomAlbedo, roomAlbedo};
  const double x = px + 0.5, y = py + 0.5;
  Vec3 p;
  if (!tablePoint(camera, x, y, p) || std::hypot(p.x(), p.y()) > scene.tableRadius) return shade(scene.lights, room, cosKey);
  Rgb albedo = scene.tableColour;
  if (withGrid && scene.gridSpacing > 0) {
    // The pixel's footprint on the table: the box around the parallelogram
    // spanned by the table points half a pixel to each side.
    Vec3 left, rightP, top, bottom;
    double wx = 0, wy = 0;
    if (tablePoint(camera, x - 0.5, y, left) && tablePoint(camera, x + 0.5, y, rightP) &&
        tablePoint(camera, x, y - 0.5, top) && tablePoint(camera, x, y + 0.5, bottom)) {
      const Vec3 du = rightP - left, dv = bottom - top;
      wx = std::abs(du.x()) + std::abs(dv.x());
      wy = std::abs(du.y()) + std::abs(dv.y());
    }
    const double cx = lineCoverage(p.x(), wx, scene.gridSpacing, gridLineWidth);
    const double cy = lineCoverage(p.y(), wy, scene.gridSpacing, gridLineWidth);
    const double keep = 1.0 - (1.0 - (1.0 - cx) * (1.0 - cy)) * (1.0 - gridLineShade);
    albedo = {albedo.r * keep, albedo.g * keep, albedo.b * keep};
  }
  return shade(scene.lights, albedo, cosKey);
}

}  // namespace dm
