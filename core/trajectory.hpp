// The dense record of a run: one sample per integrator step, with pose
// interpolation at any time (cubic Hermite in position and in the rotation
// vector, using the recorded velocities), and per-sample phase.
#pragma once
#include <vector>

#include "core/dynamics.hpp"
#include "core/vec.hpp"

namespace dm {

struct Sample {
  double t = 0;                         ///< s
  Vec3 position = Vec3::Zero();         ///< m
  Quat orientation = Quat::Identity();  ///< worldFromBody
  Vec3 velocity = Vec3::Zero();         ///< m/s
  Vec3 spin = Vec3::Zero();             ///< angular velocity, lab axes, rad/s
  Phase phase = Phase::Airborne;
  float slip = 0;                       ///< largest contact slip speed, m/s
  float normal = 0;                     ///< total normal force, N
};

class Trajectory {
 public:
  std::vector<Sample> samples;  ///< uniformly spaced in time (the integrator step)

  bool empty() const { return samples.empty(); }
  double startTime() const { return samples.empty() ? 0 : samples.front().t; }
  double endTime() const { return samples.empty() ? 0 : samples.back().t; }
  /// Pose at any time within the record (clamped to its ends). Error of the
  /// interpolation: O(h^4) in position, O(h^3 |w|^3) in angle for a step h.
  Pose poseAt(double t) const;
  /// Velocity of the centre and angular velocity (lab) at time t (linear).
  Vec3 velocityAt(double t) const;
  Vec3 spinAt(double t) const;
  /// Index of the last sample at or before t (clamped).
  std::size_t indexAt(double t) const;
};

}  // namespace dm
