// The viewing check of a design review: what a standing adult, a child and
// a seated visitor see of the spots from their eye heights at the viewing
// distance, and whether the spots' contrast reaches the detection
// threshold (observer.spot_threshold: a Weber contrast of about 2 % for
// large targets, Blackwell, JOSA 36, 624, 1946, from memory).
#pragma once
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/scenario.hpp"
#include "render/image.hpp"
#include "render/observe.hpp"

namespace dm {

/// One place a visitor looks from.
struct ViewerPosition {
  std::string name;        ///< "standing adult", "child", "seated visitor"
  double eyeHeight = 0;    ///< above the floor, m
};

/// The three positions of a scenario's viewing section.
std::vector<ViewerPosition> viewerPositions(const ViewingSpec& v);

/// What one viewer sees.
struct ViewingResult {
  ViewerPosition viewer;
  double eyeAboveTable = 0;   ///< m (negative: below the table top)
  double distance = 0;        ///< horizontal distance from the spin centre, m
  double elevation = 0;       ///< angle of the sight line to the spin centre above the table, rad
  int spots = 0;              ///< spots found above the threshold
  double contrast = 0;        ///< largest |Weber contrast| of a found spot (0 when none)
  double threshold = 0;       ///< the detection threshold used
  bool seen = false;          ///< at least one spot reaches the threshold
  double footprint = 0;       ///< width a pixel covers at the ring, m
  /// The image resolves the markings as viewingImageSize() asks; false when
  /// the size limit was reached first (the contrast then reads low).
  bool resolved = true;
  Image image;                ///< the viewer's exposure (empty when the eye is below the table top)
};

/// The eye's resolving angle, rad: decimal visual acuity 1.0 resolves a gap
/// of one minute of arc (ISO 8596, the Landolt ring; from memory).
inline constexpr double eyeAcuity = k::degree / 60;

/// Pixels across the smallest marking a viewing check's image asks for.
/// Spot detection averages each bin over five pixels across the ring and
/// five along it, which dilutes a spot only a few pixels wide: the demo's
/// 5 mm patch seen from above read 60 %, 76 %, 89 % and 96 % of its
/// contrast at 2.8, 5.6, 11 and 22 pixels across (measured).
inline constexpr double pixelsPerMark = 10;

/// The smallest extent of the scenario's markings, m: a band's or rim
/// patch's width, a rim patch's arc, a stripe's width, a dot's diameter;
/// 0 when there are none.
double smallestMarkExtent(const Scenario& s);

/// Image size (px) for a view `fieldOfView` (rad) wide from `range` (m) off
/// the ring: a pixel no wider at the ring than the larger of what the eye
/// resolves there and a pixelsPerMark-th of the smallest marking, at least
/// 64 px, at most `largest` px. `resolved` says whether `largest` left it so.
int viewingImageSize(const Scenario& s, double fieldOfView, double range, int largest, bool& resolved);

/// Smallest eye height above the table top a viewer's camera is placed at,
/// m (the observer field's lower limit); lower eyes see no spots.
inline constexpr double minEyeAboveTable = 0.01;

/// The full field of view (rad, 1 to 120 deg) that holds the ring and the
/// body's sweep around it (the ring's radius and the body's diameter), with
/// a fifth to spare, from an eye `eyeAbove` (m) above the table and
/// `distance` (m) from the spin centre.
double framingFieldOfView(const Scenario& s, const Observation& seen, double eyeAbove, double distance);

/// Exposes the observation from each viewer position (the scenario's
/// observer settings with the viewer's eye, the field of view framing the
/// body's sweep, the image sized by viewingImageSize() up to
/// `largestImageSize` px) and finds the spots the markings make.
std::vector<ViewingResult> viewingCheck(const Scenario& s, const Observation& seen, int largestImageSize, int threads);

}  // namespace dm
