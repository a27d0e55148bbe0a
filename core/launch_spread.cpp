#include "core/launch_spread.hpp"

#include <algorithm>
#include <cmath>

namespace dm {

double normalCdf(double x) { return 0.5 * std::erfc(-x / std::sqrt(2.0)); }

double normalQuantile(double p) {
  // Phi is increasing: bisect until the bracket stops shrinking.
  double lo = -40, hi = 40;
  for (int i = 0; i < 200; ++i) {
    const double mid = 0.5 * (lo + hi);
    if (mid == lo || mid == hi) break;
    (normalCdf(mid) < p ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

double drawFrom(const Spread& spread, double nominal, SplitMix64& rng) {
  switch (spread.kind) {
    case SpreadKind::Fixed:
      return nominal;
    case SpreadKind::Uniform:
      return spread.min + (spread.max - spread.min) * rng.uniform();
    case SpreadKind::Normal: {
      const double u = rng.uniform();
      if (spread.sd <= 0) return spread.mean;
      // Uniform between the cumulative probabilities of the bounds, mapped back.
      const double pLo = normalCdf((spread.min - spread.mean) / spread.sd);
      const double pHi = normalCdf((spread.max - spread.mean) / spread.sd);
      if (!(pHi > pLo)) return spread.min + (spread.max - spread.min) * u;
      const double x = spread.mean + spread.sd * normalQuantile(pLo + u * (pHi - pLo));
      return std::clamp(x, spread.min, spread.max);
    }
  }
  return nominal;
}

LaunchSpec drawLaunch(const LaunchSpec& nominal, const LaunchSpreadSpec& spread, std::uint64_t seed,
                      std::uint64_t index) {
  SplitMix64 rng{itemSeed(seed, index)};
  LaunchSpec l = nominal;
  l.pressedEnd = rng.uniform() < spread.pressedEndAShare ? End::A : End::B;
  l.revolution = drawFrom(spread.revolution, nominal.revolution, rng);
  l.backspin = drawFrom(spread.backspin, nominal.backspin, rng);
  l.tilt = drawFrom(spread.tilt, nominal.tilt, rng);
  l.drift = drawFrom(spread.drift, nominal.drift, rng);
  return l;
}

}  // namespace dm
