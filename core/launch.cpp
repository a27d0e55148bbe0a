#include "core/launch.hpp"

#include <cmath>

namespace dm {

State launchState(const Params& p, const LaunchSpec& l) {
  // Axis direction towards the pressed end, tilted down by `tilt`.
  const Vec3 pressed(std::cos(l.tilt), 0, -std::sin(l.tilt));
  const Vec3 axis = l.pressedEnd == End::A ? pressed : Vec3(-pressed);
  // Body frame: z along the axis, x up within the end plane (or lab x when
  // the axis is vertical), y completing a right-handed frame.
  Vec3 upInPlane = up() - axis.z() * axis;
  upInPlane = upInPlane.norm() > 1e-12 ? Vec3(upInPlane.normalized()) : Vec3(Vec3::UnitX());
  Mat3 worldFromBody;
  worldFromBody.col(0) = upInPlane;
  worldFromBody.col(1) = axis.cross(upInPlane);
  worldFromBody.col(2) = axis;

  State s;
  s.orientation = Quat(worldFromBody).normalized();
  // Lowest rim point of the pressed end touches the table.
  const Vec3 lowest = p.body.length / 2 * pressed - p.body.outerRadius * upInPlane;
  s.position = Vec3(0, 0, -lowest.z());

  // Axial spin that puts the pressed end's top point at rest:
  // (W z + psi a) x r = 0 along n, the normal of the plane holding a and z.
  const Vec3 top = p.body.length / 2 * pressed + p.body.outerRadius * upInPlane;
  Vec3 n = pressed.cross(up());
  n = n.norm() > 1e-12 ? Vec3(n.normalized()) : Vec3(Vec3::UnitY());
  const double across = pressed.cross(top).dot(n);
  const double holdPsi = std::abs(across) > 1e-15 ? -l.revolution * up().cross(top).dot(n) / across : 0.0;
  const Vec3 spin = l.revolution * up() + l.backspin * holdPsi * pressed;
  s.spinBody = s.orientation.conjugate() * spin;
  s.velocity = Vec3(0, l.drift, 0);
  return s;
}

}  // namespace dm
