// How exposures weigh time: the eye's temporal filter and the window integrals.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "render/temporal.hpp"

using namespace dm;

namespace {

// Trapezoid integral of the eye filter's impulse response over [0, until].
double filterArea(const EyeFilter& eye, double until, double dt = 1e-6) {
  double sum = 0;
  for (double t = dt; t < until; t += dt) sum += eye.impulse(t) * dt;
  return sum;
}

}  // namespace

TEST_CASE("Watson's filter has unit area, so a steady light is seen at its level", "[temporal]") {
  // Watson 1986 impulse response with xi = 1 / (1 - zeta) (physics.md
  // section 5). Each gamma stage has unit area, so the total is 1; 1 us
  // trapezoids over 0.5 s integrate it to about 1e-9.
  const EyeFilter eye;
  CHECK(filterArea(eye, 0.5) == Approx(1.0).margin(1e-6));
  // The shortest eye window the scenario allows holds all but 1e-4 of it.
  CHECK(filterArea(eye, k::minEyeWindow) == Approx(1.0).margin(1e-4));
}

TEST_CASE("the sampled filter's spectrum matches the analytic transfer function", "[temporal]") {
  // H(f) = xi [(1 + i 2 pi f tau1)^-n1 - zeta (1 + i 2 pi f tau2)^-n2] is the
  // Laplace transform of the gamma stages (Watson 1986). A 2 us Riemann sum
  // over 0.5 s reproduces it to about 1e-5 of its peak (about 6.5 at 8 Hz).
  const EyeFilter eye;
  const double dt = 2e-6;
  for (double f : {0.0, 2.0, 8.0, 20.0, 50.0}) {
    std::complex<double> sum = 0;
    for (double t = dt / 2; t < 0.5; t += dt) sum += eye.impulse(t) * std::exp(std::complex<double>(0, -k::twoPi * f * t)) * dt;
    const std::complex<double> h = eye.transfer(f);
    CHECK(sum.real() == Approx(h.real()).margin(1e-4));
    CHECK(sum.imag() == Approx(h.imag()).margin(1e-4));
  }
  // Above fusion the filter passes almost nothing (Talbot-Plateau law): at 100 Hz |H| < 1e-3.
  CHECK(std::abs(eye.transfer(100)) < 1e-3);
}

TEST_CASE("window integrals of the camera weight and flicker are exact", "[temporal]") {
  TimeWeighting w;
  w.mode = ExposureMode::Camera;
  w.start = 0.1;
  w.duration = 0.0237;
  w.flicker = {Waveform::Sine, 100, 0.4};
  const double a = 0.1013, b = 0.1201;
  const TimeWeighting::Integral i = w.integrate(a, b);
  // Closed form of the integral of 1 + d sin(2 pi f t).
  const double exact = (b - a) - 0.4 / (k::twoPi * 100) * (std::cos(k::twoPi * 100 * b) - std::cos(k::twoPi * 100 * a));
  CHECK(i.weight == Approx(b - a).epsilon(1e-14));
  CHECK(i.light == Approx(exact).epsilon(1e-12));
  // The rectified shape averages to one over whole periods, kinks and all.
  w.flicker = {Waveform::RectifiedMains, 100, 0.9};
  CHECK(w.integrate(0.1 + 0.0013, 0.1 + 0.0013 + 0.05).light == Approx(0.05).epsilon(1e-12));
}

TEST_CASE("eye-mode weights follow the filter backwards from the window's end", "[temporal]") {
  TimeWeighting w;
  w.mode = ExposureMode::Eye;
  w.start = 2.0;
  w.duration = 0.5;
  CHECK(w.weight(2.5 - 0.03) == Approx(w.eye.impulse(0.03)));
  CHECK(w.weight(2.5) == 0.0);
  // The whole window's weight is the filter's area.
  CHECK(w.integrate(2.0, 2.5).weight == Approx(1.0).margin(1e-9));
}
