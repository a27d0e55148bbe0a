#include "core/advise.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "core/io.hpp"
#include "core/roots.hpp"

namespace dm {

namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

// Grid sizes. The drift is smooth in the precession wherever the pattern
// exists; 129 points over a range plus a golden-section refinement of the
// largest value find the worst drift to about 1e-10 relatively. The length
// scan uses a coarser 33-point precession grid (only to bracket the
// optimum) and 241 lengths (a step of about 1 % of n D).
constexpr int fineGrid = 129;
constexpr int coarseGrid = 33;
constexpr int lengthScan = 241;
constexpr int windowGrid = 1001;

void checkRangeArgs(int spots, double from, double to) {
  if (spots < 1) throw std::invalid_argument("spots must be at least 1, got " + std::to_string(spots));
  if (!(from >= 0) || !std::isfinite(to) || !(from <= to))
    throw std::invalid_argument("precession range must satisfy 0 <= from <= to, got " + std::to_string(from) + " to " +
                                std::to_string(to));
}

double gridPoint(double from, double to, int i, int n) {
  return n <= 1 ? from : (i == n - 1 ? to : from + (to - from) * i / (n - 1));
}

// Worst |drift| on an n-point grid over [from, to], optionally refined.
WorstDrift worstOnGrid(const Cylinder& c, int spots, double from, double to, double g, CentreOrbit orbit, int n,
                       bool refine) {
  if (from == to) n = 1;
  WorstDrift w;
  std::vector<double> x(n), d(n);
  int iMax = 0;
  for (int i = 0; i < n; ++i) {
    x[i] = gridPoint(from, to, i, n);
    const DriftPoint p = driftAt(c, spots, x[i], g, orbit);
    if (!p.pattern) return {false, inf, x[i]};
    d[i] = std::abs(p.driftDegPerSecond);
    if (d[i] > d[iMax]) iMax = i;
  }
  w = {true, d[iMax], x[iMax]};
  if (refine && n > 1) {
    const double lo = x[std::max(0, iMax - 1)], hi = x[std::min(n - 1, iMax + 1)];
    bool missing = false;
    double missingAt = 0;
    const auto negDrift = [&](double om) {
      const DriftPoint p = driftAt(c, spots, om, g, orbit);
      if (!p.pattern) {
        missing = true;
        missingAt = om;
        return -inf;
      }
      return -std::abs(p.driftDegPerSecond);
    };
    const auto [om, nd] = numeric::goldenMinimum(negDrift, lo, hi);
    if (missing) return {false, inf, missingAt};
    if (-nd > w.driftDegPerSecond) w = {true, -nd, om};
  }
  return w;
}


}  // namespace

double defaultDriftLimitDegPerSecond(int spots) { return 360.0 / spots / 10.0; }

DriftPoint driftAt(const Cylinder& c, int spots, double precession, double g, CentreOrbit orbit) {
  DriftPoint p;
  p.precession = precession;
  const PatternResult r = patternAtPrecession(c, precession, orbit, g);
  if (!r.found) return p;
  p.pattern = true;
  p.spin = r.spin;
  p.driftDegPerRev = patternDriftDegPerRev(r.spin.spotsPerRev, spots);
  p.driftDegPerSecond = p.driftDegPerRev * precession / k::twoPi;
  return p;
}

WorstDrift worstDrift(const Cylinder& c, int spots, double from, double to, double g, CentreOrbit orbit) {
  checkRangeArgs(spots, from, to);
  return worstOnGrid(c, spots, from, to, g, orbit, fineGrid, true);
}

LengthAdvice adviseLengthFor(const Cylinder& section, int spots, double from, double to, double g,
                             CentreOrbit orbit) {
  checkRangeArgs(spots, from, to);
  Cylinder c = section;
  c.length = 2 * c.outerRadius * spots;
  checkSteadyGeometry(c);
  const double D = 2 * section.outerRadius;
  // N = L/D cos - sin - rho/R <= L/D - rho/R: an orbit towards the floor
  // contact (rho < 0) lets a shorter body show n spots, one the other way
  // asks for a longer one; the scan widens by rho/R diameters (not at all
  // with the centre still).
  const double shift = orbit.rho / section.outerRadius;
  const double lo = std::max((spots - 0.5 + std::min(0.0, shift)) * D, 1e-6),
               hi = 3 * (spots + 0.5 + std::max(0.0, shift)) * D;
  const auto fine = [&](double L) {
    c.length = L;
    return worstOnGrid(c, spots, from, to, g, orbit, fineGrid, true).driftDegPerSecond;
  };

  // 1. Coarse scan: J(L) on a coarse precession grid.
  std::vector<double> Ls(lengthScan), J(lengthScan);
  for (int i = 0; i < lengthScan; ++i) {
    Ls[i] = gridPoint(lo, hi, i, lengthScan);
    c.length = Ls[i];
    J[i] = worstOnGrid(c, spots, from, to, g, orbit, coarseGrid, false).driftDegPerSecond;
  }
  // 2. Refine the three lowest local minima with the fine objective. J is
  //    a maximum of smooth functions: not smooth at the optimum, but
  //    unimodal within a scan step of it, which golden section handles.
  std::vector<int> minima;
  for (int i = 0; i < lengthScan; ++i) {
    const bool left = i == 0 || J[i] <= J[i - 1], right = i == lengthScan - 1 || J[i] <= J[i + 1];
    if (std::isfinite(J[i]) && left && right) minima.push_back(i);
  }
  std::sort(minima.begin(), minima.end(), [&](int a, int b) { return J[a] < J[b]; });
  if (minima.size() > 3) minima.resize(3);

  LengthAdvice a;
  a.spots = spots;
  if (minima.empty()) {
    a.reason = orbit.rho == 0 && from < minSteadyPrecession(c, g)
                   ? "the range starts at " + revSText(from) + ", below the lowest precession that keeps the end up (" +
                         revSText(minSteadyPrecession(c, g)) +
                         "); no length changes that, it depends on the diameter and wall only"
                   : "no length from " + fmt(lo * 1e3, 4) + " to " + fmt(hi * 1e3, 4) +
                         " mm keeps a pattern state over the whole range";
    return a;
  }
  double bestL = 0, bestJ = inf;
  for (int i : minima) {
    const auto [L, j] =
        numeric::goldenMinimum(fine, Ls[std::max(0, i - 1)], Ls[std::min(lengthScan - 1, i + 1)], 1e-10);
    if (j < bestJ) {
      bestJ = j;
      bestL = L;
    }
  }
  if (!std::isfinite(bestJ)) {
    a.reason = "no length keeps a pattern state over the whole range";
    return a;
  }
  c.length = bestL;
  a.found = true;
  a.length = bestL;
  a.worst = worstOnGrid(c, spots, from, to, g, orbit, fineGrid, true);
  a.atFrom = driftAt(c, spots, from, g, orbit);
  a.atTo = driftAt(c, spots, to, g, orbit);
  return a;
}

DimensionAdvice adviseLength(const Cylinder& section, int spots, double from, double to, double g,
                             CentreOrbit orbit) {
  if (spots < 2) throw std::invalid_argument("spots must be at least 2, got " + std::to_string(spots));
  DimensionAdvice d;
  d.from = from;
  d.to = to;
  d.minPrecession =
      minSteadyPrecession({2 * section.outerRadius * spots, section.outerRadius, section.innerRadius, 1}, g);
  d.fewer = adviseLengthFor(section, spots - 1, from, to, g, orbit);
  d.best = adviseLengthFor(section, spots, from, to, g, orbit);
  d.more = adviseLengthFor(section, spots + 1, from, to, g, orbit);
  return d;
}

PrecessionWindow precessionWindow(const Cylinder& c, int spots, double limit, double searchFrom, double searchTo,
                                  double g, CentreOrbit orbit) {
  checkRangeArgs(spots, searchFrom, searchTo);
  checkSteadyGeometry(c);
  if (!(limit > 0) || !std::isfinite(limit))
    throw std::invalid_argument("drift limit must be positive and finite, got " + std::to_string(limit));
  PrecessionWindow w;
  w.spots = spots;
  w.length = c.length;
  w.limitDegPerSecond = limit;
  w.searchFrom = searchFrom;
  w.searchTo = searchTo;

  const int n = searchFrom == searchTo ? 1 : windowGrid;
  std::vector<DriftPoint> p(n);
  std::vector<char> inside(n);
  for (int i = 0; i < n; ++i) {
    p[i] = driftAt(c, spots, gridPoint(searchFrom, searchTo, i, n), g, orbit);
    inside[i] = p[i].pattern && std::abs(p[i].driftDegPerSecond) <= limit;
  }
  // An edge between an inside and an outside precession, by bisection on
  // "pattern exists and |drift| <= limit" down to neighbouring doubles.
  const auto edge = [&](double in, double out) {
    for (int it = 0; it < 200; ++it) {
      const double mid = 0.5 * (in + out);
      if (mid == in || mid == out) break;
      const DriftPoint q = driftAt(c, spots, mid, g, orbit);
      (q.pattern && std::abs(q.driftDegPerSecond) <= limit ? in : out) = mid;
    }
    return in;
  };
  for (int i = 0; i < n; ++i) {
    if (!inside[i]) continue;
    int j = i;
    while (j + 1 < n && inside[j + 1]) ++j;
    PrecessionBand b;
    b.from = i == 0 ? p[0].precession : edge(p[i].precession, p[i - 1].precession);
    b.to = j == n - 1 ? p[n - 1].precession : edge(p[j].precession, p[j + 1].precession);
    w.bands.push_back(b);
    i = j;
  }

  // The least |drift|: a sign change of the drift (a root, drift 0) or the
  // smallest grid value refined by golden section.
  int iBest = -1;
  for (int i = 0; i < n; ++i)
    if (p[i].pattern && (iBest < 0 || std::abs(p[i].driftDegPerSecond) < std::abs(p[iBest].driftDegPerSecond)))
      iBest = i;
  if (iBest < 0) {
    w.best.precession = searchFrom;
    w.reason = "no pattern state anywhere from " + revSText(searchFrom) + " to " + revSText(searchTo);
    return w;
  }
  w.best = p[iBest];
  const auto drift = [&](double om) {
    const DriftPoint q = driftAt(c, spots, om, g, orbit);
    return q.pattern ? q.driftDegPerSecond : inf;
  };
  bool rooted = false;
  for (int k : {iBest - 1, iBest + 1}) {
    if (rooted || k < 0 || k >= n || !p[k].pattern) continue;
    const double da = p[iBest].driftDegPerSecond, db = p[k].driftDegPerSecond;
    if ((da > 0) != (db > 0) && da != 0 && db != 0) {
      const double a = p[iBest].precession, b = p[k].precession;
      w.best = driftAt(c, spots,
                       numeric::brentRoot(drift, std::min(a, b), std::max(a, b), a < b ? da : db, a < b ? db : da), g,
                       orbit);
      rooted = true;
    }
  }
  if (!rooted && n > 1) {
    const auto absDrift = [&](double om) { return std::abs(drift(om)); };
    const auto [om, v] = numeric::goldenMinimum(absDrift, p[std::max(0, iBest - 1)].precession,
                                                p[std::min(n - 1, iBest + 1)].precession);
    if (v < std::abs(w.best.driftDegPerSecond)) w.best = driftAt(c, spots, om, g, orbit);
  }
  if (w.bands.empty())
    w.reason = "the drift stays above " + fmt(limit, 4) + " deg/s everywhere from " + revSText(searchFrom) + " to " +
               revSText(searchTo) + " (least " + fmt(std::abs(w.best.driftDegPerSecond), 4) + " deg/s at " +
               revSText(w.best.precession) + ")";
  return w;
}

}  // namespace dm
