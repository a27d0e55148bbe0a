// Traces, stop events and spot statistics of a run: where the floor and
// ceiling contacts and the marked points go, when a mark of the raised end
// passes the top and how long it stays (nearly) still there, and what
// pattern of spots those stops make over sliding time windows.
//
// Stop positions are the measurement: a spot is a place where every p-th
// stop of a mark comes back. A rational N = p/q makes p spots, each visited
// every q revolutions; a nearly rational N makes them creep; when no small
// set of places repeats, or a spot moves further than its own size within
// the eye's integration time, the stops wash out into a ring.
#pragma once
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/body.hpp"
#include "core/constants.hpp"
#include "core/markings.hpp"
#include "core/scenario.hpp"
#include "core/simulate.hpp"
#include "core/trajectory.hpp"
#include "core/vec.hpp"

namespace dm {

/// Tilt below which neither end counts as raised, rad (a tenth of a degree:
/// the ends of a 60 mm body then stand within 0.1 mm of the same height).
inline constexpr double minRaisedTilt = 0.1 * k::degree;

/// A point of the body whose path is traced.
struct MarkedPoint {
  std::string label;       ///< names its source: rim_patch0_A, stripe1_B, dot2, point0_A
  Vec3 body = Vec3::Zero();  ///< body coordinates, m
  std::optional<End> end;  ///< the end whose half it lies on (none exactly at the middle)
  double size = 0;         ///< extent of its mark along the rim direction, m (sets the spot size)
};

/// The points to trace: one per rim patch (its centre on the outer rim
/// edge), one per dot (its centre), two per stripe (where it meets each
/// end's outer rim edge), then the extra trace points; bands, being the same
/// all round, give none.
std::vector<MarkedPoint> markedPoints(const Cylinder& body, const Paint& paint,
                                      const std::vector<TracePointSpec>& extra);

/// The end standing higher, or none when the tilt is below minRaisedTilt.
std::optional<End> raisedEndOf(const Quat& worldFromBody);

/// Contact with the imaginary ceiling (the highest rim point of the raised
/// end) at one pose; the floor contact is diametrically opposite through the
/// centre: 2 * centre - ceiling. Lab, m.
Vec3 ceilingContact(const Cylinder& body, const Pose& pose);

/// Paths sampled at regular times (every `interval`, on the trajectory's own
/// samples, the rows of trajectory.csv).
struct Traces {
  std::vector<double> time;               ///< s
  std::vector<Vec3> floorContact;         ///< lowest rim point of the lower end, lab, m
  std::vector<Vec3> ceilingContact;       ///< highest rim point of the raised end, lab, m
  std::vector<std::vector<Vec3>> points;  ///< points[j][i]: marked point j at time[i], lab, m
};

/// The traces of a run every `interval` seconds (snapped to whole samples
/// of the trajectory, as trajectory.csv is).
Traces traceRun(const Trajectory& trajectory, const Cylinder& body, const std::vector<MarkedPoint>& points,
                double interval);

/// One passage of a marked point of the raised end over the top of its
/// circle about the axis.
struct StopEvent {
  std::size_t point = 0;        ///< index into the marked points
  End end = End::A;             ///< the raised end (the point's end)
  double time = 0;              ///< s, found to 1e-12 s by bisection on the interpolated pose
  Vec3 position = Vec3::Zero();  ///< lab, m
  double horizontalSpeed = 0;   ///< speed across the table at the top, m/s
  double dwell = 0;             ///< s the horizontal speed stays below the threshold around the top (0 if above it there)
};

/// Stop events of every point, in time order. `dwellSpeed` (m/s) is the
/// horizontal speed below which a mark counts as stopped.
std::vector<StopEvent> stopEvents(const Trajectory& trajectory, const std::vector<MarkedPoint>& points,
                                  double dwellSpeed);

/// What an eye makes of a window's stops.
enum class PatternKind {
  None,        ///< no raised end, or no mark of it stopped twice in the window
  Stationary,  ///< spots that move less than their size over the window
  Creeping,    ///< spots that move more than their size over the window, less within the eye time
  Ring,        ///< stops that repeat no small set of places, or spots drifting their size within the eye time
};
std::string_view patternKindName(PatternKind k);

/// One distinct stop position.
struct PatternSpot {
  double azimuth = 0;  ///< about the window's mean centre, from lab x counter-clockwise, rad (0..2 pi)
  double drift = 0;    ///< rate of its azimuth, rad/s (least squares over its stops)
  int stops = 0;       ///< stops that landed on it in the window
};

/// Spot statistics of one time window.
struct PatternWindow {
  double start = 0, end = 0;          ///< s
  std::optional<End> visibleEnd;      ///< the end raised for most of the window: its marks are seen from above
  std::vector<PatternSpot> spots;            ///< sorted by azimuth
  int revsPerVisit = 0;               ///< q: revolutions between visits of one spot (0 without spots)
  /// p: stops of one mark between its visits to one place, so that N is
  /// near p/q (lowest terms: p is the fewest that come back); one mark
  /// makes p spots, several marks more (0 without spots)
  int stopsPerVisit = 0;
  double patternDrift = 0;            ///< mean drift of a spot from one visit to the next, rad/s
  double spotSize = 0;                ///< angular size of the smallest seen spot about the centre, rad
  double spotSpread = 0;              ///< scatter of single stops about their spot's drifting place, rad (rms)
  int stopCount = 0;                  ///< stops of the visible end's marks in the window
  /// N over the window: the integral of the relative spin over that of the
  /// precession (visits of a mark to the top per revolution); none when the
  /// mean precession is below minPrecessionForN
  std::optional<double> spotsPerRev;
  double meanTilt = 0;                ///< rad
  double meanPrecession = 0;          ///< rad/s
  /// The centre's orbit about the spin axis (CentreOrbit, core/steady.hpp):
  /// the signed mean of (c - O).e over the window, m, + towards the raised
  /// end. O is the ring's centre, the vertical axis the raised end's top
  /// circles, and e the horizontal unit of the visible end's axis. O is
  /// fitted with rho by least squares, c = O + V (t - t_mid) + rho e +
  /// sigma (z x e) on every sample (O may wander at a steady velocity V), so
  /// rho is that mean exactly. None without a visible end or when the axis
  /// turns less than once in the window (O and rho are then not separable).
  std::optional<double> centreOrbit;
  /// sigma, the centre's mean offset across e (along z x e), m: the part of
  /// the orbit a steady spin does not have; a measure of how far the window
  /// is from one (none when centreOrbit is none).
  std::optional<double> centreOrbitAcross;
  PatternKind kind = PatternKind::None;
};

/// Sliding windows of `analysis.window` seconds, starting every
/// `analysis.windowStep` seconds from the start of the record while the
/// window fits (one window of the whole record if it is shorter).
std::vector<PatternWindow> patternWindows(const Trajectory& trajectory, const std::vector<MarkedPoint>& points,
                                          const std::vector<StopEvent>& stops, const AnalysisSpec& analysis);

/// Everything the pattern analysis derives from one run.
struct PatternAnalysis {
  std::vector<MarkedPoint> points;
  Traces traces;
  std::vector<StopEvent> stops;
  std::vector<PatternWindow> windows;
};

/// The whole analysis of a run of scenario `s`.
PatternAnalysis analysePattern(const Scenario& s, const RunResult& run);

}  // namespace dm
