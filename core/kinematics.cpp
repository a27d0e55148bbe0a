#include "core/kinematics.hpp"

#include <algorithm>
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

double fastestSurfaceSpeed(const Cylinder& c, const Quat& q, const Vec3& v, const Vec3& w) {
  const Vec3 a = q * Vec3::UnitZ();
  const Vec3 e1 = q * Vec3::UnitX(), e2 = q * Vec3::UnitY();
  double best = 0;
  constexpr int n = 32;  // rim samples per end: within 0.5 % of the true maximum
  for (double sign : {1.0, -1.0})
    for (int i = 0; i < n; ++i) {
      const double th = k::twoPi * i / n;
      const Vec3 r = sign * c.length / 2 * a + c.outerRadius * (std::cos(th) * e1 + std::sin(th) * e2);
      best = std::max(best, (v + w.cross(r)).norm());
    }
  return best;
}

}  // namespace dm
