// Traces, stop events and spot statistics. Exact checks run on records of
// the steady solver's prescribed motion (SteadyMotion), most with a fixed centre:
// the axis turns about the vertical at a constant tilt and rate while the
// body spins about its axis. Most set N by hand, choosing the length so that
// N = (L/D) cos(tilt) - sin(tilt) (physics.md section 3): the contact point
// and the top of the raised end are then at rest, as in a steady spin, for
// any N the test asks for. Further checks run the solver's own states, and
// simulations started on them.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "core/kinematics.hpp"
#include "core/pattern.hpp"
#include "core/random.hpp"
#include "core/simulate.hpp"
#include "core/steady.hpp"
#include "support.hpp"

using namespace dm;

namespace {

// A tube of 16 mm outer diameter and 1 mm wall turning as SteadyMotion
// prescribes, end A raised, with a hand-set tilt, precession (rev/s) and N,
// and the length that makes that N roll without slip at that tilt. Body x
// is at the top of the end circle at t = 0 (roll0 = pi: SteadyMotion's body
// x points down at zero roll).
SteadyMotion rolling(double tiltDeg, double precessionRevS, double n) {
  SteadyMotion m;
  m.body.outerRadius = 0.008;
  m.body.innerRadius = 0.007;
  const double tilt = tiltDeg * k::degree, R = m.body.outerRadius;
  m.body.length = 2 * R * (n + std::sin(tilt)) / std::cos(tilt);
  const double halfL = m.body.length / 2;
  m.spin.tilt = tilt;
  m.spin.precession = precessionRevS * k::twoPi;
  m.spin.spotsPerRev = n;
  m.spin.relativeSpin = n * m.spin.precession;
  m.spin.centreHeight = halfL * std::sin(tilt) + R * std::cos(tilt);
  m.spin.ceilingHeight = 2 * m.spin.centreHeight;
  m.spin.contactRadius = halfL * std::cos(tilt) - R * std::sin(tilt);
  m.centre = Vec3(0.01, -0.02, 0);
  m.roll0 = k::pi;
  return m;
}

Vec3 centreOf(const SteadyMotion& m) { return m.poseAt(0).position; }

// The motion sampled every `h` seconds into a trajectory.
Trajectory record(const SteadyMotion& m, double duration, double h = 1e-4) {
  Trajectory tr;
  const long steps = std::lround(duration / h);
  for (long i = 0; i <= steps; ++i) {
    Sample s;
    s.t = double(i) * h;
    const Pose pose = m.poseAt(s.t);
    s.position = pose.position;
    s.orientation = pose.worldFromBody;
    s.spin = m.spinAt(s.t);
    s.velocity = m.velocityAt(s.t);
    tr.samples.push_back(s);
  }
  return tr;
}

// One rim patch on end A, 24 degrees wide, centred at body azimuth `centreDeg`.
Paint patchOnA(double centreDeg) {
  Marking m;
  m.kind = MarkingKind::RimPatch;
  m.end = End::A;
  m.fromAngle = (centreDeg - 12) * k::degree;
  m.toAngle = (centreDeg + 12) * k::degree;
  Paint p;
  p.markings = {m};
  return p;
}

double degrees(double rad) { return rad / k::degree; }

// Signed difference of two angles in degrees, -180..180.
double angleDiffDeg(double a, double b) { return std::remainder(a - b, 360.0); }

// The pattern analysis of a synthetic record with one patch on end A.
struct Analysed {
  Trajectory tr;
  std::vector<MarkedPoint> points;
  std::vector<StopEvent> stops;
  std::vector<PatternWindow> windows;
};

Analysed analyse(const SteadyMotion& r, double duration, const AnalysisSpec& spec = {}) {
  Analysed a{record(r, duration), {}, {}, {}};
  a.points = markedPoints(r.body, patchOnA(30), {});
  a.stops = stopEvents(a.tr, a.points, spec.dwellSpeed);
  a.windows = patternWindows(a.tr, a.points, a.stops, spec);
  return a;
}

// A dissipation-free tube of 16 mm outer diameter and 1 mm wall, `lengthMm` long.
Scenario tubeScenario(double lengthMm) { return test::bodyScenario(Shape::Tube, lengthMm * 1e-3, 0.016, 0.001); }

// A simulation started on the solver's steady motion (end A raised), with the
// contact at its static deflection, analysed with the scenario's defaults.
struct SteadyRun {
  SteadySpin spin;
  RunResult run;
  std::vector<MarkedPoint> points;
  std::vector<StopEvent> stops;
  std::vector<PatternWindow> windows;
};

SteadyRun simulateFromSteady(const Scenario& sc, const SteadySpin& spin, double duration) {
  const Params p = makeParams(sc);
  SteadyMotion m;
  m.body = p.body;
  m.spin = spin;
  const Pose pose = m.poseAt(0);
  State s;
  s.orientation = pose.worldFromBody;
  s.position = pose.position - Vec3(0, 0, p.inertia.mass * p.gravity / p.normalStiffness);
  s.spinBody = s.orientation.conjugate() * m.spinAt(0);
  if (spin.orbit != 0) {
    // On an orbit the centre moves, and the lower end's lowest slot (end B's
    // slot 0) starts with its stick spring carrying the centripetal
    // friction -m Omega^2 rho e, as it would in the steady state.
    s.velocity = m.velocityAt(0);
    const Vec3 e = m.raisedAxisAt(0).cwiseProduct(Vec3(1, 1, 0)).normalized();
    s.slots[slotsPerEnd].spring = p.inertia.mass * spin.precession * spin.precession * spin.orbit * e / p.tangentStiffness;
  }
  SteadyRun r{spin, simulateFrom(p, s, duration, sc.run.sampleInterval, End::B), {}, {}, {}};
  r.points = markedPoints(p.body, sc.paint, {});
  r.stops = stopEvents(r.run.trajectory, r.points, sc.analysis.dwellSpeed);
  r.windows = patternWindows(r.run.trajectory, r.points, r.stops, sc.analysis);
  return r;
}

// Largest error, degrees, of the azimuth step between successive stops of
// point 0 about `centre`, against 360/N.
double worstStopSpacingError(const std::vector<StopEvent>& stops, const Vec3& centre, double n) {
  double worst = 0;
  const StopEvent* previous = nullptr;
  for (const StopEvent& s : stops) {
    if (s.point != 0) continue;
    if (previous) {
      const Vec3 d0 = previous->position - centre, d1 = s.position - centre;
      const double step = degrees(std::atan2(d1.y(), d1.x()) - std::atan2(d0.y(), d0.x()));
      worst = std::max(worst, std::abs(std::remainder(step - 360 / n, 360.0)));
    }
    previous = &s;
  }
  return worst;
}

}  // namespace

TEST_CASE("marked points come from the markings and the extra trace points", "[pattern]") {
  Cylinder c{0.064, 0.008, 0.007, 0.008};
  Paint paint;
  Marking patch;
  patch.kind = MarkingKind::RimPatch;
  patch.end = End::B;
  patch.fromAngle = 350 * k::degree;  // wraps through zero: centre at 0
  patch.toAngle = 10 * k::degree;
  Marking band;
  band.kind = MarkingKind::Band;
  Marking stripe;
  stripe.kind = MarkingKind::Stripe;
  stripe.angle = 90 * k::degree;
  stripe.arcWidth = 0.25;
  Marking dot;
  dot.kind = MarkingKind::Dot;
  dot.axial = -0.01;
  dot.angle = 180 * k::degree;
  dot.radius = 0.0015;
  paint.markings = {patch, band, stripe, dot};
  TracePointSpec extra;
  extra.end = End::A;
  extra.angle = 45 * k::degree;
  extra.size = 0.003;

  const auto points = markedPoints(c, paint, {extra});
  REQUIRE(points.size() == 5);  // patch, stripe at both ends, dot, extra point; the band gives none
  CHECK(points[0].label == "rim_patch0_B");
  CHECK(points[0].body.isApprox(Vec3(0.008, 0, -0.032), 1e-12));
  CHECK(points[0].size == Approx(0.008 * 20 * k::degree));
  CHECK(points[1].label == "stripe2_A");
  CHECK(points[2].label == "stripe2_B");
  CHECK(points[2].body.z() == Approx(-0.032));
  CHECK(points[2].size == Approx(0.008 * 0.25));
  CHECK(points[3].label == "dot3");
  CHECK(points[3].end == End::B);
  CHECK(points[3].body.isApprox(Vec3(-0.008, 0, -0.01), 1e-9));
  CHECK(points[3].size == Approx(0.003));
  CHECK(points[4].label == "point0_A");
  CHECK(points[4].body.isApprox(Vec3(0.008 * std::cos(k::pi / 4), 0.008 * std::sin(k::pi / 4), 0.032), 1e-12));
}

TEST_CASE("floor and ceiling contacts trace circles on the table and the ceiling", "[pattern]") {
  const SteadyMotion r = rolling(10, 7, 4);
  const Trajectory tr = record(r, 0.3);
  const Traces t = traceRun(tr, r.body, markedPoints(r.body, patchOnA(0), {}), 1e-3);
  REQUIRE(t.time.size() == 301);  // one row per millisecond, like trajectory.csv
  // Both contacts circle the centre at (L/2) cos(tilt) - R sin(tilt), the
  // floor one on the table, the ceiling one at twice the centre height
  // (physics.md section 3, item 3).
  const double radius = r.spin.contactRadius;
  for (std::size_t i = 0; i < t.time.size(); i += 37) {
    const Vec3 floor = t.floorContact[i] - centreOf(r), ceiling = t.ceilingContact[i] - centreOf(r);
    CHECK(t.floorContact[i].z() == Approx(0).margin(1e-12));
    CHECK(t.ceilingContact[i].z() == Approx(r.spin.ceilingHeight).epsilon(1e-12));
    CHECK(std::hypot(floor.x(), floor.y()) == Approx(radius).epsilon(1e-12));
    CHECK(std::hypot(ceiling.x(), ceiling.y()) == Approx(radius).epsilon(1e-12));
    // The ceiling contact lies over the raised end, at the axis' azimuth.
    CHECK(angleDiffDeg(degrees(std::atan2(ceiling.y(), ceiling.x())), degrees(r.spin.precession * t.time[i])) ==
          Approx(0).margin(1e-9));
  }
  // The marked point is the patch centre on end A's rim, moved rigidly.
  const Vec3 expected = centreOf(r) + r.poseAt(t.time[100]).worldFromBody * Vec3(0.008, 0, r.body.length / 2);
  CHECK((t.points[0][100] - expected).norm() < 1e-15);
}

TEST_CASE("stops of a rim mark come at the analytic times, at rest, 360/N degrees apart", "[pattern]") {
  const SteadyMotion r = rolling(8, 6.5, 3.8);
  const Analysed a = analyse(r, 1.0);
  // The patch centre (body azimuth 30 deg) reaches the top when
  // 30 deg + psi t = 360 k deg: t_k = (2 pi k - theta) / psi.
  const double theta = 30 * k::degree;
  REQUIRE(a.stops.size() == std::size_t(std::floor((r.spin.relativeSpin * 1.0 + theta) / k::twoPi)));
  for (std::size_t i = 0; i < a.stops.size(); ++i) {
    const StopEvent& s = a.stops[i];
    const double expected = (k::twoPi * double(i + 1) - theta) / r.spin.relativeSpin;
    // Bisection to 1e-13 s on the Hermite-interpolated pose; its error in
    // this motion, measured, moves the crossing by 5e-14 s.
    CHECK(s.time == Approx(expected).margin(1e-10));
    CHECK(s.end == End::A);
    // The top of the raised end is at rest in this motion: what is left is
    // the linear interpolation of the spin between samples (measured 4 um/s).
    CHECK(s.horizontalSpeed < 2e-5);
    // The stop sits at the ceiling contact of that moment.
    CHECK((s.position - ceilingContact(r.body, {centreOf(r), r.poseAt(s.time).worldFromBody})).norm() < 1e-9);
    if (i == 0) continue;
    const Vec3 d0 = a.stops[i - 1].position - centreOf(r), d1 = s.position - centreOf(r);
    const double step = degrees(std::atan2(d1.y(), d1.x()) - std::atan2(d0.y(), d0.x()));
    CHECK(std::remainder(step - 360 / r.spin.spotsPerRev, 360.0) == Approx(0).margin(1e-6));
  }
}

TEST_CASE("dwell is the time the mark stays slower than the threshold", "[pattern]") {
  const SteadyMotion r = rolling(12, 7, 4);
  AnalysisSpec spec;
  spec.dwellSpeed = 0.05;
  const Analysed a = analyse(r, 0.3, spec);
  REQUIRE(a.stops.size() >= 4);
  const Vec3 mark = a.points[0].body;
  // Reference: scan the exact motion's velocity in 0.1 us steps from the stop.
  auto speed = [&](double t) {
    const Vec3 v = r.spinAt(t).cross(r.poseAt(t).worldFromBody * mark);
    return std::hypot(v.x(), v.y());
  };
  for (const StopEvent& s : a.stops) {
    double after = s.time, before = s.time;
    while (speed(after) < spec.dwellSpeed) after += 1e-7;
    while (speed(before) < spec.dwellSpeed) before -= 1e-7;
    const double reference = after - before;
    CHECK(s.dwell > 0);
    // Scan resolution 0.1 us at each edge; the interpolated speed itself
    // moves the edges by 0.01 us (measured with a 0.01 us scan).
    CHECK(s.dwell == Approx(reference).margin(2.5e-7));
  }
}

TEST_CASE("a rational N = 4 gives four stationary spots at the analytic azimuths", "[pattern]") {
  const SteadyMotion r = rolling(5, 6, 4);
  const Analysed a = analyse(r, 2.0);
  REQUIRE(a.windows.size() == 3);  // 1 s windows starting every 0.5 s over 2 s
  for (const PatternWindow& w : a.windows) {
    CHECK(w.visibleEnd == End::A);
    CHECK(w.kind == PatternKind::Stationary);
    REQUIRE(w.spots.size() == 4);
    CHECK(w.revsPerVisit == 1);
    CHECK(w.stopsPerVisit == 4);  // N = 4/1
    REQUIRE(w.spotsPerRev);
    CHECK(*w.spotsPerRev == Approx(4).epsilon(1e-9));
    CHECK(degrees(w.meanTilt) == Approx(5).epsilon(1e-9));
    CHECK(w.meanPrecession == Approx(r.spin.precession).epsilon(1e-9));
    // Stop k at azimuth (360 k - 30) / N about the centre: 82.5 + 90 j deg.
    for (std::size_t j = 0; j < 4; ++j) {
      CHECK(angleDiffDeg(degrees(w.spots[j].azimuth), 82.5 + 90.0 * double(j)) == Approx(0).margin(1e-6));
      CHECK(degrees(w.spots[j].drift) == Approx(0).margin(1e-4));
    }
  }
}

TEST_CASE("N = 7/2 gives seven spots, each visited every two revolutions", "[pattern]") {
  const Analysed a = analyse(rolling(6, 6, 3.5), 1.0);
  REQUIRE(a.windows.size() == 1);
  const PatternWindow& w = a.windows[0];
  CHECK(w.kind == PatternKind::Stationary);
  CHECK(w.spots.size() == 7);
  CHECK(w.revsPerVisit == 2);
  CHECK(w.stopsPerVisit == 7);  // N = 7/2 in lowest terms
  for (std::size_t j = 0; j < w.spots.size(); ++j)
    CHECK(angleDiffDeg(degrees(w.spots[j].azimuth), degrees(w.spots[0].azimuth) + 360.0 / 7 * double(j)) ==
          Approx(0).margin(1e-6));
}

TEST_CASE("N slightly off four makes four spots creep at -(N - 4) 90 degrees per revolution", "[pattern]") {
  const double f = 6, n = 4.02;
  const Analysed a = analyse(rolling(4, f, n), 1.0);
  REQUIRE(a.windows.size() == 1);
  const PatternWindow& w = a.windows[0];
  CHECK(w.kind == PatternKind::Creeping);
  REQUIRE(w.spots.size() == 4);
  // Four stops take 4/N revolutions and shift the spot by 360 (4/N - 1)
  // degrees: the exact drift is 90 f (4 - N) deg/s, about -(N-4) 360/4 per
  // revolution (physics.md section 4).
  const double expected = 90 * f * (4 - n);
  CHECK(degrees(w.patternDrift) == Approx(expected).epsilon(1e-6));
  for (const PatternSpot& s : w.spots) CHECK(degrees(s.drift) == Approx(expected).epsilon(1e-6));
}

TEST_CASE("N far from a simple ratio washes the stops out into a ring", "[pattern]") {
  // N = 3.57 at 8 rev/s: four stops shift a spot by 43 deg, seven by 14 deg,
  // against a spot of about 6.6 deg; finer patterns would need more stops
  // than a 1 s window holds.
  const Analysed a = analyse(rolling(10, 8, 3.57), 1.0);
  REQUIRE(a.windows.size() == 1);
  CHECK(a.windows[0].kind == PatternKind::Ring);
  CHECK(a.windows[0].spots.empty());
  CHECK(a.windows[0].stopCount > 20);
}

TEST_CASE("spots drifting their own size within the eye time read as a ring", "[pattern]") {
  // N = 4.06 at 20 rev/s: each visit lands 5.3 deg on (within the 5.9 deg
  // spot), but visits are 49 ms apart, so the spot moves 10.8 deg in 0.1 s.
  const Analysed a = analyse(rolling(10, 20, 4.06), 1.0);
  const PatternWindow& w = a.windows.at(0);
  CHECK(w.spots.size() == 4);
  CHECK(std::abs(degrees(w.patternDrift)) * 0.1 > degrees(w.spotSize));
  CHECK(w.kind == PatternKind::Ring);
  // An eye integrating over 20 ms smears it by only 2.2 deg: it creeps.
  AnalysisSpec quick;
  quick.eyeTime = 0.02;
  CHECK(analyse(rolling(10, 20, 4.06), 1.0, quick).windows.at(0).kind == PatternKind::Creeping);
}

TEST_CASE("the visible end is the raised one; a flat body shows none", "[pattern]") {
  // End B up: its patch stops, the one on end A does not.
  SteadyMotion r = rolling(6, 6, 4);
  r.raised = End::B;
  const Trajectory tr = record(r, 1.0);
  Paint paint = patchOnA(0);
  paint.markings[0].end = End::B;
  paint.markings.push_back(patchOnA(0).markings[0]);
  const auto points = markedPoints(r.body, paint, {});
  const auto stops = stopEvents(tr, points, 0.05);
  REQUIRE(!stops.empty());
  for (const StopEvent& s : stops) CHECK(s.end == End::B);
  const auto windows = patternWindows(tr, points, stops, {});
  CHECK(windows.at(0).visibleEnd == End::B);
  CHECK(windows.at(0).spots.size() == 4);

  // Lying flat and still: no end raised, no stops, no pattern.
  Trajectory flat;
  for (int i = 0; i <= 1000; ++i) {
    Sample s;
    s.t = i * 1e-3;
    s.orientation = Quat(Eigen::AngleAxisd(k::pi / 2, Vec3::UnitY()));
    flat.samples.push_back(s);
  }
  const auto none = patternWindows(flat, points, stopEvents(flat, points, 0.05), {});
  REQUIRE(none.size() == 1);
  CHECK(!none[0].visibleEnd);
  CHECK(none[0].kind == PatternKind::None);
}

TEST_CASE("two marks on the raised end make their own spots, merged where they coincide", "[pattern]") {
  const SteadyMotion r = rolling(5, 6, 4);
  const Trajectory tr = record(r, 1.0);
  // Patches at body 0 and 90 deg: with N = 4 their stops land 22.5 deg apart
  // (90 deg of body turn take a quarter of a stop interval); patches at 0 and
  // 2 deg land 0.5 deg apart, inside one spot.
  Paint apart = patchOnA(0);
  apart.markings.push_back(patchOnA(90).markings[0]);
  Paint together = patchOnA(0);
  together.markings.push_back(patchOnA(2).markings[0]);
  for (const auto& [paint, spots] : {std::pair{apart, 8u}, std::pair{together, 4u}}) {
    const auto points = markedPoints(r.body, paint, {});
    const auto windows = patternWindows(tr, points, stopEvents(tr, points, 0.05), {});
    CHECK(windows.at(0).spots.size() == spots);
    CHECK(windows.at(0).stopsPerVisit == 4);  // each mark still comes back every 4 stops: N = 4/1
  }
}

TEST_CASE("windows slide by the step and stop at the end of the record", "[pattern]") {
  const SteadyMotion r = rolling(5, 6, 4);
  AnalysisSpec spec;
  spec.window = 0.4;
  spec.windowStep = 0.25;
  const Analysed a = analyse(r, 1.3, spec);
  REQUIRE(a.windows.size() == 4);  // starts 0, 0.25, 0.5, 0.75; 1.0 + 0.4 > 1.3
  for (std::size_t i = 0; i < a.windows.size(); ++i) {
    CHECK(a.windows[i].start == Approx(0.25 * double(i)));
    CHECK(a.windows[i].end - a.windows[i].start == Approx(0.4));
  }
  // A record shorter than one window gives one window of the whole record.
  const Analysed shortRun = analyse(r, 0.3);
  REQUIRE(shortRun.windows.size() == 1);
  CHECK(shortRun.windows[0].end == Approx(0.3));
}

TEST_CASE("a four-spot pattern blurred by scatter still counts four spots; more scatter is a ring", "[pattern]") {
  // Hand-made stops: a quarter turn apart, four per revolution at 6 rev/s,
  // each thrown off its place by a scatter uniform in +-A (SplitMix64 with a
  // fixed seed, so the test repeats exactly).
  const SteadyMotion r = rolling(5, 6, 4);
  const Trajectory tr = record(r, 1.0);
  const auto points = markedPoints(r.body, patchOnA(0), {});
  auto scattered = [&](double amplitudeDeg) {
    SplitMix64 random{7};
    std::vector<StopEvent> stops;
    for (int i = 0; i < 24; ++i) {
      const double u = random.uniform();
      const double az = (90.0 * i + amplitudeDeg * (2 * u - 1)) * k::degree;
      StopEvent s;
      s.time = (i + 0.5) / 24.0;
      s.position = centreOf(r) + 0.03 * Vec3(std::cos(az), std::sin(az), 0);
      stops.push_back(s);
    }
    return patternWindows(tr, points, stops, {}).at(0);
  };
  // The spot: 24 deg of an 8 mm rim seen from 30 mm, 6.4 deg. A +-8 deg
  // scatter (4.6 deg rms) makes revisits land about 6.5 deg off, beyond the
  // spot but within an eighth of the 90 deg spacing: four blurred spots, not
  // one spot moving a quarter turn per stop.
  const PatternWindow blurred = scattered(8);
  CHECK(degrees(blurred.spotSize) == Approx(0.008 * 24 / 0.03).epsilon(1e-9));
  CHECK(blurred.spots.size() == 4);
  // The reported spread is one stop's rms scatter, A / sqrt(3) for a
  // uniform scatter, within the sampling error of 24 stops (about 20 %).
  CHECK(degrees(blurred.spotSpread) == Approx(8 / std::sqrt(3.0)).epsilon(0.25));
  // At +-25 deg (14 deg rms) no count of places repeats: a washed-out ring.
  const PatternWindow washed = scattered(25);
  CHECK(washed.kind == PatternKind::Ring);
  CHECK(washed.spots.empty());
}

TEST_CASE("on the solver's exact motion the analysis reads back the solver's N, ceiling and drift", "[pattern]") {
  // Our two modules against each other (no outside source): the steady
  // solver's state for the worked tube at 6 rev/s, end B raised, sampled as
  // a record. Every figure is geometry, so the tolerances are those of the
  // interpolation and the bisection (measured far below them).
  const Cylinder c = cylinderOf(tubeScenario(64).body);
  const SteadySpin spin = *steadyAtPrecession(c, 6 * k::twoPi).pattern();
  SteadyMotion m;
  m.body = c;
  m.spin = spin;
  m.raised = End::B;
  m.centre = Vec3(0.004, 0.009, 0);
  m.azimuth0 = 0.4;
  m.roll0 = -0.9;
  const Trajectory tr = record(m, 2.0);
  Paint paint = patchOnA(0);
  paint.markings[0].end = End::B;
  const auto points = markedPoints(c, paint, {});
  const auto stops = stopEvents(tr, points, 0.05);
  const auto windows = patternWindows(tr, points, stops, {});
  const Vec3 centre = m.poseAt(0).position;

  const Traces t = traceRun(tr, c, points, 1e-3);
  for (std::size_t i = 0; i < t.time.size(); i += 101) {
    CHECK(t.ceilingContact[i].z() == Approx(spin.ceilingHeight).epsilon(1e-12));
    const Vec3 d = t.floorContact[i] - centre;
    CHECK(std::hypot(d.x(), d.y()) == Approx(spin.contactRadius).epsilon(1e-12));
  }
  CHECK(worstStopSpacingError(stops, centre, spin.spotsPerRev) < 1e-6);
  for (const PatternWindow& w : windows) {
    CHECK(w.visibleEnd == End::B);
    CHECK(*w.spotsPerRev == Approx(spin.spotsPerRev).epsilon(1e-9));
    CHECK(int(w.spots.size()) == spin.nearestSpots);
    CHECK(degrees(w.patternDrift) == Approx(spin.driftDegPerSecond).epsilon(1e-6));
  }
}

TEST_CASE("a simulated tube started on the steady state holds the solver's tilt, N and stop spacing", "[pattern]") {
  // Dynamics against the solver (our own derivation, physics.md section 3):
  // the worked tube (64 mm, 16 mm, 1 mm wall) at the three precessions of
  // the worked table, started on the solver's motion with the contact at its
  // static deflection, no dissipation, the default step (1/3 ms), 3 s.
  // Targets from the issue: window mean tilt within 0.5 deg, N within 0.01,
  // stops 360/N apart within 1 deg. Measured at the default step: 0.001 deg,
  // 1e-4 and 0.002 deg (at a 1 ms step all three miss the tilt target).
  const Scenario sc = tubeScenario(64);
  for (double f : {6.0, 8.0, 10.0}) {
    CAPTURE(f);
    const SteadySpin spin = *steadyAtPrecession(cylinderOf(sc.body), f * k::twoPi).pattern();
    const SteadyRun r = simulateFromSteady(sc, spin, 3.0);
    REQUIRE(!r.run.fault);
    REQUIRE(r.windows.size() == 5);
    for (const PatternWindow& w : r.windows) {
      CHECK(w.visibleEnd == End::A);
      CHECK(degrees(w.meanTilt) == Approx(degrees(spin.tilt)).margin(0.5));
      REQUIRE(w.spotsPerRev);
      CHECK(*w.spotsPerRev == Approx(spin.spotsPerRev).margin(0.01));
    }
    const Vec3 centre = r.run.trajectory.samples.front().position;
    CHECK(worstStopSpacingError(r.stops, centre, spin.spotsPerRev) < 1.0);
  }
}

TEST_CASE("a simulated tube started near the steady state nutates about the solver's tilt and N", "[pattern]") {
  // Dynamics against the solver (our own derivation, physics.md section 3)
  // from a start off the steady state, so that the run nutates: the worked
  // tube at the three precessions of the worked table, started either 1 %
  // faster in precession (tilt and N the solver's) or 0.3 deg more tilted
  // (precession and relative spin the solver's), no dissipation, 3 s.
  // Targets from the issue: window mean tilt within 0.5 deg, N within 0.01,
  // of the solver's state at the window's own mean precession (a start 1 %
  // fast settles about a state 1 % fast, 0.7 deg above the nominal tilt at
  // 6 rev/s). Measured: the tilt swings by up to 1.2 deg peak to peak, its
  // mean stays within 0.19 deg and N within 0.004. A 1 deg tilt offset puts
  // the mean 0.6 deg off at 10 rev/s: the centre then circles by about
  // 0.15 mm, a neighbouring rolling motion the centre-fixed solver does
  // not describe.
  const Scenario sc = tubeScenario(64);
  const Cylinder c = cylinderOf(sc.body);
  for (double f : {6.0, 8.0, 10.0}) {
    const SteadySpin spin = *steadyAtPrecession(c, f * k::twoPi).pattern();
    SteadySpin fast = spin;
    fast.precession *= 1.01;
    fast.relativeSpin = fast.precession * spin.spotsPerRev;
    SteadySpin tilted = spin;
    tilted.tilt += 0.3 * k::degree;
    tilted.centreHeight = c.length / 2 * std::sin(tilted.tilt) + c.outerRadius * std::cos(tilted.tilt);
    for (const SteadySpin& start : {fast, tilted}) {
      CAPTURE(f, degrees(start.tilt), start.precession / k::twoPi);
      const SteadyRun r = simulateFromSteady(sc, start, 3.0);
      REQUIRE(!r.run.fault);
      REQUIRE(r.windows.size() == 5);
      double lowest = k::pi, highest = 0;
      for (const Sample& s : r.run.trajectory.samples) {
        const double tilt = axisMotion(s.orientation, s.spin).tilt;
        lowest = std::min(lowest, tilt);
        highest = std::max(highest, tilt);
      }
      CHECK(degrees(highest - lowest) > 0.1);  // it does nutate
      for (const PatternWindow& w : r.windows) {
        const PatternResult solver = patternAtPrecession(c, w.meanPrecession);
        REQUIRE(solver.found);
        CHECK(degrees(w.meanTilt) == Approx(degrees(solver.spin.tilt)).margin(0.5));
        REQUIRE(w.spotsPerRev);
        CHECK(*w.spotsPerRev == Approx(solver.spin.spotsPerRev).margin(0.01));
      }
    }
  }
}

TEST_CASE("a window's N counts the visits to the top per revolution while the precession rate swings", "[pattern]") {
  // Kinematics, no outside source. The axis stands at 5 deg and turns at
  // Omega(t) = Omega0 (1 + e cos(nu t)) while the body turns about it at a
  // steady relative spin N0 Omega0. Over whole periods of nu the axis turns
  // Omega0 T and the mark N0 Omega0 T: it reaches the top N0 times per
  // revolution, the N a window must read. A mean of the instantaneous ratio
  // relative spin / precession would read N0 / sqrt(1 - e^2), 4.13 here
  // (e = 0.25; the demo's first second swings between 6.3 and 9 rev/s).
  const SteadyMotion m = rolling(5, 6, 4);
  const double omega0 = m.spin.precession, e = 0.25, nu = 10 * k::twoPi, n0 = 4;
  Trajectory tr;
  for (long i = 0; i <= 20000; ++i) {  // 2 s every 0.1 ms: 20 periods of nu, 12 revolutions
    Sample s;
    s.t = double(i) * 1e-4;
    const double azimuth = omega0 * s.t + e * omega0 / nu * std::sin(nu * s.t);
    const double roll = k::pi + n0 * omega0 * s.t;  // body x at the top at t = 0, as in rolling()
    s.orientation = Quat(Eigen::AngleAxisd(azimuth, Vec3::UnitZ())) *
                    Quat(Eigen::AngleAxisd(k::pi / 2 - m.spin.tilt, Vec3::UnitY())) *
                    Quat(Eigen::AngleAxisd(roll, Vec3::UnitZ()));
    s.position = centreOf(m);
    s.spin = omega0 * (1 + e * std::cos(nu * s.t)) * Vec3::UnitZ() + n0 * omega0 * (s.orientation * Vec3::UnitZ());
    tr.samples.push_back(s);
  }
  const auto points = markedPoints(m.body, patchOnA(30), {});
  const auto stops = stopEvents(tr, points, 0.05);
  // The stops themselves: the patch centre (30 deg) is at the top when
  // 30 deg + N0 Omega0 t is a whole turn, 48 times in the 12 revolutions.
  CHECK(stops.size() == 48);
  const auto windows = patternWindows(tr, points, stops, {});
  REQUIRE(windows.size() == 3);
  for (const PatternWindow& w : windows) {
    CHECK(w.meanPrecession == Approx(omega0).epsilon(1e-4));
    REQUIRE(w.spotsPerRev);
    // Each 1 s window holds 10 whole periods of nu; the sums count both end
    // samples, which adds about e / 10^4 of N.
    CHECK(*w.spotsPerRev == Approx(n0).margin(2e-4));
  }
}

TEST_CASE("four diameters long and barely tilted shows four spots; three diameters, three", "[pattern]") {
  // Common practice, no source: a tube about four times as long as its
  // diameter shows four spots, three times as long three (physics.md
  // section 4), when it spins slowly enough to roll nearly flat (tilt
  // under 2 deg). Simulated from the solver's state at 1.5 deg of tilt.
  for (const auto& [lengthMm, spots] : {std::pair{64.0, 4u}, std::pair{48.0, 3u}}) {
    CAPTURE(lengthMm);
    const Scenario sc = tubeScenario(lengthMm);
    const SteadySpin spin = *steadyAtTilt(cylinderOf(sc.body), 1.5 * k::degree).pattern();
    const SteadyRun r = simulateFromSteady(sc, spin, 2.0);
    REQUIRE(!r.run.fault);
    const PatternWindow& last = r.windows.back();
    CHECK(degrees(last.meanTilt) < 2.0);
    CHECK(last.spots.size() == spots);
    // The spots creep at the solver's drift (our two modules agree; the
    // simulated N differs from the solver's by 4e-5, about 0.2 % of N - n,
    // which moves the drift as much).
    CHECK(degrees(last.patternDrift) == Approx(spin.driftDegPerSecond).epsilon(0.02));
  }
}

TEST_CASE("a tiny extra trace point finds its spots; a patch of zero span gives no point", "[pattern]") {
  // A 0.05 mm point seen from 34 mm is 0.08 deg across: the spot count is
  // then bounded by the stops in the window, not by the spot size.
  const SteadyMotion r = rolling(5, 6, 4);
  const Trajectory tr = record(r, 1.0);
  TracePointSpec tiny;
  tiny.angle = 1.0;
  tiny.size = 5e-5;
  Paint none;
  Marking empty = patchOnA(0).markings[0];
  empty.toAngle = empty.fromAngle;
  none.markings = {empty};
  const auto points = markedPoints(r.body, none, {tiny});
  REQUIRE(points.size() == 1);
  CHECK(points[0].label == "point0_A");
  const PatternWindow w = patternWindows(tr, points, stopEvents(tr, points, 0.05), {}).at(0);
  CHECK(degrees(w.spotSize) < 0.1);
  CHECK(w.spots.size() == 4);
  CHECK(w.kind == PatternKind::Stationary);
}

namespace {

// The demo tube (131 mm, 32 mm, 1.6 mm wall) as a dissipation-free scenario.
Scenario demoTube() { return test::bodyScenario(Shape::Tube, 0.131, 0.032, 0.0016); }

}  // namespace

TEST_CASE("a window reads back the prescribed centre orbit, even while the spin axis wanders", "[pattern]") {
  // Our derivation (core/steady.cpp): on the solver's orbiting motion the
  // centre is O + rho e exactly, so the fit returns rho and no offset across
  // e, to rounding (the normal equations lose about cond ~ 1e4 of 1e-16 on
  // positions of 0.1 m: 1e-12 m is far above that and far below anything a
  // designer reads). Moving O at a steady 20 mm/s (the spin axis wandering
  // across the table) changes nothing. With the centre still the orbit is 0;
  // with windows too short for the axis to turn once there is no reading.
  const Cylinder c = cylinderOf(demoTube().body);
  for (double rhoMm : {-3.5, 0.0, 2.0}) {
    CAPTURE(rhoMm);
    const SteadySpin spin = *steadyAtPrecession(c, 4.9 * k::twoPi, CentreOrbit{rhoMm * 1e-3}).pattern();
    SteadyMotion m;
    m.body = c;
    m.spin = spin;
    m.centre = Vec3(0.004, 0.009, 0);
    m.azimuth0 = 0.4;
    for (double wanderMmS : {0.0, 20.0}) {
      CAPTURE(wanderMmS);
      Trajectory tr = record(m, 2.0, 1e-3);
      for (Sample& s : tr.samples) {
        s.position += Vec3(wanderMmS * 1e-3 * s.t, 0, 0);
        s.velocity += Vec3(wanderMmS * 1e-3, 0, 0);
      }
      const auto points = markedPoints(c, patchOnA(0), {});
      const auto stops = stopEvents(tr, points, 0.05);
      const auto windows = patternWindows(tr, points, stops, {});
      REQUIRE(windows.size() == 3);
      for (const PatternWindow& w : windows) {
        REQUIRE(w.centreOrbit);
        CHECK(std::abs(*w.centreOrbit - spin.orbit) < 1e-12);
        CHECK(std::abs(*w.centreOrbitAcross) < 1e-12);
      }
      AnalysisSpec brief;  // 0.15 s at 4.9 rev/s: under a turn of the axis
      brief.window = 0.15;
      brief.windowStep = 0.5;
      for (const PatternWindow& w : patternWindows(tr, points, stops, brief)) CHECK_FALSE(w.centreOrbit);
    }
  }
}

TEST_CASE("the demo launch's settled windows are the solver's steady spin on the measured orbit", "[pattern]") {
  // Dynamics against the solver (our derivation of the orbiting steady
  // state, core/steady.cpp; physics.md section 3 for rho = 0): the demo
  // launch as shipped (losses and all), every window from 3.5 s on in which
  // the visible end stays raised (above minRaisedTilt) on every sample: the
  // settled end-raised stretch before the tube sinks flat near 8 s. The
  // solver at the window's mean precession and measured orbit must give the
  // window's mean tilt within 0.3 deg and its N within 0.01.
  // Measured (Release, default step; windows 3.5 to 6.5 s): tilt 0.08 to
  // 0.20 deg, N 0.0001 to 0.005. The tolerances are 1.5 and 2 times the
  // worst of those, not tighter because the run is no steady
  // state (the precession falls 0.4 rev/s and the tilt 3 deg per second,
  // rolling resistance, pivot friction and drag add torques the balance
  // does not have, and the centre slides at the friction limit for a tenth
  // of the time), and the window means average that over 1 s. With the
  // centre still (orbit 0) the same solver misses every one of these
  // windows by more than 5 deg of tilt (the audit's 5.5 to 7.5 deg).
  const Scenario demo = test::demo();
  const RunResult run = simulate(demo);
  REQUIRE(!run.fault);
  const PatternAnalysis a = analysePattern(demo, run);
  const Cylinder c = cylinderOf(demo.body);
  int checked = 0;
  for (const PatternWindow& w : a.windows) {
    if (w.start < 3.5 || !w.visibleEnd) continue;
    bool raisedThroughout = true;
    for (const Sample& s : run.trajectory.samples)
      if (s.t >= w.start && s.t <= w.end && raisedEndOf(s.orientation) != w.visibleEnd) raisedThroughout = false;
    if (!raisedThroughout) continue;
    ++checked;
    REQUIRE(w.centreOrbit);
    REQUIRE(w.spotsPerRev);
    CAPTURE(w.start, degrees(w.meanTilt), *w.spotsPerRev, *w.centreOrbit * 1e3, *w.centreOrbitAcross * 1e3);
    const PatternResult orbiting = patternAtPrecession(c, w.meanPrecession, CentreOrbit{*w.centreOrbit});
    REQUIRE(orbiting.found);
    CAPTURE(degrees(orbiting.spin.tilt), orbiting.spin.spotsPerRev, orbiting.spin.frictionNeeded);
    CHECK(degrees(orbiting.spin.tilt) == Approx(degrees(w.meanTilt)).margin(0.3));
    CHECK(orbiting.spin.spotsPerRev == Approx(*w.spotsPerRev).margin(0.01));
    // The orbit the run holds is the one its table's kinetic friction allows
    // (0.33 on the demo's lacquered birch): within a tenth of it.
    CHECK(orbiting.spin.frictionNeeded == Approx(demo.surface.frictionKinetic).epsilon(0.1));
    // Across e the centre is off by a small part of the orbit (measured up
    // to 8 %, 0.23 of 2.97 mm in the 3.5 s window, from the slides).
    CHECK(std::abs(*w.centreOrbitAcross) < 0.15 * std::abs(*w.centreOrbit));
    const PatternResult still = patternAtPrecession(c, w.meanPrecession);
    if (still.found) CHECK(std::abs(degrees(still.spin.tilt - w.meanTilt)) > 5);
  }
  CHECK(checked >= 6);
}

TEST_CASE("a simulated tube started on an orbiting steady state holds it", "[pattern]") {
  // Dynamics against the solver (our derivation, core/steady.cpp): the demo
  // tube without losses at 5 rev/s with its centre circling 3 mm either way
  // (it needs a friction of 0.30; the table gives 1, ample), started on the
  // solver's motion with the contact at its static deflection and its
  // friction spring carrying the centripetal force, the default step, 2 s.
  // Every sample must keep the solver's tilt within 0.1 deg and the orbit
  // radius about the start's spin axis within 0.5 mm (README's stated
  // accuracy for holding a steady spin), and roll throughout. Measured:
  // 0.003 deg and 0.005 mm, so the orbiting state is as steady in the
  // dynamics as the centre-still one.
  Scenario sc = demoTube();
  sc.surface.frictionStatic = sc.surface.frictionKinetic = 1.0;
  validate(sc);
  const Cylinder c = cylinderOf(sc.body);
  for (double rhoMm : {-3.0, 3.0}) {
    CAPTURE(rhoMm);
    const SteadySpin spin = *steadyAtPrecession(c, 5 * k::twoPi, CentreOrbit{rhoMm * 1e-3}).pattern();
    REQUIRE(spin.frictionNeeded < 0.5 * sc.surface.frictionStatic);
    const SteadyRun r = simulateFromSteady(sc, spin, 2.0);
    REQUIRE(!r.run.fault);
    double worstTilt = 0, worstRadius = 0;
    bool rolled = true;
    for (const Sample& s : r.run.trajectory.samples) {
      worstTilt = std::max(worstTilt, std::abs(axisMotion(s.orientation, s.spin).tilt - spin.tilt));
      worstRadius = std::max(worstRadius, std::abs(std::hypot(s.position.x(), s.position.y()) - std::abs(spin.orbit)));
      rolled = rolled && s.phase == Phase::RollingB;
    }
    CAPTURE(degrees(worstTilt), worstRadius * 1e3);
    CHECK(degrees(worstTilt) < 0.1);
    CHECK(worstRadius < 0.5e-3);
    CHECK(rolled);
    // And the pattern analysis reads the orbit back.
    for (const PatternWindow& w : r.windows) {
      REQUIRE(w.centreOrbit);
      CHECK(*w.centreOrbit == Approx(spin.orbit).margin(0.5e-3));
    }
  }
}
