#include "core/dynamics.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"

namespace dm {

namespace {

// Time derivative of the integrated state.
struct Deriv {
  Vec3 dPosition, dVelocity, dSpin;
  Eigen::Vector4d dOrientation;  // (w, x, y, z)
  std::array<Vec3, slotCount> dSpring;
};

// Rim directions of the four slots of an end: slot k's rim point is
// endCentre - R * dir[k]. dir[0] points "up" within the end's plane, so
// slot 0 is the lowest rim point. When the axis is vertical every rim point
// is equally low and body x is used.
std::array<Vec3, slotsPerEnd> slotDirections(const Mat3& worldFromBody) {
  const Vec3 a = worldFromBody.col(2);
  const Vec3 h = up() - a.z() * a;
  const double hn = h.norm();
  const Vec3 d = hn > 1e-12 ? Vec3(h * (1.0 / hn)) : Vec3(worldFromBody.col(0));
  const Vec3 side = a.cross(d);
  return {d, side, -d, -side};
}

// Cundall-Strack: a spring beyond its Coulomb limit (static while it sticks,
// kinetic while it slides) slides and is cut back to the kinetic limit. A
// slot off the table (no normal force) loses its spring.
SlotState withinCoulombLimit(const Params& p, SlotState slot, double normal) {
  const double mu = slot.sliding ? p.frictionKinetic : p.frictionStatic;
  const double springForce = p.tangentStiffness * slot.spring.norm();
  slot.sliding = springForce > mu * normal;
  if (slot.sliding) slot.spring *= p.frictionKinetic * normal / springForce;
  return slot;
}

// Rate (rad/s, counter-clockwise seen from above) at which the slots turn
// about the vertical: the azimuth rate of the axis, (a x da/dt)_z / |a_h|^2.
// The stick springs are held in this turning contact frame: a friction force
// that turns with the contact, as the centripetal force of a centre circling
// in steady rim rolling does, then needs no slip. Held in the lab instead, the
// spring creeps at (rate x force) / stiffness: measured on the 4:1 tube of
// physics.md rolling steadily at 12 deg with its centre on a 1 mm circle,
// 4.3e-4 of the rim speed (R times the relative spin) against 3.4e-5 in the
// turning frame, where it creeps no more than with the centre fixed. Within about
// 6 deg of vertical (|a_h| < 0.1) the azimuth is ill-defined and its rate
// is damped by that floor.
double contactFrameRate(const Vec3& axis, const Vec3& spin) {
  const Vec3 axisRate = spin.cross(axis);
  const double horizontal2 = axis.x() * axis.x() + axis.y() * axis.y();
  constexpr double floor2 = 0.1 * 0.1;
  return (axis.x() * axisRate.y() - axis.y() * axisRate.x()) / std::max(horizontal2, floor2);
}

// Forces at one instant. With `commit`, the friction springs of `s` are first
// brought back within their Coulomb limit (Cundall-Strack truncation) and
// their slide flags updated; RK4's later stages evaluate without it.
Deriv evaluate(const Params& p, State& s, bool commit, ContactReport* report) {
  const Mat3 rot = s.orientation.toRotationMatrix();
  const Vec3 axis = rot.col(2);
  const Vec3 spin = rot * s.spinBody;
  const double m = p.inertia.mass;
  const double halfL = p.body.length / 2;
  const double radius = p.body.outerRadius;

  Vec3 force(0, 0, -m * p.gravity);
  Vec3 torque = Vec3::Zero();
  double normalSum = 0;
  Deriv d;
  const auto dirs = slotDirections(rot);
  const double turn = contactFrameRate(axis, spin);

  // Contacts: normal spring-damper on penetration, friction stick spring.
  for (int e = 0; e < 2; ++e) {
    const double sign = e == 0 ? 1.0 : -1.0;
    const Vec3 endCentre = s.position + sign * halfL * axis;
    for (int k = 0; k < slotsPerEnd; ++k) {
      const int i = e * slotsPerEnd + k;
      SlotState& slot = s.slots[i];
      d.dSpring[i] = Vec3::Zero();
      // Height first: most slots are off the table most of the time.
      const double depth = radius * dirs[k].z() - endCentre.z();
      if (report) {
        report->point[i] = endCentre - radius * dirs[k];
        report->normalForce[i] = 0;
        report->slipSpeed[i] = 0;
      }
      if (depth <= 0) {
        if (commit) slot = SlotState{};
        continue;
      }
      const Vec3 lever = endCentre - radius * dirs[k] - s.position;
      const Vec3 pointVelocity = s.velocity + spin.cross(lever);
      const double normal = std::max(0.0, p.normalStiffness * depth - p.normalDamping * pointVelocity.z());
      const Vec3 slip(pointVelocity.x(), pointVelocity.y(), 0);
      if (commit) slot = withinCoulombLimit(p, slot, normal);
      Vec3 friction = -p.tangentStiffness * slot.spring - p.tangentDamping * slip;
      const double frictionLimit = (slot.sliding ? p.frictionKinetic : p.frictionStatic) * normal;
      const double frictionNorm2 = friction.squaredNorm();
      if (frictionNorm2 > frictionLimit * frictionLimit) friction *= frictionLimit / std::sqrt(frictionNorm2);
      const Vec3 f = normal * up() + friction;
      force += f;
      torque += lever.cross(f);
      normalSum += normal;
      // The spring turns with the slot about the vertical (contactFrameRate).
      d.dSpring[i] = slip + turn * Vec3(-slot.spring.y(), slot.spring.x(), 0);
      if (report) {
        report->normalForce[i] = normal;
        report->slipSpeed[i] = slip.norm();
        if (normal > 0) ++(e == 0 ? report->activeA : report->activeB);
      }
    }
  }

  // Rolling resistance and pivot friction: couples proportional to the load,
  // smoothed through zero angular speed.
  if (normalSum > 0) {
    const double eps2 = k::torqueSmoothing * k::torqueSmoothing;
    const Vec3 rolling(spin.x(), spin.y(), 0);
    torque -= (p.rollingResistance * radius * normalSum / std::sqrt(rolling.squaredNorm() + eps2)) * rolling;
    torque.z() -= p.pivotArm * normalSum * spin.z() / std::sqrt(spin.z() * spin.z() + eps2);
  }

  // Quadratic air drag on the centre's motion (projected area by direction)
  // and on tumbling about a transverse axis.
  const double speed = s.velocity.norm();
  if (speed > 0 && p.dragLinear > 0) {
    const double c = std::min(1.0, std::abs(axis.dot(s.velocity)) / speed);
    const double area = 2 * radius * p.body.length * std::sqrt(1 - c * c) + k::pi * radius * radius * c;
    force -= p.dragLinear * area * speed * s.velocity;
  }
  if (p.dragTransverse > 0) {
    const Vec3 tumble = spin - spin.dot(axis) * axis;
    torque -= p.dragTransverse * tumble.norm() * tumble;
  }

  // Newton-Euler in body axes: I dw/dt = tau - w x I w.
  const Vec3 torqueBody = rot.transpose() * torque;
  const Vec3 wb = s.spinBody;
  d.dSpin = (torqueBody - wb.cross(p.principal.cwiseProduct(wb))).cwiseProduct(p.inversePrincipal);
  const Quat q = s.orientation;
  const Quat dq = q * Quat(0, wb.x(), wb.y(), wb.z());
  d.dOrientation = 0.5 * Eigen::Vector4d(dq.w(), dq.x(), dq.y(), dq.z());
  d.dPosition = s.velocity;
  d.dVelocity = force * p.inverseMass;
  return d;
}

// s + h * d, for the integrated parts of the state.
State advanced(const State& s, const Deriv& d, double h) {
  State r = s;
  r.position += h * d.dPosition;
  r.velocity += h * d.dVelocity;
  r.spinBody += h * d.dSpin;
  r.orientation.coeffs() += h * Eigen::Vector4d(d.dOrientation[1], d.dOrientation[2], d.dOrientation[3], d.dOrientation[0]);
  r.orientation.coeffs() *= 1.0 / r.orientation.coeffs().norm();
  for (int i = 0; i < slotCount; ++i) r.slots[i].spring += h * d.dSpring[i];
  return r;
}

}  // namespace

std::string_view phaseName(Phase p) {
  switch (p) {
    case Phase::Sliding: return "sliding";
    case Phase::RollingA: return "rolling_rim_A";
    case Phase::RollingB: return "rolling_rim_B";
    case Phase::LyingFlat: return "lying_flat";
    case Phase::StandingEnd: return "standing_end";
    case Phase::Airborne: return "airborne";
    case Phase::AtRest: return "at_rest";
  }
  return "sliding";
}

double ContactReport::totalNormal() const {
  double n = 0;
  for (double f : normalForce) n += f;
  return n;
}

double ContactReport::maxSlip() const {
  double v = 0;
  for (int i = 0; i < slotCount; ++i)
    if (normalForce[i] > 0) v = std::max(v, slipSpeed[i]);
  return v;
}

Params makeParams(const Scenario& s) {
  Params p;
  p.body = cylinderOf(s.body);
  p.inertia = massProperties(p.body);
  setInertia(p, p.inertia.diagonal());
  p.frictionStatic = s.surface.frictionStatic;
  p.frictionKinetic = s.surface.frictionKinetic;
  p.rollingResistance = s.surface.rollingResistance;
  p.pivotArm = s.surface.pivotFriction;
  p.dragLinear = 0.5 * k::airDensity * s.surface.airDrag;
  // Tumbling drag: the side (D x L) and the faces (pi R^2) sweeping broadside,
  // integrated over the body: rho C_d (D L^4 / 64 + 4 R^5 / 15).
  const double R = p.body.outerRadius, L = p.body.length;
  p.dragTransverse = k::airDensity * s.surface.airDrag * (2 * R * std::pow(L, 4) / 64 + 4 * std::pow(R, 5) / 15);
  // Contact: the body's mass on a spring of the chosen natural frequency; the
  // damping ratio gives the chosen restitution to one contact point carrying
  // the whole mass.
  const double m = p.inertia.mass;
  const double w = s.contact.frequency;
  const double zeta = dampingRatioForRestitution(s.surface.restitution);
  p.normalStiffness = m * w * w;
  p.normalDamping = 2 * zeta * m * w;
  // Tangential stick spring: 0.8 of the normal stiffness (Mindlin's ratio
  // 2(1-nu)/(2-nu) for nu ~ 0.33; from memory), lightly damped (5 % of
  // critical): enough to settle the spring's own ringing. More damping makes
  // the contact mode stiff for RK4, which then feeds energy in; measured over
  // 10 s of nutating rim rolling at 100 Hz: +2.6e-5 of the energy at 0.1 and
  // a 250 us step, +4.9e-5 at 0.1 and 333 us, -4.1e-5 at 0.05 and 333 us.
  p.tangentStiffness = 0.8 * p.normalStiffness;
  p.tangentDamping = 2 * 0.05 * std::sqrt(p.tangentStiffness * m);
  p.timeStep = s.run.timeStep();
  p.gravity = k::gravity;
  return p;
}

void setInertia(Params& p, const Vec3& principal) {
  p.principal = principal;
  p.inversePrincipal = principal.cwiseInverse();
  p.inverseMass = 1.0 / p.inertia.mass;
}

double restitutionOfDampingRatio(double zeta) {
  // x'' + 2 zeta w x' + w^2 x = 0 from x = 0, x' = v0 (underdamped); the contact lets go
  // when the force k x + c x' reaches zero (it never pulls), at
  // w_d t = pi - atan(2 zeta sqrt(1 - zeta^2) / (1 - 2 zeta^2)); e = -x'(t) / v0.
  const double r = std::sqrt(1 - zeta * zeta);
  const double phase = k::pi - std::atan2(2 * zeta * r, 1 - 2 * zeta * zeta);
  const double decay = std::exp(-zeta / r * phase);
  return -decay * (std::cos(phase) - zeta / r * std::sin(phase));
}

double dampingRatioForRestitution(double e) {
  // e falls monotonically from 1 at zeta = 0 to 0.1355 at zeta = 0.999;
  // bisect on that interval (stiffer damping is never needed: e >= 0.14).
  double lo = 0, hi = 0.999;
  for (int i = 0; i < 80; ++i) {
    const double mid = 0.5 * (lo + hi);
    (restitutionOfDampingRatio(mid) > e ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

ContactReport contacts(const Params& p, const State& s) {
  ContactReport r;
  State copy = s;
  evaluate(p, copy, false, &r);
  return r;
}

Phase classify(const Params& p, const State& s, const ContactReport& c) {
  if (c.activeA + c.activeB == 0) return Phase::Airborne;
  const double spin = s.spinBody.norm();
  if (s.velocity.norm() < k::restSpeed && spin < k::restSpin) return Phase::AtRest;
  if ((c.activeA >= 3 && c.activeB == 0) || (c.activeB >= 3 && c.activeA == 0)) {
    // On an end face the rim slides whenever the piece spins about the
    // vertical (drilling, which the pivot friction resists); the piece
    // slides across the table when the face's centre moves.
    const double sign = c.activeA >= 3 ? 1.0 : -1.0;
    const Vec3 lever = sign * (p.body.length / 2) * (s.orientation * Vec3::UnitZ());
    const Vec3 v = s.velocity + s.spinWorld().cross(lever);
    return std::hypot(v.x(), v.y()) > k::rollingSlip ? Phase::Sliding : Phase::StandingEnd;
  }
  if (c.maxSlip() > k::rollingSlip) return Phase::Sliding;
  if (c.activeA > 0 && c.activeB > 0) return Phase::LyingFlat;
  return c.activeA > 0 ? Phase::RollingA : Phase::RollingB;
}

ContactReport step(const Params& p, State& s) {
  ContactReport report;
  const double h = p.timeStep;
  const Deriv k1 = evaluate(p, s, true, &report);
  State s2 = advanced(s, k1, h / 2);
  const Deriv k2 = evaluate(p, s2, false, nullptr);
  State s3 = advanced(s, k2, h / 2);
  const Deriv k3 = evaluate(p, s3, false, nullptr);
  State s4 = advanced(s, k3, h);
  const Deriv k4 = evaluate(p, s4, false, nullptr);
  Deriv sum;
  sum.dPosition = (k1.dPosition + 2 * k2.dPosition + 2 * k3.dPosition + k4.dPosition) / 6;
  sum.dVelocity = (k1.dVelocity + 2 * k2.dVelocity + 2 * k3.dVelocity + k4.dVelocity) / 6;
  sum.dSpin = (k1.dSpin + 2 * k2.dSpin + 2 * k3.dSpin + k4.dSpin) / 6;
  sum.dOrientation = (k1.dOrientation + 2 * k2.dOrientation + 2 * k3.dOrientation + k4.dOrientation) / 6;
  for (int i = 0; i < slotCount; ++i)
    sum.dSpring[i] = (k1.dSpring[i] + 2 * k2.dSpring[i] + 2 * k3.dSpring[i] + k4.dSpring[i]) / 6;
  s = advanced(s, sum, h);
  s.t += h;
  return report;
}

double energy(const Params& p, const State& s) { return energy(p, s, contacts(p, s)); }

double energy(const Params& p, const State& s, const ContactReport& c) {
  const Vec3& inertia = p.principal;
  double e = 0.5 * p.inertia.mass * s.velocity.squaredNorm() +
             0.5 * s.spinBody.dot(inertia.cwiseProduct(s.spinBody)) +
             p.inertia.mass * p.gravity * s.position.z();
  for (int i = 0; i < slotCount; ++i) {
    const double depth = -c.point[i].z();
    if (depth > 0) e += 0.5 * p.normalStiffness * depth * depth;
    // What the spring holds: a step of sliding stretches it past its
    // Coulomb limit, and the next step cuts it back before it acts; the
    // stretch beyond the limit never pushes (the force is capped) and is
    // not stored energy.
    e += 0.5 * p.tangentStiffness * withinCoulombLimit(p, s.slots[i], c.normalForce[i]).spring.squaredNorm();
  }
  return e;
}

bool healthy(const State& s) {
  const bool finite = s.position.allFinite() && s.velocity.allFinite() && s.spinBody.allFinite() &&
                      s.orientation.coeffs().allFinite() && std::isfinite(s.t);
  return finite && s.velocity.norm() < k::runawaySpeed && s.spinBody.norm() < k::runawaySpin;
}

}  // namespace dm
