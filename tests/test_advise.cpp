// The dimension advisor (core/advise.hpp): its answers fed back into the
// steady-spin solver must give what it reported, and its optimum must be
// an optimum. No outside reference exists for these numbers; the checks
// are self-consistency against core/steady.hpp, which test_steady.cpp
// validates.
#include <catch2/catch.hpp>

#include <cmath>
#include <stdexcept>

#include "core/advise.hpp"
#include "support.hpp"

using namespace dm;

namespace {

using test::mm;
using test::revS;

Cylinder section(double outerDiameterMm, double wallMm) {
  return {0.0, outerDiameterMm * mm / 2, (outerDiameterMm / 2 - wallMm) * mm, 0.01};
}

Cylinder withLength(Cylinder c, double length) {
  c.length = length;
  return c;
}

// The n-spot drift (deg/s) of a body at one precession, straight from the
// full solver (not the advisor's own path).
double solverDrift(const Cylinder& c, int n, double omega) {
  const SteadySolution s = steadyAtPrecession(c, omega);
  REQUIRE(s.pattern() != nullptr);
  return patternDriftDegPerRev(s.pattern()->spotsPerRev, n) * omega / k::twoPi;
}

}  // namespace

TEST_CASE("the recommended length, fed back into the solver, gives the drift reported", "[advise]") {
  struct Case {
    double D, wall, from, to;
    int n;
  };
  for (const Case& tc : {Case{16, 1, 6.5, 9, 4}, Case{16, 1, 7, 7.5, 3}, Case{25, 2, 5, 8, 4}, Case{12, 1, 8, 14, 5}}) {
    CAPTURE(tc.D, tc.wall, tc.from, tc.to, tc.n);
    const Cylinder sec = section(tc.D, tc.wall);
    const double from = tc.from * revS, to = tc.to * revS;
    const DimensionAdvice adv = adviseLength(sec, tc.n, from, to);
    REQUIRE(adv.best.found);
    REQUIRE(adv.fewer.found);
    REQUIRE(adv.more.found);
    CHECK(adv.fewer.spots == tc.n - 1);
    CHECK(adv.more.spots == tc.n + 1);
    CHECK(adv.fewer.length < adv.best.length);
    CHECK(adv.best.length < adv.more.length);
    for (const LengthAdvice* a : {&adv.fewer, &adv.best, &adv.more}) {
      CAPTURE(a->spots);
      const Cylinder c = withLength(sec, a->length);
      // Both ends, exactly as the solver gives them.
      CHECK(a->atFrom.precession == from);
      CHECK(a->atTo.precession == to);
      CHECK(a->atFrom.driftDegPerSecond == Approx(solverDrift(c, a->spots, from)).epsilon(1e-12));
      CHECK(a->atTo.driftDegPerSecond == Approx(solverDrift(c, a->spots, to)).epsilon(1e-12));
      CHECK(a->atFrom.driftDegPerRev * tc.from == Approx(a->atFrom.driftDegPerSecond).epsilon(1e-12));
      // The worst over a grid denser than the advisor's (2001 points) is
      // the reported worst: never above it (the advisor refines its
      // largest value) and equal to it within the grid's resolution.
      double worst = 0;
      for (int i = 0; i <= 2000; ++i)
        worst = std::max(worst, std::abs(solverDrift(c, a->spots, from + (to - from) * i / 2000)));
      CHECK(worst <= a->worst.driftDegPerSecond * (1 + 1e-9));
      CHECK(worst >= a->worst.driftDegPerSecond * (1 - 1e-6));
      CHECK(a->worst.driftDegPerSecond >= std::abs(a->atFrom.driftDegPerSecond));
      CHECK(a->worst.driftDegPerSecond >= std::abs(a->atTo.driftDegPerSecond));
      // N is close to n over the range: the pattern has n spots.
      CHECK(a->atFrom.spin.nearestSpots == a->spots);
      CHECK(a->atTo.spin.nearestSpots == a->spots);
    }
  }
}

TEST_CASE("the recommended length is a minimum of the worst drift", "[advise]") {
  const Cylinder sec = section(16, 1);
  const double from = 6.5 * revS, to = 9 * revS;
  const LengthAdvice a = adviseLengthFor(sec, 4, from, to);
  REQUIRE(a.found);
  for (double rel : {-0.05, -0.01, -1e-3, -1e-5, 1e-5, 1e-3, 0.01, 0.05}) {
    CAPTURE(rel);
    const WorstDrift w = worstDrift(withLength(sec, a.length * (1 + rel)), 4, from, to);
    CHECK(w.driftDegPerSecond >= a.worst.driftDegPerSecond * (1 - 1e-9));
  }
  // A balanced optimum: the drifts at the two ends have opposite signs and
  // (here, where N falls steadily with the rate) equal sizes.
  CHECK(a.atFrom.driftDegPerSecond * a.atTo.driftDegPerSecond < 0);
  CHECK(std::abs(a.atFrom.driftDegPerSecond) == Approx(std::abs(a.atTo.driftDegPerSecond)).epsilon(1e-6));
}

TEST_CASE("a single precession gets a length with no drift", "[advise]") {
  // With FROM = TO the best length puts N exactly on n.
  const Cylinder sec = section(16, 1);
  const LengthAdvice a = adviseLengthFor(sec, 4, 7 * revS, 7 * revS);
  REQUIRE(a.found);
  CHECK(a.worst.driftDegPerSecond < 1e-6);
  CHECK(steadyAtPrecession(withLength(sec, a.length), 7 * revS).pattern()->spotsPerRev == Approx(4).margin(1e-9));
}

TEST_CASE("a range starting below the lowest precession has no length", "[advise]") {
  // physics.md section 3: below Omega_min (5.93 rev/s for 16 mm OD, 1 mm
  // wall, whatever the length) the end does not stay up.
  const LengthAdvice a = adviseLengthFor(section(16, 1), 4, 5 * revS, 8 * revS);
  CHECK_FALSE(a.found);
  CHECK(a.reason.find("below the lowest precession") != std::string::npos);
}

TEST_CASE("precession window of a given length: |drift| under the limit inside, over it outside", "[advise]") {
  const Cylinder sec = section(16, 1);
  const LengthAdvice a = adviseLengthFor(sec, 4, 6.5 * revS, 9 * revS);
  REQUIRE(a.found);
  const Cylinder c = withLength(sec, a.length);
  // Default limit: one spot spacing (90 deg for four spots) in 10 s.
  CHECK(defaultDriftLimitDegPerSecond(4) == Approx(9.0).epsilon(1e-15));
  const double limit = defaultDriftLimitDegPerSecond(4);
  const PrecessionWindow w = precessionWindow(c, 4, limit, 0, 50 * revS);
  REQUIRE(w.bands.size() == 1);
  CHECK(w.reason.empty());
  const PrecessionBand& b = w.bands[0];
  CHECK(b.from < b.to);
  // The band lies within the advisor's range here (the drift is zero
  // somewhere inside it) and its edges sit on the limit.
  CHECK(b.from > 6.5 * revS);
  CHECK(b.to < 9 * revS);
  CHECK(std::abs(solverDrift(c, 4, b.from)) == Approx(limit).epsilon(1e-9));
  CHECK(std::abs(solverDrift(c, 4, b.to)) == Approx(limit).epsilon(1e-9));
  for (int i = 1; i < 50; ++i) CHECK(std::abs(solverDrift(c, 4, b.from + (b.to - b.from) * i / 50)) < limit);
  CHECK(std::abs(solverDrift(c, 4, b.from * (1 - 1e-4))) > limit);
  CHECK(std::abs(solverDrift(c, 4, b.to * (1 + 1e-4))) > limit);
  // The steadiest rate has no drift at all (N passes through 4).
  REQUIRE(w.best.pattern);
  CHECK(std::abs(w.best.driftDegPerSecond) < 1e-9);
  CHECK(w.best.precession > b.from);
  CHECK(w.best.precession < b.to);
}

TEST_CASE("precession window starting below the minimum starts at the minimum", "[advise]") {
  // A loose limit: every rate with a pattern qualifies, so the band starts
  // where the pattern starts, Omega_min.
  const Cylinder c = withLength(section(16, 1), 0.064);
  const PrecessionWindow w = precessionWindow(c, 4, 3000, 0, 10 * revS);
  REQUIRE(w.bands.size() == 1);
  CHECK(w.bands[0].from == Approx(minSteadyPrecession(c)).epsilon(1e-12));
  CHECK(w.bands[0].to == 10 * revS);
  // A limit nothing meets gives no band and says why.
  const PrecessionWindow none = precessionWindow(c, 6, 0.001, 7 * revS, 8 * revS);
  CHECK(none.bands.empty());
  CHECK(none.reason.find("stays above") != std::string::npos);
}

TEST_CASE("advisor bad input is refused", "[advise]") {
  const Cylinder sec = section(16, 1);
  CHECK_THROWS_AS(adviseLength(sec, 1, 40, 50), std::invalid_argument);
  CHECK_THROWS_AS(adviseLengthFor(sec, 4, 50, 40), std::invalid_argument);
  CHECK_THROWS_AS(adviseLengthFor(sec, 4, -1, 40), std::invalid_argument);
  CHECK_THROWS_AS(adviseLengthFor({0, 0.008, 0.009, 1}, 4, 40, 50), std::invalid_argument);
  CHECK_THROWS_AS(precessionWindow(withLength(sec, 0.064), 4, 0, 40, 50), std::invalid_argument);
  CHECK_FALSE(advise_input::spots.contains(1));
  CHECK(advise_input::spots.contains(4));
}
