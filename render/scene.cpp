#include "render/scene.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>
#include <vector>

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

namespace scene_detail {

bool endPlaneHit(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                 const BoundsCrossing& c, BodyHit& hit) {
  const double a = terms.across, invA = terms.invAcross, b = c.b, rho2 = c.rho2, slabIn = c.slabIn;
  // The face annulus, or the bore's opening.
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
  if (!(wall < c.slabOut)) return false;
  return wallHit(o, d, wall, SurfacePart::Bore, s.inner, s.invInner, -1.0, hit);
}

}  // namespace scene_detail

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
    // Every kind can cover the outer surface; bands and rim patches also their end's face; none the bore.
    const bool endKind = m.kind == MarkingKind::Band || m.kind == MarkingKind::RimPatch;
    const SurfacePart face = m.end == End::A ? SurfacePart::FaceA : SurfacePart::FaceB;
    for (SurfacePart part : {SurfacePart::Outer, face})
      if (part == SurfacePart::Outer || endKind) {
        std::vector<Compiled>& list = byPart_[int(part)];
        list.insert(list.begin(), c);
      }
  }
  findPlainStretch();
}

void PaintLookup::findPlainStretch() {
  // Each marking's reach along the outer surface (z from, to), widened by a
  // margin far above rounding and far below a pixel; a stripe reaches all of it.
  const double half = body_.length / 2, margin = 1e-9 * (half + body_.outerRadius);
  std::vector<std::pair<double, double>> reach;
  for (const Compiled& c : byPart_[int(SurfacePart::Outer)]) {
    const Marking& m = c.marking;
    switch (m.kind) {
      case MarkingKind::Band:
      case MarkingKind::RimPatch:
        reach.push_back(m.end == End::A ? std::pair{half - m.width, half} : std::pair{-half, m.width - half});
        break;
      case MarkingKind::Stripe: reach.push_back({-half, half}); break;
      case MarkingKind::Dot: reach.push_back({m.axial - m.radius, m.axial + m.radius}); break;
    }
  }
  // The longest gap between the reaches within the body's length.
  std::sort(reach.begin(), reach.end());
  double covered = -half;
  plain_ = {};
  reach.push_back({half, half});
  for (const auto& [from, to] : reach) {
    if (from - covered > plain_.hi - plain_.lo) plain_ = {covered, from};
    covered = std::max(covered, to);
  }
  plain_.lo += margin;
  plain_.hi -= margin;
}

// ---- shading and background ----------------------------------------------

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
