// How an exposure weighs time: a camera's box shutter, or the eye's temporal
// impulse response (Watson, "Temporal sensitivity", Handbook of Perception
// and Human Performance vol. I, 1986), times the lights' flicker.
#pragma once
#include <complex>

#include "core/scenario.hpp"
#include "render/flicker.hpp"

namespace dm {

/// Watson's two-stage temporal filter h(t) = xi [h1(t) - zeta h2(t)],
/// h_i(t) = (t/tau_i)^(n_i - 1) e^(-t/tau_i) / (tau_i (n_i - 1)!).
/// Parameters from physics.md section 5 (Watson 1986; zeta from memory); xi
/// makes the area one, xi = 1 / (1 - zeta), so a steady light is seen at
/// its own level.
struct EyeFilter {
  double tau1 = 4.94e-3;  ///< s
  double tau2 = 1.33 * 4.94e-3;  ///< s
  int n1 = 9;
  int n2 = 10;
  double zeta = 0.9;  ///< weight of the inhibitory stage, 0..1 (exclusive of 1)

  double xi() const { return 1.0 / (1.0 - zeta); }
  /// Impulse response at t seconds after the impulse, 1/s (0 for t < 0).
  double impulse(double t) const;
  /// Transfer function H(f) = xi [(1 + i 2 pi f tau1)^-n1 - zeta (1 + i 2 pi f tau2)^-n2], f in Hz.
  std::complex<double> transfer(double frequency) const;
};

/// The weight of time in one exposure of [start, start + duration]: 1 for
/// the camera, h(end - t) for the eye; the lights' flicker multiplies the
/// light, not the weight.
struct TimeWeighting {
  ExposureMode mode = ExposureMode::Camera;
  double start = 0;     ///< s
  double duration = 0;  ///< s, > 0
  LightFlicker flicker;
  EyeFilter eye;

  double end() const { return start + duration; }
  /// Weight of time t (s) within the window.
  double weight(double t) const;

  /// Integrals of the weight over [a, b] within the window (s): `weight` of
  /// w(t) and `light` of w(t) times the flicker factor.
  struct Integral {
    double weight = 0;
    double light = 0;
  };
  /// Composite 5-point Gauss-Legendre quadrature on pieces no longer than a
  /// sixteenth of the flicker period and a quarter of tau1, split at the
  /// rectified shape's kinks: exact to rounding for these smooth pieces.
  Integral integrate(double a, double b) const;

 private:
  // Adds the quadrature of [a, b], a smooth stretch, in pieces no longer than `piece`.
  void addSmooth(double a, double b, double piece, Integral& sum) const;
};

}  // namespace dm
