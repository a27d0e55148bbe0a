#include "render/temporal.hpp"

#include <algorithm>
#include <array>
#include <cmath>

#include "core/constants.hpp"

namespace dm {

namespace {

// Gamma-shaped stage (t/tau)^(n-1) e^(-t/tau) / (tau (n-1)!), evaluated in
// logarithms so large n cannot overflow.
double stage(double t, double tau, int n) {
  if (t <= 0) return 0.0;
  const double x = t / tau;
  return std::exp((n - 1) * std::log(x) - x - std::lgamma(double(n))) / tau;
}

// 5-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz & Stegun, Table 25.4).
constexpr std::array<double, 5> glNode{0.0, -0.5384693101056831, 0.5384693101056831, -0.9061798459386640,
                                       0.9061798459386640};
constexpr std::array<double, 5> glWeight{0.5688888888888889, 0.4786286704993665, 0.4786286704993665,
                                         0.2369268850561891, 0.2369268850561891};

}  // namespace

double EyeFilter::impulse(double t) const { return xi() * (stage(t, tau1, n1) - zeta * stage(t, tau2, n2)); }

std::complex<double> EyeFilter::transfer(double f) const {
  const std::complex<double> s1(1.0, k::twoPi * f * tau1), s2(1.0, k::twoPi * f * tau2);
  return xi() * (std::pow(s1, -double(n1)) - zeta * std::pow(s2, -double(n2)));
}

double TimeWeighting::weight(double t) const {
  if (mode == ExposureMode::Camera) return 1.0;
  return eye.impulse(end() - t);
}

void TimeWeighting::addSmooth(double a, double b, double piece, Integral& sum) const {
  const long pieces = std::max(1L, long(std::ceil((b - a) / piece * (1 - 1e-12))));
  const double h = (b - a) / double(pieces);
  for (long p = 0; p < pieces; ++p) {
    const double mid = a + (double(p) + 0.5) * h;
    for (std::size_t i = 0; i < glNode.size(); ++i) {
      const double t = mid + 0.5 * h * glNode[i];
      const double w = glWeight[i] * 0.5 * h * weight(t);
      sum.weight += w;
      sum.light += w * flicker.factor(t);
    }
  }
}

TimeWeighting::Integral TimeWeighting::integrate(double a, double b) const {
  Integral sum;
  if (!(b > a)) return sum;
  // Longest piece: resolve the flicker period and the eye's fastest stage.
  const bool flickers = flicker.waveform != Waveform::None && flicker.depth > 0;
  double piece = b - a;
  if (flickers) piece = std::min(piece, 1.0 / (16.0 * flicker.frequency));
  if (mode == ExposureMode::Eye) piece = std::min(piece, eye.tau1 / 4.0);
  // The rectified shape has a kink at every multiple of its period: split
  // there so each piece is smooth.
  if (!flickers || flicker.waveform != Waveform::RectifiedMains) {
    addSmooth(a, b, piece, sum);
    return sum;
  }
  const double period = 1.0 / flicker.frequency;
  double from = a;
  for (double kink = (std::floor(a / period) + 1) * period; kink < b; kink += period) {
    addSmooth(from, kink, piece, sum);
    from = kink;
  }
  addSmooth(from, b, piece, sum);
  return sum;
}

}  // namespace dm
