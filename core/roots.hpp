// One-dimensional numerics shared by the steady-spin solver and the dimension
// advisor: bracketed root finding (Brent) and bracketed minimisation (golden
// section). Header-only, no allocation.
#pragma once
#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

namespace dm::numeric {

/// A root of `f` in [a, b], where fa = f(a) and fb = f(b) have opposite
/// signs (or one is zero). Brent's method (R. P. Brent, "Algorithms for
/// Minimization without Derivatives", 1973, ch. 4; the netlib `zeroin`),
/// run with no absolute tolerance: it stops when the bracket is down to a
/// few units in the last place of the root, i.e. full double precision.
template <class F>
double brentRoot(F&& f, double a, double b, double fa, double fb) {
  if (fa == 0) return a;
  if (fb == 0) return b;
  constexpr double eps = std::numeric_limits<double>::epsilon();
  constexpr double tiny = 4 * std::numeric_limits<double>::min();  // guards a root at exactly 0
  double c = a, fc = fa, d = b - a, e = d;
  for (int iter = 0; iter < 500; ++iter) {
    if ((fb > 0) == (fc > 0)) {  // keep the root between b and c
      c = a;
      fc = fa;
      d = e = b - a;
    }
    if (std::abs(fc) < std::abs(fb)) {  // b is the best estimate so far
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const double tol = 2 * eps * std::abs(b) + tiny;
    const double m = 0.5 * (c - b);
    if (std::abs(m) <= tol || fb == 0) return b;
    if (std::abs(e) < tol || std::abs(fa) <= std::abs(fb)) {
      d = e = m;  // bisection
    } else {
      double p, q;
      const double s = fb / fa;
      if (a == c) {  // secant
        p = 2 * m * s;
        q = 1 - s;
      } else {  // inverse quadratic interpolation
        const double qa = fa / fc, r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      p = std::abs(p);
      if (2 * p < std::min(3 * m * q - std::abs(tol * q), std::abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = e = m;
      }
    }
    a = b;
    fa = fb;
    b += std::abs(d) > tol ? d : (m > 0 ? tol : -tol);
    fb = f(b);
  }
  return b;
}

/// The minimiser of `f` on [a, b] by golden-section search, assuming `f` is
/// unimodal there; returns {x, f(x)}. Stops when the bracket is below
/// `relTol` times the bracket's scale (1e-12 is close to the best a
/// minimum's flat bottom allows in double).
template <class F>
std::pair<double, double> goldenMinimum(F&& f, double a, double b, double relTol = 1e-12) {
  const double invPhi = (std::sqrt(5.0) - 1) / 2;  // 0.618...
  double x1 = b - invPhi * (b - a), x2 = a + invPhi * (b - a);
  double f1 = f(x1), f2 = f(x2);
  const double scale = std::max(std::abs(a), std::abs(b)) + 1e-300;
  for (int iter = 0; iter < 200 && (b - a) > relTol * scale; ++iter) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - invPhi * (b - a);
      f1 = f(x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + invPhi * (b - a);
      f2 = f(x2);
    }
  }
  return f1 <= f2 ? std::pair{x1, f1} : std::pair{x2, f2};
}

}  // namespace dm::numeric
