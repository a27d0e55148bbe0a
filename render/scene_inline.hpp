// Inline definitions of scene.hpp's per-sample functions (ray test, paint
// look-up, shading): the exposure calls them for every sample that meets
// the body's bounds, so they are compiled where they are called. Included
// at the end of render/scene.hpp only.
#pragma once
#include <algorithm>
#include <cmath>
#include <limits>

#include "core/constants.hpp"

namespace dm {

namespace scene_detail {

// A hit at ray parameter t on a cylindrical wall of `radius` (1/radius
// given), its normal pointing away from the axis (`outward` +1) or towards it (-1).
inline bool wallHit(const Vec3& o, const Vec3& d, double t, SurfacePart part, double radius, double invRadius,
                    double outward, BodyHit& hit) {
  hit.t = t;
  hit.part = part;
  hit.point = o + t * d;
  hit.radius = radius;
  hit.dirX = hit.point.x() * invRadius;
  hit.dirY = hit.point.y() * invRadius;
  hit.normal = Vec3(outward * hit.dirX, outward * hit.dirY, 0);
  return true;
}

// True when direction (x, y) lies in the counter-clockwise arc of `span`
// radians starting at direction (fx, fy) and ending at (tx, ty), by signs of
// cross products instead of angles.
inline bool inArc(double x, double y, double fx, double fy, double tx, double ty, double span) {
  if (span >= k::twoPi) return true;
  if (span <= 0.0) return x == fx && y == fy;
  if (span < k::pi) return fx * y - fy * x >= 0 && x * ty - y * tx >= 0;
  // Outside the open complementary arc from `to` to `from` (no longer than pi).
  return !(tx * y - ty * x > 0 && x * fy - y * fx > 0);
}

inline bool onFace(SurfacePart part, End e) {
  return (part == SurfacePart::FaceA && e == End::A) || (part == SurfacePart::FaceB && e == End::B);
}

// The rest of intersectBody() for a ray that crosses the solid's bounds
// as `c` says and enters through an end plane: the face annulus, or through
// the opening the bore wall before the ray leaves the slab.
bool endPlaneHit(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                 const BoundsCrossing& c, BodyHit& hit);

}  // namespace scene_detail

inline bool crossCylinder(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                          BoundsCrossing& c) {
  // The infinite outer cylinder along the ray (tested first: most misses end here).
  const double a = terms.across, invA = terms.invAcross;
  c.b = o.x() * d.x() + o.y() * d.y();
  c.rho2 = o.x() * o.x() + o.y() * o.y();
  c.cylIn = -std::numeric_limits<double>::infinity();
  c.cylOut = std::numeric_limits<double>::infinity();
  if (!(a > 0.0)) return c.rho2 <= s.outer2;
  const double disc = c.b * c.b - a * (c.rho2 - s.outer2);
  if (disc < 0) return false;
  const double root = std::sqrt(disc);
  c.cylIn = (-c.b - root) * invA;
  c.cylOut = (-c.b + root) * invA;
  return true;
}

inline bool crossSlab(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                      BoundsCrossing& c) {
  // The slab |z| <= L/2 along the ray.
  c.slabIn = -std::numeric_limits<double>::infinity();
  c.slabOut = std::numeric_limits<double>::infinity();
  if (d.z() != 0.0) {
    const double ta = (s.half - o.z()) * terms.invZ, tb = (-s.half - o.z()) * terms.invZ;
    c.slabIn = std::min(ta, tb);
    c.slabOut = std::max(ta, tb);
  } else if (std::abs(o.z()) > s.half) {
    return false;
  }
  const double enter = std::max(c.cylIn, c.slabIn), leave = std::min(c.cylOut, c.slabOut);
  return enter < leave && enter > 0;
}

inline bool intersectBody(const BodyShape& s, const Vec3& o, const Vec3& d, const DirectionTerms& terms, BodyHit& hit) {
  BoundsCrossing c;
  if (!crossCylinder(s, o, d, terms, c) || !crossSlab(s, o, d, terms, c)) return false;
  // Entering through the outer surface, or through an end plane (rarer, not inline).
  if (c.throughOuter()) return scene_detail::wallHit(o, d, c.cylIn, SurfacePart::Outer, s.outer, s.invOuter, 1.0, hit);
  return scene_detail::endPlaneHit(s, o, d, terms, c, hit);
}

inline bool PaintLookup::covers(const Compiled& c, const BodyHit& hit) const {
  const Marking& m = c.marking;
  const double fromEdge = body_.length / 2 - endSign(m.end) * hit.point.z();
  const double cx = hit.dirX, cy = hit.dirY;
  switch (m.kind) {
    case MarkingKind::Band:
      if (scene_detail::onFace(hit.part, m.end)) return true;
      return hit.part == SurfacePart::Outer && fromEdge <= m.width;
    case MarkingKind::RimPatch:
      // The cheap test of the extent first, then the arc.
      if (scene_detail::onFace(hit.part, m.end)) {
        if (!(body_.outerRadius - hit.radius <= m.width)) return false;
      } else if (!(hit.part == SurfacePart::Outer && fromEdge <= m.width)) {
        return false;
      }
      return scene_detail::inArc(cx, cy, c.fromX, c.fromY, c.toX, c.toY, c.span);
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

inline Rgb PaintLookup::albedoAt(const BodyHit& hit) const {
  if (hit.part == SurfacePart::Outer && plain_.contains(hit.point.z())) return paint_.body;
  for (const Compiled& c : byPart_[int(hit.part)])
    if (covers(c, hit)) return c.marking.colour;
  return hit.part == SurfacePart::Bore ? paint_.bore : paint_.body;
}

inline Rgb shade(const SceneLights& lights, const Rgb& albedo, double cosKey) {
  const double light = lights.ambient + lights.key * std::max(0.0, cosKey);
  return {albedo.r * light, albedo.g * light, albedo.b * light};
}

}  // namespace dm
