#include "core/kinematics.hpp"

#include <algorithm>
#include <array>
#include <cmath>

#include "core/constants.hpp"

namespace dm {

AxisMotion axisMotion(const Quat& worldFromBody, const Vec3& w) {
  AxisMotion m;
  const Vec3 a = worldFromBody * Vec3::UnitZ();
  m.raisedEnd = a.z() >= 0 ? End::A : End::B;
  m.raisedAxis = a.z() >= 0 ? a : Vec3(-a);
  const Vec3& r = m.raisedAxis;
  m.tilt = std::asin(std::clamp(r.z(), 0.0, 1.0));
  const double horizontal2 = r.x() * r.x() + r.y() * r.y();
  const Vec3 rate = w.cross(r);
  m.precession = horizontal2 > 1e-18 ? (r.x() * rate.y() - r.y() * rate.x()) / horizontal2 : 0.0;
  m.relativeSpin = w.dot(r) - m.precession * r.z();
  m.precessing = std::abs(m.precession) >= minPrecessionForN;
  m.spotsPerRev = m.precessing ? m.relativeSpin / m.precession : 0.0;
  return m;
}

Vec3 rimUpDirection(const Quat& worldFromBody) {
  const Vec3 a = worldFromBody * Vec3::UnitZ();
  const Vec3 h = up() - a.z() * a;
  const double n = h.norm();
  return n > 1e-12 ? Vec3(h / n) : Vec3(worldFromBody * Vec3::UnitX());
}

namespace {

// Rim sample directions (cos, sin) at 32 even azimuths: the largest speed
// over 32 samples is within 0.5 % of the true maximum (1 - cos(pi/32)).
constexpr int rimSamples = 32;
const std::array<std::array<double, 2>, rimSamples> rimDirections = [] {
  std::array<std::array<double, 2>, rimSamples> t{};
  for (int i = 0; i < rimSamples; ++i) t[i] = {std::cos(k::twoPi * i / rimSamples), std::sin(k::twoPi * i / rimSamples)};
  return t;
}();

}  // namespace

double fastestSurfaceSpeed(const Cylinder& c, const Quat& q, const Vec3& v, const Vec3& w) {
  const Mat3 rot = q.toRotationMatrix();
  // Surface point velocity: v + w x (end offset) + R (cos w x e1 + sin w x e2).
  const Vec3 we1 = c.outerRadius * w.cross(rot.col(0)), we2 = c.outerRadius * w.cross(rot.col(1));
  const Vec3 wa = c.length / 2 * w.cross(rot.col(2));
  double best2 = 0;
  for (const Vec3& base : {Vec3(v + wa), Vec3(v - wa)})
    for (const auto& [cs, sn] : rimDirections) best2 = std::max(best2, (base + cs * we1 + sn * we2).squaredNorm());
  return std::sqrt(best2);
}

}  // namespace dm
