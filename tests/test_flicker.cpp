// Light flicker: waveforms, their spectra, the stroboscopic visibility
// measure and the IEEE 1789 limits.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"
#include "render/flicker.hpp"

using namespace dm;

namespace {

// Mean, min and max of the flicker factor over one period, sampled finely.
struct Extremes {
  double mean = 0, min = 1e300, max = -1e300;
};

Extremes overPeriod(const LightFlicker& f) {
  Extremes e;
  const int n = 200000;
  for (int i = 0; i < n; ++i) {
    const double v = f.factor((i + 0.5) / n / f.frequency);
    e.mean += v / n;
    e.min = std::min(e.min, v);
    e.max = std::max(e.max, v);
  }
  return e;
}

}  // namespace

TEST_CASE("sine and rectified flicker keep mean one and the stated Michelson depth", "[flicker]") {
  for (Waveform w : {Waveform::Sine, Waveform::RectifiedMains})
    for (double depth : {0.1, 0.5, 1.0}) {
      const LightFlicker f{w, 100, depth};
      const Extremes e = overPeriod(f);
      // 2e5 midpoint samples of a smooth (or once-kinked) period: mean to 1e-8;
      // the rectified minimum sits on a kink the samples miss by up to
      // pi / (2 x 2e5) ~ 1e-5 in phase, so the depth to 1e-4.
      CHECK(e.mean == Approx(1.0).margin(1e-8));
      CHECK((e.max - e.min) / (e.max + e.min) == Approx(depth).margin(1e-4));
      CHECK(e.min >= -1e-12);
    }
}

TEST_CASE("the closed-form rectified spectrum matches a numerical Fourier transform", "[flicker]") {
  const LightFlicker f{Waveform::RectifiedMains, 120, 0.6};
  const auto spectrum = modulationSpectrum(f, 2000);
  REQUIRE(spectrum.size() == 16);  // 120 Hz harmonics up to 2 kHz
  const int n = 100000;
  for (std::size_t k = 0; k < 4; ++k) {
    double re = 0, im = 0;
    for (int i = 0; i < n; ++i) {
      const double t = (i + 0.5) / n / f.frequency;
      re += f.factor(t) * std::cos(k::twoPi * (k + 1) * f.frequency * t) / n;
      im += f.factor(t) * std::sin(k::twoPi * (k + 1) * f.frequency * t) / n;
    }
    // Amplitude of a cosine component is twice the mean of factor x cos.
    CHECK(spectrum[k].frequency == Approx(120.0 * (k + 1)));
    CHECK(spectrum[k].amplitude == Approx(2 * std::hypot(re, im)).margin(1e-7));
  }
}

TEST_CASE("stroboscopic visibility of one sinusoid is C / T(f)", "[flicker]") {
  // CIE TN 006:2016 (from memory until checked): SVM = (sum (C_m/T_m)^3.7)^(1/3.7)
  // with T(f) = 2.865e-5 f^1.543 + 0.225 (physics.md section 5); one component gives C / T(f).
  for (double f : {100.0, 300.0, 1000.0}) {
    const LightFlicker sine{Waveform::Sine, f, 0.3};
    CHECK(stroboscopicVisibility(modulationSpectrum(sine)) == Approx(0.3 / (2.865e-5 * std::pow(f, 1.543) + 0.225)).epsilon(1e-12));
  }
  // Components above 2 kHz do not count (CIE TN 006:2016, from memory).
  CHECK(stroboscopicVisibility({{2500, 1.0}}) == 0.0);
  // Two equal components at one frequency: 2^(1/3.7) times one.
  CHECK(stroboscopicVisibility({{100, 0.1}, {100, 0.1}}) ==
        Approx(std::pow(2.0, 1 / 3.7) * 0.1 / svmThreshold(100)).epsilon(1e-12));
}

TEST_CASE("IEEE 1789 low-risk modulation limits", "[flicker]") {
  // IEEE Std 1789-2015 low-risk region (from memory): Mod% < 0.025 f below
  // 90 Hz, Mod% < 0.08 f from 90 Hz to 1250 Hz, no limit above.
  CHECK(ieee1789LowRiskLimitPercent(60) == Approx(1.5));
  CHECK(ieee1789LowRiskLimitPercent(100) == Approx(8.0));
  CHECK(ieee1789LowRiskLimitPercent(1250) == Approx(100.0));
  CHECK(std::isinf(ieee1789LowRiskLimitPercent(2000)));
  CHECK(ieee1789LowRisk({Waveform::RectifiedMains, 100, 0.05}));
  CHECK_FALSE(ieee1789LowRisk({Waveform::RectifiedMains, 100, 0.30}));
  CHECK(ieee1789LowRisk({Waveform::None, 100, 1.0}));
  CHECK(modulationPercent({Waveform::Sine, 100, 0.25}) == Approx(25.0));
}
