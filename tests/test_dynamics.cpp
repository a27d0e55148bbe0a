// Validation of the physics core against outside values (sources beside each
// check) and against our own steady-spin derivation.
#include <algorithm>
#include <cmath>

#include <catch2/catch.hpp>

#include "core/kinematics.hpp"
#include "core/launch.hpp"
#include "core/random.hpp"
#include "core/simulate.hpp"
#include "support.hpp"

using namespace dm;
using dm::test::bodyScenario;

namespace {

// A body lying on its side, axis along lab y, at the static deflection.
State lyingAlongY(const Params& p, const Vec3& velocity, double axialSpin) {
  State s;
  s.orientation = test::frameAlong(Vec3::UnitY());
  s.position = Vec3(0, 0, p.body.outerRadius - p.inertia.mass * p.gravity / (2 * p.normalStiffness));
  s.velocity = velocity;
  s.spinBody = Vec3(0, 0, axialSpin);
  return s;
}

struct RollOnset {
  double time = -1;   // s, when the contact stops slipping
  double speed = 0;   // m/s, centre speed once rolling
};

// Runs until the contact slip falls below 1 mm/s, then reads the speed a
// little later (rolling without resistance keeps it constant).
RollOnset rollOnset(const Params& p, State s, double maxTime) {
  RollOnset r;
  while (s.t < maxTime) {
    const ContactReport c = step(p, s);
    if (c.activeA + c.activeB > 0 && c.maxSlip() < 1e-3 && s.t > 0.002) {
      r.time = s.t;
      for (int i = 0; i < 500; ++i) step(p, s);
      r.speed = std::hypot(s.velocity.x(), s.velocity.y());
      return r;
    }
  }
  return r;
}

Params sideRollParams(double innerRatio, double mu) {
  Scenario sc = innerRatio == 0 ? bodyScenario(Shape::Rod, 0.08, 0.03, 0)
                                : bodyScenario(Shape::Tube, 0.08, 0.03, 0.015 * (1 - innerRatio));
  sc.surface.frictionStatic = sc.surface.frictionKinetic = mu;
  return makeParams(sc);
}

}  // namespace

TEST_CASE("sliding cylinders, hoops and tubes start rolling when and as fast as standard mechanics says", "[dynamics][validation]") {
  // Young & Freedman, University Physics, ch. 10 (rolling with slipping;
  // physics.md section 7): a body with I = k m R^2 launched sliding at v0
  // without spin feels F = -mu m g and a torque mu m g R, so its slip stops
  // at t = v0 / (mu g (1 + 1/k)) at the speed v0 / (1 + k). Solid cylinder
  // k = 1/2: t = v0/(3 mu g), 2 v0/3. Thin hoop k = 1: t = v0/(2 mu g), v0/2,
  // checked on a wall near the thinnest the table allows (0.06 mm on a 15 mm
  // radius, k = 0.996: 0.2 % from the hoop). Thick tube
  // k = (1 + (r/R)^2) / 2. Tolerance 1 % (the target).
  const double mu = 0.3, v0 = 1.0, g = k::gravity;
  struct Case {
    const char* body;
    double innerRatio, expectedTime, expectedSpeed;
  };
  const double thick = 0.6, kThick = (1 + thick * thick) / 2;
  const Case cases[] = {
      {"solid cylinder", 0.0, v0 / (3 * mu * g), 2 * v0 / 3},
      {"thin hoop", 1 - 0.06 / 15, v0 / (2 * mu * g), v0 / 2},
      {"thick tube r/R = 0.6", thick, v0 / (mu * g * (1 + 1 / kThick)), v0 / (1 + kThick)},
  };
  for (const Case& c : cases) {
    const Params p = sideRollParams(c.innerRatio, mu);
    const RollOnset r = rollOnset(p, lyingAlongY(p, Vec3(v0, 0, 0), 0), 2.0);
    INFO(c.body);
    CHECK(r.time == Approx(c.expectedTime).epsilon(0.01));
    CHECK(r.speed == Approx(c.expectedSpeed).epsilon(0.01));
  }
}

TEST_CASE("a cylinder set down spinning without speed rolls off at R w0 / 3", "[dynamics][validation]") {
  // Young & Freedman, University Physics, ch. 10 (rolling with slipping):
  // a solid cylinder set down with spin w0 and no speed rolls after
  // t = R w0 / (3 mu g) at speed R w0 / 3. Tolerance 1 %.
  const double mu = 0.25, w0 = 60.0;
  const Params p = sideRollParams(0.0, mu);
  const double R = p.body.outerRadius;
  const RollOnset r = rollOnset(p, lyingAlongY(p, Vec3::Zero(), w0), 2.0);
  CHECK(r.time == Approx(R * w0 / (3 * mu * k::gravity)).epsilon(0.01));
  CHECK(r.speed == Approx(R * w0 / 3).epsilon(0.01));
}

namespace {

struct Hold {
  double maxTiltError = 0;  // rad
  double maxCentreDrift = 0;  // m, from where the centre would be on the rigid steady path
  double maxSlipRatio = 0;  // slip / rim speed
};

// Runs the rigid steady start for `duration` and records how far the run
// departs from it. The rim speed is R times the relative spin (the speed at
// which the rim runs through the contact), smaller than R |w| and so the
// stricter reference for the creep.
Hold holdFrom(const Params& p, const test::SteadyStart& st, double alpha, double duration, double circle) {
  State s = st.state;
  const Vec3 c0 = s.position;
  const double rimSpeed = p.body.outerRadius * std::abs(st.relativeSpin);
  Hold h;
  while (s.t < duration) {
    const ContactReport c = step(p, s);
    const AxisMotion m = axisMotion(s.orientation, s.spinWorld());
    h.maxTiltError = std::max(h.maxTiltError, std::abs(m.tilt - alpha));
    // The rigid path: the centre turns about (-circle, 0) at the precession rate.
    const double turned = st.precession * s.t;
    const Vec3 onPath(c0.x() - circle + circle * std::cos(turned), c0.y() + circle * std::sin(turned), c0.z());
    h.maxCentreDrift = std::max(h.maxCentreDrift, std::hypot(s.position.x() - onPath.x(), s.position.y() - onPath.y()));
    h.maxSlipRatio = std::max(h.maxSlipRatio, c.maxSlip() / rimSpeed);
  }
  return h;
}

Hold holdSteady(const Params& p, double alpha, double duration, double circle = 0) {
  return holdFrom(p, test::steadyStart(p, alpha, circle), alpha, duration, circle);
}

}  // namespace

TEST_CASE("a thin disk started in Moffatt's steady state holds it", "[dynamics][validation]") {
  // Moffatt, Nature 404, 833 (2000): a thin disk rolling on its rim at angle
  // theta to the table, its centre fixed, precesses steadily with
  // W^2 = 4 g / (R sin theta); rolling at the contact then gives the spin
  // about the axis -W cos theta in the frame turning with the axis (the
  // L -> 0 limit of physics.md section 3). The thinnest disk the table
  // allows (0.2 mm on 40 mm, L/R = 0.01) is started exactly there, with
  // dissipation off. The target: tilt within 0.1 deg, centre within
  // 0.5 mm for 2 s (measured 0.044 deg and 0.06 mm; a 0.8 mm disk started
  // there departs by 0.17 deg, its own steady state being 1.1 % faster).
  Scenario sc = bodyScenario(Shape::Disk, 0.0002, 0.040, 0, 7800);
  const Params p = makeParams(sc);
  const double theta = 30 * k::degree, alpha = k::pi / 2 - theta;
  test::SteadyStart st = test::steadyStart(p, alpha);  // pose, at the static deflection
  // Our finite-thickness steady state tends to Moffatt's: within about L/R.
  const double moffatt = std::sqrt(4 * k::gravity / (p.body.outerRadius * std::sin(theta)));
  CHECK(st.precession == Approx(moffatt).epsilon(0.01));
  st.precession = moffatt;
  st.relativeSpin = -moffatt * std::cos(theta);
  const Vec3 axis = st.state.orientation * Vec3::UnitZ();
  st.state.spinBody = st.state.orientation.conjugate() * Vec3(moffatt * up() + st.relativeSpin * axis);
  const Hold h = holdFrom(p, st, alpha, 2.0, 0);
  CHECK(h.maxTiltError < 0.1 * k::degree);
  CHECK(h.maxCentreDrift < 0.5e-3);
}

TEST_CASE("a 4:1 tube started in its steady spin holds it, with no creep", "[dynamics][validation]") {
  // physics.md section 3 (our derivation): tube D = 16 mm, wall 1 mm,
  // L = 64 mm. Tilt within 0.1 deg and centre within 0.5 mm for 2 s; in
  // steady rim rolling the contact slips less than 1e-4 of the rim speed
  // (the creep bound the README states).
  Scenario sc = bodyScenario(Shape::Tube, 0.064, 0.016, 0.001, 2700);
  const Params p = makeParams(sc);
  for (double tiltDeg : {2.0, 16.0}) {
    INFO("tilt " << tiltDeg << " deg");
    const Hold h = holdSteady(p, tiltDeg * k::degree, 2.0);
    CHECK(h.maxTiltError < 0.1 * k::degree);
    CHECK(h.maxCentreDrift < 0.5e-3);
    CHECK(h.maxSlipRatio < 1e-4);
  }
}

TEST_CASE("a 4:1 tube rolling steadily with its centre on a circle keeps to it, with no creep", "[dynamics][validation]") {
  // Our derivation (tests/support.hpp, steadyStart: physics.md section 3 with
  // the centre on a circle): here the contact must carry the centripetal
  // friction m W^2 X, which turns with the precession, so the creep bound is
  // tested where friction is needed (at a fixed centre it is not). Circles of
  // 0.5 and 1 mm need 8 to 33 % of the weight, under the static coefficient
  // 0.45. Same targets: slip below 1e-4 of the rim speed, tilt within 0.1 deg,
  // centre within 0.5 mm of its rigid circle for 2 s. A spring held in the
  // lab frame instead of the contact's creeps at W F / k: 1.1e-4 to 5.9e-4
  // of the rim speed (measured), so this check fails for it; held in the
  // contact's frame, 2.4e-5 to 4.1e-5, as with the centre fixed.
  Scenario sc = bodyScenario(Shape::Tube, 0.064, 0.016, 0.001, 2700);
  const Params p = makeParams(sc);
  for (double circleMm : {0.5, 1.0})
    for (double tiltDeg : {2.0, 12.0, 16.0}) {
      INFO("circle " << circleMm << " mm, tilt " << tiltDeg << " deg");
      const Hold h = holdSteady(p, tiltDeg * k::degree, 2.0, circleMm * 1e-3);
      CHECK(h.maxTiltError < 0.1 * k::degree);
      CHECK(h.maxCentreDrift < 0.5e-3);
      CHECK(h.maxSlipRatio < 1e-4);
    }
}

TEST_CASE("a torque-free body conserves energy and angular momentum, and the intermediate axis is unstable", "[dynamics][validation]") {
  // Landau & Lifshitz, Mechanics, section 37: free rotation conserves energy
  // and angular momentum; rotation about the axis of intermediate moment is
  // unstable, about the largest and smallest stable. Conservation to 1e-6
  // over 10 s (the target) checks the RK4 rotation integrator.
  Scenario sc = bodyScenario(Shape::Rod, 0.05, 0.01, 0);
  Params p = makeParams(sc);
  p.gravity = 0;
  p.dragLinear = p.dragTransverse = 0;
  setInertia(p, Vec3(1e-6, 2e-6, 3e-6));
  auto spinFor = [&](const Vec3& w0, double duration, Vec3* wEnd, double* energyError, double* momentumError) {
    State s;
    s.position = Vec3(0, 0, 1.0);  // far above the table: no contact
    s.spinBody = w0;
    auto momentum = [&](const State& st) { return Vec3(st.orientation * p.principal.cwiseProduct(st.spinBody)); };
    const double e0 = energy(p, s) - p.inertia.mass * 0;  // gravity is off
    const Vec3 l0 = momentum(s);
    *energyError = *momentumError = 0;
    while (s.t < duration) {
      step(p, s);
      *energyError = std::max(*energyError, std::abs(energy(p, s) - e0) / e0);
      *momentumError = std::max(*momentumError, (momentum(s) - l0).norm() / l0.norm());
    }
    *wEnd = s.spinBody;
  };
  Vec3 w;
  double de, dl;
  spinFor(Vec3(3, 1, 2), 10.0, &w, &de, &dl);
  CHECK(de < 1e-6);
  CHECK(dl < 1e-6);
  // Intermediate axis (y): a 1e-3 perturbation grows until the spin flips.
  double minWy = 1e9;
  {
    State s;
    s.position = Vec3(0, 0, 1.0);
    s.spinBody = Vec3(1e-3, 10, 1e-3);
    while (s.t < 10) {
      step(p, s);
      minWy = std::min(minWy, s.spinBody.y());
    }
  }
  CHECK(minWy < -5);
  // Largest (z) and smallest (x) axes: the same perturbation stays small.
  spinFor(Vec3(1e-3, 1e-3, 10), 10.0, &w, &de, &dl);
  CHECK(w.z() > 9.99);
  spinFor(Vec3(10, 1e-3, 1e-3), 10.0, &w, &de, &dl);
  CHECK(w.x() > 9.99);
}

TEST_CASE("conservative rolling keeps its energy", "[dynamics][validation]") {
  // With rolling resistance, pivot friction and drag off, rolling does no
  // work: total mechanical energy (kinetic, gravity, contact springs) must
  // drift less than 1e-4 relatively over 10 s (the target).
  SECTION("a cylinder rolling straight on its side") {
    const Params p = sideRollParams(0.0, 0.4);
    const double v = 0.3;
    State s = lyingAlongY(p, Vec3(v, 0, 0), v / p.body.outerRadius);  // rolling: w_y R = v
    const double e0 = energy(p, s);
    double worst = 0;
    while (s.t < 10) {
      step(p, s);
      worst = std::max(worst, std::abs(energy(p, s) - e0) / e0);
    }
    CHECK(worst < 1e-4);
  }
  SECTION("a tube rolling on its rim, nutating about the steady spin") {
    Scenario sc = bodyScenario(Shape::Tube, 0.064, 0.016, 0.001, 2700);
    const Params p = makeParams(sc);
    test::SteadyStart st = test::steadyStart(p, 12 * k::degree);
    State s = st.state;
    s.spinBody *= 1.01;  // off the steady state: it nutates
    for (int i = 0; i < 2000; ++i) step(p, s);  // let the first contact transient pass
    const double e0 = energy(p, s);
    double worst = 0;
    const double end = s.t + 10;
    while (s.t < end) {
      step(p, s);
      worst = std::max(worst, std::abs(energy(p, s) - e0) / e0);
    }
    CHECK(worst < 1e-4);
  }
}

TEST_CASE("the energy record counts only what the friction springs hold", "[dynamics][energy]") {
  // A cylinder set down spinning slides until it rolls (Young & Freedman,
  // ch. 10, as above); kinetic friction and the contact's damping only take
  // energy out, so the recorded energy must never rise. Each step of sliding
  // stretches a friction spring past its Coulomb limit before the next step
  // cuts it back; counted as stored, that stretch added 0.5 k (v h)^2 to the
  // record, here 8 % of the energy at touchdown (measured). Allowed rise per
  // step: 1e-9 of the energy, far above RK4's own error on this run
  // (measured 1.5e-16) and far below the miscount.
  const Params p = sideRollParams(0.0, 0.25);
  State s = lyingAlongY(p, Vec3::Zero(), 60.0);
  double previous = energy(p, s);
  const double e0 = previous;
  double worstRise = 0;
  bool slid = false;
  while (s.t < 0.3) {
    const ContactReport c = step(p, s);
    slid = slid || c.maxSlip() > 0.1;
    const double e = energy(p, s);
    worstRise = std::max(worstRise, (e - previous) / e0);
    previous = e;
  }
  CHECK(slid);
  CHECK(worstRise < 1e-9);
  CHECK(previous < e0);
}

TEST_CASE("the pressed end of the demo tube rises and is the one seen", "[dynamics][launch]") {
  // Common practice, no source: a hand-spun tube rises onto the end that was
  // not pressed, so the pressed end is the raised one; the issue asks for at
  // least 9 of 10 seeded launches at 6 to 12 rev/s with back-spin 0.3 to 1.0.
  const Scenario demo = test::demo();
  SplitMix64 rng{20261201};
  int raisedIsPressed = 0;
  for (int i = 0; i < 10; ++i) {
    Scenario s = demo;
    s.launch.revolution = (6 + 6 * rng.uniform()) * k::twoPi;
    s.launch.backspin = 0.3 + 0.7 * rng.uniform();
    s.launch.pressedEnd = rng.uniform() < 0.5 ? End::A : End::B;
    SimulateOptions o;
    o.duration = 4.0;  // long enough for slow starters to sustain rim rolling
    const RunResult r = simulate(s, o);
    INFO("launch " << i << ": " << s.launch.revolution / k::twoPi << " rev/s, back-spin " << s.launch.backspin);
    if (r.summary.raisedEnd && *r.summary.raisedEnd == s.launch.pressedEnd) ++raisedIsPressed;
  }
  CHECK(raisedIsPressed >= 9);
}

TEST_CASE("the contact's damping gives the chosen restitution", "[dynamics][contact]") {
  // Newton's impact law (standard mechanics): rebound speed = e * impact
  // speed. For a linear spring-damper that never pulls, the contact ends when
  // its force returns to zero, before the spring is relaxed; a rebound
  // derived for that case (our derivation, in restitutionOfDampingRatio) is
  // inverted to set the damping. Check the derivation against its textbook
  // limit: without damping e = 1; for light damping e ~ exp(-zeta pi).
  CHECK(restitutionOfDampingRatio(0) == Approx(1));
  CHECK(restitutionOfDampingRatio(0.01) == Approx(std::exp(-0.01 * k::pi)).epsilon(2e-3));
  for (double e : {0.15, 0.5, 0.9}) CHECK(restitutionOfDampingRatio(dampingRatioForRestitution(e)) == Approx(e).epsilon(1e-9));
  // A rod hitting the table flat lands on two contacts, each carrying half
  // the mass: its damping ratio is sqrt(2) times the one-contact value, so it
  // rebounds at e(sqrt 2 zeta). Gravity is off so the derivation applies
  // exactly. Tolerance: within 1 % with 48 steps per millisecond; 6 % at the
  // default 3, where the 3.5 ms impact spans about 11 steps and its start
  // and end fall between them (measured +5.2 %).
  for (int substeps : {48, 3}) {
    Scenario sc = bodyScenario(Shape::Rod, 0.1, 0.02, 0);
    sc.surface.restitution = 0.5;
    sc.run.substeps = substeps;
    Params p = makeParams(sc);
    p.gravity = 0;
    State s;
    s.orientation = test::frameAlong(Vec3::UnitY());
    s.position = Vec3(0, 0, p.body.outerRadius + 1e-4);
    s.velocity = Vec3(0, 0, -0.5);
    double rebound = 0;
    bool touched = false, left = false;
    while (s.t < 0.1 && !left) {
      const ContactReport c = step(p, s);
      touched = touched || c.totalNormal() > 0;
      left = touched && c.totalNormal() == 0;
      rebound = s.velocity.z();
    }
    const double expected = restitutionOfDampingRatio(std::sqrt(2.0) * dampingRatioForRestitution(0.5));
    INFO("substeps " << substeps);
    CHECK(rebound / 0.5 == Approx(expected).epsilon(substeps == 3 ? 0.06 : 0.01));
  }
}

TEST_CASE("a tube spinning on its end face stands, and slides while its face moves", "[dynamics][contact]") {
  // Common practice, no source: spinning in place on a face is standing on
  // it (the face's rim slides, the face's centre does not); a face that moves
  // across the table slides. The friction on the end ring slows the spin.
  const Params p = makeParams(bodyScenario(Shape::Tube, 0.05, 0.04, 0.003));
  auto spinUpright = [&](double sideways, double& spinStart, double& spinEnd) {
    State s;
    s.orientation = test::frameAlong(-Vec3::UnitZ());  // end B down
    s.position = Vec3(0, 0, p.body.length / 2 - 1e-6);
    s.velocity = Vec3(sideways, 0, 0);
    s.spinBody = s.orientation.conjugate() * Vec3(0, 0, 5 * k::twoPi);  // 5 rev/s about the vertical
    std::vector<Phase> phases;
    while (s.t < 0.1) {
      const ContactReport c = step(p, s);
      if (s.t < 0.02) continue;  // the contact springs take up the weight
      if (phases.empty()) spinStart = s.spinWorld().z();
      phases.push_back(classify(p, s, c));
    }
    spinEnd = s.spinWorld().z();
    return phases;
  };
  double spin0 = 0, spin1 = 0;
  const std::vector<Phase> inPlace = spinUpright(0, spin0, spin1);
  REQUIRE(!inPlace.empty());
  CHECK(std::count(inPlace.begin(), inPlace.end(), Phase::StandingEnd) == long(inPlace.size()));
  CHECK(spin1 < spin0);
  CHECK(spin1 > 0);
  const std::vector<Phase> moving = spinUpright(0.3, spin0, spin1);
  REQUIRE(!moving.empty());
  CHECK(moving.front() == Phase::Sliding);
}

TEST_CASE("a rod stands on its end face, and topples and lies flat when tipped far enough", "[dynamics][contact]") {
  // Statics (common practice, no source): a cylinder on its end is stable
  // while its centre is over the face, tan(tilt from vertical) < R / (L/2).
  Scenario sc = bodyScenario(Shape::Rod, 0.08, 0.02, 0);
  const Params p = makeParams(sc);
  auto standAt = [&](double tiltFromVertical) {
    State s;
    const Vec3 axis(std::sin(tiltFromVertical), 0, std::cos(tiltFromVertical));
    s.orientation = test::frameAlong(axis);
    // End B's lowest rim point just touching.
    const Vec3 lowest = -0.04 * axis - p.body.outerRadius * (up() - axis.z() * axis).normalized();
    s.position = Vec3(0, 0, -lowest.z());
    Phase last = Phase::Airborne;
    for (int i = 0; i < int(3.0 / p.timeStep); ++i) {  // rocking settles within about 2.5 s
      const ContactReport c = step(p, s);
      last = classify(p, s, c);
    }
    return std::pair{last, axisMotion(s.orientation, s.spinWorld()).tilt};
  };
  const auto upright = standAt(0.0);
  CHECK((upright.first == Phase::StandingEnd || upright.first == Phase::AtRest));
  CHECK(upright.second > 89.9 * k::degree);
  const auto nudged = standAt(10 * k::degree);  // centre still over the face (critical 26.6 deg)
  CHECK(nudged.second > 89.0 * k::degree);
  const auto tipped = standAt(40 * k::degree);  // beyond the critical angle
  CHECK(tipped.second < 1.0 * k::degree);
  CHECK((tipped.first == Phase::LyingFlat || tipped.first == Phase::AtRest || tipped.first == Phase::Sliding));
}
