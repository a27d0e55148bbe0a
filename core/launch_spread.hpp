// Visitor launches drawn from a scenario's launch spread: every launch of an
// ensemble gets its own generator, seeded from the ensemble seed and the
// launch's index (itemSeed), so a launch is the same whichever thread runs
// it and however many there are.
#pragma once
#include <cstdint>

#include "core/random.hpp"
#include "core/scenario.hpp"

namespace dm {

/// One draw from `spread` (SI, its parameter's unit). Fixed returns
/// `nominal`; uniform is uniform on [min, max]; normal is the normal of
/// `mean` and `sd` truncated to [min, max], drawn by inverting its
/// cumulative distribution (so one uniform number gives one draw, however
/// far the bounds lie in a tail). Consumes exactly one number of `rng`
/// unless the kind is fixed.
double drawFrom(const Spread& spread, double nominal, SplitMix64& rng);

/// Standard normal cumulative distribution Phi(x) = erfc(-x / sqrt 2) / 2.
double normalCdf(double x);
/// Its inverse on (0, 1), by bisection to the last bit (x within -40..40).
double normalQuantile(double p);

/// Launch `index` of an ensemble seeded with `seed`: the nominal launch with
/// the pressed end, revolution, back-spin, tilt and drift drawn from the
/// spread, in that order, from the generator of itemSeed(seed, index).
LaunchSpec drawLaunch(const LaunchSpec& nominal, const LaunchSpreadSpec& spread, std::uint64_t seed,
                      std::uint64_t index);

}  // namespace dm
