#include "core/markings.hpp"

#include <cmath>

#include "core/constants.hpp"

namespace dm {

std::string_view markingKindName(MarkingKind k) {
  switch (k) {
    case MarkingKind::Band: return "band";
    case MarkingKind::RimPatch: return "rim_patch";
    case MarkingKind::Stripe: return "stripe";
    case MarkingKind::Dot: return "dot";
  }
  return "band";
}

double wrapAngle(double a) {
  double w = std::fmod(a, k::twoPi);
  if (w < 0) w += k::twoPi;
  return w;
}

namespace {

// True when azimuth `a` lies in the counter-clockwise arc from `from` to `to`.
bool inArc(double a, double from, double to) {
  const double span = wrapAngle(to - from);
  if (span == 0.0 && to != from) return true;  // a whole turn
  return wrapAngle(a - from) <= span;
}

// Distance (m) of an outer-surface point from end `e`'s edge along the axis.
double fromEdge(const Cylinder& c, End e, double z) { return c.length / 2 - endSign(e) * z; }

bool onFace(SurfacePart part, End e) {
  return (part == SurfacePart::FaceA && e == End::A) || (part == SurfacePart::FaceB && e == End::B);
}

}  // namespace

bool covers(const Cylinder& c, const Marking& m, const SurfacePoint& p) {
  switch (m.kind) {
    case MarkingKind::Band:
      if (onFace(p.part, m.end)) return true;
      return p.part == SurfacePart::Outer && fromEdge(c, m.end, p.z) <= m.width;
    case MarkingKind::RimPatch:
      if (!inArc(p.angle, m.fromAngle, m.toAngle)) return false;
      if (onFace(p.part, m.end)) return c.outerRadius - p.radius <= m.width;
      return p.part == SurfacePart::Outer && fromEdge(c, m.end, p.z) <= m.width;
    case MarkingKind::Stripe: {
      if (p.part != SurfacePart::Outer) return false;
      const double d = std::remainder(p.angle - m.angle, k::twoPi);
      return std::abs(d) <= m.arcWidth / 2;
    }
    case MarkingKind::Dot: {
      if (p.part != SurfacePart::Outer) return false;
      const double arc = std::remainder(p.angle - m.angle, k::twoPi) * c.outerRadius;
      const double dz = p.z - m.axial;
      return arc * arc + dz * dz <= m.radius * m.radius;
    }
  }
  return false;
}

Rgb colourAt(const Cylinder& c, const Paint& paint, const SurfacePoint& p) {
  Rgb colour = p.part == SurfacePart::Bore ? paint.bore : paint.body;
  for (const Marking& m : paint.markings)
    if (covers(c, m, p)) colour = m.colour;
  return colour;
}

}  // namespace dm
