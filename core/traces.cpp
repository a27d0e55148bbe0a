#include "core/traces.hpp"

#include <cmath>

namespace dm {

namespace {

// Unit vector within end plane pointing most upwards: z - (z.a) a normalised.
Vec3 upInEndPlane(const Pose& pose) {
  const Vec3 a = pose.axis();
  const Vec3 h = up() - a.z() * a;
  const double n = h.norm();
  return n > 1e-12 ? Vec3(h / n) : Vec3(pose.worldFromBody * Vec3::UnitX());
}

Vec3 endCentre(const Cylinder& c, const Pose& pose, End e) {
  return pose.position + endSign(e) * c.length / 2 * pose.axis();
}

// The end whose centre is lower (end B when level, matching a tie on A up).
End lowerEnd(const Pose& pose) { return pose.axis().z() >= 0 ? End::B : End::A; }

Pose poseOf(const Sample& s) { return {s.position, s.orientation}; }

}  // namespace

Vec3 lowestRimPoint(const Cylinder& c, const Pose& pose, End e) {
  return endCentre(c, pose, e) - c.outerRadius * upInEndPlane(pose);
}

Vec3 highestRimPoint(const Cylinder& c, const Pose& pose, End e) {
  return endCentre(c, pose, e) + c.outerRadius * upInEndPlane(pose);
}

TracePoints tracePoints(const Cylinder& c, const Pose& pose) {
  const End low = lowerEnd(pose);
  return {pose.position, lowestRimPoint(c, pose, low), highestRimPoint(c, pose, otherEnd(low))};
}

Vec3 markingAnchor(const Cylinder& c, const Marking& m) {
  const double R = c.outerRadius, half = c.length / 2;
  auto rim = [&](double angle, double z) { return Vec3(R * std::cos(angle), R * std::sin(angle), z); };
  switch (m.kind) {
    case MarkingKind::RimPatch: {
      const double span = wrapAngle(m.toAngle - m.fromAngle);
      return rim(m.fromAngle + span / 2, endSign(m.end) * half);
    }
    case MarkingKind::Band: return rim(0, endSign(m.end) * half);
    case MarkingKind::Stripe: return rim(m.angle, half);
    case MarkingKind::Dot: return rim(m.angle, m.axial);
  }
  return rim(0, half);
}

std::vector<Vec3> tracePath(const Cylinder& c, const std::vector<Sample>& samples, TraceKind kind, std::size_t first,
                            std::size_t stride) {
  std::vector<Vec3> out;
  for (std::size_t i = first; i < samples.size(); i += std::max<std::size_t>(1, stride)) {
    const TracePoints p = tracePoints(c, poseOf(samples[i]));
    out.push_back(kind == TraceKind::Centre ? p.centre : kind == TraceKind::FloorContact ? p.floorContact
                                                                                          : p.ceilingContact);
  }
  return out;
}

std::vector<Vec3> bodyPointPath(const Vec3& bodyPoint, const std::vector<Sample>& samples, std::size_t first,
                                std::size_t stride) {
  std::vector<Vec3> out;
  for (std::size_t i = first; i < samples.size(); i += std::max<std::size_t>(1, stride))
    out.push_back(poseOf(samples[i]).toWorld(bodyPoint));
  return out;
}

}  // namespace dm
