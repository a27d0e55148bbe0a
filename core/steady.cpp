#include "core/steady.hpp"

#include <algorithm>
#include <array>
#include <limits>
#include <stdexcept>

#include "core/io.hpp"
#include "core/roots.hpp"

namespace dm {

// The equations (physics.md section 3, derived again here). Raised axis a at
// tilt alpha, d the unit vector in the end plane pointing up
// (z = sin(alpha) a + cos(alpha) d), e = a x d horizontal. The contact P is
// the lowest rim point of the lower end, P - c = -(L/2) a - R d; the top Q of
// the raised end is c - (P - c).
//  - Kinematics. w = Omega z + psi_dot a = (Omega sin + psi_dot) a + Omega cos d.
//    The centre is at rest and P rolls, so w x (P - c) = 0: w is parallel
//    to (L/2) a + R d, which gives psi_dot / Omega = (L/D) cos - sin, the
//    axial component w_a = Omega (L/D) cos, and Q at rest too.
//  - Torque balance. The frame (a, d, e) turns at Omega about z, so
//    dH/dt = Omega z x H with H = I_a w_a a + I_t Omega cos d. With
//    z x a = -cos e and z x d = sin e:
//      dH/dt = Omega cos (I_t Omega sin - I_a w_a) e.
//    The normal force m g z at P (no horizontal force: the centre is at
//    rest) has the torque (P - c) x m g z = -m g ((L/2) cos - R sin) e.
//    Equating: Omega^2 cos (I_a (L/D) cos - I_t sin) = m g ((L/2) cos - R sin).
//  - Both sides carry m, so everything below uses inertias per unit mass.
//  - Branches. The right side changes sign only at tan = L/D (centre right
//    above the contact), the bracket on the left only at
//    tan = I_a L / (I_t D); Omega^2 > 0 below both (the rolling, pattern
//    branch) and above both (the standing branch, up to 90 deg).
//  - Monotony. With t = tan alpha, Omega^2 = g sec(alpha) (L/2 - R t) /
//    (I_a L/D - I_t t); the fraction's t-derivative has the sign of
//    (L/2) (I_t - I_a). So when I_t > I_a (L^2 > 3 (R^2 + r^2): every tube
//    and rod) the rolling branch rises from Omega_min at alpha = 0 to
//    infinity: one pattern root above Omega_min, none below. Squatter
//    bodies may have several rolling roots; the roots are therefore found
//    by sampling, never assumed unique.
//  - Limits. alpha -> 0: Omega^2 = g (L/2) / (I_a L / D) = g R / I_a.
//    Thin disk (L -> 0, r = 0, I_a = R^2/2, I_t = R^2/4): both bounds go to
//    0 and Omega^2 = g R tan / (I_t tan cos) = 4 g / (R cos alpha)
//    = 4 g / (R sin theta), theta = 90 deg - alpha (Moffatt, Nature 404,
//    833, 2000). Thin hoop (L -> 0, r -> R, I_a = R^2, I_t = R^2/2):
//    Omega^2 = 2 g / (R sin theta).

// The centre orbit (our derivation, checked twice; rho = 0 gives the
// above exactly). Everything turns at Omega about a vertical axis through
// O; e is the horizontal unit from the floor contact towards the raised
// end, t = z x e, a = cos e + sin z, and the centre is c = O + rho e. With
// b = (L/2) cos - R sin and h = (L/2) sin + R cos, P - c = -b e - h z and
// the top Q - c = b e + h z.
//  - Rolling. v_c = Omega rho t and w x (P - c) = (-Omega b + psi_dot R) t
//    (using h cos - b sin = R), so the contact material point is at rest
//    when psi_dot / Omega = (b - rho) / R = (L/D) cos - sin - rho/R. The top's
//    material point then moves at v_c + w x (Q - c) = 2 Omega rho t: still
//    only with the centre still. The top circles O at radius |b + rho| (the
//    ring), the contact at |b - rho|; the ceiling stays at 2 h.
//  - Torque balance. H = I_a w_a a + I_t Omega cos d as before, now with
//    w_a = Omega ((L/D) cos - rho/R); dH/dt = Omega z x H =
//    Omega^2 cos (I_a ((L/D) cos - rho/R) - I_t sin) t. The contact carries
//    the weight m g z and the centripetal friction -m Omega^2 rho e, whose
//    torque about the centre is (P - c) x (m g z - m Omega^2 rho e) =
//    m (g b + h Omega^2 rho) t. So
//      Omega^2 [cos (I_a ((L/D) cos - rho/R) - I_t sin) - rho h] = g b
//    per unit mass, and rolling needs the friction coefficient
//    Omega^2 |rho| / g. The gyroscopic bracket on the left now has no
//    closed-form zero: its zeros are found numerically and bound the
//    branches with those of b.

namespace {

struct Geometry {
  double L, R, N0;  // length, outer radius, aspect ratio L/D
  double ia, it;    // axial and transverse inertia per unit mass, m^2
};

Geometry geometryOf(const Cylinder& c) {
  checkSteadyGeometry(c);
  Cylinder unit = c;
  unit.mass = 1;
  const MassProperties p = massProperties(unit);
  return {c.length, c.outerRadius, c.length / (2 * c.outerRadius), p.axial, p.transverse};
}

// Torque balance residual per unit mass, m^2/s^2: zero in a steady state.
// Written so that rho = 0 subtracts exact zeros from physics.md's form: the
// centre-still answers keep every bit.
double residual(const Geometry& G, double omega2, double a, double g, double rho) {
  const double ca = std::cos(a), sa = std::sin(a);
  return omega2 * ca * (G.ia * G.N0 * ca - G.ia * rho / G.R - G.it * sa) -
         omega2 * rho * (G.L / 2 * sa + G.R * ca) - g * (G.L / 2 * ca - G.R * sa);
}

// The gyroscopic side over Omega^2, m^2: cos (I_a ((L/D) cos - rho/R) - I_t sin) - rho h.
double gyroscopic(const Geometry& G, double a, double rho) {
  const double ca = std::cos(a), sa = std::sin(a);
  return ca * (G.ia * G.N0 * ca - G.ia * rho / G.R - G.it * sa) - rho * (G.L / 2 * sa + G.R * ca);
}

// The gravity arm b = (L/2) cos - R sin, m.
double gravityArm(const Geometry& G, double a) { return G.L / 2 * std::cos(a) - G.R * std::sin(a); }

SteadyTiltLimits limitsOf(const Geometry& G) {
  const double balance = std::atan(G.N0);             // centre above the contact
  const double gyro = std::atan2(G.ia * G.N0, G.it);  // gyroscopic bracket zero
  return {std::min(balance, gyro), std::max(balance, gyro)};
}

SteadySpin stateAt(const Geometry& G, double a, double omega, bool pattern, double rho, double g) {
  SteadySpin s;
  const double ca = std::cos(a), sa = std::sin(a);
  s.tilt = a;
  s.precession = omega;
  s.spotsPerRev = G.N0 * ca - sa - rho / G.R;
  s.relativeSpin = omega * s.spotsPerRev;
  s.centreHeight = G.L / 2 * sa + G.R * ca;
  s.ceilingHeight = 2 * s.centreHeight;
  s.contactRadius = std::abs(G.L / 2 * ca - G.R * sa - rho);
  s.ringRadius = std::abs(G.L / 2 * ca - G.R * sa + rho);
  s.orbit = rho;
  s.frictionNeeded = omega * omega * std::abs(rho) / g;
  s.topSpeed = 2 * std::abs(omega * rho);
  s.nearestSpots = int(std::lround(std::abs(s.spotsPerRev)));
  if (s.nearestSpots > 0) {
    s.driftDegPerRev = patternDriftDegPerRev(s.spotsPerRev, s.nearestSpots);
    s.driftDegPerSecond = s.driftDegPerRev * omega / k::twoPi;
  } else {
    s.driftDegPerRev = s.driftDegPerSecond = std::numeric_limits<double>::quiet_NaN();
  }
  s.fraction = fractionPattern(s.spotsPerRev);
  s.pattern = pattern;
  return s;
}

// Samples per branch interval when bracketing roots: the residual is a
// smooth trigonometric function with at most a few roots per interval, so
// 256 samples (a third of a degree apart at most) separate them; touching
// roots between samples are caught by the minimum search below.
constexpr int rootSamples = 256;

// Every root of f in [lo, hi], ascending: sign changes on a uniform grid,
// each refined by Brent to full double precision, plus roots where f only
// touches zero between samples (a local minimum of |f| without a sign
// change, searched by golden section; a pair when it crosses).
template <class F>
std::vector<double> rootsIn(F&& f, double lo, double hi) {
  std::vector<double> roots;
  if (!(hi > lo)) return roots;
  std::array<double, rootSamples + 1> x{}, v{};
  for (int i = 0; i <= rootSamples; ++i) {
    x[i] = i == rootSamples ? hi : lo + (hi - lo) * i / rootSamples;
    v[i] = f(x[i]);
  }
  for (int i = 0; i < rootSamples; ++i) {
    if (v[i] == 0) {
      roots.push_back(x[i]);
    } else if (v[i + 1] != 0 && (v[i] > 0) != (v[i + 1] > 0)) {
      roots.push_back(numeric::brentRoot(f, x[i], x[i + 1], v[i], v[i + 1]));
    }
  }
  if (v[rootSamples] == 0) roots.push_back(x[rootSamples]);
  for (int i = 1; i < rootSamples; ++i) {
    const bool sameSign =
        (v[i - 1] > 0) == (v[i] > 0) && (v[i] > 0) == (v[i + 1] > 0) && v[i] != 0 && v[i - 1] != 0 && v[i + 1] != 0;
    if (!sameSign || !(std::abs(v[i]) < std::abs(v[i - 1]) && std::abs(v[i]) <= std::abs(v[i + 1]))) continue;
    const double sign = v[i] > 0 ? 1.0 : -1.0;
    const auto [xm, fm] = numeric::goldenMinimum([&](double t) { return sign * f(t); }, x[i - 1], x[i + 1]);
    if (fm > 0) continue;
    if (fm == 0) {
      roots.push_back(xm);
      continue;
    }
    const double fx = sign * fm;
    roots.push_back(numeric::brentRoot(f, x[i - 1], xm, v[i - 1], fx));
    roots.push_back(numeric::brentRoot(f, xm, x[i + 1], fx, v[i + 1]));
  }
  std::sort(roots.begin(), roots.end());
  roots.erase(std::unique(roots.begin(), roots.end()), roots.end());
  return roots;
}

std::string degText(double a) { return fmt(a / k::degree, 4) + " deg"; }
std::string orbitText(double rho) { return " with the centre orbiting " + fmt(rho * 1e3, 4) + " mm"; }

// A tilt interval on which the torque balance can hold: the gravity arm b
// and the gyroscopic side have one sign, so Omega^2 > 0. Rolling states lie
// where both are positive, standing ones where both are negative.
struct Branch {
  double lo = 0, hi = 0;  // rad
  bool rolling = false;
};

// The branch intervals over [0, pi/2], lowest first. With the centre still
// they are the closed-form limits (so those answers keep every bit); on an
// orbit the zeros of the gyroscopic side are found like the roots.
std::vector<Branch> branchesOf(const Geometry& G, double rho) {
  if (rho == 0) {
    const SteadyTiltLimits lim = limitsOf(G);
    return {{0.0, lim.patternMax, true}, {lim.standingMin, k::pi / 2, false}};
  }
  std::vector<double> cuts = rootsIn([&](double a) { return gyroscopic(G, a, rho); }, 0.0, k::pi / 2);
  cuts.insert(cuts.end(), {0.0, std::atan(G.N0), k::pi / 2});
  std::sort(cuts.begin(), cuts.end());
  cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());
  std::vector<Branch> out;
  for (std::size_t i = 0; i + 1 < cuts.size(); ++i) {
    const double mid = 0.5 * (cuts[i] + cuts[i + 1]);
    const double arm = gravityArm(G, mid), gyro = gyroscopic(G, mid, rho);
    if ((arm > 0 && gyro > 0) || (arm < 0 && gyro < 0)) out.push_back({cuts[i], cuts[i + 1], arm > 0});
  }
  return out;
}

// Why the rolling branch has no root at this precession.
std::string noPatternAtPrecession(const Geometry& G, double omega, double omegaMin, double rho, double g) {
  if (omega == 0) return "a precession of 0 is no spin: there is no steady spin";
  if (rho == 0) {
    if (G.it >= G.ia && omega < omegaMin)
      return "precession " + revSText(omega) + " is below the lowest that keeps the end up, " + revSText(omegaMin) +
             " for this diameter and wall";
    if (G.it < G.ia && omega > omegaMin)
      return "precession " + revSText(omega) + " is above " + revSText(omegaMin) +
             ": a body this short (axial inertia above transverse) rolls steadily on its rim only below that";
    return "no rolling steady state at precession " + revSText(omega);
  }
  // On an orbit: the precessions the rolling states span, sampled.
  double lowest = std::numeric_limits<double>::infinity(), highest = 0;
  for (const Branch& b : branchesOf(G, rho)) {
    if (!b.rolling) continue;
    for (int i = 0; i <= rootSamples; ++i) {
      const double a = b.lo + (b.hi - b.lo) * i / rootSamples;
      const double w = std::sqrt(g * gravityArm(G, a) / gyroscopic(G, a, rho));
      if (!std::isfinite(w) || !(w > 0)) continue;
      lowest = std::min(lowest, w);
      highest = std::max(highest, w);
    }
  }
  if (!(highest > 0)) return "no tilt lets the lower rim roll steadily" + orbitText(rho);
  if (omega < lowest)
    return "precession " + revSText(omega) + " is below the lowest rolling steady precession" + orbitText(rho) +
           ", about " + revSText(lowest);
  if (omega > highest)
    return "precession " + revSText(omega) + " is above the highest rolling steady precession" + orbitText(rho) +
           ", about " + revSText(highest);
  return "no rolling steady state at precession " + revSText(omega) + orbitText(rho);
}

void checkOrbit(CentreOrbit orbit) {
  if (!std::isfinite(orbit.rho))
    throw std::invalid_argument("centre orbit must be finite, got " + std::to_string(orbit.rho) + " m");
}

}  // namespace

std::string InputRange::allowedText() const {
  std::string text = "allowed " + fmt(min, 10) + " to " + fmt(max, 10);
  if (unit != "-") text.append(" ").append(unit);
  return text;
}

const SteadySpin* SteadySolution::pattern() const {
  for (const SteadySpin& s : branches)
    if (s.pattern) return &s;
  return nullptr;
}

void checkSteadyGeometry(const Cylinder& c) {
  const bool ok = std::isfinite(c.length) && std::isfinite(c.outerRadius) && std::isfinite(c.innerRadius) &&
                  c.length > 0 && c.outerRadius > 0 && c.innerRadius >= 0 && c.innerRadius < c.outerRadius;
  if (!ok)
    throw std::invalid_argument("not a cylinder: length " + std::to_string(c.length) + " m, outer radius " +
                                std::to_string(c.outerRadius) + " m, inner radius " + std::to_string(c.innerRadius) +
                                " m; need length > 0 and 0 <= inner < outer radius");
}

double patternDriftDegPerRev(double spotsPerRev, int spots) { return -(std::abs(spotsPerRev) - spots) * 360.0 / spots; }

std::string ratioText(int spots, int revsPerVisit) { return std::to_string(spots) + "/" + std::to_string(revsPerVisit); }

FractionPattern fractionPattern(double spotsPerRev) {
  const double n = std::abs(spotsPerRev);
  if (!(n >= 0.5)) return {};
  // A mark stops every 1/n revolution, 360/n degrees on from the last stop;
  // p stops on it has come 360 p/n degrees, q whole turns and a shift.
  for (int p = 1; p <= int(maxRevsPerVisit * n) + 1; ++p) {
    const int q = int(std::lround(p / n));
    if (q < 1 || q > maxRevsPerVisit) continue;
    const double shift = 360.0 * (p / n - q);
    if (std::abs(shift) >= k::revisitTolerance * 360.0 / p) continue;
    // The shift comes every p/n revolutions.
    return {p, q, shift * n / p};
  }
  return {};
}

double minSteadyPrecession(const Cylinder& c, double g) {
  const Geometry G = geometryOf(c);
  return std::sqrt(g * G.R / G.ia);
}

bool squatBody(const Cylinder& c) {
  const Geometry G = geometryOf(c);
  return G.it < G.ia;
}

SteadyTiltLimits steadyTiltLimits(const Cylinder& c) { return limitsOf(geometryOf(c)); }

PatternResult patternAtPrecession(const Cylinder& c, double omega, CentreOrbit orbit, double g) {
  if (!(omega >= 0) || !std::isfinite(omega))
    throw std::invalid_argument("precession must be finite and >= 0 rad/s, got " + std::to_string(omega));
  checkOrbit(orbit);
  const Geometry G = geometryOf(c);
  const double rho = orbit.rho;
  PatternResult r;
  if (omega == 0) return r;
  const double omega2 = omega * omega;
  for (const Branch& b : branchesOf(G, rho)) {
    if (!b.rolling) continue;
    const auto roots = rootsIn([&](double a) { return residual(G, omega2, a, g, rho); }, b.lo, b.hi);
    if (roots.empty()) continue;
    r.found = true;
    r.spin = stateAt(G, roots.front(), omega, true, rho, g);
    return r;
  }
  return r;
}

PatternResult patternAtPrecession(const Cylinder& c, double omega, double g) {
  return patternAtPrecession(c, omega, CentreOrbit{}, g);
}

SteadySolution steadyAtPrecession(const Cylinder& c, double omega, CentreOrbit orbit, double g) {
  const PatternResult p = patternAtPrecession(c, omega, orbit, g);  // checks the inputs
  const Geometry G = geometryOf(c);
  const double rho = orbit.rho;
  SteadySolution s;
  s.minPrecession = std::sqrt(g * G.R / G.ia);
  if (omega == 0) {
    s.reason = noPatternAtPrecession(G, omega, s.minPrecession, rho, g);
    return s;
  }
  const double omega2 = omega * omega;
  const auto f = [&](double a) { return residual(G, omega2, a, g, rho); };
  // Every root but the pattern state's: further rolling roots (squat bodies,
  // or an orbit), then the standing ones.
  for (const Branch& b : branchesOf(G, rho))
    for (double a : rootsIn(f, b.lo, b.hi))
      if (a < k::pi / 2 && (!p.found || a != p.spin.tilt) && (s.branches.empty() || a != s.branches.back().tilt))
        s.branches.push_back(stateAt(G, a, omega, false, rho, g));
  if (p.found) s.branches.push_back(p.spin);
  std::sort(s.branches.begin(), s.branches.end(),
            [](const SteadySpin& x, const SteadySpin& y) { return x.tilt < y.tilt; });
  if (!p.found) s.reason = noPatternAtPrecession(G, omega, s.minPrecession, rho, g);
  return s;
}

SteadySolution steadyAtPrecession(const Cylinder& c, double omega, double g) {
  return steadyAtPrecession(c, omega, CentreOrbit{}, g);
}

SteadySolution steadyAtTilt(const Cylinder& c, double tilt, CentreOrbit orbit, double g) {
  if (!(tilt >= 0 && tilt <= k::pi / 2))
    throw std::invalid_argument("tilt must be within 0 to pi/2 rad, got " + std::to_string(tilt));
  checkOrbit(orbit);
  const Geometry G = geometryOf(c);
  const double rho = orbit.rho;
  const SteadyTiltLimits lim = limitsOf(G);
  SteadySolution s;
  s.minPrecession = std::sqrt(g * G.R / G.ia);
  if (tilt >= k::pi / 2) {
    s.reason = "standing upright (tilt 90 deg) would need an infinite precession";
    return s;
  }
  if (rho == 0 && tilt >= lim.patternMax && tilt <= lim.standingMin) {
    s.reason = "no steady spin at tilt " + degText(tilt) + ": from " + degText(lim.patternMax) + " to " +
               degText(lim.standingMin) + " the gravity torque and the gyroscopic torque cannot balance";
    return s;
  }
  // Closed form: Omega^2 = g b / (cos (I_a ((L/D) cos - rho/R) - I_t sin) - rho h).
  const double ca = std::cos(tilt), sa = std::sin(tilt);
  const double omega2 = g * (G.L / 2 * ca - G.R * sa) /
                        (ca * (G.ia * G.N0 * ca - G.ia * rho / G.R - G.it * sa) - rho * (G.L / 2 * sa + G.R * ca));
  if (!(omega2 > 0) || !std::isfinite(omega2)) {
    s.reason = "no steady spin at tilt " + degText(tilt);
    if (rho != 0) s.reason += orbitText(rho) + ": the gravity torque and the gyroscopic torque cannot balance";
    return s;
  }
  const bool pattern = rho == 0 ? tilt < lim.patternMax : gravityArm(G, tilt) > 0;
  s.branches.push_back(stateAt(G, tilt, std::sqrt(omega2), pattern, rho, g));
  if (!pattern)
    s.reason = rho == 0 ? "tilt " + degText(tilt) + " is on the standing branch (above " + degText(lim.standingMin) +
                              "): a steady state nearly on end, not the pattern state"
                        : "tilt " + degText(tilt) + " is on the standing branch (the contact beyond the centre)" +
                              orbitText(rho) + ": a steady state nearly on end, not the pattern state";
  return s;
}

SteadySolution steadyAtTilt(const Cylinder& c, double tilt, double g) { return steadyAtTilt(c, tilt, CentreOrbit{}, g); }

// ---- the prescribed motion ------------------------------------------------

Vec3 SteadyMotion::velocityAt(double t) const {
  const double phi = azimuth0 + spin.precession * t;
  return spin.precession * spin.orbit * Vec3(-std::sin(phi), std::cos(phi), 0);
}

Vec3 SteadyMotion::raisedAxisAt(double t) const {
  const double phi = azimuth0 + spin.precession * t;
  const double ca = std::cos(spin.tilt);
  return {ca * std::cos(phi), ca * std::sin(phi), std::sin(spin.tilt)};
}

Pose SteadyMotion::poseAt(double t) const {
  using AA = Eigen::AngleAxisd;
  const double phi = azimuth0 + spin.precession * t;
  const double roll = roll0 + spin.relativeSpin * t;
  // Body z to the raised axis: tip it down from vertical by 90 deg - tilt
  // towards +x, then turn it to its azimuth; end B first turns body z over.
  // The roll about body z is signed so that it turns about the raised axis.
  const Quat flip = raised == End::B ? Quat(AA(k::pi, Vec3::UnitX())) : Quat::Identity();
  Pose p;
  p.worldFromBody = Quat(AA(phi, Vec3::UnitZ())) * Quat(AA(k::pi / 2 - spin.tilt, Vec3::UnitY())) * flip *
                    Quat(AA(endSign(raised) * roll, Vec3::UnitZ()));
  p.worldFromBody.normalize();
  p.position = Vec3(centre.x(), centre.y(), spin.centreHeight);
  // The orbit, added only when there is one (a still centre keeps its bits).
  if (spin.orbit != 0) p.position += spin.orbit * Vec3(std::cos(phi), std::sin(phi), 0);
  return p;
}

Vec3 SteadyMotion::spinAt(double t) const {
  return spin.precession * Vec3::UnitZ() + spin.relativeSpin * raisedAxisAt(t);
}

}  // namespace dm
