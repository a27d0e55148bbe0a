// The steady spin (physics.md sections 3 and 4): the state a well-launched
// tube settles into and the one that paints the spots. The lower end's rim
// rolls on the table while everything turns at the precession rate about a
// vertical axis. With the centre on that axis (physics.md's state) the top
// of the raised end is at rest too; a hand launch usually settles with the
// centre circling the axis at a small signed offset rho along the axis'
// horizontal direction (CentreOrbit), held by friction. Given the geometry,
// the orbit and the precession rate (or the tilt) the solver finds the other
// and everything a designer reads off it: relative spin, spots per
// revolution, the floor contact circle and the ring the top traces, the
// imaginary ceiling, the pattern's drift, the friction the orbit needs and
// the lowest precession that keeps the end up. The mass cancels: only the
// geometry, the orbit and g matter.
#pragma once
#include <cmath>
#include <string>
#include <string_view>
#include <vector>

#include "core/body.hpp"
#include "core/constants.hpp"
#include "core/vec.hpp"

namespace dm {

/// The valid range of one user-facing input, in the unit the user types
/// (CLI flags, GUI fields), inclusive at both ends. The ranges of the steady
/// and advisor inputs live here and in core/advise.hpp, nowhere else.
struct InputRange {
  std::string_view name;  ///< what the value is, e.g. "precession"
  std::string_view unit;  ///< the unit typed, e.g. "rev/s"; "-" when dimensionless
  double min = 0, max = 0;
  bool contains(double v) const { return std::isfinite(v) && v >= min && v <= max; }
  /// "allowed 0 to 100 rev/s"
  std::string allowedText() const;
};

namespace steady_input {
/// Precession rate of the axis, rev/s. Zero is allowed (the answer is "no
/// steady spin"); the top leaves room above the launch table's 50 rev/s.
inline constexpr InputRange precession{"precession", "rev/s", 0, 100};
/// Tilt of the raised axis above the horizontal, degrees.
inline constexpr InputRange tilt{"tilt", "deg", 0, 90};
/// Step of a precession sweep, rev/s: a ten-thousandth of a revolution per
/// second is finer than any table a designer reads.
inline constexpr InputRange sweepStep{"sweep step", "rev/s", 1e-4, 100};
/// Most rows a sweep prints (a 0..100 rev/s sweep at 1e-3 rev/s steps).
inline constexpr int maxSweepRows = 100001;
/// Signed centre orbit rho, mm (CentreOrbit): as far either way as the
/// longest body the scenario table allows (body.length_mm, 1000 mm). A
/// launch settles with a few millimetres; the friction the answer needs
/// says whether a table can hold a larger one.
inline constexpr InputRange orbit{"centre orbit", "mm", -1000, 1000};
}  // namespace steady_input

/// Where the centre goes in a steady spin. Everything turns at the
/// precession rate Omega about a vertical axis through O; e is the
/// horizontal unit from the floor contact towards the raised end. The
/// centre is c = O + rho e: rho = 0 is physics.md section 3's state with the
/// centre still; rho != 0 circles the centre about O at radius |rho|, the
/// table's friction supplying the centripetal force m Omega^2 rho.
struct CentreOrbit {
  double rho = 0;  ///< m, signed: + towards the raised end, - towards the floor contact
};

/// A fraction N ~ p/q (fractionPattern).
struct FractionPattern {
  int spots = 0;              ///< p, the places one mark stops at (0: none)
  int revsPerVisit = 0;       ///< q, precession revolutions between visits of one place
  double driftDegPerRev = 0;  ///< how far a place moves per precession revolution, deg, + with the precession
};

/// One steady state. Angles in radians, rates in rad/s, lengths in metres.
/// b = (L/2) cos a - R sin a is the horizontal offset of the contact circle's
/// centre, rho the centre orbit (CentreOrbit).
struct SteadySpin {
  double tilt = 0;            ///< raised axis above the horizontal, rad (0..pi/2)
  double precession = 0;      ///< Omega, azimuth rate of the raised axis, rad/s, > 0
  double relativeSpin = 0;    ///< psi_dot = Omega ((L/D) cos a - sin a - rho/R), rad/s
  double spotsPerRev = 0;     ///< N = relativeSpin / precession (negative on the standing branch)
  double contactRadius = 0;   ///< radius of the floor contact circle about the spin axis |b - rho|, m
  double ringRadius = 0;      ///< radius of the ring the raised end's top traces about the spin axis |b + rho|, m
  double ceilingHeight = 0;   ///< height of the imaginary ceiling the raised end's top touches, 2 z_c, m
  double centreHeight = 0;    ///< z_c = (L/2) sin a + R cos a, m
  double orbit = 0;           ///< rho, the centre's signed offset from the spin axis, m (CentreOrbit)
  /// Friction coefficient the orbit needs to roll: Omega^2 |rho| / g (the
  /// centripetal force over the weight); 0 with the centre still.
  double frictionNeeded = 0;
  /// Speed of the raised end's top point across the table, m/s: 2 |Omega
  /// rho|. With the centre still the mark stands still at the top; on an
  /// orbit it passes the top this fast, along the ring.
  double topSpeed = 0;
  /// Drift of the nearestSpots-spot pattern, degrees of azimuth per
  /// precession revolution, + in the direction of precession (NaN when
  /// nearestSpots is 0: fewer than half a spot per revolution).
  double driftDegPerRev = 0;
  double driftDegPerSecond = 0;  ///< the same per second, deg/s (NaN when nearestSpots is 0)
  int nearestSpots = 0;          ///< n, the whole number nearest |N|
  /// The fewest places the stops come back to, when N is near a fraction
  /// p/q with few revolutions between visits (fractionPattern).
  FractionPattern fraction;
  bool pattern = false;          ///< true for the pattern state (the low-tilt rolling branch)
};

/// Every steady state at one input, lowest tilt first.
struct SteadySolution {
  std::vector<SteadySpin> branches;
  double minPrecession = 0;  ///< minSteadyPrecession() of the body (centre still), rad/s
  std::string reason;        ///< why there is no pattern state; empty when there is one
  /// The pattern state, or nullptr when none exists.
  const SteadySpin* pattern() const;
};

/// Every steady state at precession `precession` (rad/s, >= 0; 0 gives none)
/// with the centre on `orbit` (finite). Throws std::invalid_argument for a
/// negative or non-finite precession or orbit or a body that is not a
/// cylinder (see checkSteadyGeometry). The pattern state is the lowest-tilt
/// state rolling on the lower rim (b > 0); the others are further rolling
/// states or the standing ones (b < 0, nearly on end).
SteadySolution steadyAtPrecession(const Cylinder& c, double precession, CentreOrbit orbit, double g = k::gravity);
/// The same with the centre still (rho = 0, physics.md section 3).
SteadySolution steadyAtPrecession(const Cylinder& c, double precession, double g = k::gravity);

/// The steady state at tilt `tilt` (rad, 0..pi/2) with the centre on
/// `orbit`, if any: the precession follows in closed form. Throws
/// std::invalid_argument outside 0..pi/2 or for a non-finite orbit.
SteadySolution steadyAtTilt(const Cylinder& c, double tilt, CentreOrbit orbit, double g = k::gravity);
/// The same with the centre still (rho = 0).
SteadySolution steadyAtTilt(const Cylinder& c, double tilt, double g = k::gravity);

/// The pattern state alone at one precession (rad/s): exactly the pattern()
/// of steadyAtPrecession, without the search of the standing branch.
/// `spin.pattern` is false and `found` false when there is none.
struct PatternResult {
  bool found = false;
  SteadySpin spin;
};
PatternResult patternAtPrecession(const Cylinder& c, double precession, CentreOrbit orbit, double g = k::gravity);
PatternResult patternAtPrecession(const Cylinder& c, double precession, double g = k::gravity);

/// Omega_min = sqrt(m g R / I_a) = sqrt(2 g R / (R^2 + r^2)), rad/s: the
/// tilt -> 0 limit of the pattern branch. For a body longer than
/// sqrt(3 (R^2 + r^2)) (I_t > I_a: every tube and rod) it is the lowest
/// precession that keeps the end up; for a squatter body (I_t < I_a) the
/// rolling branch exists only below it.
double minSteadyPrecession(const Cylinder& c, double g = k::gravity);

/// True when I_t < I_a (L^2 < 3 (R^2 + r^2)): a body this squat rolls
/// steadily on its rim only below minSteadyPrecession().
bool squatBody(const Cylinder& c);

/// The tilts that bound the branches with the centre still, rad: the rolling (pattern) branch lies
/// in [0, patternMax), the standing branch in (standingMin, pi/2); between
/// them the gravity and gyroscopic torques cannot balance.
/// patternMax = min(atan(L/D), atan(I_a L / (I_t D))), standingMin the max.
struct SteadyTiltLimits {
  double patternMax = 0;
  double standingMin = 0;
};
SteadyTiltLimits steadyTiltLimits(const Cylinder& c);

/// Drift of an n-spot pattern, degrees of azimuth per precession
/// revolution, when the mark comes to the top |N| times per revolution:
/// -(|N| - n) 360 / n (physics.md section 4). Exact, not only for small
/// |N| - n: stops fall 360/|N| degrees apart, so every n stops a spot moves
/// by n 360/|N| - 360 degrees, and n stops take n/|N| revolutions. n >= 1.
double patternDriftDegPerRev(double spotsPerRev, int spots);

/// Most precession revolutions between two visits of one place that
/// fractionPattern considers: beyond that a place is lit too seldom to read
/// as a spot (at 5 rev/s, once in 0.8 s).
inline constexpr int maxRevsPerVisit = 4;

/// What a steady N makes of one mark's stops, read as the window analysis
/// reads measured stops (core/pattern.cpp): the fewest places p that every
/// p-th stop comes back to within an eighth of their spacing, each visited
/// every q revolutions, so that |N| is near p/q. None (spots 0) when no p
/// with q <= maxRevsPerVisit does: the stops creep round the ring. It
/// knows no marks: p spots stand apart only where a mark spans less than
/// 180/p degrees of the ring (the windows' condition, with the mark's size).
FractionPattern fractionPattern(double spotsPerRev);

/// "7/2": N near p/q, as files and reports write it (the windows' n_ratio too).
std::string ratioText(int spots, int revsPerVisit);

/// Throws std::invalid_argument unless 0 < L, 0 < R, 0 <= r < R, all finite.
void checkSteadyGeometry(const Cylinder& c);

/// The exact prescribed steady motion. The raised axis (from the centre
/// towards the raised end: body +z for end A, body -z for end B) stands at
/// spin.tilt above the horizontal with azimuth azimuth0 + Omega t, its
/// horizontal unit e(t); the centre is at (centre.x, centre.y,
/// spin.centreHeight) + spin.orbit e(t), still when the orbit is 0; the body
/// turns about its own axis by roll0 + relativeSpin t. The angular velocity
/// is w = Omega z + relativeSpin a_raised, the convention of axisMotion()
/// in core/kinematics.cpp.
struct SteadyMotion {
  Cylinder body;
  SteadySpin spin;
  End raised = End::A;
  Vec3 centre = Vec3::Zero();  ///< the spin axis O: only x and y are used, m
  double azimuth0 = 0;         ///< azimuth of the raised axis at t = 0, rad
  double roll0 = 0;            ///< roll about the axis at t = 0, rad
  /// Pose at time t (s).
  Pose poseAt(double t) const;
  /// Angular velocity in the lab frame at time t (s), rad/s.
  Vec3 spinAt(double t) const;
  /// Velocity of the centre at time t (s), m/s: Omega rho (z x e).
  Vec3 velocityAt(double t) const;
  /// Unit raised axis at time t.
  Vec3 raisedAxisAt(double t) const;
};

}  // namespace dm
