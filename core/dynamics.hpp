// Rigid-body dynamics of the cylinder on the table: compliant normal contact
// at the rims, Coulomb friction through a stick spring with a slip limit
// (Cundall & Strack, Geotechnique 29, 47, 1979), rolling resistance, pivot
// friction and quadratic air drag, integrated with classical RK4.
//
// Contact geometry: each end's rim is sampled at four points that move with
// the lowest point of that rim (slot 0 is the lowest point; slots 1..3 are a
// quarter, a half and three quarters of the way round). A tilted body touches
// with slot 0 of one end (rim rolling), a body lying flat with slot 0 of both
// ends (line contact), a body standing on an end with all four slots of that
// end (face contact). Friction acts on the velocity of the material point at
// the slot, not its acceleration, so rolling needs no friction where the
// steady state needs none.
#pragma once
#include <array>
#include <string_view>

#include "core/body.hpp"
#include "core/scenario.hpp"
#include "core/vec.hpp"

namespace dm {

inline constexpr int slotsPerEnd = 4;
inline constexpr int slotCount = 2 * slotsPerEnd;

/// Everything fixed during a run, SI.
struct Params {
  Cylinder body;
  MassProperties inertia;
  /// Principal moments about body x, y, z, kg m^2: (I_t, I_t, I_a) for the
  /// cylinder. Kept separate so the integrator can be checked on a body
  /// with three distinct moments.
  Vec3 principal = Vec3::Ones();
  Vec3 inversePrincipal = Vec3::Ones();  ///< 1 / principal, 1/(kg m^2)
  double inverseMass = 1;                ///< 1/kg
  double frictionStatic = 0.45;   ///< -
  double frictionKinetic = 0.35;  ///< -
  double rollingResistance = 0;   ///< c_rr, -
  double pivotArm = 0;            ///< drilling torque N * arm, m
  double dragLinear = 0;          ///< 1/2 rho C_d, kg/m^3 (times projected area and |v| v)
  double dragTransverse = 0;      ///< torque = -dragTransverse |w_t| w_t, kg m^2
  double normalStiffness = 0;     ///< N/m
  double normalDamping = 0;       ///< N s/m
  double tangentStiffness = 0;    ///< N/m
  double tangentDamping = 0;      ///< N s/m
  double timeStep = 1e-4;         ///< s
  double gravity = 9.80665;       ///< m/s^2
};

/// Derives the run parameters (stiffness, damping, drag) from a scenario.
Params makeParams(const Scenario& s);
/// Coefficient of restitution of a linear spring-damper contact that never
/// pulls, for damping ratio zeta in [0, 1/sqrt 2): the rebound speed over the
/// impact speed when the contact force first returns to zero.
double restitutionOfDampingRatio(double zeta);
/// Its inverse: the damping ratio giving restitution e in (0, 1].
double dampingRatioForRestitution(double e);

/// Sets the principal moments (and their inverses) of `p`.
void setInertia(Params& p, const Vec3& principal);

/// Per-slot friction memory: the accumulated slip of the contact (stick
/// spring elongation, horizontal, metres, in lab coordinates; it turns with
/// the slot about the vertical) and whether it slid at the end of the last
/// step.
struct SlotState {
  Vec3 spring = Vec3::Zero();
  bool sliding = false;
};

/// The mutable state of a run. Angular velocity is kept in body axes.
struct State {
  double t = 0;                          ///< s
  Vec3 position = Vec3::Zero();          ///< centre of mass, m
  Quat orientation = Quat::Identity();   ///< worldFromBody
  Vec3 velocity = Vec3::Zero();          ///< m/s
  Vec3 spinBody = Vec3::Zero();          ///< angular velocity in body axes, rad/s
  std::array<SlotState, slotCount> slots{};
  Pose pose() const { return {position, orientation}; }
  Vec3 spinWorld() const { return orientation * spinBody; }
};

/// What the contacts do at one instant (diagnostics, not state).
struct ContactReport {
  std::array<double, slotCount> normalForce{};  ///< N, 0 when the slot is off the table
  std::array<double, slotCount> slipSpeed{};    ///< material-point speed across the table, m/s
  std::array<Vec3, slotCount> point{};          ///< lab position of each slot, m
  int activeA = 0, activeB = 0;                 ///< slots touching, per end
  double totalNormal() const;
  double maxSlip() const;  ///< largest slip over touching slots, m/s (0 if none)
};

/// The contact phase of one instant.
enum class Phase { Sliding, RollingA, RollingB, LyingFlat, StandingEnd, Airborne, AtRest };
std::string_view phaseName(Phase p);

/// Contact diagnostics of a state (no state change).
ContactReport contacts(const Params& p, const State& s);
/// The phase of a state, from its contacts.
Phase classify(const Params& p, const State& s, const ContactReport& c);

/// Advances the state by one RK4 step of p.timeStep. Returns the contact
/// report of the state at the start of the step (evaluated anyway as RK4's
/// first stage).
ContactReport step(const Params& p, State& s);

/// Mechanical energy, J: kinetic + gravitational (table top = 0) + the
/// elastic energy stored in the contact springs (each friction spring as
/// its Coulomb limit leaves it).
double energy(const Params& p, const State& s);
/// The same, from the state's contact report (no extra force evaluation).
/// The report must be that of `s` with its springs as they are now.
double energy(const Params& p, const State& s, const ContactReport& c);

/// Spin axis direction in the lab (body z, towards end A).
inline Vec3 axisOf(const State& s) { return s.orientation * Vec3::UnitZ(); }

/// True when every number in the state is finite and no speed is runaway.
bool healthy(const State& s);

}  // namespace dm
