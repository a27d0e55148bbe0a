// How the axis moves: tilt, precession, relative spin and spots per
// revolution, from an orientation and an angular velocity.
#pragma once
#include "core/body.hpp"
#include "core/vec.hpp"

namespace dm {

/// The axis' motion at one instant. `raisedAxis` points from the centre to
/// the higher end; precession is the rate of its azimuth (positive
/// counter-clockwise seen from above); relative spin is the spin about that
/// axis measured in the frame turning with the axis (physics.md section 3).
struct AxisMotion {
  double tilt = 0;          ///< raised axis above the horizontal, rad (0..pi/2)
  double precession = 0;    ///< rad/s
  double relativeSpin = 0;  ///< rad/s
  bool precessing = false;  ///< false when the precession is too slow to define N
  double spotsPerRev = 0;   ///< relativeSpin / precession (valid when precessing)
  End raisedEnd = End::A;
  Vec3 raisedAxis = Vec3::UnitX();
};

/// Slowest precession, rad/s, for which spots per revolution is defined
/// (about a hundredth of a revolution per second).
inline constexpr double minPrecessionForN = 0.06;

AxisMotion axisMotion(const Quat& worldFromBody, const Vec3& spinWorld);

/// Unit vector in the plane of the ends (perpendicular to the axis) that
/// points most nearly up: an end's highest rim point is its centre plus R
/// times it, its lowest the centre minus R times it. With the axis vertical
/// every rim point is equally high and body x is returned.
Vec3 rimUpDirection(const Quat& worldFromBody);

/// Fastest speed of any surface point (rim points of both ends), m/s.
double fastestSurfaceSpeed(const struct Cylinder& c, const Quat& worldFromBody, const Vec3& velocity,
                           const Vec3& spinWorld);

}  // namespace dm
