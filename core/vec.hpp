// Small fixed-size linear algebra used everywhere in core/ (Eigen, no heap).
#pragma once
#include <Eigen/Core>
#include <Eigen/Geometry>

namespace dm {

using Vec3 = Eigen::Vector3d;
using Mat3 = Eigen::Matrix3d;
using Quat = Eigen::Quaterniond;

/// Linear RGB colour, each channel 0..1 (not gamma-encoded).
struct Rgb {
  double r = 0, g = 0, b = 0;
  friend bool operator==(const Rgb&, const Rgb&) = default;
};

/// Up direction of the lab frame; the table is the plane z = 0.
inline Vec3 up() { return Vec3::UnitZ(); }

/// Rigid pose: where the body is. `worldFromBody` maps body coordinates
/// (axis = body z, end A at z = +L/2) to lab coordinates; `position` is the
/// centre of mass in metres.
struct Pose {
  Vec3 position = Vec3::Zero();
  Quat worldFromBody = Quat::Identity();
  Vec3 toWorld(const Vec3& bodyPoint) const { return position + worldFromBody * bodyPoint; }
  Vec3 axis() const { return worldFromBody * Vec3::UnitZ(); }
};

}  // namespace dm
