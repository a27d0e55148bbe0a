// Launch draws from a spread: bounds hold, a normal has its mean and
// spread, and a launch depends on its seed and index alone.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "core/launch_spread.hpp"

using namespace dm;

TEST_CASE("the normal distribution and its inverse match the tabulated values", "[launch_spread]") {
  // Phi(1.96) = 0.9750021 and Phi(1) = 0.8413447 (Abramowitz & Stegun,
  // Handbook of Mathematical Functions, Table 26.1); the table gives 7 digits.
  CHECK(normalCdf(1.96) == Approx(0.9750021).margin(1e-7));
  CHECK(normalCdf(1.0) == Approx(0.8413447).margin(1e-7));
  CHECK(normalCdf(0.0) == 0.5);
  // The inverse is bisected to the last bit, so it undoes the cumulative
  // distribution to rounding wherever Phi is not flat in double precision.
  for (double x : {-6.0, -2.5, -0.3, 0.0, 0.7, 1.96, 4.0})
    CHECK(normalQuantile(normalCdf(x)) == Approx(x).margin(1e-9));
}

TEST_CASE("each kind of spread draws within its bounds", "[launch_spread]") {
  SplitMix64 rng{7};
  const Spread fixed{SpreadKind::Fixed, 1, 2, 1.5, 0.1};
  CHECK(drawFrom(fixed, 42.0, rng) == 42.0);
  const Spread uniform{SpreadKind::Uniform, 1, 3, 0, 0};
  const Spread normal{SpreadKind::Normal, 0.5, 0.6, 0.55, 10.0};   // a wide normal cut to a narrow band
  const Spread half{SpreadKind::Normal, 0.0, 1.0, 0.0, 1e-3};      // the mean on a bound: a half normal
  for (int i = 0; i < 10000; ++i) {
    const double u = drawFrom(uniform, 0, rng), n = drawFrom(normal, 0, rng), h = drawFrom(half, 0, rng);
    REQUIRE((u >= 1 && u <= 3));
    REQUIRE((n >= 0.5 && n <= 0.6));
    REQUIRE((h >= 0 && h <= 1));
  }
}

TEST_CASE("an untruncated normal has its mean and standard deviation", "[launch_spread]") {
  // Bounds at +-8 sd cut off less than 1e-15 of the mass. With 40000 draws
  // the sample mean has a standard error of sd/200 and the sample sd one of
  // about sd/283: 5 standard errors leave a chance below 1e-6 of a false alarm.
  SplitMix64 rng{2024};
  const Spread normal{SpreadKind::Normal, 10 - 8 * 2.0, 10 + 8 * 2.0, 10.0, 2.0};
  const int n = 40000;
  double sum = 0, sumSquares = 0;
  for (int i = 0; i < n; ++i) {
    const double x = drawFrom(normal, 0, rng);
    sum += x;
    sumSquares += x * x;
  }
  const double mean = sum / n, sd = std::sqrt(sumSquares / n - mean * mean);
  CHECK(mean == Approx(10.0).margin(5 * 2.0 / 200));
  CHECK(sd == Approx(2.0).margin(5 * 2.0 / 283));
}

TEST_CASE("a launch depends on the seed and its index only", "[launch_spread]") {
  const Scenario s = defaultScenario();
  const LaunchSpec a = drawLaunch(s.launch, s.launchSpread, 99, 5);
  const LaunchSpec again = drawLaunch(s.launch, s.launchSpread, 99, 5);
  const LaunchSpec other = drawLaunch(s.launch, s.launchSpread, 99, 6);
  CHECK(a.revolution == again.revolution);
  CHECK(a.backspin == again.backspin);
  CHECK(a.tilt == again.tilt);
  CHECK(a.drift == again.drift);
  CHECK(a.revolution != other.revolution);
  // The seed of the scenario's own launch is kept; the drawn values lie in the spread.
  CHECK(a.seed == s.launch.seed);
  CHECK((a.revolution >= s.launchSpread.revolution.min && a.revolution <= s.launchSpread.revolution.max));
}

TEST_CASE("the pressed-end share decides which end is pressed", "[launch_spread]") {
  Scenario s = defaultScenario();
  s.launchSpread.pressedEndAShare = 1.0;
  CHECK(drawLaunch(s.launch, s.launchSpread, 1, 3).pressedEnd == End::A);
  s.launchSpread.pressedEndAShare = 0.0;
  CHECK(drawLaunch(s.launch, s.launchSpread, 1, 3).pressedEnd == End::B);
  // An even share presses each end about half the time: 2000 launches give a
  // standard error of 0.011 on the share, so 0.45..0.55 is over 4 errors wide.
  s.launchSpread.pressedEndAShare = 0.5;
  int endA = 0;
  for (std::uint64_t i = 0; i < 2000; ++i) endA += drawLaunch(s.launch, s.launchSpread, 1, i).pressedEnd == End::A;
  CHECK(endA / 2000.0 == Approx(0.5).margin(0.05));
}

TEST_CASE("fixed spreads leave the nominal launch as it is", "[launch_spread]") {
  Scenario s = defaultScenario();
  s.launch.revolution = 7 * k::twoPi;
  s.launch.tilt = 3 * k::degree;
  for (Spread* d : {&s.launchSpread.revolution, &s.launchSpread.backspin, &s.launchSpread.tilt, &s.launchSpread.drift})
    d->kind = SpreadKind::Fixed;
  const LaunchSpec l = drawLaunch(s.launch, s.launchSpread, 5, 0);
  CHECK(l.revolution == s.launch.revolution);
  CHECK(l.tilt == s.launch.tilt);
  CHECK(l.backspin == s.launch.backspin);
  CHECK(l.drift == s.launch.drift);
}
