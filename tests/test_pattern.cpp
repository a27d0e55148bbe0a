// Traces, stop events and spot statistics. Exact checks run on synthetic
// records of a rigid motion with a fixed centre: the axis turns about the
// vertical at a constant tilt and rate while the body spins about its axis,
// with the length chosen so that the spin matches the rolling condition
// N = (L/D) cos(tilt) - sin(tilt) (physics.md section 3). The contact point
// and the top of the raised end are then at rest, as in a steady spin, for
// any N the test asks for.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>

#include "core/constants.hpp"
#include "core/kinematics.hpp"
#include "core/pattern.hpp"

using namespace dm;

namespace {

// A rigid motion with a fixed centre: tilt, precession rate (rad/s) and
// spots per revolution N; raised end A.
struct Rolling {
  Cylinder body;
  double tilt = 0;
  double precession = 0;
  double n = 0;
  Vec3 centre = Vec3::Zero();
  double relativeSpin() const { return n * precession; }
  Vec3 axis(double t) const {
    const double az = precession * t;
    return {std::cos(tilt) * std::cos(az), std::cos(tilt) * std::sin(az), std::sin(tilt)};
  }
  Quat orientation(double t) const {
    const Vec3 a0(std::cos(tilt), 0, std::sin(tilt));
    const Vec3 up0(-std::sin(tilt), 0, std::cos(tilt));  // body x: the top of the end circle at t = 0
    Mat3 b0;
    b0.col(0) = up0;
    b0.col(1) = a0.cross(up0);
    b0.col(2) = a0;
    return (Quat(Eigen::AngleAxisd(precession * t, Vec3::UnitZ())) * Quat(b0) *
            Quat(Eigen::AngleAxisd(relativeSpin() * t, Vec3::UnitZ())))
        .normalized();
  }
  Vec3 spin(double t) const { return precession * Vec3::UnitZ() + relativeSpin() * axis(t); }
};

// A tube of 16 mm outer diameter and 1 mm wall whose length makes N roll
// without slip at the given tilt.
Rolling rolling(double tiltDeg, double precessionRevS, double n) {
  Rolling r;
  r.tilt = tiltDeg * k::degree;
  r.precession = precessionRevS * k::twoPi;
  r.n = n;
  r.body.outerRadius = 0.008;
  r.body.innerRadius = 0.007;
  r.body.length = 2 * r.body.outerRadius * (n + std::sin(r.tilt)) / std::cos(r.tilt);
  r.centre = Vec3(0.01, -0.02, r.body.length / 2 * std::sin(r.tilt) + r.body.outerRadius * std::cos(r.tilt));
  return r;
}

// The motion sampled every `h` seconds into a trajectory.
Trajectory record(const Rolling& r, double duration, double h = 1e-4) {
  Trajectory tr;
  const long steps = std::lround(duration / h);
  for (long i = 0; i <= steps; ++i) {
    Sample s;
    s.t = double(i) * h;
    s.position = r.centre;
    s.orientation = r.orientation(s.t);
    s.spin = r.spin(s.t);
    s.phase = Phase::RollingB;
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
  Rolling motion;
  Trajectory tr;
  std::vector<MarkedPoint> points;
  std::vector<StopEvent> stops;
  std::vector<PatternWindow> windows;
};

Analysed analyse(const Rolling& r, double duration, const AnalysisSpec& spec = {}) {
  Analysed a{r, record(r, duration), {}, {}, {}};
  a.points = markedPoints(r.body, patchOnA(30), {});
  a.stops = stopEvents(a.tr, a.points, spec.dwellSpeed);
  a.windows = patternWindows(a.tr, a.points, a.stops, spec);
  return a;
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
  const Rolling r = rolling(10, 7, 4);
  const Trajectory tr = record(r, 0.3);
  const Traces t = traceRun(tr, r.body, markedPoints(r.body, patchOnA(0), {}), 1e-3);
  REQUIRE(t.time.size() == 301);  // one row per millisecond, like trajectory.csv
  // Both contacts circle the centre at (L/2) cos(tilt) - R sin(tilt), the
  // floor one on the table, the ceiling one at twice the centre height
  // (physics.md section 3, item 3).
  const double radius = r.body.length / 2 * std::cos(r.tilt) - r.body.outerRadius * std::sin(r.tilt);
  for (std::size_t i = 0; i < t.time.size(); i += 37) {
    const Vec3 floor = t.floorContact[i] - r.centre, ceiling = t.ceilingContact[i] - r.centre;
    CHECK(t.floorContact[i].z() == Approx(0).margin(1e-12));
    CHECK(t.ceilingContact[i].z() == Approx(2 * r.centre.z()).epsilon(1e-12));
    CHECK(std::hypot(floor.x(), floor.y()) == Approx(radius).epsilon(1e-12));
    CHECK(std::hypot(ceiling.x(), ceiling.y()) == Approx(radius).epsilon(1e-12));
    // The ceiling contact lies over the raised end, at the axis' azimuth.
    CHECK(angleDiffDeg(degrees(std::atan2(ceiling.y(), ceiling.x())), degrees(r.precession * t.time[i])) ==
          Approx(0).margin(1e-9));
  }
  // The marked point is the patch centre on end A's rim, moved rigidly.
  const Vec3 expected = r.centre + r.orientation(t.time[100]) * Vec3(0.008, 0, r.body.length / 2);
  CHECK((t.points[0][100] - expected).norm() < 1e-15);
}

TEST_CASE("stops of a rim mark come at the analytic times, at rest, 360/N degrees apart", "[pattern]") {
  const Rolling r = rolling(8, 6.5, 3.8);
  const Analysed a = analyse(r, 1.0);
  // The patch centre (body azimuth 30 deg) reaches the top when
  // 30 deg + psi t = 360 k deg: t_k = (2 pi k - theta) / psi.
  const double theta = 30 * k::degree;
  REQUIRE(a.stops.size() == std::size_t(std::floor((r.relativeSpin() * 1.0 + theta) / k::twoPi)));
  for (std::size_t i = 0; i < a.stops.size(); ++i) {
    const StopEvent& s = a.stops[i];
    const double expected = (k::twoPi * double(i + 1) - theta) / r.relativeSpin();
    // Bisection to 1e-13 s on the Hermite-interpolated pose; its error in
    // this motion, measured, moves the crossing by 5e-14 s.
    CHECK(s.time == Approx(expected).margin(1e-10));
    CHECK(s.end == End::A);
    // The top of the raised end is at rest in this motion: what is left is
    // the linear interpolation of the spin between samples (measured 4 um/s).
    CHECK(s.horizontalSpeed < 2e-5);
    // The stop sits at the ceiling contact of that moment.
    CHECK((s.position - ceilingContact(r.body, {r.centre, r.orientation(s.time)})).norm() < 1e-9);
    if (i == 0) continue;
    const Vec3 d0 = a.stops[i - 1].position - r.centre, d1 = s.position - r.centre;
    const double step = degrees(std::atan2(d1.y(), d1.x()) - std::atan2(d0.y(), d0.x()));
    CHECK(std::remainder(step - 360 / r.n, 360.0) == Approx(0).margin(1e-6));
  }
}

TEST_CASE("dwell is the time the mark stays slower than the threshold", "[pattern]") {
  const Rolling r = rolling(12, 7, 4);
  AnalysisSpec spec;
  spec.dwellSpeed = 0.05;
  const Analysed a = analyse(r, 0.3, spec);
  REQUIRE(a.stops.size() >= 4);
  const Vec3 mark = a.points[0].body;
  // Reference: scan the exact motion's velocity in 0.1 us steps from the stop.
  auto speed = [&](double t) {
    const Vec3 v = r.spin(t).cross(r.orientation(t) * mark);
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
  const Rolling r = rolling(5, 6, 4);
  const Analysed a = analyse(r, 2.0);
  REQUIRE(a.windows.size() == 3);  // 1 s windows starting every 0.5 s over 2 s
  for (const PatternWindow& w : a.windows) {
    CHECK(w.visibleEnd == End::A);
    CHECK(w.kind == PatternKind::Stationary);
    REQUIRE(w.spots.size() == 4);
    CHECK(w.revsPerVisit == 1);
    REQUIRE(w.spotsPerRev);
    CHECK(*w.spotsPerRev == Approx(4).epsilon(1e-9));
    CHECK(degrees(w.meanTilt) == Approx(5).epsilon(1e-9));
    CHECK(w.meanPrecession == Approx(r.precession).epsilon(1e-9));
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
  for (const Spot& s : w.spots) CHECK(degrees(s.drift) == Approx(expected).epsilon(1e-6));
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
  // Turn the motion upside down in body terms: end B up. Its patch stops,
  // the one on end A does not.
  Rolling r = rolling(6, 6, 4);
  Trajectory tr = record(r, 1.0);
  const Quat flip(Eigen::AngleAxisd(k::pi, Vec3::UnitX()));
  for (Sample& s : tr.samples) s.orientation = s.orientation * flip;
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
  const Rolling r = rolling(5, 6, 4);
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
  }
}

TEST_CASE("windows slide by the step and stop at the end of the record", "[pattern]") {
  const Rolling r = rolling(5, 6, 4);
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
  // each thrown off its place by a scatter uniform in +-A (mt19937's output
  // sequence is fixed by the C++ standard, so the test repeats exactly).
  const Rolling r = rolling(5, 6, 4);
  const Trajectory tr = record(r, 1.0);
  const auto points = markedPoints(r.body, patchOnA(0), {});
  auto scattered = [&](double amplitudeDeg) {
    std::mt19937 random(7);
    std::vector<StopEvent> stops;
    for (int i = 0; i < 24; ++i) {
      const double u = double(random()) / 4294967296.0;
      const double az = (90.0 * i + amplitudeDeg * (2 * u - 1)) * k::degree;
      StopEvent s;
      s.time = (i + 0.5) / 24.0;
      s.position = r.centre + 0.03 * Vec3(std::cos(az), std::sin(az), 0);
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
