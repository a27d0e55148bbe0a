#include "core/flick.hpp"

namespace dm {

namespace {

// SplitMix64 (Steele, Lea & Flood, OOPSLA 2014): a fixed, portable generator.
struct SplitMix64 {
  std::uint64_t state;
  std::uint64_t next() {
    std::uint64_t z = (state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
  }
  // Uniform in [0, 1) from the top 53 bits.
  double unit() { return double(next() >> 11) * 0x1.0p-53; }
  double between(double lo, double hi) { return lo + (hi - lo) * unit(); }
};

}  // namespace

LaunchSpec visitorFlick(const LaunchSpec& nominal, std::uint64_t draw, const FlickSpread& spread) {
  // One generator per draw, seeded from the scenario seed and the draw number.
  SplitMix64 seedMixer{nominal.seed};
  SplitMix64 rng{seedMixer.next() ^ (draw * 0xd1b54a32d192ed03ULL)};
  LaunchSpec l = nominal;
  l.pressedEnd = rng.unit() < 0.5 ? End::A : End::B;
  l.revolution = rng.between(spread.revolutionMin, spread.revolutionMax);
  l.backspin = rng.between(spread.backspinMin, spread.backspinMax);
  l.tilt = rng.between(0, spread.tiltMax);
  l.drift = rng.between(0, spread.driftMax);
  return l;
}

}  // namespace dm
