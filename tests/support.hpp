// Helpers shared by the tests: scenarios built inline, dissipation switched
// off, and initial states placed exactly on the rigid steady spin.
#pragma once
#include <cmath>
#include <cstdint>
#include <string>

#include <nlohmann/json.hpp>

#include "core/constants.hpp"
#include "core/dynamics.hpp"
#include "core/scenario.hpp"

namespace dm::test {

/// Practical units to SI: one millimetre in metres, one rev/s in rad/s.
inline constexpr double mm = 1e-3;
inline constexpr double revS = k::twoPi;

/// The bundled demo scenario, parsed and validated, or as its JSON document.
inline std::string demoPath() { return std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json"; }
inline Scenario demo() { return loadScenario(demoPath()); }
inline nlohmann::json demoDoc() { return readScenarioJson(demoPath()); }

/// A valid scenario for a body, dissipation-free unless told otherwise.
inline Scenario bodyScenario(Shape shape, double length, double diameter, double wall, double density = 1180) {
  Scenario s = defaultScenario();
  s.body.shape = shape;
  s.body.length = length;
  s.body.outerDiameter = diameter;
  s.body.wall = wall;
  s.body.density = density;
  s.body.mass = 0;
  s.surface.rollingResistance = 0;
  s.surface.pivotFriction = 0;
  s.surface.airDrag = 0;
  validate(s);
  return s;
}

/// Frame whose z is `axis` and whose x points up within the end plane.
inline Quat frameAlong(const Vec3& axis) {
  Vec3 x = up() - axis.z() * axis;
  x = x.norm() > 1e-12 ? Vec3(x.normalized()) : Vec3(Vec3::UnitX());
  Mat3 m;
  m.col(0) = x;
  m.col(1) = axis.cross(x);
  m.col(2) = axis;
  return Quat(m).normalized();
}

/// Rigid steady rolling on end B's rim at tilt `alpha` (end A raised, axis
/// azimuth 0) with the centre fixed, or, for `circle` > 0, moving on a circle
/// of that radius about a vertical through the point `circle` metres from the
/// centre towards -x (the lower end's side). Our derivation, physics.md
/// section 3 with the centre's motion added: rolling at the contact
/// r = -(L/2) a - R d (d the rim's up direction) gives the relative spin
/// W ((L/D) cos a - sin a - X/R), and the torque balance about the centre,
/// with the centripetal friction m W^2 X, gives
/// W^2 [cos a (I_a ((L/D) cos a - X/R) - I_t sin a) - m X ((L/2) sin a + R cos a)]
///   = m g ((L/2) cos a - R sin a);
/// for X = 0 the fixed-centre balance of physics.md. The centre is lowered by
/// the static deflection m g / k so the compliant contact starts in balance,
/// and the contact's stick spring holds the centripetal friction.
struct SteadyStart {
  State state;
  double precession = 0;  ///< rad/s
  double relativeSpin = 0;
};

inline SteadyStart steadyStart(const Params& p, double alpha, double circle = 0) {
  const double L = p.body.length, R = p.body.outerRadius, D = 2 * R;
  const double Ia = p.principal.z(), It = p.principal.x(), m = p.inertia.mass, g = p.gravity;
  const double c = std::cos(alpha), s = std::sin(alpha), X = circle;
  const double w2 = m * g * (L / 2 * c - R * s) / (c * (Ia * ((L / D) * c - X / R) - It * s) - m * X * (L / 2 * s + R * c));
  SteadyStart r;
  r.precession = std::sqrt(w2);
  r.relativeSpin = r.precession * ((L / D) * c - s - X / R);
  const Vec3 axis(c, 0, s);
  r.state.orientation = frameAlong(axis);
  r.state.position = Vec3(0, 0, L / 2 * s + R * c - m * g / p.normalStiffness);
  r.state.velocity = Vec3(0, r.precession * X, 0);
  r.state.spinBody = r.state.orientation.conjugate() * Vec3(r.precession * up() + r.relativeSpin * axis);
  // End B's lowest slot carries the centripetal friction -m W^2 X along x.
  r.state.slots[slotsPerEnd].spring = Vec3(m * w2 * X / p.tangentStiffness, 0, 0);
  return r;
}

}  // namespace dm::test
