// A visitor's flick drawn at random: the launch a hand might give, from a
// stated spread, reproducible from the scenario's seed and a draw number.
#pragma once
#include <cstdint>

#include "core/scenario.hpp"

namespace dm {

/// The range a hand-flick is drawn from, SI; every value uniform within its
/// range. Our own assumption of what visitors do (common practice, no source):
/// a few to a dozen turns a second, a firm but imperfect press, a small tilt
/// and a little sideways push.
struct FlickSpread {
  double revolutionMin = 4 * 6.283185307179586;   ///< rad/s
  double revolutionMax = 12 * 6.283185307179586;  ///< rad/s
  double backspinMin = 0.4;                       ///< -
  double backspinMax = 1.0;                       ///< -
  double tiltMax = 8 * 0.017453292519943295;      ///< rad (from 0)
  double driftMax = 0.04;                         ///< m/s (from 0)
};

/// Draw number `draw` of a visitor flick: the nominal launch with its
/// pressed end, revolution, back-spin, tilt and drift replaced by values
/// drawn from `spread` (the pressed end is A or B with equal chance). The
/// same seed and draw give the same launch on every machine (SplitMix64).
LaunchSpec visitorFlick(const LaunchSpec& nominal, std::uint64_t draw, const FlickSpread& spread = {});

}  // namespace dm
