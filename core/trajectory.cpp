#include "core/trajectory.hpp"

#include <algorithm>
#include <cmath>

namespace dm {

namespace {

// Rotation vector of a unit quaternion (angle * axis), and its inverse.
Vec3 logRotation(Quat q) {
  if (q.w() < 0) q.coeffs() = -q.coeffs();
  const Vec3 v = q.vec();
  const double s = v.norm();
  if (s < 1e-12) return 2.0 * v;
  return 2.0 * std::atan2(s, q.w()) / s * v;
}

Quat expRotation(const Vec3& phi) {
  const double angle = phi.norm();
  if (angle < 1e-12) return Quat(1, phi.x() / 2, phi.y() / 2, phi.z() / 2).normalized();
  return Quat(Eigen::AngleAxisd(angle, phi / angle));
}

}  // namespace

std::size_t Trajectory::indexAt(double t) const {
  if (samples.size() < 2 || t <= samples.front().t) return 0;
  if (t >= samples.back().t) return samples.size() - 1;
  const double h = samples[1].t - samples[0].t;
  std::size_t i = std::min<std::size_t>(samples.size() - 2, std::size_t((t - samples.front().t) / h));
  while (i > 0 && samples[i].t > t) --i;
  while (i + 2 < samples.size() && samples[i + 1].t <= t) ++i;
  return i;
}

Pose Trajectory::poseAt(double t) const {
  if (samples.empty()) return {};
  const std::size_t i = indexAt(t);
  if (i + 1 >= samples.size()) return {samples.back().position, samples.back().orientation};
  const Sample& a = samples[i];
  const Sample& b = samples[i + 1];
  const double h = b.t - a.t;
  const double s = std::clamp((t - a.t) / h, 0.0, 1.0);
  // Cubic Hermite basis.
  const double s2 = s * s, s3 = s2 * s;
  const double h00 = 2 * s3 - 3 * s2 + 1, h10 = s3 - 2 * s2 + s, h01 = -2 * s3 + 3 * s2, h11 = s3 - s2;
  Pose p;
  p.position = h00 * a.position + h10 * h * a.velocity + h01 * b.position + h11 * h * b.velocity;
  // Rotation vector relative to the first sample, in its body frame. End
  // tangents come from the body-frame angular velocities; at the far end the
  // inverse right Jacobian of the rotation is taken to first order.
  const Quat rel = a.orientation.conjugate() * b.orientation;
  const Vec3 phi1 = logRotation(rel);
  const Vec3 m0 = h * (a.orientation.conjugate() * a.spin);
  const Vec3 w1 = h * (b.orientation.conjugate() * b.spin);
  const Vec3 phi = h10 * m0 + h01 * phi1 + h11 * (w1 + 0.5 * phi1.cross(w1));
  p.worldFromBody = (a.orientation * expRotation(phi)).normalized();
  return p;
}

Vec3 Trajectory::velocityAt(double t) const {
  if (samples.empty()) return Vec3::Zero();
  const std::size_t i = indexAt(t);
  if (i + 1 >= samples.size()) return samples.back().velocity;
  const double s = std::clamp((t - samples[i].t) / (samples[i + 1].t - samples[i].t), 0.0, 1.0);
  return (1 - s) * samples[i].velocity + s * samples[i + 1].velocity;
}

Vec3 Trajectory::spinAt(double t) const {
  if (samples.empty()) return Vec3::Zero();
  const std::size_t i = indexAt(t);
  if (i + 1 >= samples.size()) return samples.back().spin;
  const double s = std::clamp((t - samples[i].t) / (samples[i + 1].t - samples[i].t), 0.0, 1.0);
  return (1 - s) * samples[i].spin + s * samples[i + 1].spin;
}

}  // namespace dm
