// The lighting check: the stroboscopic visibility and IEEE 1789 figures of
// a design's lights, and the beat of the spots' stops with the flicker.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "render/lighting_check.hpp"

using namespace dm;

namespace {

// A pattern analysis with one mark on end A stopping `rate` times a second
// for 2 s, each stop `dwell` long, in one window showing `spots` spots.
PatternAnalysis stoppingMark(double rate, double dwell, int spots) {
  PatternAnalysis a;
  a.points.push_back(MarkedPoint{"rim_patch0_A", Vec3::Zero(), End::A, 0.002});
  for (int i = 0; i <= int(2 * rate); ++i) {
    StopEvent s;
    s.point = 0;
    s.end = End::A;
    s.time = 0.1 + i / rate;
    s.dwell = dwell;
    a.stops.push_back(s);
  }
  PatternWindow w;
  w.start = 0;
  w.end = 2.5;
  w.visibleEnd = End::A;
  w.kind = PatternKind::Stationary;
  w.spots.resize(std::size_t(spots));
  w.stopCount = int(a.stops.size());
  a.windows.push_back(w);
  return a;
}

}  // namespace

TEST_CASE("a sinusoidal room light has SVM C / T(f) and its IEEE 1789 verdict", "[lighting_check]") {
  // CIE TN 006:2016 (from memory until checked): one sinusoidal component of
  // relative amplitude C at f has SVM = C / T(f), T(f) = 2.865e-5 f^1.543 + 0.225.
  Scenario s = defaultScenario();
  s.lighting.flicker = Waveform::Sine;
  s.lighting.flickerFrequency = 100;
  s.lighting.flickerDepth = 0.3;
  const LightingCheck c = lightingCheck(s, PatternAnalysis{});
  CHECK(c.svm == Approx(0.3 / (2.865e-5 * std::pow(100.0, 1.543) + 0.225)).epsilon(1e-12));
  CHECK(c.svmVisible == (c.svm >= 1));
  // IEEE Std 1789-2015 low risk at 100 Hz (from memory): below 0.08 x 100 = 8 %; 30 % is above.
  CHECK(c.modulationPercent == Approx(30));
  CHECK(c.lowRiskLimitPercent == Approx(8));
  CHECK_FALSE(c.lowRisk);
  CHECK_FALSE(c.beat);  // no stops
  CHECK_FALSE(c.flashWarning);
}

TEST_CASE("stops beat with the light at the alias of its frequency", "[lighting_check]") {
  // 21 stops a second over 4 spots: each spot is visited 5.25 times a
  // second; the 100 Hz light's nearest multiple of that is 19 x 5.25 = 99.75 Hz,
  // a 0.25 Hz beat. A 2 ms dwell averages the light by sin(x) / x with
  // x = pi 100 Hz 2 ms (the box average of a sinusoid).
  const LightFlicker sine{Waveform::Sine, 100, 0.2};
  const auto beat = stopBeat(sine, stoppingMark(21, 0.002, 4), 0.02);
  REQUIRE(beat);
  CHECK(beat->stopRate == Approx(21));
  CHECK(beat->spots == 4);
  CHECK(beat->visitRate == Approx(5.25));
  CHECK(beat->lightFrequency == 100);
  CHECK(beat->beatFrequency == Approx(0.25));
  const double x = k::pi * 100 * 0.002;
  CHECK(beat->modulation == Approx(0.2 * std::sin(x) / x));
  CHECK(beat->visible);
  // A dwell of one whole light period averages the flicker away.
  const auto averaged = stopBeat(sine, stoppingMark(21, 0.01, 4), 0.02);
  REQUIRE(averaged);
  CHECK(averaged->modulation == Approx(0).margin(1e-12));
  CHECK_FALSE(averaged->visible);
  // Steady light: nothing to beat with.
  CHECK_FALSE(stopBeat(LightFlicker{}, stoppingMark(21, 0.002, 4), 0.02));
}

TEST_CASE("a strobe above three flashes a second is flagged", "[lighting_check]") {
  // WCAG 2.x success criterion 2.3.1: no more than three flashes in any one second.
  Scenario s = defaultScenario();
  s.lighting.strobeRate = 3;
  CHECK_FALSE(lightingCheck(s, PatternAnalysis{}).flashWarning);
  s.lighting.strobeRate = 3.5;
  CHECK(lightingCheck(s, PatternAnalysis{}).flashWarning);
}
