// Reproducible random numbers: SplitMix64 (Steele, Lea & Flood, OOPSLA 2014),
// identical with every compiler and standard library, and seedable per item
// so results do not depend on how work is split between threads.
#pragma once
#include <cstdint>

namespace dm {

/// One SplitMix64 mixing step of `x` (a good 64-bit hash of a counter).
constexpr std::uint64_t mix64(std::uint64_t x) {
  x += 0x9E3779B97F4A7C15ULL;
  x = (x ^ (x >> 30)) * 0xBF58476D1CE4E5B9ULL;
  x = (x ^ (x >> 27)) * 0x94D049BB133111EBULL;
  return x ^ (x >> 31);
}

/// A seed for item `index` of a run seeded with `seed`.
constexpr std::uint64_t itemSeed(std::uint64_t seed, std::uint64_t index) { return mix64(mix64(seed) ^ index); }

struct SplitMix64 {
  std::uint64_t state = 0;
  std::uint64_t next() {
    state += 0x9E3779B97F4A7C15ULL;
    std::uint64_t z = state;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
    return z ^ (z >> 31);
  }
  /// Uniform in [0, 1) with 53 random bits.
  double uniform() { return double(next() >> 11) * 0x1.0p-53; }
};

}  // namespace dm
