#include "core/pattern.hpp"

#include <algorithm>
#include <cmath>

#include "core/kinematics.hpp"

namespace dm {

namespace {

// ---- marked points ----------------------------------------------------------

// A point on end `e`'s outer rim edge at body azimuth `angle`.
MarkedPoint rimMark(std::string label, const Cylinder& c, End e, double angle, double size) {
  MarkedPoint p;
  p.label = std::move(label);
  p.body = Vec3(c.outerRadius * std::cos(angle), c.outerRadius * std::sin(angle), endSign(e) * c.length / 2);
  p.end = e;
  p.size = size;
  return p;
}

// Angular span of a rim patch, rad (a whole turn when the ends differ by one).
double patchSpan(const Marking& m) {
  const double span = wrapAngle(m.toAngle - m.fromAngle);
  return span == 0.0 && m.toAngle != m.fromAngle ? k::twoPi : span;
}

// Appends the marked points of marking number `index`.
void addMarkingPoints(const Cylinder& c, const Marking& m, std::size_t index, std::vector<MarkedPoint>& out) {
  const std::string name = std::string(markingKindName(m.kind)) + std::to_string(index);
  switch (m.kind) {
    case MarkingKind::RimPatch: {
      const double span = patchSpan(m);
      if (span == 0) return;  // paints a single azimuth: nothing to see
      out.push_back(rimMark(name + "_" + std::string(endName(m.end)), c, m.end, m.fromAngle + span / 2,
                            c.outerRadius * span));
      return;
    }
    case MarkingKind::Stripe:
      for (End e : {End::A, End::B})
        out.push_back(rimMark(name + "_" + std::string(endName(e)), c, e, m.angle, c.outerRadius * m.arcWidth));
      return;
    case MarkingKind::Dot: {
      MarkedPoint p;
      p.label = name;
      p.body = Vec3(c.outerRadius * std::cos(m.angle), c.outerRadius * std::sin(m.angle), m.axial);
      if (m.axial != 0) p.end = m.axial > 0 ? End::A : End::B;
      p.size = 2 * m.radius;
      out.push_back(p);
      return;
    }
    case MarkingKind::Band:
      return;  // the same all round: no point of its own
  }
}

// ---- stop events --------------------------------------------------------------

// Angle of a body point about the axis from the top of its circle, rad
// (-pi..pi), positive in the sense of a right-handed turn about the axis.
double angleFromTop(const Quat& worldFromBody, const Vec3& bodyPoint) {
  const Vec3 a = worldFromBody * Vec3::UnitZ();
  const Vec3 r = worldFromBody * bodyPoint;
  const Vec3 radial = r - r.dot(a) * a;
  const Vec3 top = rimUpDirection(worldFromBody);
  return std::atan2(a.dot(top.cross(radial)), top.dot(radial));
}

// Speed of a body point across the table at time t, m/s.
double horizontalSpeedAt(const Trajectory& tr, const Vec3& bodyPoint, double t) {
  const Pose pose = tr.poseAt(t);
  const Vec3 v = tr.velocityAt(t) + tr.spinAt(t).cross(pose.worldFromBody * bodyPoint);
  return std::hypot(v.x(), v.y());
}

// True when the angle from the top changes sign between a and b without
// passing the bottom of the circle.
bool crossesTop(double a, double b) {
  const double quarter = k::pi / 2;
  if (std::abs(a) >= quarter || std::abs(b) >= quarter) return false;
  return (a < 0 && b >= 0) || (a > 0 && b <= 0);
}

// Bisection steps: the default 1/3 ms step shrinks to 3e-13 s.
constexpr int bisections = 30;

// Time in [a, b] at which the point passes the top; `angleA` is its angle at a.
double crossingTime(const Trajectory& tr, const Vec3& bodyPoint, double a, double b, double angleA) {
  for (int i = 0; i < bisections; ++i) {
    const double mid = 0.5 * (a + b);
    const double angle = angleFromTop(tr.poseAt(mid).worldFromBody, bodyPoint);
    if (angle != 0 && (angle < 0) == (angleA < 0))
      a = mid;
    else
      b = mid;
  }
  return 0.5 * (a + b);
}

// True while the point is slower than `limit` across the table and within a
// quarter turn of the top.
bool stillAt(const Trajectory& tr, const Vec3& bodyPoint, double t, double limit) {
  return std::abs(angleFromTop(tr.poseAt(t).worldFromBody, bodyPoint)) < k::pi / 2 &&
         horizontalSpeedAt(tr, bodyPoint, t) < limit;
}

// Walking from `from` (where the point is still) in steps of `step` (either
// sign), the last time the point is still, refined by bisection. Stops at the
// ends of the record.
double dwellEdge(const Trajectory& tr, const Vec3& bodyPoint, double from, double step, double limit) {
  double inside = from;
  double outside = from;
  for (;;) {
    const double next = std::clamp(inside + step, tr.startTime(), tr.endTime());
    if (next == inside) return inside;
    if (!stillAt(tr, bodyPoint, next, limit)) {
      outside = next;
      break;
    }
    inside = next;
  }
  for (int i = 0; i < bisections; ++i) {
    const double mid = 0.5 * (inside + outside);
    (stillAt(tr, bodyPoint, mid, limit) ? inside : outside) = mid;
  }
  return inside;
}

// The stop of point `index` passing the top between samples a and b.
StopEvent makeStop(const Trajectory& tr, const MarkedPoint& p, std::size_t index, const Sample& a, const Sample& b,
                   double angleA, double dwellSpeed) {
  StopEvent s;
  s.point = index;
  s.end = *p.end;
  s.time = crossingTime(tr, p.body, a.t, b.t, angleA);
  s.position = tr.poseAt(s.time).toWorld(p.body);
  s.horizontalSpeed = horizontalSpeedAt(tr, p.body, s.time);
  if (s.horizontalSpeed < dwellSpeed) {
    const double h = b.t - a.t;
    s.dwell = dwellEdge(tr, p.body, s.time, h, dwellSpeed) - dwellEdge(tr, p.body, s.time, -h, dwellSpeed);
  }
  return s;
}

// ---- spot statistics ------------------------------------------------------------

// Means over the samples of one window.
struct WindowMeans {
  Vec3 centre = Vec3::Zero();
  double tilt = 0, precession = 0;
  std::optional<double> spotsPerRev;
  std::optional<End> visibleEnd;
};

// N over a window is the mark's turn about the axis, relative to the top,
// divided by the axis' turn about the vertical: the time integrals of the
// relative spin and of the precession (the top point turns with the axis'
// frame, whose spin about the axis is Omega sin(tilt) even while the tilt
// nutates, so the mark's angle from the top grows at exactly the relative
// spin). That is the number of visits to the top per revolution, which the
// stops show. A mean of the instantaneous ratio is not: where the
// precession rate nutates by a fraction e about its mean, 1/Omega averages
// to about (1 + e^2/2) / mean(Omega) (Jensen's inequality); it read N 0.01
// to 0.04 high in the demo's first two seconds.
WindowMeans windowMeans(const Trajectory& tr, double t0, double t1) {
  WindowMeans m;
  std::size_t count = 0, raisedA = 0, raisedB = 0;
  double sumRelativeSpin = 0;
  for (std::size_t i = tr.indexAt(t0); i < tr.samples.size() && tr.samples[i].t <= t1; ++i) {
    const Sample& s = tr.samples[i];
    if (s.t < t0) continue;
    const AxisMotion motion = axisMotion(s.orientation, s.spin);
    ++count;
    m.centre += s.position;
    m.tilt += motion.tilt;
    m.precession += motion.precession;
    sumRelativeSpin += motion.relativeSpin;
    const std::optional<End> raised = raisedEndOf(s.orientation);
    if (raised) ++(*raised == End::A ? raisedA : raisedB);
  }
  if (count == 0) return m;
  m.centre /= double(count);
  m.tilt /= double(count);
  m.precession /= double(count);
  // Samples are evenly spaced, so the sums stand for the time integrals.
  if (std::abs(m.precession) >= minPrecessionForN) m.spotsPerRev = sumRelativeSpin / double(count) / m.precession;
  if (2 * raisedA > count) m.visibleEnd = End::A;
  if (2 * raisedB > count) m.visibleEnd = End::B;
  return m;
}

// The centre's orbit over [t0, t1] (PatternWindow::centreOrbit): linear
// least squares for (O_x, O_y, V_x, V_y, rho, sigma) in
// c = O + V (t - t_mid) + rho e + sigma (z x e), e the horizontal unit of
// the visible end's axis. The fit needs e to turn: it is made only when the
// axis' azimuth sweeps at least a whole turn over the window.
struct OrbitFit {
  double along = 0, across = 0;  // rho, sigma, m
};
std::optional<OrbitFit> centreOrbitFit(const Trajectory& tr, double t0, double t1, End visible) {
  using Mat6 = Eigen::Matrix<double, 6, 6>;
  using Vec6 = Eigen::Matrix<double, 6, 1>;
  Mat6 normal = Mat6::Zero();
  Vec6 rhs = Vec6::Zero();
  const double mid = 0.5 * (t0 + t1);
  double swept = 0, previous = 0;
  bool first = true;
  for (std::size_t i = tr.indexAt(t0); i < tr.samples.size() && tr.samples[i].t <= t1; ++i) {
    const Sample& s = tr.samples[i];
    if (s.t < t0) continue;
    const Vec3 axis = endSign(visible) * (s.orientation * Vec3::UnitZ());
    const double horizontal = std::hypot(axis.x(), axis.y());
    if (!(horizontal > 1e-9)) continue;  // axis upright: no e
    const double ex = axis.x() / horizontal, ey = axis.y() / horizontal;
    const double azimuth = std::atan2(ey, ex);
    if (!first) swept += std::remainder(azimuth - previous, k::twoPi);
    previous = azimuth;
    first = false;
    const double dt = s.t - mid;
    Vec6 rowX, rowY;
    rowX << 1, 0, dt, 0, ex, -ey;
    rowY << 0, 1, 0, dt, ey, ex;
    normal += rowX * rowX.transpose() + rowY * rowY.transpose();
    rhs += rowX * s.position.x() + rowY * s.position.y();
  }
  if (std::abs(swept) < k::twoPi) return std::nullopt;
  const Vec6 x = normal.ldlt().solve(rhs);
  if (!x.allFinite()) return std::nullopt;
  return OrbitFit{x(4), x(5)};
}

// A stop as seen about the window's centre.
struct SeenStop {
  double time = 0;
  double azimuth = 0;  ///< rad
  double radius = 0;   ///< horizontal distance from the centre, m
};

// The stops of the visible end's marks in [t0, t1], one time-ordered
// sequence per marked point. Every passage over the top counts, however fast:
// where the marks pass the top is the pattern; the dwell says how sharp it is.
std::vector<std::vector<SeenStop>> seenStops(const std::vector<StopEvent>& stops, std::size_t pointCount, End visible,
                                             const Vec3& centre, double t0, double t1) {
  std::vector<std::vector<SeenStop>> seqs(pointCount);
  auto it = std::lower_bound(stops.begin(), stops.end(), t0, [](const StopEvent& s, double t) { return s.time < t; });
  for (; it != stops.end() && it->time <= t1; ++it) {
    if (it->end != visible) continue;
    const Vec3 d = it->position - centre;
    seqs[it->point].push_back({it->time, wrapAngle(std::atan2(d.y(), d.x())), std::hypot(d.x(), d.y())});
  }
  return seqs;
}

// Angular size about the centre of the smallest mark with stops, rad.
double smallestSpotSize(const std::vector<std::vector<SeenStop>>& seqs, const std::vector<MarkedPoint>& points) {
  double smallest = 0;
  for (std::size_t j = 0; j < seqs.size(); ++j) {
    if (seqs[j].empty()) continue;
    double radius = 0;
    for (const SeenStop& s : seqs[j]) radius += s.radius;
    radius /= double(seqs[j].size());
    const double size = radius > 0 ? points[j].size / radius : k::twoPi;
    smallest = smallest == 0 ? size : std::min(smallest, size);
  }
  return smallest;
}

// How stops revisit their places: every `spots`-th stop of a mark comes
// back to the same place, moving `shift` (rad, mean) per visit with a
// scatter `spread` (rad, one stop's), visits `period` seconds apart.
struct Revisit {
  int spots = 0;
  double shift = 0;
  double spread = 0;
  double period = 0;
};

// The fewest spots whose revisits come back to their own place (root mean
// square over all revisits in the window): within the spot's own size, or,
// for spots far apart, within k::revisitTolerance (an eighth) of their
// spacing, so that a spot blurred by nutation still counts as one; none when no
// count does. A count is tried only if the spots fit round the circle with a
// spot size of gap between them, and if the longest sequence can hit each of
// them twice (a place hit once in a window is a flash, not a spot).
std::optional<Revisit> findRevisit(const std::vector<std::vector<SeenStop>>& seqs, double spotSize) {
  std::size_t longest = 0;
  for (const auto& seq : seqs) longest = std::max(longest, seq.size());
  const int maxSpots = int(std::min(k::pi / spotSize, double(longest / 2)));
  for (int p = 1; p <= maxSpots; ++p) {
    double sumShift = 0, sumSquare = 0, sumPeriod = 0;
    int pairs = 0;
    for (const auto& seq : seqs)
      for (std::size_t i = 0; i + std::size_t(p) < seq.size(); ++i) {
        const double shift = std::remainder(seq[i + p].azimuth - seq[i].azimuth, k::twoPi);
        sumShift += shift;
        sumSquare += shift * shift;
        sumPeriod += seq[i + p].time - seq[i].time;
        ++pairs;
      }
    const double mean = sumShift / pairs, meanSquare = sumSquare / pairs;
    if (std::sqrt(meanSquare) >= std::max(spotSize, k::revisitTolerance * k::twoPi / p)) continue;
    // A shift is the difference of two stops: its variance is twice a stop's.
    const double spread = std::sqrt(std::max(0.0, meanSquare - mean * mean) / 2);
    return Revisit{p, mean, spread, sumPeriod / pairs};
  }
  return std::nullopt;
}

// Least-squares slope of y against x (both non-empty, same size, x not all equal).
double slope(const std::vector<double>& x, const std::vector<double>& y) {
  double mx = 0, my = 0;
  for (std::size_t i = 0; i < x.size(); ++i) mx += x[i], my += y[i];
  mx /= double(x.size());
  my /= double(y.size());
  double sxy = 0, sxx = 0;
  for (std::size_t i = 0; i < x.size(); ++i) sxy += (x[i] - mx) * (y[i] - my), sxx += (x[i] - mx) * (x[i] - mx);
  return sxx > 0 ? sxy / sxx : 0.0;
}

// The spots of one mark: stop i belongs to spot i mod `spots`. A spot's
// azimuth is the mean of its (unwrapped) stops, its drift their slope in
// time, or `fallbackDrift` when it holds one stop.
std::vector<PatternSpot> spotsOfSequence(const std::vector<SeenStop>& seq, int spots, double fallbackDrift) {
  const std::size_t stride = std::size_t(spots);
  std::vector<PatternSpot> out;
  for (std::size_t first = 0; first < std::min(seq.size(), stride); ++first) {
    std::vector<double> times{seq[first].time}, azimuths{seq[first].azimuth};
    for (std::size_t i = first + stride; i < seq.size(); i += stride) {
      times.push_back(seq[i].time);
      azimuths.push_back(azimuths.back() + std::remainder(seq[i].azimuth - seq[i - stride].azimuth, k::twoPi));
    }
    double mean = 0;
    for (double a : azimuths) mean += a;
    mean /= double(azimuths.size());
    out.push_back({wrapAngle(mean), times.size() > 1 ? slope(times, azimuths) : fallbackDrift, int(times.size())});
  }
  return out;
}

// Folds spot b into spot a, weighting by their stops.
void absorb(PatternSpot& a, const PatternSpot& b) {
  const double w = double(b.stops) / double(a.stops + b.stops);
  a.azimuth = wrapAngle(a.azimuth + w * std::remainder(b.azimuth - a.azimuth, k::twoPi));
  a.drift = (1 - w) * a.drift + w * b.drift;
  a.stops += b.stops;
}

// Spots of several marks merged where they lie within `size` of each other
// (round the circle), sorted by azimuth.
std::vector<PatternSpot> mergeSpots(std::vector<PatternSpot> spots, double size) {
  const auto byAzimuth = [](const PatternSpot& a, const PatternSpot& b) { return a.azimuth < b.azimuth; };
  std::sort(spots.begin(), spots.end(), byAzimuth);
  std::vector<PatternSpot> merged;
  for (const PatternSpot& s : spots) {
    if (!merged.empty() && s.azimuth - merged.back().azimuth < size)
      absorb(merged.back(), s);
    else
      merged.push_back(s);
  }
  if (merged.size() > 1 && merged.front().azimuth + k::twoPi - merged.back().azimuth < size) {
    absorb(merged.front(), merged.back());
    merged.pop_back();
  }
  std::sort(merged.begin(), merged.end(), byAzimuth);
  return merged;
}

// What an eye makes of spots drifting at `drift` rad/s.
PatternKind kindOfDrift(double drift, double spotSize, double eyeTime, double window) {
  const double rate = std::abs(drift);
  if (rate * eyeTime >= spotSize) return PatternKind::Ring;
  if (rate * window >= spotSize) return PatternKind::Creeping;
  return PatternKind::Stationary;
}

// Spot statistics of the window [t0, t1].
PatternWindow patternWindow(const Trajectory& tr, const std::vector<MarkedPoint>& points,
                            const std::vector<StopEvent>& stops, const AnalysisSpec& analysis, double t0, double t1) {
  PatternWindow w;
  w.start = t0;
  w.end = t1;
  const WindowMeans means = windowMeans(tr, t0, t1);
  w.visibleEnd = means.visibleEnd;
  w.spotsPerRev = means.spotsPerRev;
  w.meanTilt = means.tilt;
  w.meanPrecession = means.precession;
  if (!w.visibleEnd) return w;
  if (const std::optional<OrbitFit> orbit = centreOrbitFit(tr, t0, t1, *w.visibleEnd)) {
    w.centreOrbit = orbit->along;
    w.centreOrbitAcross = orbit->across;
  }
  const auto seqs = seenStops(stops, points.size(), *w.visibleEnd, means.centre, t0, t1);
  std::size_t longest = 0;
  for (const auto& seq : seqs) {
    w.stopCount += int(seq.size());
    longest = std::max(longest, seq.size());
  }
  w.spotSize = smallestSpotSize(seqs, points);
  if (longest < 2) return w;  // no mark stopped twice: nothing to tell
  const std::optional<Revisit> revisit = findRevisit(seqs, w.spotSize);
  if (!revisit) {
    w.kind = PatternKind::Ring;
    return w;
  }
  w.patternDrift = revisit->shift / revisit->period;
  w.spotSpread = revisit->spread;
  std::vector<PatternSpot> all;
  for (const auto& seq : seqs)
    for (const PatternSpot& s : spotsOfSequence(seq, revisit->spots, w.patternDrift)) all.push_back(s);
  w.spots = mergeSpots(all, w.spotSize);
  w.revsPerVisit = std::max(1, int(std::lround(revisit->period * std::abs(w.meanPrecession) / k::twoPi)));
  w.stopsPerVisit = revisit->spots;
  w.kind = kindOfDrift(w.patternDrift, w.spotSize, analysis.eyeTime, t1 - t0);
  return w;
}

}  // namespace

std::vector<MarkedPoint> markedPoints(const Cylinder& body, const Paint& paint,
                                      const std::vector<TracePointSpec>& extra) {
  std::vector<MarkedPoint> points;
  for (std::size_t i = 0; i < paint.markings.size(); ++i) addMarkingPoints(body, paint.markings[i], i, points);
  for (std::size_t i = 0; i < extra.size(); ++i) {
    const TracePointSpec& p = extra[i];
    points.push_back(rimMark("point" + std::to_string(i) + "_" + std::string(endName(p.end)), body, p.end, p.angle,
                             p.size));
  }
  return points;
}

std::optional<End> raisedEndOf(const Quat& worldFromBody) {
  const double z = (worldFromBody * Vec3::UnitZ()).z();
  if (std::abs(z) < std::sin(minRaisedTilt)) return std::nullopt;
  return z > 0 ? End::A : End::B;
}

Vec3 ceilingContact(const Cylinder& body, const Pose& pose) {
  const Vec3 a = pose.axis();
  const double raised = a.z() >= 0 ? 1.0 : -1.0;
  return pose.position + raised * body.length / 2 * a + body.outerRadius * rimUpDirection(pose.worldFromBody);
}

Traces traceRun(const Trajectory& tr, const Cylinder& body, const std::vector<MarkedPoint>& points, double interval) {
  Traces t;
  t.points.resize(points.size());
  if (tr.empty()) return t;
  const double h = tr.samples.size() > 1 ? tr.samples[1].t - tr.samples[0].t : interval;
  const std::size_t every = std::size_t(std::max(1L, long(std::llround(interval / h))));
  for (std::size_t i = 0; i < tr.samples.size(); i += every) {
    const Sample& s = tr.samples[i];
    const Pose pose{s.position, s.orientation};
    const Vec3 ceiling = ceilingContact(body, pose);
    t.time.push_back(s.t);
    t.ceilingContact.push_back(ceiling);
    t.floorContact.push_back(2 * s.position - ceiling);
    for (std::size_t j = 0; j < points.size(); ++j) t.points[j].push_back(pose.toWorld(points[j].body));
  }
  return t;
}

std::vector<StopEvent> stopEvents(const Trajectory& tr, const std::vector<MarkedPoint>& points, double dwellSpeed) {
  std::vector<StopEvent> stops;
  for (std::size_t j = 0; j < points.size(); ++j) {
    const MarkedPoint& p = points[j];
    if (!p.end) continue;
    // Walk the samples; a stop lies between two samples on which the point's
    // end is raised and its angle from the top changes sign.
    double previousAngle = 0;
    bool previousRaised = false;
    for (std::size_t i = 0; i < tr.samples.size(); ++i) {
      const Sample& s = tr.samples[i];
      const bool raised = raisedEndOf(s.orientation) == p.end;
      const double angle = angleFromTop(s.orientation, p.body);
      if (raised && previousRaised && crossesTop(previousAngle, angle))
        stops.push_back(makeStop(tr, p, j, tr.samples[i - 1], s, previousAngle, dwellSpeed));
      previousAngle = angle;
      previousRaised = raised;
    }
  }
  std::sort(stops.begin(), stops.end(), [](const StopEvent& a, const StopEvent& b) {
    return a.time != b.time ? a.time < b.time : a.point < b.point;
  });
  return stops;
}

std::string_view patternKindName(PatternKind k) {
  switch (k) {
    case PatternKind::None: return "none";
    case PatternKind::Stationary: return "stationary";
    case PatternKind::Creeping: return "creeping";
    case PatternKind::Ring: return "ring";
  }
  return "none";
}

std::vector<PatternWindow> patternWindows(const Trajectory& tr, const std::vector<MarkedPoint>& points,
                                          const std::vector<StopEvent>& stops, const AnalysisSpec& analysis) {
  std::vector<PatternWindow> windows;
  if (tr.empty()) return windows;
  const double start = tr.startTime(), end = tr.endTime();
  if (end - start < analysis.window) {
    windows.push_back(patternWindow(tr, points, stops, analysis, start, end));
    return windows;
  }
  // Window starts are computed from their index, so no rounding accumulates;
  // a nanosecond of slack keeps the last window that ends at the record's end.
  for (long n = 0;; ++n) {
    const double t0 = start + double(n) * analysis.windowStep;
    if (t0 + analysis.window > end + 1e-9) break;
    windows.push_back(patternWindow(tr, points, stops, analysis, t0, std::min(end, t0 + analysis.window)));
  }
  return windows;
}

PatternAnalysis analysePattern(const Scenario& s, const RunResult& run) {
  PatternAnalysis a;
  a.points = markedPoints(run.params.body, s.paint, s.analysis.tracePoints);
  a.traces = traceRun(run.trajectory, run.params.body, a.points, s.run.sampleInterval);
  a.stops = stopEvents(run.trajectory, a.points, s.analysis.dwellSpeed);
  a.windows = patternWindows(run.trajectory, a.points, a.stops, s.analysis);
  return a;
}

}  // namespace dm
