// The dimension advisor: which length makes a tube of a given cross-section
// show n steady spots over the precession rates visitors reach, and, for a
// given length, over which precession rates the pattern stays still enough.
// Built on the steady-spin solver (core/steady.hpp); every drift here is the
// drift of the n-spot pattern the designer asked for (physics.md section 4),
// degrees of azimuth, positive in the direction of precession. Every
// function takes the centre orbit the designer expects (CentreOrbit, the
// same at every precession; default the centre still, physics.md section 3).
#pragma once
#include <limits>
#include <string>
#include <vector>

#include "core/steady.hpp"

namespace dm {

namespace advise_input {
/// Spots a design asks for: at least 2, so that n - 1 still names a pattern.
inline constexpr InputRange spots{"spots", "-", 2, 20};
/// A drift limit, deg/s: from a thousandth of a degree per second to ten
/// turns per second.
inline constexpr InputRange driftLimit{"drift limit", "deg/s", 1e-3, 3600};
/// Top of the precession search for the reverse question when no range is
/// given, rev/s: the launch table's fastest release spin.
inline constexpr double windowSearchTopRevS = 50;
}  // namespace advise_input

/// The default drift limit, deg/s: one spot spacing (360/n degrees) in 10 s.
double defaultDriftLimitDegPerSecond(int spots);

/// The n-spot pattern at one precession.
struct DriftPoint {
  double precession = 0;         ///< rad/s
  bool pattern = false;          ///< a pattern state exists here
  SteadySpin spin;               ///< the solver's pattern state (when pattern)
  double driftDegPerRev = 0;     ///< drift of the n-spot pattern, deg per precession revolution
  double driftDegPerSecond = 0;  ///< the same per second
};
DriftPoint driftAt(const Cylinder& c, int spots, double precession, double g = k::gravity, CentreOrbit orbit = {});

/// The largest |drift| (deg/s) of the n-spot pattern over [from, to]
/// (rad/s): a dense grid including both ends, the largest grid value refined
/// by golden section. Infinite, with pattern = false, when the pattern state
/// is missing somewhere in the range (precession then names where).
struct WorstDrift {
  bool pattern = false;
  double driftDegPerSecond = std::numeric_limits<double>::infinity();
  double precession = 0;  ///< where the worst drift is, rad/s
};
WorstDrift worstDrift(const Cylinder& c, int spots, double from, double to, double g = k::gravity,
                      CentreOrbit orbit = {});

/// The length that keeps N closest to n over a precession range.
struct LengthAdvice {
  int spots = 0;
  bool found = false;       ///< false when no length keeps a pattern over the whole range
  std::string reason;       ///< why not, when not found
  double length = 0;        ///< m
  WorstDrift worst;         ///< the minimised worst drift
  DriftPoint atFrom, atTo;  ///< the pattern at both ends of the range
};

/// Advice for n spots with n - 1 and n + 1 beside it, so the designer sees
/// the trade. Precessions in rad/s.
struct DimensionAdvice {
  double from = 0, to = 0;
  double minPrecession = 0;  ///< minSteadyPrecession() of the cross-section, rad/s
  LengthAdvice fewer, best, more;
};

/// The length minimising the worst |drift| of the n-spot pattern over the
/// precession range [from, to] (rad/s, 0 <= from <= to) for the cross-section
/// of `section` (its length is ignored; n >= 1). A fine scan over lengths
/// (n - 1/2) D to 3 (n + 1/2) D (no shorter length can show n spots, as
/// N <= L/D; on an orbit both ends move by rho/R diameters where that
/// widens the scan, as N <= L/D - rho/R), then golden-section refinement of
/// the best local minima.
/// Throws std::invalid_argument on bad arguments.
LengthAdvice adviseLengthFor(const Cylinder& section, int spots, double from, double to, double g = k::gravity,
                             CentreOrbit orbit = {});
/// adviseLengthFor for n - 1, n and n + 1 (n >= 2).
DimensionAdvice adviseLength(const Cylinder& section, int spots, double from, double to, double g = k::gravity,
                             CentreOrbit orbit = {});

/// The reverse: for a body of given length, the precessions (rad/s) within
/// [searchFrom, searchTo] where the n-spot pattern exists and its |drift|
/// stays at or under the limit (deg/s). Bands are found on a dense grid and
/// their edges refined by bisection to full precision.
struct PrecessionBand {
  double from = 0, to = 0;  ///< rad/s
};
struct PrecessionWindow {
  int spots = 0;
  double length = 0;  ///< m
  double limitDegPerSecond = 0;
  double searchFrom = 0, searchTo = 0;  ///< rad/s
  std::vector<PrecessionBand> bands;    ///< ascending, disjoint
  DriftPoint best;                      ///< least |drift| in the search range (pattern = false if none anywhere)
  std::string reason;                   ///< why there is no band, when there is none
};
PrecessionWindow precessionWindow(const Cylinder& c, int spots, double limitDegPerSecond, double searchFrom,
                                  double searchTo, double g = k::gravity, CentreOrbit orbit = {});

}  // namespace dm
